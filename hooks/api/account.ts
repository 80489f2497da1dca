import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { AccountView, LoginInput, ProfileInput, RegisterInput } from '@/lib/schemas/account';
import { api } from './client';

export interface SessionPayload {
  token: string;
  user: AccountView;
}

export const accountKeys = {
  all: ['account'] as const,
  me: (token: string | null) => [...accountKeys.all, 'me', token ?? 'anonymous'] as const,
};

export const fetchMe = (token: string) => api<{ user: AccountView }>('/me', { token }).then((r) => r.user);

export const meQueryOptions = (token: string | null) =>
  queryOptions({
    queryKey: accountKeys.me(token),
    queryFn: () => fetchMe(token!),
    enabled: !!token,
    staleTime: 60_000,
  });

export function useMe(token: string | null) {
  return useQuery(meQueryOptions(token));
}

export const registerAccount = (body: RegisterInput) => api<SessionPayload>('/auth/register', { body, token: null });
export const loginAccount = (body: LoginInput) => api<SessionPayload>('/auth/login', { body, token: null });
export const logoutAccount = () => api<void>('/auth/logout', { method: 'POST' });

export function useUpdateProfile() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: ProfileInput) => api<{ user: AccountView }>('/me', { method: 'PATCH', body }).then((r) => r.user),
    onSuccess: (user) => {
      qc.setQueriesData({ queryKey: [...accountKeys.all, 'me'] }, user);
    },
  });
}
