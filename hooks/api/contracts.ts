import { infiniteQueryOptions, onlineManager, useInfiniteQuery, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import {
  MAX_CONTRACT_PAGE,
  type AmendmentInput,
  type AmendmentView,
  type CancelContractInput,
  type ContractListResponse,
  type ContractView,
  type LogEntryKind,
  type LogEntryView,
  type LogFigures,
  type LogPage,
  type SignContractInput,
  type SignOffInput,
  type SignOffView,
  type VoidLogEntryInput,
} from '@/lib/schemas/contract';
import { deviceCopies } from '@/hooks/offline/device-copies';
import type { LogEntryToSend } from '@/hooks/offline/log-queue';
import { api, queryString } from './client';
import { staleTimes } from './query-client';

// The views come from lib/schemas/contract.ts; these names are how the screens read them.
export type ContractDetailView = ContractView;
export type SignOffRound = SignOffView;
export type LogEntryRecord = LogEntryView;
export type LogFiguresView = LogFigures;

export const pendingAmendmentOf = (c: ContractDetailView): AmendmentView | null => c.pendingAmendment ?? null;
export const signOffOf = (c: ContractDetailView): SignOffRound | null => c.signOff ?? null;

/** The log as the screens use it: every page fetched so far, the figures over the whole log. */
export interface ContractLog {
  items: LogEntryRecord[];
  figures: LogFiguresView;
  canWrite?: LogEntryKind[];
  /** Older entries are on the server and not fetched yet. */
  hasOlder: boolean;
  /** Set when the network failed and the copy kept on this device is shown: when that copy was saved. */
  savedAt: string | null;
}

export const contractKeys = {
  all: ['contracts'] as const,
  list: () => [...contractKeys.all, 'list'] as const,
  detail: (id: string) => [...contractKeys.all, 'detail', id] as const,
  log: (id: string) => [...contractKeys.all, 'log', id] as const,
};

const enc = encodeURIComponent;
/** Pages as large as the API gives: a season's contracts or a stay's log in one or two. */
const PAGE = MAX_CONTRACT_PAGE;
/** How often an open log reads its figures again while online. */
const LOG_REFRESH_MS = 60_000;

type ContractPage = ContractListResponse;

export const fetchContracts = (cursor?: string) => api<ContractPage>(`/contracts${queryString({ limit: PAGE, cursor })}`);
export const fetchContract = (id: string) => api<{ contract: ContractDetailView }>(`/contracts/${enc(id)}`).then((r) => r.contract);
export const fetchContractLog = (id: string, cursor?: string) => api<LogPage>(`/contracts/${enc(id)}/log${queryString({ limit: PAGE, cursor })}`);

/** One log entry; the same clientId twice is stored once, so the offline queue may send it again safely. */
export const postLogEntry = (contractId: string, entry: LogEntryToSend) =>
  api<{ entry: LogEntryView }>(`/contracts/${enc(contractId)}/log`, { body: entry }).then((r) => r.entry);

export const logPdfPath = (id: string) => `/contracts/${enc(id)}/log.pdf`;

// Contracts and their logs are read in the truck: the first page of each keeps a copy on the device and,
// with no network at all, answers from it. networkMode 'always' lets the query run (and fall back) while
// the browser says it is offline, instead of pausing until it comes back.
export const contractsQueryOptions = () =>
  infiniteQueryOptions({
    queryKey: contractKeys.list(),
    queryFn: ({ pageParam }): Promise<ContractPage> => (pageParam ? fetchContracts(pageParam) : deviceCopies.fetch('contracts', () => fetchContracts()).then((r) => r.data)),
    initialPageParam: '',
    getNextPageParam: (last) => last.nextCursor || undefined,
    staleTime: staleTimes.list,
    networkMode: 'always',
  });

export const contractQueryOptions = (id: string) => ({
  queryKey: contractKeys.detail(id),
  queryFn: () => deviceCopies.fetch(`contract/${id}`, () => fetchContract(id)).then((r) => r.data),
  staleTime: staleTimes.detail,
  networkMode: 'always' as const,
});

type LogPageWithCopy = LogPage & { savedAt: string | null };

export const contractLogQueryOptions = (id: string) =>
  infiniteQueryOptions({
    queryKey: contractKeys.log(id),
    queryFn: ({ pageParam }): Promise<LogPageWithCopy> =>
      pageParam
        ? fetchContractLog(id, pageParam).then((p) => ({ ...p, savedAt: null }))
        : deviceCopies.fetch(`log/${id}`, () => fetchContractLog(id)).then((r) => ({ ...r.data, savedAt: r.savedAt })),
    initialPageParam: '',
    getNextPageParam: (last) => last.nextCursor || undefined,
    staleTime: staleTimes.detail,
    // Head-days so far grow by the minute while animals are on: read the figures again now and then.
    refetchInterval: () => (onlineManager.isOnline() ? LOG_REFRESH_MS : false),
    networkMode: 'always',
  });

export function useContracts() {
  const q = useInfiniteQuery(contractsQueryOptions());
  return { ...q, items: q.data?.pages.flatMap((p) => p.items) ?? [] };
}

export function useContract(id: string | undefined) {
  return useQuery({ ...contractQueryOptions(id ?? ''), enabled: !!id });
}

/** The log, its figures and the pages fetched so far; `fetchNextPage` reads older entries. */
export function useContractLog(id: string | undefined) {
  const q = useInfiniteQuery({ ...contractLogQueryOptions(id ?? ''), enabled: !!id });
  const pages = q.data?.pages ?? [];
  const log: ContractLog | undefined = pages.length
    ? { items: pages.flatMap((p) => p.items), figures: pages[0].figures, canWrite: pages[0].canWrite, hasOlder: !!q.hasNextPage, savedAt: pages[0].savedAt }
    : undefined;
  return { ...q, log };
}

/** Any change to a contract can move its status, its terms, its log figures and its place in the list. */
export function useContractChanged() {
  const qc = useQueryClient();
  return (id: string) =>
    Promise.all([
      qc.invalidateQueries({ queryKey: contractKeys.detail(id) }),
      qc.invalidateQueries({ queryKey: contractKeys.list() }),
      qc.invalidateQueries({ queryKey: contractKeys.log(id) }),
    ]);
}

function useContractAction<B>(id: string, action: string) {
  const changed = useContractChanged();
  return useMutation({
    mutationFn: (body: B) => api<unknown>(`/contracts/${enc(id)}/${action}`, { body }),
    // A refused action (409: the terms changed, someone signed first) also means the copy on screen is stale.
    onSettled: () => changed(id),
    // Fail at once with the client's offline message rather than wait, paused, for a connection.
    networkMode: 'always',
  });
}

export const useSignContract = (id: string) => useContractAction<SignContractInput>(id, 'sign');
export const useProposeAmendment = (id: string) => useContractAction<AmendmentInput>(id, 'amendments');
export const useCancelContract = (id: string) => useContractAction<CancelContractInput>(id, 'cancel');
export const useSignOff = (id: string) => useContractAction<SignOffInput>(id, 'sign-off');
/** The proposer withdraws a pending amendment; the other party declines it. */
export const useCloseAmendment = (id: string, amendmentId: string, how: 'withdraw' | 'decline') => useContractAction<Record<string, never>>(id, `amendments/${enc(amendmentId)}/${how}`);
/** The author voids a mistaken entry: it stays in the record, struck out, and counts for nothing. */
export const useVoidLogEntry = (id: string, entryId: string) => useContractAction<VoidLogEntryInput>(id, `log/${enc(entryId)}/void`);
