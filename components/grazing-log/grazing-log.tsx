import { useMemo, useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { useRouter } from 'expo-router';
import { Button, Card, Notice, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import type { ContractDetailView, ContractLog } from '@/hooks/api/contracts';
import type { QueuedEntry } from '@/hooks/offline/log-queue';
import { figuresWithQueue, mergeLog } from '@/hooks/offline/log-with-queue';
import { useQueuedEntries } from '@/hooks/offline/use-log-queue';
import { useLayout } from '@/hooks/use-layout';
import { useOnline } from '@/hooks/use-online';
import { todayIn } from '@/lib/day-keys';
import { formatNumber } from '@/lib/format';
import { formatMoment } from '@/lib/local-time';
import type { ContractStatus, LogEntryKind } from '@/lib/schemas/contract';
import { ContractStatusBadge } from '@/components/contracts/contract-status';
import { EntryForm, ENTRY_MODE_LABELS, modeOf, type EntryMode } from './entry-form';
import { LogChart } from './log-chart';
import { LogEntries } from './log-entries';
import { LogFiguresPanel } from './log-figures-panel';
import { QueuePanel } from './queue-panel';

/** The log is written from the signatures until the head-days are agreed (the grazier may amend it during sign-off). */
const WRITABLE: ReadonlySet<ContractStatus> = new Set(['signed', 'grazing', 'sign-off']);

export interface GrazingLogProps {
  contract: ContractDetailView;
  log: ContractLog;
  side: 'grower' | 'grazier';
  /** Reads the next (older) page of entries. */
  onShowOlder?: () => void;
  loadingOlder?: boolean;
}

/** The log is closed for good: the head-days are agreed, or the contract was cancelled. */
const CLOSED: ReadonlySet<ContractStatus> = new Set(['agreed', 'invoiced', 'paid', 'cancelled']);

const MODES_OF_KIND: Record<LogEntryKind, EntryMode[]> = { move: ['in', 'out'], tally: ['tally'], observation: ['observation'] };

/**
 * The grazing log for the truck: four big entry buttons for the grazier (the grower adds observations
 * only), what waits on the phone, the running figures and chart, and the record itself.
 */
export function GrazingLog({ contract, log, side, onShowOlder, loadingOlder }: GrazingLogProps) {
  const online = useOnline();
  const router = useRouter();
  const { isWide } = useLayout();
  const queue = useQueuedEntries(contract.id);
  const [mode, setMode] = useState<EntryMode | null>(null);
  const [fixing, setFixing] = useState<QueuedEntry | null>(null);
  /** The entry just saved, whose state the notice under the buttons follows. */
  const [saved, setSaved] = useState<string | null>(null);

  const rows = useMemo(() => mergeLog(log.items, queue.items, contract), [log.items, queue.items, contract]);
  const { figures, queuedMoves, problem } = useMemo(
    () => figuresWithQueue(contract, log.items, log.figures, queue.items, Date.now(), !log.hasOlder),
    [contract, log.items, log.figures, log.hasOlder, queue.items],
  );
  const lastPaddock = rows.find((r) => r.entry.paddock)?.entry.paddock ?? null;
  // The server says which kinds the viewer may add now (`canWrite`); the contract's status stands in without it.
  const kinds: LogEntryKind[] = log.canWrite ?? (WRITABLE.has(contract.status) ? (side === 'grazier' ? ['move', 'tally', 'observation'] : ['observation']) : []);
  const writable = kinds.length > 0;
  const modes = kinds.flatMap((k) => MODES_OF_KIND[k]);
  const anyMoves = rows.some((r) => r.entry.kind === 'move' && !r.entry.voided);

  const open = (m: EntryMode) => {
    setSaved(null);
    setFixing(null);
    setMode(m);
  };
  const close = () => {
    setMode(null);
    setFixing(null);
  };

  const connection = !online ? (
    <Notice tone="caution" title="No signal">
      {log.savedAt
        ? `Showing the log as this phone saved it at ${formatMoment(log.savedAt, contract.timeZone)}. New entries are kept on the phone and sent when the connection returns.`
        : 'New entries are kept on the phone and sent when the connection returns.'}
    </Notice>
  ) : log.savedAt ? (
    <Notice tone="caution" title="Fieldfold did not answer">
      {`Showing the copy saved at ${formatMoment(log.savedAt, contract.timeZone)}. Entries wait on the phone until it answers.`}
    </Notice>
  ) : null;

  const actions = writable ? (
    <View style={styles.actions} role="group" aria-label="Add to the log">
      {modes.map((m) => (
        <Button
          key={m}
          title={side === 'grower' ? 'Add an observation' : ENTRY_MODE_LABELS[m]}
          large
          variant={mode === m ? 'primary' : m === 'in' || m === 'out' ? 'primary' : 'secondary'}
          disabled={m === 'out' && figures.headNow === 0 && !anyMoves}
          onPress={() => open(m)}
          style={styles.action}
        />
      ))}
    </View>
  ) : (
    <Notice tone="info">
      {contract.status === 'to-sign'
        ? 'The log opens once both of you have signed the contract.'
        : contract.status === 'cancelled'
          ? 'This contract was cancelled; the log is kept as it stands.'
          : ['agreed', 'invoiced', 'paid'].includes(contract.status)
            ? 'The head-days are agreed: the log is closed and kept as the record.'
            : 'The log is read-only for you now.'}
    </Notice>
  );
  const movesPaused =
    side === 'grazier' && contract.status === 'sign-off' && writable && !kinds.includes('move') ? (
      <Notice tone="info">The grower is reviewing the head-days you proposed: moves wait until they answer. Tallies and observations go in as usual.</Notice>
    ) : null;

  const form =
    mode && writable ? (
      <EntryForm
        key={fixing?.entry.clientId ?? mode}
        mode={mode}
        side={side}
        contract={contract}
        headNow={figures.headNow}
        lastPaddock={lastPaddock}
        fixing={fixing ? { entry: fixing.entry, problem: fixing.problem, fields: fixing.fields } : undefined}
        onCancel={close}
        onSave={async (entry) => {
          await queue.add(entry);
          close();
          setSaved(entry.clientId);
        }}
      />
    ) : null;

  const signOffPrompt =
    side === 'grazier' && contract.status === 'grazing' && anyMoves && figures.headNow === 0 ? (
      <Card style={styles.card}>
        <Text variant="heading">All animals are out</Text>
        <Text>
          The log comes to {formatNumber(figures.headDaysSoFar, 1)} head-days. End the grazing and propose them to the grower.
        </Text>
        <Button title="End grazing and propose head-days" large onPress={() => router.push(`/contracts/${contract.id}/sign-off`)} />
      </Card>
    ) : ['sign-off', 'agreed', 'invoiced', 'paid'].includes(contract.status) ? (
      <Button
        title={contract.status === 'sign-off' ? 'Open the sign-off' : 'See the agreed head-days'}
        large
        variant="secondary"
        onPress={() => router.push(`/contracts/${contract.id}/sign-off`)}
      />
    ) : null;

  const queuePanel = (
    <QueuePanel
      items={queue.items}
      flushing={queue.flushing}
      online={online}
      timeZone={contract.timeZone}
      onSendNow={() => void queue.sendNow()}
      onFix={(q) => {
        setSaved(null);
        setFixing(q);
        setMode(modeOf(q.entry));
      }}
      onDiscard={(q) => void queue.discard(q.entry.clientId)}
    />
  );

  const figuresPanel = (
    <>
      <LogFiguresPanel figures={figures} queuedMoves={queuedMoves} problem={problem} closed={CLOSED.has(contract.status)} />
      <Card>
        <LogChart
          byDay={figures.byDay}
          today={todayIn(contract.timeZone, Date.now())}
          headCount={contract.headCount}
          startDate={contract.startDate}
          endDate={contract.endDate}
          outBy={contract.outBy}
          eatenLb={figures.eatenLb}
          headDaysSoFar={figures.headDaysSoFar}
          targetTakeLb={figures.targetTakeLb}
        />
      </Card>
    </>
  );

  const entries = (
    <Card style={styles.card}>
      <Text variant="heading">The log</Text>
      <LogEntries rows={rows} contractId={contract.id} timeZone={contract.timeZone} side={side} canVoid={writable} />
      {log.hasOlder ? <Button title="Show older entries" variant="secondary" large loading={loadingOlder} onPress={onShowOlder} /> : null}
      <Text variant="caption" tone="muted">
        Times at the block ({contract.timeZone}). Entries after the animals-out-by date are kept and flagged: the record shows what happened.
        {writable ? ' Tap an entry you wrote to void it if it is wrong; it stays in the record, struck out.' : ''}
      </Text>
    </Card>
  );

  const savedItem = saved ? queue.items.find((q) => q.entry.clientId === saved) : undefined;
  const savedNotice = !savedItem ? null : savedItem.state === 'sent' ? (
    <Notice tone="ok" title="Sent">{`Saved and sent at ${formatMoment(savedItem.sentAt!, contract.timeZone)}.`}</Notice>
  ) : savedItem.state === 'refused' ? (
    <Notice tone="caution" title="Not accepted">Kept on this phone, but Fieldfold did not accept it: see below to fix or discard it.</Notice>
  ) : (
    <Notice tone="ok" title="Kept">
      {online ? 'Saved on this phone — sending now.' : 'Saved on this phone. It will be sent when there is signal.'}
    </Notice>
  );

  const writing = (
    <>
      {actions}
      {movesPaused}
      {savedNotice}
      {form}
      {queuePanel}
    </>
  );

  return (
    <View style={styles.col}>
      <View style={styles.statusRow}>
        <ContractStatusBadge status={contract.status} />
        {side === 'grower' && writable ? (
          <Text variant="caption" tone="muted">
            The grazier keeps this log; you can add your own observations.
          </Text>
        ) : null}
      </View>
      {connection}
      {isWide ? (
        // A desk: writing and the record on the left, the figures beside them.
        <View style={styles.wide}>
          <View style={styles.main}>
            {writing}
            {signOffPrompt}
            {entries}
          </View>
          <View style={styles.side}>{figuresPanel}</View>
        </View>
      ) : (
        // A phone: the buttons first, then what waits, the figures, and the record below.
        <>
          {writing}
          {figuresPanel}
          {signOffPrompt}
          {entries}
        </>
      )}
    </View>
  );
}

const styles = StyleSheet.create({
  col: { gap: space.lg },
  statusRow: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.sm },
  card: { gap: space.md },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  action: { flexGrow: 1, flexBasis: '45%', minHeight: 64 },
  wide: { flexDirection: 'row', alignItems: 'flex-start', gap: space.xl },
  main: { flex: 3, minWidth: 0, gap: space.lg },
  side: { flex: 2, minWidth: 320, gap: space.lg },
});
