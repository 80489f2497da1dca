import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { Formik } from 'formik';
import { Button, Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { FormTextField } from '@/components/form/form-text-field';
import { applyServerErrors, FormError } from '@/components/form/form-error';
import { localDateKey, parseIsoInstant } from '@/lib/dates';
import { formatDay } from '@/lib/format';
import { formatClock, formatMoment } from '@/lib/local-time';
import { voidLogEntrySchema } from '@/lib/schemas/contract';
import { useVoidLogEntry } from '@/hooks/api/contracts';
import type { LogRow } from '@/hooks/offline/log-with-queue';
import { entryDetail, entryTitle } from './log-words';

function dayOf(at: string, timeZone: string): string {
  const t = parseIsoInstant(at);
  return t === null ? at.slice(0, 10) : localDateKey(t, timeZone);
}

/** "This entry is wrong": voided with a reason, it stays in the record struck out and counts for nothing. */
function VoidEntry({ contractId, entryId, onDone }: { contractId: string; entryId: string; onDone: () => void }) {
  const voidIt = useVoidLogEntry(contractId, entryId);
  const [formError, setFormError] = useState<string | null>(null);
  return (
    <Formik
      initialValues={{ reason: '' }}
      validationSchema={voidLogEntrySchema}
      onSubmit={async (v, helpers) => {
        setFormError(null);
        try {
          await voidIt.mutateAsync({ reason: v.reason.trim() });
          onDone();
        } catch (err) {
          setFormError(applyServerErrors(err, helpers));
        }
      }}
    >
      {({ handleSubmit, isSubmitting }) => (
        <View style={styles.void}>
          <FormTextField name="reason" label="What is wrong with it" placeholder="e.g. Counted twice: the move in was at 8:10, not 7:10." />
          <FormError message={formError} />
          <View style={styles.actions}>
            <Button title="Void the entry" variant="danger" large loading={isSubmitting} onPress={() => handleSubmit()} />
            <Button title="Keep it" variant="secondary" large onPress={onDone} />
          </View>
        </View>
      )}
    </Formik>
  );
}

function Row({ row, contractId, timeZone, voidable }: { row: LogRow; contractId: string; timeZone: string; voidable: boolean }) {
  const e = row.entry;
  const [open, setOpen] = useState(false);
  const [voiding, setVoiding] = useState(false);
  const canVoid = voidable && !row.queued && !e.voided;
  const flagged = e.flags.length > 0 && !e.voided;
  const detail = entryDetail(e);
  return (
    <View style={[styles.row, flagged && styles.flagged, row.queued && styles.queued, !!e.voided && styles.voided]} testID={`log-entry-${e.clientId}`}>
      {/* An entry the viewer wrote opens on a tap to offer voiding; the form sits outside the pressable so typing in it does not close it. */}
      <Pressable disabled={!canVoid} onPress={() => setOpen((o) => !o)} aria-expanded={canVoid ? open : undefined} style={styles.summary}>
        <Text variant="label" tone="muted" style={styles.time}>
          {formatClock(e.at, timeZone)}
        </Text>
        <View style={styles.body}>
          <Text variant="bodyStrong" style={e.voided ? styles.struck : undefined}>
            {entryTitle(e)}
            {e.author === 'grower' ? <Text variant="caption" tone="clay"> · grower's observation{e.authorName ? ` (${e.authorName})` : ''}</Text> : null}
          </Text>
          {detail ? (
            <Text variant="caption" style={e.voided ? styles.struck : undefined}>
              {detail}
            </Text>
          ) : null}
          {e.note ? (
            <Text variant="caption" tone="muted">
              “{e.note}”
            </Text>
          ) : null}
          {e.voided ? (
            <Text variant="caption" tone="danger">
              Voided {formatMoment(e.voided.at, timeZone)}: {e.voided.reason}. It counts for nothing.
            </Text>
          ) : null}
          {flagged
            ? e.flags.map((f) => (
                <Text key={f} variant="caption" tone="danger" aria-label={`Flagged: ${f}`}>
                  Flagged: {f}
                </Text>
              ))
            : null}
          {row.queued ? (
            <Text variant="caption" tone="caution">
              {row.queued.state === 'sent' ? `Sent ${formatClock(row.queued.sentAt!, timeZone)}` : 'On this phone, waiting to send'}
            </Text>
          ) : null}
        </View>
      </Pressable>
      {canVoid && open ? (
        voiding ? (
          <VoidEntry
            contractId={contractId}
            entryId={e.id}
            onDone={() => {
              setVoiding(false);
              setOpen(false);
            }}
          />
        ) : (
          <Button title="This entry is wrong: void it…" variant="secondary" large onPress={() => setVoiding(true)} style={styles.voidButton} />
        )
      ) : null}
    </View>
  );
}

/**
 * The record, newest first, one heading per day at the block: flagged entries marked, voided ones struck
 * out, waiting ones shaded. The author of an entry may void it while the log is open.
 */
export function LogEntries({ rows, contractId, timeZone, side, canVoid }: { rows: LogRow[]; contractId: string; timeZone: string; side: 'grower' | 'grazier'; canVoid: boolean }) {
  if (rows.length === 0) {
    return (
      <Text tone="muted" testID="log-empty">
        Nothing logged yet. The first entry is usually “Animals in” as the flock comes off the truck.
      </Text>
    );
  }
  const days: Array<{ day: string; rows: LogRow[] }> = [];
  for (const r of rows) {
    const day = dayOf(r.entry.at, timeZone);
    if (days.length === 0 || days[days.length - 1].day !== day) days.push({ day, rows: [] });
    days[days.length - 1].rows.push(r);
  }
  return (
    <View style={styles.list} aria-label="Log entries">
      {days.map((d) => (
        <View key={d.day} style={styles.day}>
          <Text variant="label" tone="muted">
            {formatDay(d.day)}
          </Text>
          {d.rows.map((r) => (
            <Row key={r.entry.clientId} row={r} contractId={contractId} timeZone={timeZone} voidable={canVoid && r.entry.author === side} />
          ))}
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.lg },
  day: { gap: space.xs },
  row: { gap: space.sm, padding: space.md, borderRadius: radius.md, backgroundColor: colors.surface, borderWidth: 1, borderColor: colors.line },
  summary: { flexDirection: 'row', gap: space.md },
  flagged: { borderColor: colors.danger, borderLeftWidth: 4 },
  queued: { backgroundColor: colors.cautionWash, borderStyle: 'dashed', borderColor: colors.cautionLine },
  voided: { backgroundColor: colors.surfaceSunk },
  struck: { textDecorationLine: 'line-through', color: colors.inkMuted },
  time: { width: 72 },
  body: { flex: 1, gap: 2 },
  void: { gap: space.sm, marginTop: space.xs },
  voidButton: { alignSelf: 'flex-start', marginTop: space.xs },
  actions: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
});
