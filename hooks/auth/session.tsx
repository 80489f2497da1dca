import { createContext, useCallback, useContext, useEffect, useMemo, useState, type ReactNode } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import type { AccountView } from '@/lib/schemas/account';
import { ApiError, setAuthToken, setUnauthorizedHandler } from '@/hooks/api/client';
import { accountKeys, logoutAccount, refreshSession, useMe, type SessionPayload } from '@/hooks/api/account';
import { deviceCopies, setDeviceCopyOwner } from '@/hooks/offline/device-copies';
import { accountStorage, tokenStorage } from './token-storage';
import { useTokenRotation } from './token-rotation';

/**
 * 'unreachable': a token is kept but neither the server nor the device could say whose it is (first visit
 * with no network). The session is not ended for that: only the server's 401 signs someone out.
 */
type Status = 'loading' | 'signed-out' | 'signed-in' | 'unreachable';

interface SessionValue {
  status: Status;
  user: AccountView | null;
  token: string | null;
  signIn: (payload: SessionPayload) => Promise<void>;
  signOut: () => Promise<void>;
  /** Asks the server again who is signed in (after 'unreachable'). */
  retry: () => void;
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
    await accountStorage.set(null);
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
      await accountStorage.set(user);
      setAuthToken(t);
      await tokenStorage.set(t);
      setToken(t);
    },
    [qc],
  );

  const rotate = useCallback(
    async (current: string): Promise<boolean> => {
      // Another tab of this browser may have rotated already (the token is shared through storage): take its token.
      const stored = await tokenStorage.get();
      if (stored && stored !== current) {
        setAuthToken(stored);
        setToken(stored);
        return true;
      }
      try {
        await signIn(await refreshSession(current));
      } catch {
        // No signal or a server restarting: tried again later. A 401 has signed out already (the client's handler).
        return false;
      }
      // Views carry photo and PDF links signed for the closed session: fetch them again under the new one.
      void qc.invalidateQueries({ predicate: (q) => q.queryKey[0] !== accountKeys.all[0] });
      return true;
    },
    [qc, signIn],
  );
  useTokenRotation(token, rotate);

  const userId = me.data?.id ?? null;
  const signOut = useCallback(async () => {
    try {
      await logoutAccount();
    } catch {
      // Signing out locally matters more than telling the server; an expired token is already signed out.
    }
    // Copies of contracts and logs kept for offline use go with the session (a shared phone or laptop).
    if (userId) await deviceCopies.forget(userId);
    await clear();
  }, [clear, userId]);

  // Set during render, not in an effect: the signed-in screens mount in this same render and their
  // queries read the owner when they fetch (child effects run before a parent's).
  setDeviceCopyOwner(token ? userId : null);

  const unauthorized = me.error instanceof ApiError && me.error.status === 401;
  const status: Status = !restored
    ? 'loading'
    : !token
      ? 'signed-out'
      : me.data
        ? 'signed-in'
        : me.isPending
          ? 'loading'
          : unauthorized
            ? 'signed-out'
            : 'unreachable';

  const refetchMe = me.refetch;
  const retry = useCallback(() => void refetchMe(), [refetchMe]);
  const value = useMemo(() => ({ status, user: me.data ?? null, token, signIn, signOut, retry }), [status, me.data, token, signIn, signOut, retry]);
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
