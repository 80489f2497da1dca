// Native builds keep the token in memory only until a secure store is added; Fieldfold ships on the web first.
let memory: string | null = null;

export const tokenStorage = {
  get: async (): Promise<string | null> => memory,
  set: async (token: string | null): Promise<void> => {
    memory = token;
  },
};
