import { useState, type ReactNode } from 'react';
import { StyleSheet, View } from 'react-native';
import { useRouter } from 'expo-router';
import { Formik } from 'formik';
import { Button, Card, Notice, Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { FormTextField } from '@/components/form/form-text-field';
import { applyServerErrors, FormError } from '@/components/form/form-error';
import { signOffOf, useSignOff, type ContractDetailView, type SignOffRound } from '@/hooks/api/contracts';
import { formatDay, formatNumber } from '@/lib/format';
import { formatMoment } from '@/lib/local-time';
import type { HeadDaysByDay } from '@/lib/grazing/head-days';
import { signOffSchema, type SignOffInput } from '@/lib/schemas/contract';
import type { Side } from './next-step';

const hd = (n: number | null | undefined) => formatNumber(n ?? 0, 4);

/** The head-days of each day at the block, from the log, with the total the grazier proposes. */
export function DailyBreakdown({ byDay, total }: { byDay: readonly HeadDaysByDay[]; total: number }) {
  return (
    <View style={styles.table} role="table" aria-label="Head-days by day">
      <View style={[styles.tr, styles.thead]} role="row">
        <Text variant="caption" tone="muted" style={styles.cellDay}>
          Day at the block
        </Text>
        <Text variant="caption" tone="muted" style={styles.cellNum}>
          Head-days
        </Text>
      </View>
      {byDay.map((d) => (
        <View key={d.date} style={styles.tr} role="row">
          <Text style={styles.cellDay}>{formatDay(d.date)}</Text>
          <Text style={styles.cellNum}>{hd(d.headDays)}</Text>
        </View>
      ))}
      <View style={[styles.tr, styles.total]} role="row">
        <Text variant="bodyStrong" style={styles.cellDay}>
          Total
        </Text>
        <Text variant="bodyStrong" style={styles.cellNum} testID="breakdown-total">
          {hd(total)}
        </Text>
      </View>
    </View>
  );
}

/** The agreed figure, locked: who proposed, who countered, who approved, and when. */
function Agreed({ s, timeZone }: { s: SignOffRound; timeZone: string }) {
  const when = (at: string | null) => (at ? formatMoment(at, timeZone) : '—');
  return (
    <Card style={[styles.card, styles.locked]} aria-label="Agreed head-days">
      <Text variant="label" tone="cover">
        Head-days agreed · locked
      </Text>
      <Text variant="display" testID="agreed-head-days">
        {hd(s.agreedHeadDays)}
      </Text>
      <Text variant="caption">
        Proposed by {s.grazierName} ({hd(s.proposedHeadDays)}), {when(s.proposedAt)}
      </Text>
      {s.counterHeadDays != null ? (
        <Text variant="caption">
          Countered by {s.growerName ?? 'the grower'} ({hd(s.counterHeadDays)}), {when(s.disputedAt)}
        </Text>
      ) : null}
      <Text variant="caption">
        {s.agreedBy === 'grazier'
          ? `Agreed when ${s.grazierName} accepted the counter, ${when(s.agreedAt)}`
          : `Agreed when ${s.growerName ?? 'the grower'} approved, ${when(s.agreedAt)}`}
      </Text>
      <Text variant="caption" tone="muted">
        The invoice bills these head-days. The log is closed; it stays as the record.
      </Text>
    </Card>
  );
}

// headDays stays undefined unless a figure is given: the shared schema treats it as optional, not nullable.
type Values = { action: SignOffInput['action']; headDays?: number | null; comment: string };

function useSend(contractId: string) {
  const signOff = useSignOff(contractId);
  const [formError, setFormError] = useState<string | null>(null);
  const send = async (v: Values, helpers: Parameters<typeof applyServerErrors<Values>>[1]) => {
    setFormError(null);
    const body: SignOffInput = { action: v.action };
    if (v.headDays != null) body.headDays = v.headDays;
    if (v.comment.trim()) body.comment = v.comment.trim();
    try {
      await signOff.mutateAsync(body);
    } catch (err) {
      setFormError(applyServerErrors(err, helpers));
    }
  };
  return { send, formError };
}

/** The server counts the head-days from the log itself; the button shows the figure it will find. */
function Propose({ contractId, headDays, again }: { contractId: string; headDays: number; again: boolean }) {
  const { send, formError } = useSend(contractId);
  return (
    <Formik<Values> initialValues={{ action: 'propose', comment: '' }} validationSchema={signOffSchema} onSubmit={send}>
      {({ handleSubmit, isSubmitting }) => (
        <>
          <FormTextField name="comment" label="Note to the grower (optional)" multiline numberOfLines={2} placeholder={again ? 'What you changed in the log' : 'e.g. Out a day early: the residual reached 3 in.'} />
          <FormError message={formError} />
          <Button title={`${again ? 'Propose again' : 'Propose'}: ${hd(headDays)} head-days`} large loading={isSubmitting} onPress={() => handleSubmit()} testID="propose-head-days" />
        </>
      )}
    </Formik>
  );
}

function GrowerAnswer({ contractId, proposed }: { contractId: string; proposed: number }) {
  const { send, formError } = useSend(contractId);
  const [disputing, setDisputing] = useState(false);
  return (
    <Formik<Values>
      initialValues={{ action: 'approve', comment: '' }}
      validationSchema={signOffSchema}
      validate={(v) =>
        v.action !== 'dispute'
          ? {}
          : {
              ...(v.headDays == null ? { headDays: 'Give the head-days you would agree to' } : {}),
              ...(v.comment.trim() ? {} : { comment: 'Say what you see differently, so the grazier can check the log' }),
            }
      }
      onSubmit={send}
    >
      {({ handleSubmit, isSubmitting, setFieldValue, values }) => (
        <>
          {!disputing ? (
            <View style={styles.row}>
              <Button title={`Approve ${hd(proposed)} head-days`} large loading={isSubmitting && values.action === 'approve'} onPress={() => handleSubmit()} testID="approve-head-days" />
              <Button
                title="Dispute…"
                variant="secondary"
                large
                onPress={() => {
                  setDisputing(true);
                  void setFieldValue('action', 'dispute');
                  // Present (null), so a send without a figure marks the field and shows its message.
                  void setFieldValue('headDays', null);
                }}
              />
            </View>
          ) : (
            <>
              <FormTextField name="headDays" label="Head-days you would agree to" numeric hint={`The grazier proposed ${hd(proposed)}`} />
              <FormTextField name="comment" label="Why" multiline numberOfLines={3} placeholder="e.g. The tally on Jan 24 shows 540 head, not 600." />
              <FormError message={formError} />
              <View style={styles.row}>
                <Button title="Send the dispute" large loading={isSubmitting} onPress={() => handleSubmit()} />
                <Button
                  title="Back"
                  variant="secondary"
                  large
                  onPress={() => {
                    setDisputing(false);
                    void setFieldValue('action', 'approve');
                    void setFieldValue('headDays', undefined);
                  }}
                />
              </View>
            </>
          )}
          {!disputing ? <FormError message={formError} /> : null}
        </>
      )}
    </Formik>
  );
}

function AcceptCounter({ contractId, counter }: { contractId: string; counter: number }) {
  const { send, formError } = useSend(contractId);
  return (
    <Formik<Values> initialValues={{ action: 'accept-counter', comment: '' }} validationSchema={signOffSchema} onSubmit={send}>
      {({ handleSubmit, isSubmitting }) => (
        <>
          <FormError message={formError} />
          <Button title={`Accept ${hd(counter)} head-days`} large loading={isSubmitting} onPress={() => handleSubmit()} testID="accept-counter" />
        </>
      )}
    </Formik>
  );
}

export interface SignOffPanelProps {
  contract: ContractDetailView;
  /** The server's figures of the log (never ones that include entries still on a phone). */
  figures: { headNow: number; headDaysSoFar: number; byDay: HeadDaysByDay[] };
  side: Side;
  /** Entries on this phone not yet sent: the head-days cannot be proposed until the server has them. */
  waitingOnPhone: number;
}

/**
 * Ending the stay: the grazier proposes the head-days the log adds up to (day by day); the grower approves
 * or disputes with a counter figure and a comment; the grazier accepts the counter or amends the log and
 * proposes again; once agreed the figure is locked with both names and times.
 */
export function SignOffPanel({ contract, figures, side, waitingOnPhone }: SignOffPanelProps) {
  const router = useRouter();
  const s = signOffOf(contract);
  const tz = contract.timeZone;
  const toLog = <Button title="Open the grazing log" variant="secondary" large onPress={() => router.push(`/contracts/${contract.id}/log`)} />;

  if (s?.status === 'agreed' || (s && ['agreed', 'invoiced', 'paid'].includes(contract.status))) return <Agreed s={s} timeZone={tz} />;

  // What the grower weighs is the round as proposed; once disputed, the grazier works from the log as it is now.
  const proposal = s && s.status === 'proposed' && s.byDay ? s : null;
  const breakdown = (
    <Card style={styles.card}>
      <Text variant="heading">{proposal ? 'Proposed, day by day' : 'From the log'}</Text>
      <DailyBreakdown byDay={proposal ? proposal.byDay! : figures.byDay} total={proposal ? proposal.proposedHeadDays : figures.headDaysSoFar} />
      <Text variant="caption" tone="muted">
        Head-days are head on the block × time, split at midnight at the block ({tz}); a daylight-saving day counts its 23 or 25 hours.
      </Text>
    </Card>
  );

  let action: ReactNode = null;
  if (contract.status === 'grazing' && !s) {
    if (side === 'grazier') {
      action =
        figures.headNow > 0 ? (
          <Notice tone="caution" title="Animals are still on the block">
            {`By the log ${formatNumber(figures.headNow)} head are still on. Log them out first: head-days keep counting while they are on.`}
          </Notice>
        ) : waitingOnPhone > 0 ? (
          <Notice tone="caution" title="Entries still waiting to send">
            {`${waitingOnPhone} ${waitingOnPhone === 1 ? 'entry is' : 'entries are'} still on this phone. Send them before proposing, so the head-days include them.`}
          </Notice>
        ) : (
          <Card style={styles.card}>
            <Text variant="heading">End the grazing</Text>
            <Text>Propose the head-days the log adds up to. The grower approves them or disputes them with a counter figure.</Text>
            <Propose contractId={contract.id} headDays={figures.headDaysSoFar} again={false} />
          </Card>
        );
    } else {
      action = <Notice tone="info">{`The grazier has not proposed the head-days yet. So far the log comes to ${hd(figures.headDaysSoFar)}.`}</Notice>;
    }
  } else if (s?.status === 'proposed') {
    action = (
      <Card style={styles.card}>
        <Text variant="heading">Proposed: {hd(s.proposedHeadDays)} head-days</Text>
        <Text variant="caption" tone="muted">
          By {s.grazierName}, {formatMoment(s.proposedAt, tz)}
        </Text>
        {s.comment ? <Text>“{s.comment}”</Text> : null}
        {side === 'grower' ? <GrowerAnswer contractId={contract.id} proposed={s.proposedHeadDays} /> : <Text>Waiting for the grower to approve or dispute.</Text>}
      </Card>
    );
  } else if (s?.status === 'disputed') {
    action = (
      <Card style={styles.card}>
        <Text variant="heading">Disputed: the grower counters with {hd(s.counterHeadDays)} head-days</Text>
        <Text variant="caption" tone="muted">
          {s.growerName ?? 'The grower'}, {s.disputedAt ? formatMoment(s.disputedAt, tz) : ''} · you proposed {hd(s.proposedHeadDays)}
        </Text>
        {s.disputeComment ? <Text>“{s.disputeComment}”</Text> : null}
        {side === 'grazier' ? (
          <>
            <AcceptCounter contractId={contract.id} counter={s.counterHeadDays ?? 0} />
            <Text variant="caption" tone="muted">
              Or amend the log (a missed move, a wrong count) and propose again:
            </Text>
            {toLog}
            {waitingOnPhone === 0 ? <Propose contractId={contract.id} headDays={figures.headDaysSoFar} again /> : null}
          </>
        ) : (
          <Text>Waiting for the grazier to accept your figure or amend the log.</Text>
        )}
      </Card>
    );
  }

  return (
    <View style={styles.col}>
      {action}
      {side === 'grazier' && contract.status === 'grazing' && figures.headNow > 0 ? toLog : null}
      {breakdown}
    </View>
  );
}

const styles = StyleSheet.create({
  col: { gap: space.lg },
  card: { gap: space.md },
  locked: { borderColor: colors.cover, borderWidth: 2 },
  row: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
  table: { borderWidth: 1, borderColor: colors.line, borderRadius: radius.md, overflow: 'hidden' },
  tr: { flexDirection: 'row', paddingHorizontal: space.md, paddingVertical: space.sm, borderTopWidth: 1, borderTopColor: colors.line, backgroundColor: colors.surface },
  thead: { borderTopWidth: 0, backgroundColor: colors.paper },
  total: { backgroundColor: colors.coverWash },
  cellDay: { flex: 1 },
  cellNum: { width: 120, textAlign: 'right', fontVariant: ['tabular-nums'] },
});
