import type { AccountView } from '@/lib/schemas/account';

// On the web the token lives in localStorage so a reload keeps the grazier signed in on the truck's phone,
// and the account /api/me last answered with sits beside it so that reload works in airplane mode too.
const KEY = 'fieldfold.token';
const ACCOUNT_KEY = 'fieldfold.account';

function read(key: string): string | null {
  try {
    return globalThis.localStorage?.getItem(key) ?? null;
  } catch {
    return null;
  }
}

function write(key: string, value: string | null) {
  try {
    if (value) globalThis.localStorage?.setItem(key, value);
    else globalThis.localStorage?.removeItem(key);
  } catch {
    // Private browsing can refuse storage; the session still works until the tab closes.
  }
}

export const tokenStorage = {
  get: async (): Promise<string | null> => read(KEY),
  set: async (token: string | null): Promise<void> => write(KEY, token),
};

export const accountStorage = {
  get: async (): Promise<AccountView | null> => {
    const text = read(ACCOUNT_KEY);
    if (!text) return null;
    try {
      return JSON.parse(text) as AccountView;
    } catch {
      return null;
    }
  },
  set: async (user: AccountView | null): Promise<void> => write(ACCOUNT_KEY, user ? JSON.stringify(user) : null),
};
