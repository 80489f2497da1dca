import { createContext, useCallback, useContext, useEffect, useMemo, useState, type ReactNode } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import type { AccountView } from '@/lib/schemas/account';
import { setAuthToken, setUnauthorizedHandler } from '@/hooks/api/client';
import { accountKeys, logoutAccount, useMe, type SessionPayload } from '@/hooks/api/account';
import { tokenStorage } from './token-storage';

type Status = 'loading' | 'signed-out' | 'signed-in';

interface SessionValue {
  status: Status;
  user: AccountView | null;
  token: string | null;
  signIn: (payload: SessionPayload) => Promise<void>;
  signOut: () => Promise<void>;
}

const SessionContext = createContext<SessionValue | null>(null);

export function SessionProvider({ children }: { children: ReactNode }) {
  const qc = useQueryClient();
  const [token, setToken] = useState<string | null>(null);
  const [restored, setRestored] = useState(false);

  useEffect(() => {
    tokenStorage.get().then((t) => {
      setAuthToken(t);
      setToken(t);
      setRestored(true);
    });
  }, []);

  const clear = useCallback(async () => {
    setAuthToken(null);
    setToken(null);
    await tokenStorage.set(null);
    qc.clear();
  }, [qc]);

  useEffect(() => {
    setUnauthorizedHandler(() => void clear());
    return () => setUnauthorizedHandler(null);
  }, [clear]);

  const me = useMe(token);

  const signIn = useCallback(
    async ({ token: t, user }: SessionPayload) => {
      qc.setQueryData(accountKeys.me(t), user);
      setAuthToken(t);
      await tokenStorage.set(t);
      setToken(t);
    },
    [qc],
  );

  const signOut = useCallback(async () => {
    try {
      await logoutAccount();
    } catch {
      // Signing out locally matters more than telling the server; an expired token is already signed out.
    }
    await clear();
  }, [clear]);

  const status: Status = !restored || (token && me.isPending) ? 'loading' : token && me.data ? 'signed-in' : 'signed-out';

  const value = useMemo(() => ({ status, user: me.data ?? null, token, signIn, signOut }), [status, me.data, token, signIn, signOut]);
  return <SessionContext.Provider value={value}>{children}</SessionContext.Provider>;
}

export function useSession(): SessionValue {
  const v = useContext(SessionContext);
  if (!v) throw new Error('useSession must be used inside <SessionProvider>');
  return v;
}

/** The role the signed-in account is acting as: the chosen one, or its first. */
export function useActiveRole(): 'grower' | 'grazier' | null {
  const { user } = useSession();
  if (!user) return null;
  if (user.activeRole) return user.activeRole;
  return (user.roles.find((r) => r === 'grower' || r === 'grazier') as 'grower' | 'grazier' | undefined) ?? null;
}
