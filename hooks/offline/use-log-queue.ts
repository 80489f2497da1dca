import { useCallback, useEffect, useState } from 'react';
import { onlineManager, useQueryClient } from '@tanstack/react-query';
import { contractKeys, postLogEntry } from '@/hooks/api/contracts';
import { useSession } from '@/hooks/auth/session';
import { deviceStore } from './device-store';
import { createLogQueue, type LogEntryToSend, type QueuedEntry } from './log-queue';

/** The app's one queue, on the device's store, sending through the API client. */
export const logQueue = createLogQueue({ store: deviceStore, send: postLogEntry, now: () => Date.now() });

/** How often waiting entries are tried again while the app is open (the `online` event also starts a round). */
export const RESEND_INTERVAL_MS = 30_000;

/** A fresh client id for a log entry: a UUID where the platform has one. */
export function newClientId(): string {
  const c = globalThis.crypto as Crypto | undefined;
  if (c?.randomUUID) return c.randomUUID();
  const bytes = new Uint8Array(16);
  if (c?.getRandomValues) c.getRandomValues(bytes);
  else for (let i = 0; i < 16; i++) bytes[i] = Math.floor(Math.random() * 256);
  return Array.from(bytes, (b) => b.toString(16).padStart(2, '0')).join('');
}

/**
 * Sends the signed-in account's waiting entries: at once, whenever the connection comes back, and on an
 * interval. Mounted once in the signed-in layout, so entries go out whichever screen is open. After a
 * round that sent something, the logs and contracts are fetched again (a first move-in starts "grazing").
 */
export function useLogQueueSender() {
  const { user } = useSession();
  const qc = useQueryClient();
  const accountId = user?.id ?? null;

  useEffect(() => {
    if (!accountId) return;
    let alive = true;
    const round = async () => {
      const r = await logQueue.flush(accountId);
      if (alive && r.sent > 0) await qc.invalidateQueries({ queryKey: contractKeys.all });
    };
    void round();
    const unsubscribe = onlineManager.subscribe((online) => {
      if (online) void round();
    });
    const timer = setInterval(() => void round(), RESEND_INTERVAL_MS);
    return () => {
      alive = false;
      unsubscribe();
      clearInterval(timer);
    };
  }, [accountId, qc]);
}

/** One contract's entries on this device — waiting, refused and recently sent — and what can be done with them. */
export function useQueuedEntries(contractId: string) {
  const { user } = useSession();
  const accountId = user?.id ?? null;
  const qc = useQueryClient();
  const [items, setItems] = useState<QueuedEntry[]>([]);
  const [flushing, setFlushing] = useState(false);

  useEffect(() => {
    if (!accountId) return;
    let alive = true;
    const load = () =>
      logQueue.list(accountId, contractId).then((rows) => {
        if (!alive) return;
        setItems(rows);
        setFlushing(logQueue.isFlushing(accountId));
      });
    void load();
    const unsubscribe = logQueue.subscribe(() => void load());
    return () => {
      alive = false;
      unsubscribe();
    };
  }, [accountId, contractId]);

  const sendNow = useCallback(async () => {
    if (!accountId) return null;
    const r = await logQueue.flush(accountId);
    if (r.sent > 0) await qc.invalidateQueries({ queryKey: contractKeys.all });
    return r;
  }, [accountId, qc]);

  /** Keeps the entry on the device first, then tries to send it straight away. */
  const add = useCallback(
    async (entry: LogEntryToSend) => {
      if (!accountId) throw new Error('Sign in to write in the log');
      const item = await logQueue.enqueue(accountId, contractId, entry);
      void sendNow();
      return item;
    },
    [accountId, contractId, sendNow],
  );

  const discard = useCallback((clientId: string) => (accountId ? logQueue.discard(accountId, contractId, clientId) : Promise.resolve(false)), [accountId, contractId]);

  return { items, flushing, add, discard, sendNow };
}
