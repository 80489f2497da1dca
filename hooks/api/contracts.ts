import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ContractView } from '@/lib/schemas/contract';
import { api } from './client';
import { staleTimes } from './query-client';

export const contractKeys = {
  all: ['contracts'] as const,
  list: () => [...contractKeys.all, 'list'] as const,
  detail: (id: string) => [...contractKeys.all, 'detail', id] as const,
};

export const contractsQueryOptions = () =>
  queryOptions({ queryKey: contractKeys.list(), queryFn: () => api<{ items: ContractView[] }>('/contracts').then((r) => r.items), staleTime: staleTimes.list });

export const contractQueryOptions = (id: string) =>
  queryOptions({
    queryKey: contractKeys.detail(id),
    queryFn: () => api<{ contract: ContractView }>(`/contracts/${encodeURIComponent(id)}`).then((r) => r.contract),
    staleTime: staleTimes.detail,
  });

export function useContracts() {
  return useQuery(contractsQueryOptions());
}

export function useContract(id: string | undefined) {
  return useQuery({ ...contractQueryOptions(id ?? ''), enabled: !!id });
}
