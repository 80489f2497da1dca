import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { AccountView, LoginInput, PasswordResetConfirm, PasswordResetRequest, ProfileInput, RegisterInput } from '@/lib/schemas/account';
import { accountStorage } from '@/hooks/auth/token-storage';
import { api, ApiError } from './client';

export interface SessionPayload {
  token: string;
  user: AccountView;
}

export const accountKeys = {
  all: ['account'] as const,
  me: (token: string | null) => [...accountKeys.all, 'me', token ?? 'anonymous'] as const,
};

export const fetchMe = (token: string) => api<{ user: AccountView }>('/me', { token }).then((r) => r.user);

/**
 * The signed-in account: from /api/me, kept on the device each time; when the network fails (no answer, or
 * the server is down) the kept account is used, so a grazier with no signal stays signed in. Only the
 * server's 401 ends a session.
 */
export async function fetchMeOrKept(token: string): Promise<AccountView> {
  try {
    const user = await fetchMe(token);
    await accountStorage.set(user);
    return user;
  } catch (err) {
    const unreachable = err instanceof ApiError && (err.status === 0 || err.status >= 500);
    const kept = unreachable ? await accountStorage.get() : null;
    if (kept) return kept;
    throw err;
  }
}

export const meQueryOptions = (token: string | null) =>
  queryOptions({
    queryKey: accountKeys.me(token),
    queryFn: () => fetchMeOrKept(token!),
    enabled: !!token,
    staleTime: 60_000,
    // Run (and fall back to the kept account) even while the browser reports no network.
    networkMode: 'always',
  });

export function useMe(token: string | null) {
  return useQuery(meQueryOptions(token));
}

export const registerAccount = (body: RegisterInput) => api<SessionPayload>('/auth/register', { body, token: null });
export const loginAccount = (body: LoginInput) => api<SessionPayload>('/auth/login', { body, token: null });
export const logoutAccount = () => api<void>('/auth/logout', { method: 'POST' });
/** Asks for a reset link by mail; the server answers the same whether or not the email has an account. */
export const requestPasswordReset = (body: PasswordResetRequest) => api<{ message: string }>('/auth/password-reset', { body, token: null });
/** Sets a new password with the mailed token; every device is signed out, so the person signs in afresh. */
export const confirmPasswordReset = (body: PasswordResetConfirm) => api<void>('/auth/password-reset/confirm', { body, token: null });
/** Trades a signed-in token for a new one; the server closes the old session (hooks/auth/token-rotation.ts). */
export const refreshSession = (token: string) => api<SessionPayload>('/auth/refresh', { method: 'POST', token });

export function useUpdateProfile() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: ProfileInput) => api<{ user: AccountView }>('/me', { method: 'PATCH', body }).then((r) => r.user),
    onSuccess: (user) => {
      qc.setQueriesData({ queryKey: [...accountKeys.all, 'me'] }, user);
      void accountStorage.set(user);
    },
  });
}
