import { StyleSheet, View } from 'react-native';
import { Button, Card, Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { formatClock, formatMoment } from '@/lib/local-time';
import type { QueuedEntry } from '@/hooks/offline/log-queue';
import { queuedFacts } from '@/hooks/offline/log-with-queue';
import { entryDetail, entryTitle } from './log-words';

const SENT_SHOWN = 5;

function Item({ q, timeZone, onFix, onDiscard }: { q: QueuedEntry; timeZone: string; onFix: (q: QueuedEntry) => void; onDiscard: (q: QueuedEntry) => void }) {
  const facts = queuedFacts(q);
  const detail = entryDetail(facts);
  return (
    <View style={[styles.item, q.state === 'refused' && styles.refused]} testID={`queued-${q.entry.clientId}`}>
      <Text variant="bodyStrong">
        {entryTitle(facts)} · {formatMoment(q.entry.at, timeZone)}
      </Text>
      {detail ? <Text variant="caption">{detail}</Text> : null}
      {q.state === 'sent' ? (
        <Text variant="caption" tone="ok">
          ✓ Sent {formatClock(q.sentAt!, timeZone)}
        </Text>
      ) : null}
      {q.state === 'waiting' ? (
        <Text variant="caption" tone="caution">
          Waiting to send{q.attempts > 0 ? ` · tried ${q.attempts} ${q.attempts === 1 ? 'time' : 'times'}, last ${formatClock(q.lastTriedAt!, timeZone)}` : ''}
          {q.problem ? ` · ${q.problem}` : ''}
        </Text>
      ) : null}
      {q.state === 'refused' ? (
        <View style={styles.refusal}>
          <Text variant="caption" tone="danger" role="alert">
            Not accepted: {q.problem}
          </Text>
          {Object.entries(q.fields).map(([field, message]) => (
            <Text key={field} variant="caption" tone="danger">
              {message}
            </Text>
          ))}
          <View style={styles.actions}>
            <Button title="Fix it" large onPress={() => onFix(q)} />
            <Button title="Discard" variant="secondary" large onPress={() => onDiscard(q)} />
          </View>
        </View>
      ) : null}
    </View>
  );
}

/**
 * What this phone holds for the log: entries waiting to send (with why the last try failed), entries the
 * server refused (its message beside each, to fix or discard), and when each recent one was sent.
 */
export function QueuePanel({ items, flushing, online, timeZone, onSendNow, onFix, onDiscard }: {
  items: QueuedEntry[];
  flushing: boolean;
  online: boolean;
  timeZone: string;
  onSendNow: () => void;
  onFix: (q: QueuedEntry) => void;
  onDiscard: (q: QueuedEntry) => void;
}) {
  const waiting = items.filter((q) => q.state === 'waiting');
  const refused = items.filter((q) => q.state === 'refused');
  const sent = items.filter((q) => q.state === 'sent').slice(-SENT_SHOWN).reverse();
  if (items.length === 0) return null;
  const summary =
    waiting.length + refused.length === 0
      ? 'Everything written on this phone has been sent.'
      : [waiting.length ? `${waiting.length} waiting to send` : '', refused.length ? `${refused.length} not accepted` : ''].filter(Boolean).join(' · ');
  return (
    <Card style={styles.card} aria-label="Entries on this phone">
      <Text variant="heading">On this phone</Text>
      <Text tone={refused.length ? 'danger' : waiting.length ? 'caution' : 'ok'} testID="queue-summary">
        {summary}
      </Text>
      {[...refused, ...waiting, ...sent].map((q) => (
        <Item key={q.entry.clientId} q={q} timeZone={timeZone} onFix={onFix} onDiscard={onDiscard} />
      ))}
      {waiting.length ? (
        <Button title={flushing ? 'Sending…' : online ? 'Send now' : 'Try sending now'} large variant="secondary" loading={flushing} onPress={onSendNow} />
      ) : null}
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.sm },
  item: { gap: 2, padding: space.md, borderRadius: radius.md, backgroundColor: colors.paper },
  refused: { backgroundColor: colors.dangerWash },
  refusal: { gap: space.xs },
  actions: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap', marginTop: space.xs },
});
