import { ApiError } from '@/hooks/api/client';
import type { LogEntryInput, LogEntryView } from '@/lib/schemas/contract';
import type { DeviceStore } from './device-store-types';

// Log entries written on the phone wait here, on the device, until the server has them. Each carries the
// clientId made when it was written, and the server stores one entry per clientId, so sending the same
// entry twice (a retry after a lost answer, two tabs, a flush racing the interval) never makes two.
//
// What an answer means for a queued entry:
//   2xx                      sent: kept for a few days so the screen can say when, then forgotten
//   no answer, 5xx, 408, 429 the network or the server is down: the entry waits and the round stops
//   401                      the sign-in ran out: the entry is fine, it waits for the next sign-in
//   any other 4xx            refused: the server's message (and fields) stay beside the entry, which
//                            waits for the grazier to fix or discard it; the round goes on with the rest

export type QueuedEntryState = 'waiting' | 'refused' | 'sent';

export type LogEntryToSend = LogEntryInput & { clientId: string };

export interface QueuedEntry {
  accountId: string;
  contractId: string;
  entry: LogEntryToSend;
  queuedAt: string;
  state: QueuedEntryState;
  attempts: number;
  lastTriedAt: string | null;
  /** Why the last try did not go through: a network problem (waiting) or the server's refusal (refused). */
  problem: string | null;
  /** The server's per-field messages for a refused entry. */
  fields: Record<string, string>;
  sentAt: string | null;
  /** The entry as the server stored it. */
  stored: LogEntryView | null;
}

export interface FlushResult {
  sent: number;
  refused: number;
  waiting: number;
  /** Why the round stopped early, if it did. */
  stoppedBy: 'offline' | 'server' | 'signed-out' | null;
}

export interface LogQueueDeps {
  store: DeviceStore;
  send: (contractId: string, entry: LogEntryToSend) => Promise<LogEntryView>;
  now: () => number;
}

/** Sent entries stay listed ("sent 7:42 AM") this long, then are forgotten: the server's log has them. */
export const SENT_KEPT_MS = 3 * 86_400_000;

const PREFIX = 'log-queue/';
const keyOf = (accountId: string, contractId: string, clientId: string) => `${PREFIX}${accountId}/${contractId}/${clientId}`;

function byQueueOrder(a: QueuedEntry, b: QueuedEntry): number {
  return a.queuedAt < b.queuedAt ? -1 : a.queuedAt > b.queuedAt ? 1 : a.entry.clientId < b.entry.clientId ? -1 : 1;
}

type Outcome = { kind: 'sent'; stored: LogEntryView } | { kind: 'refused'; message: string; fields: Record<string, string> } | { kind: 'wait'; message: string; stop: FlushResult['stoppedBy'] };

function outcomeOf(err: unknown): Outcome {
  if (!(err instanceof ApiError) || err.status === 0) {
    return { kind: 'wait', message: 'No connection: it will be sent when the phone is back online.', stop: 'offline' };
  }
  if (err.status === 401) return { kind: 'wait', message: 'Sign in again to send it.', stop: 'signed-out' };
  if (err.status >= 500 || err.status === 408 || err.status === 429) {
    return { kind: 'wait', message: `Fieldfold could not take it just now (${err.status}); it will try again.`, stop: 'server' };
  }
  return { kind: 'refused', message: err.message, fields: err.fields };
}

export type LogQueue = ReturnType<typeof createLogQueue>;

export function createLogQueue({ store, send, now }: LogQueueDeps) {
  const listeners = new Set<() => void>();
  const flushing = new Map<string, Promise<FlushResult>>();
  const notify = () => listeners.forEach((l) => l());
  const stamp = () => new Date(now()).toISOString();

  async function read(prefix: string): Promise<QueuedEntry[]> {
    const keys = await store.keys(prefix);
    const rows = await Promise.all(keys.map((k) => store.get<QueuedEntry>(k)));
    return rows.filter((r): r is QueuedEntry => !!r).sort(byQueueOrder);
  }

  async function write(item: QueuedEntry) {
    await store.set(keyOf(item.accountId, item.contractId, item.entry.clientId), item);
  }

  return {
    /**
     * Keeps an entry on the device until it is sent. The same clientId again replaces a waiting or refused
     * entry (a fix) and leaves a sent one alone, so a double tap or a retried save never queues it twice.
     */
    async enqueue(accountId: string, contractId: string, entry: LogEntryToSend): Promise<QueuedEntry> {
      const existing = await store.get<QueuedEntry>(keyOf(accountId, contractId, entry.clientId));
      if (existing?.state === 'sent') return existing;
      const item: QueuedEntry = {
        accountId,
        contractId,
        entry,
        queuedAt: existing?.queuedAt ?? stamp(),
        state: 'waiting',
        attempts: existing?.attempts ?? 0,
        lastTriedAt: existing?.lastTriedAt ?? null,
        problem: null,
        fields: {},
        sentAt: null,
        stored: null,
      };
      await write(item);
      notify();
      return item;
    },

    /** The account's queued entries (for one contract, or all), in the order they were written. */
    list(accountId: string, contractId?: string): Promise<QueuedEntry[]> {
      return read(contractId ? `${PREFIX}${accountId}/${contractId}/` : `${PREFIX}${accountId}/`);
    },

    /** Drops an entry that was not sent (a refused one the grazier gives up on, or a slip). */
    async discard(accountId: string, contractId: string, clientId: string): Promise<boolean> {
      const key = keyOf(accountId, contractId, clientId);
      const existing = await store.get<QueuedEntry>(key);
      if (!existing || existing.state === 'sent') return false;
      await store.del(key);
      notify();
      return true;
    },

    isFlushing(accountId: string): boolean {
      return flushing.has(accountId);
    },

    /**
     * Sends the account's waiting entries, oldest first, one at a time (the server checks each against the
     * ones before it). One round at a time per account: a second call while one runs gets the same round.
     */
    flush(accountId: string): Promise<FlushResult> {
      const running = flushing.get(accountId);
      if (running) return running;
      const round = (async (): Promise<FlushResult> => {
        const result: FlushResult = { sent: 0, refused: 0, waiting: 0, stoppedBy: null };
        const items = await read(`${PREFIX}${accountId}/`);
        for (const item of items) {
          if (item.state === 'sent') {
            if (item.sentAt && now() - Date.parse(item.sentAt) > SENT_KEPT_MS) await store.del(keyOf(accountId, item.contractId, item.entry.clientId));
            continue;
          }
          if (item.state !== 'waiting') continue;
          if (result.stoppedBy) {
            result.waiting += 1;
            continue;
          }
          let outcome: Outcome;
          try {
            outcome = { kind: 'sent', stored: await send(item.contractId, item.entry) };
          } catch (err) {
            outcome = outcomeOf(err);
          }
          const tried = { ...item, attempts: item.attempts + 1, lastTriedAt: stamp() };
          if (outcome.kind === 'sent') {
            await write({ ...tried, state: 'sent', sentAt: stamp(), stored: outcome.stored, problem: null, fields: {} });
            result.sent += 1;
          } else if (outcome.kind === 'refused') {
            await write({ ...tried, state: 'refused', problem: outcome.message, fields: outcome.fields });
            result.refused += 1;
          } else {
            await write({ ...tried, problem: outcome.message });
            result.waiting += 1;
            result.stoppedBy = outcome.stop;
          }
          notify();
        }
        return result;
      })().finally(() => {
        flushing.delete(accountId);
        notify();
      });
      flushing.set(accountId, round);
      notify();
      return round;
    },

    subscribe(listener: () => void): () => void {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
  };
}
