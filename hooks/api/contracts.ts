import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type {
  AmendmentInput,
  CancelContractInput,
  ContractView,
  LogEntryView,
  LogFigures,
  SignContractInput,
  SignOffInput,
  SignOffView,
} from '@/lib/schemas/contract';
import { deviceCopies } from '@/hooks/offline/device-copies';
import type { LogEntryToSend } from '@/hooks/offline/log-queue';
import { api } from './client';
import { staleTimes } from './query-client';

/** A change of terms one party proposed, waiting for both to sign the new version. */
export interface PendingAmendmentView {
  proposedBy: 'grower' | 'grazier';
  proposedAt: string;
  reason: string;
  changes: Partial<Omit<AmendmentInput, 'reason'>>;
}

/**
 * The contract view with the parts the contracts API adds beside lib's ContractView (the pending amendment,
 * the sign-off state). Read through pendingAmendmentOf / signOffOf so the screens do not care where they sit.
 */
export type ContractDetailView = ContractView & {
  pendingAmendment?: PendingAmendmentView | null;
  signOff?: SignOffView | null;
};

export const pendingAmendmentOf = (c: ContractDetailView): PendingAmendmentView | null => c.pendingAmendment ?? null;
export const signOffOf = (c: ContractDetailView): SignOffView | null => c.signOff ?? null;

export interface ContractLog {
  items: LogEntryView[];
  figures: LogFigures;
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

export const fetchContracts = () => api<{ items: ContractDetailView[] }>('/contracts').then((r) => r.items);
export const fetchContract = (id: string) => api<{ contract: ContractDetailView }>(`/contracts/${enc(id)}`).then((r) => r.contract);
export const fetchContractLog = (id: string) => api<{ items: LogEntryView[]; figures: LogFigures }>(`/contracts/${enc(id)}/log`);

/** One log entry; the same clientId twice is stored once, so the offline queue may send it again safely. */
export const postLogEntry = (contractId: string, entry: LogEntryToSend) =>
  api<{ entry?: LogEntryView } & Partial<LogEntryView>>(`/contracts/${enc(contractId)}/log`, { body: entry }).then((r) => (r.entry ?? r) as LogEntryView);

export const logPdfPath = (id: string) => `/contracts/${enc(id)}/log.pdf`;

// Contracts and their logs are read in the truck: each query keeps a copy on the device and, with no
// network at all, answers from it. networkMode 'always' lets the query run (and fall back) while the
// browser says it is offline, instead of pausing until it comes back.
export const contractsQueryOptions = () =>
  queryOptions({
    queryKey: contractKeys.list(),
    queryFn: () => deviceCopies.fetch('contracts', fetchContracts).then((r) => r.data),
    staleTime: staleTimes.list,
    networkMode: 'always',
  });

export const contractQueryOptions = (id: string) =>
  queryOptions({
    queryKey: contractKeys.detail(id),
    queryFn: () => deviceCopies.fetch(`contract/${id}`, () => fetchContract(id)).then((r) => r.data),
    staleTime: staleTimes.detail,
    networkMode: 'always',
  });

export const contractLogQueryOptions = (id: string) =>
  queryOptions({
    queryKey: contractKeys.log(id),
    queryFn: (): Promise<ContractLog> => deviceCopies.fetch(`log/${id}`, () => fetchContractLog(id)).then((r) => ({ ...r.data, savedAt: r.savedAt })),
    staleTime: staleTimes.detail,
    networkMode: 'always',
  });

export function useContracts() {
  return useQuery(contractsQueryOptions());
}

export function useContract(id: string | undefined) {
  return useQuery({ ...contractQueryOptions(id ?? ''), enabled: !!id });
}

export function useContractLog(id: string | undefined) {
  return useQuery({ ...contractLogQueryOptions(id ?? ''), enabled: !!id });
}

/** Any change to a contract can move its status, its terms, its log figures and its place in the list. */
export function useContractChanged() {
  const qc = useQueryClient();
  return (id: string) => Promise.all([qc.invalidateQueries({ queryKey: contractKeys.detail(id) }), qc.invalidateQueries({ queryKey: contractKeys.list() }), qc.invalidateQueries({ queryKey: contractKeys.log(id) })]);
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
