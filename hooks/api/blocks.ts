import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { BlockInput, BlockListQuery, BlockListResponse, BlockPhotoView, BlockView } from '@/lib/schemas/block';
import { api, queryString } from './client';
import { staleTimes } from './query-client';

export type BlockFilters = Partial<Record<keyof BlockListQuery, string | number>>;

export const blockKeys = {
  all: ['blocks'] as const,
  lists: () => [...blockKeys.all, 'list'] as const,
  list: (filters: BlockFilters) => [...blockKeys.lists(), filters] as const,
  details: () => [...blockKeys.all, 'detail'] as const,
  detail: (id: string) => [...blockKeys.details(), id] as const,
};

export const fetchBlocks = (filters: BlockFilters) => api<BlockListResponse>(`/blocks${queryString(filters)}`);
export const fetchBlock = (id: string) => api<{ block: BlockView }>(`/blocks/${encodeURIComponent(id)}`).then((r) => r.block);

export const blocksQueryOptions = (filters: BlockFilters) =>
  queryOptions({ queryKey: blockKeys.list(filters), queryFn: () => fetchBlocks(filters), staleTime: staleTimes.list, placeholderData: keepPreviousData });

export const blockQueryOptions = (id: string) => queryOptions({ queryKey: blockKeys.detail(id), queryFn: () => fetchBlock(id), staleTime: staleTimes.detail });

export function useBlocks(filters: BlockFilters) {
  return useQuery(blocksQueryOptions(filters));
}

export function useBlock(id: string | undefined) {
  return useQuery({ ...blockQueryOptions(id ?? ''), enabled: !!id });
}

/** After any change to a block: its detail is replaced, every list is refetched. */
function useBlockSaved() {
  const qc = useQueryClient();
  return (block: BlockView) => {
    qc.setQueryData(blockKeys.detail(block.id), block);
    void qc.invalidateQueries({ queryKey: blockKeys.lists() });
  };
}

export function useCreateBlock() {
  const saved = useBlockSaved();
  return useMutation({
    mutationFn: (body: BlockInput) => api<{ block: BlockView }>('/blocks', { body }).then((r) => r.block),
    onSuccess: saved,
  });
}

export function useUpdateBlock(id: string) {
  const saved = useBlockSaved();
  return useMutation({
    mutationFn: (body: Partial<BlockInput>) => api<{ block: BlockView }>(`/blocks/${encodeURIComponent(id)}`, { method: 'PATCH', body }).then((r) => r.block),
    onSuccess: saved,
  });
}

export function useBlockAction(id: string, action: 'publish' | 'withdraw') {
  const saved = useBlockSaved();
  return useMutation({
    mutationFn: () => api<{ block: BlockView }>(`/blocks/${encodeURIComponent(id)}/${action}`, { method: 'POST' }).then((r) => r.block),
    onSuccess: saved,
  });
}

export function useUploadPhoto(blockId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (file: Blob & { name?: string }) => {
      const form = new FormData();
      form.append('photo', file, file.name ?? 'photo');
      return api<{ photo: BlockPhotoView }>(`/blocks/${encodeURIComponent(blockId)}/photos`, { form }).then((r) => r.photo);
    },
    onSuccess: () => qc.invalidateQueries({ queryKey: blockKeys.detail(blockId) }),
  });
}

export function useDeletePhoto(blockId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (photoId: string) => api<void>(`/blocks/${encodeURIComponent(blockId)}/photos/${encodeURIComponent(photoId)}`, { method: 'DELETE' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: blockKeys.detail(blockId) }),
  });
}
