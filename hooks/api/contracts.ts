import { infiniteQueryOptions, onlineManager, useInfiniteQuery, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type {
  AmendmentInput,
  CancelContractInput,
  ContractView,
  LogEntryKind,
  LogEntryView,
  LogFigures,
  SignContractInput,
  SignOffAction,
  SignOffInput,
  SignOffView,
} from '@/lib/schemas/contract';
import { deviceCopies } from '@/hooks/offline/device-copies';
import type { LogEntryToSend } from '@/hooks/offline/log-queue';
import { api, queryString } from './client';
import { staleTimes } from './query-client';

// ——— What the contracts API adds to lib/schemas/contract.ts's first draft ———
// Mirrored here with the API's names and shapes until its lib/schemas/contract.ts reaches main; the screens
// read them through this file only, so the switch is one import.

export type ContractParty = 'grower' | 'grazier';

export interface AmendmentView {
  id: string;
  version: number;
  status: 'proposed' | 'agreed' | 'withdrawn' | 'declined' | 'void';
  proposedBy: ContractParty;
  proposedByName: string;
  reason: string;
  /** Each changed term with its old and new value in words. */
  changes: Array<{ field: string; label: string; from: string; to: string }>;
  /** What each party signs for this amendment (sent with the signature). */
  termsHash: string;
  signatures: Array<{ party: ContractParty; typedName: string; signedAt: string; termsHash: string }>;
  createdAt: string;
}

export interface ContractViewerFacts {
  party: ContractParty | null;
  /** The viewer has to sign the current terms or the pending amendment. */
  mustSign: boolean;
  canCancel: boolean;
  canAmend: boolean;
  signOffActions: SignOffAction[];
}

export type SignOffRound = Omit<SignOffView, 'status'> & {
  status: SignOffView['status'] | 'superseded';
  /** The day-by-day breakdown of the proposed head-days. */
  byDay?: Array<{ date: string; headDays: number }>;
  comment?: string | null;
  agreedBy?: ContractParty | null;
};

export type ContractDetailView = ContractView & {
  pendingAmendment?: AmendmentView | null;
  signOff?: SignOffRound | null;
  viewer?: ContractViewerFacts;
  cancellation?: { by: ContractParty; byName: string; reason: string; at: string } | null;
  agreedAt?: string | null;
  restrictions?: { earliestSafeDate: string | null };
};

export type LogEntryRecord = LogEntryView & {
  authorName?: string;
  /** Voided by its author: kept in the record, struck out, counting for nothing. */
  voided?: { at: string; reason: string } | null;
};

export type LogFiguresView = LogFigures & {
  /** ISO instant the head-days are counted up to. */
  until?: string | null;
  alerts?: Array<{ key: string; tone: 'danger' | 'caution' | 'info'; text: string }>;
  dailyIntakeLbPerHead?: number;
};

export interface LogPage {
  items: LogEntryRecord[];
  figures: LogFiguresView;
  nextCursor: string | null;
  /** Whether the viewer may add entries now, and of which kinds. */
  canWrite?: LogEntryKind[];
}

// ———

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
/** Pages as large as the API gives (its MAX_CONTRACT_PAGE): a season's contracts or a stay's log in one or two. */
const PAGE = 100;
/** How often an open log reads its figures again while online. */
const LOG_REFRESH_MS = 60_000;

type ContractPage = { items: ContractDetailView[]; nextCursor?: string | null };

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
export const useVoidLogEntry = (id: string, entryId: string) => useContractAction<{ reason: string }>(id, `log/${enc(entryId)}/void`);
