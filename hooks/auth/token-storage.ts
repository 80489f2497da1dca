import type { AccountView } from '@/lib/schemas/account';

// Native builds keep the token and the signed-in account in memory only until a secure store is added;
// Fieldfold ships on the web first.
let memory: string | null = null;
let account: AccountView | null = null;

export const tokenStorage = {
  get: async (): Promise<string | null> => memory,
  set: async (token: string | null): Promise<void> => {
    memory = token;
  },
};

/** The last account /api/me answered with, so a session opens without a network. */
export const accountStorage = {
  get: async (): Promise<AccountView | null> => account,
  set: async (user: AccountView | null): Promise<void> => {
    account = user;
  },
};
