import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { BidInput, BidView } from '@/lib/schemas/bid';
import type { ContractView } from '@/lib/schemas/contract';
import { api } from './client';
import { staleTimes } from './query-client';
import { blockKeys } from './blocks';
import { contractKeys } from './contracts';

export const bidKeys = {
  all: ['bids'] as const,
  mine: () => [...bidKeys.all, 'mine'] as const,
  forBlock: (blockId: string) => [...bidKeys.all, 'block', blockId] as const,
  detail: (id: string) => [...bidKeys.all, 'detail', id] as const,
};

const enc = encodeURIComponent;

export const blockBidsQueryOptions = (blockId: string) =>
  queryOptions({
    queryKey: bidKeys.forBlock(blockId),
    queryFn: () => api<{ items: BidView[] }>(`/blocks/${enc(blockId)}/bids`).then((r) => r.items),
    staleTime: staleTimes.list,
  });

export const myBidsQueryOptions = () =>
  queryOptions({ queryKey: bidKeys.mine(), queryFn: () => api<{ items: BidView[] }>('/bids').then((r) => r.items), staleTime: staleTimes.list });

export const bidQueryOptions = (bidId: string) =>
  queryOptions({
    queryKey: bidKeys.detail(bidId),
    queryFn: () => api<{ bid: BidView }>(`/bids/${enc(bidId)}`).then((r) => r.bid),
    staleTime: staleTimes.list,
  });

/** One bid by id (my live bid on a block): the lists come a page at a time, so look it up directly. */
export function useBid(bidId: string | null | undefined) {
  return useQuery({ ...bidQueryOptions(bidId ?? ''), enabled: !!bidId });
}

export function useBlockBids(blockId: string | undefined, enabled = true) {
  return useQuery({ ...blockBidsQueryOptions(blockId ?? ''), enabled: !!blockId && enabled });
}

export function useMyBids() {
  return useQuery(myBidsQueryOptions());
}

/** A bid changes the block's bid list, the grazier's own list and the block (its live-bid count). */
function useBidChanged() {
  const qc = useQueryClient();
  return (bid: BidView) => {
    void qc.invalidateQueries({ queryKey: bidKeys.all });
    void qc.invalidateQueries({ queryKey: blockKeys.detail(bid.blockId) });
    void qc.invalidateQueries({ queryKey: blockKeys.lists() });
  };
}

export function usePlaceBid(blockId: string) {
  const changed = useBidChanged();
  return useMutation({
    mutationFn: (body: BidInput) => api<{ bid: BidView }>(`/blocks/${enc(blockId)}/bids`, { body }).then((r) => r.bid),
    onSuccess: changed,
  });
}

export function useUpdateBid(bidId: string) {
  const changed = useBidChanged();
  return useMutation({
    mutationFn: (body: Partial<BidInput>) => api<{ bid: BidView }>(`/bids/${enc(bidId)}`, { method: 'PATCH', body }).then((r) => r.bid),
    onSuccess: changed,
  });
}

export function useWithdrawBid() {
  const changed = useBidChanged();
  return useMutation({
    mutationFn: (bidId: string) => api<{ bid: BidView }>(`/bids/${enc(bidId)}/withdraw`, { method: 'POST' }).then((r) => r.bid),
    onSuccess: changed,
  });
}

export function useAwardBid(blockId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (bidId: string) => api<{ contract: ContractView }>(`/bids/${enc(bidId)}/award`, { method: 'POST' }).then((r) => r.contract),
    onSettled: () => {
      void qc.invalidateQueries({ queryKey: bidKeys.all });
      void qc.invalidateQueries({ queryKey: blockKeys.detail(blockId) });
      void qc.invalidateQueries({ queryKey: blockKeys.lists() });
      void qc.invalidateQueries({ queryKey: contractKeys.all });
    },
  });
}
