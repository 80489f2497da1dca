// On the web the token lives in localStorage so a reload keeps the grazier signed in on the truck's phone.
const KEY = 'fieldfold.token';

export const tokenStorage = {
  get: async (): Promise<string | null> => {
    try {
      return globalThis.localStorage?.getItem(KEY) ?? null;
    } catch {
      return null;
    }
  },
  set: async (token: string | null): Promise<void> => {
    try {
      if (token) globalThis.localStorage?.setItem(KEY, token);
      else globalThis.localStorage?.removeItem(KEY);
    } catch {
      // Private browsing can refuse storage; the session still works until the tab closes.
    }
  },
};
