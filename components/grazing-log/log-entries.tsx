import { StyleSheet, View } from 'react-native';
import { Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { localDateKey, parseIsoInstant } from '@/lib/dates';
import { formatDay } from '@/lib/format';
import { formatClock } from '@/lib/local-time';
import type { LogRow } from '@/hooks/offline/log-with-queue';
import { entryDetail, entryTitle } from './log-words';

function dayOf(at: string, timeZone: string): string {
  const t = parseIsoInstant(at);
  return t === null ? at.slice(0, 10) : localDateKey(t, timeZone);
}

function Row({ row, timeZone }: { row: LogRow; timeZone: string }) {
  const e = row.entry;
  const flagged = e.flags.length > 0;
  const detail = entryDetail(e);
  return (
    <View style={[styles.row, flagged && styles.flagged, row.queued && styles.queued]} testID={`log-entry-${e.clientId}`}>
      <Text variant="label" tone="muted" style={styles.time}>
        {formatClock(e.at, timeZone)}
      </Text>
      <View style={styles.body}>
        <Text variant="bodyStrong">
          {entryTitle(e)}
          {e.author === 'grower' ? <Text variant="caption" tone="clay"> · grower's observation</Text> : null}
        </Text>
        {detail ? <Text variant="caption">{detail}</Text> : null}
        {e.note ? (
          <Text variant="caption" tone="muted">
            “{e.note}”
          </Text>
        ) : null}
        {e.flags.map((f) => (
          <Text key={f} variant="caption" tone="danger" aria-label={`Flagged: ${f}`}>
            ⚑ Flagged: {f}
          </Text>
        ))}
        {row.queued ? (
          <Text variant="caption" tone="caution">
            {row.queued.state === 'sent' ? `Sent ${formatClock(row.queued.sentAt!, timeZone)}` : 'On this phone, waiting to send'}
          </Text>
        ) : null}
      </View>
    </View>
  );
}

/** The record, newest first, one heading per day at the block; flagged entries marked, waiting ones shaded. */
export function LogEntries({ rows, timeZone }: { rows: LogRow[]; timeZone: string }) {
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
            <Row key={r.entry.clientId} row={r} timeZone={timeZone} />
          ))}
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.lg },
  day: { gap: space.xs },
  row: { flexDirection: 'row', gap: space.md, padding: space.md, borderRadius: radius.md, backgroundColor: colors.surface, borderWidth: 1, borderColor: colors.line },
  flagged: { borderColor: colors.danger, borderLeftWidth: 4 },
  queued: { backgroundColor: colors.cautionWash, borderStyle: 'dashed', borderColor: colors.cautionLine },
  time: { width: 72 },
  body: { flex: 1, gap: 2 },
});
