import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { Formik, useField, type FormikErrors } from 'formik';
import { Button, Card, Checkbox, Notice, Stepper, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { FormMomentField } from '@/components/form/form-moment-field';
import { FormTextField } from '@/components/form/form-text-field';
import { nestErrors } from '@/components/form/nest-errors';
import { localDateKey, parseIsoInstant } from '@/lib/dates';
import { formatDay, formatNumber } from '@/lib/format';
import { isoInZone } from '@/lib/local-time';
import { LOG_CLOCK_SKEW_MINUTES, logEntrySchema, type ContractView, type LogEntryInput } from '@/lib/schemas/contract';
import type { LogEntryToSend } from '@/hooks/offline/log-queue';
import { newClientId } from '@/hooks/offline/use-log-queue';

export type EntryMode = 'in' | 'out' | 'tally' | 'observation';

export const ENTRY_MODE_LABELS: Record<EntryMode, string> = {
  in: 'Animals in',
  out: 'Animals out',
  tally: 'Daily tally',
  observation: 'Observation',
};

export function modeOf(entry: Pick<LogEntryInput, 'kind' | 'change'>): EntryMode {
  if (entry.kind === 'move') return (entry.change ?? 0) < 0 ? 'out' : 'in';
  return entry.kind === 'tally' ? 'tally' : 'observation';
}

type Values = LogEntryInput;

export interface EntryFormProps {
  mode: EntryMode;
  /** Who writes: losses are the grazier's to record (a grower describes what they saw in the note). */
  side?: 'grower' | 'grazier';
  contract: Pick<ContractView, 'headCount' | 'timeZone' | 'startDate' | 'outBy'>;
  /** Animals on the block now, by the log (prefills "out" and the tally). */
  headNow: number;
  /** The paddock or cell of the latest entry: usually where the next one happens too. */
  lastPaddock: string | null;
  /** A refused entry being fixed: its values, and the server's messages shown beside the fields. */
  fixing?: { entry: LogEntryToSend; problem: string | null; fields: Record<string, string> };
  onSave: (entry: LogEntryToSend) => Promise<void>;
  onCancel: () => void;
}

function startValues({ mode, contract, headNow, lastPaddock }: EntryFormProps): Values {
  const base = { clientId: newClientId(), at: isoInZone(Date.now(), contract.timeZone), paddock: lastPaddock ?? '' };
  if (mode === 'in') return { ...base, kind: 'move', change: contract.headCount };
  if (mode === 'out') return { ...base, kind: 'move', change: -(headNow > 0 ? headNow : contract.headCount) };
  if (mode === 'tally') return { ...base, kind: 'tally', count: headNow > 0 ? headNow : contract.headCount };
  return { ...base, kind: 'observation', residualHeightIn: null, takenPct: null, trampledPct: null, bareGroundPct: null, waterChecked: null, fenceChecked: null, losses: null, note: '' };
}

/**
 * What the server would refuse about the time, checked on the phone too so an entry written with no signal
 * is not queued only to be refused hours later: not after now (beyond the allowed clock skew), and not
 * before the contract's first day at the block.
 */
function timeProblems(v: Values, contract: EntryFormProps['contract']): FormikErrors<Values> {
  const t = parseIsoInstant(v.at);
  if (t === null) return { at: 'Time must be a date and time' };
  if (t > Date.now() + LOG_CLOCK_SKEW_MINUTES * 60_000) return { at: 'Time must not be in the future' };
  if (localDateKey(t, contract.timeZone) < contract.startDate) return { at: `Time must be on or after the contract's first day, ${formatDay(contract.startDate)}` };
  return {};
}

/** The entry as sent: blanks left out, the sign of a move kept, and "now" meaning the moment it was saved. */
function toEntry(v: Values, timeTouched: boolean, timeZone: string): LogEntryToSend {
  const out: Record<string, unknown> = {};
  for (const [k, value] of Object.entries(v)) {
    if (value === null || value === undefined) continue;
    if (typeof value === 'string' && value.trim() === '') continue;
    out[k] = typeof value === 'string' ? value.trim() : value;
  }
  if (!timeTouched) out.at = isoInZone(Date.now(), timeZone);
  return out as LogEntryToSend;
}

/** A head count bound to `change` (a move: shown as a count, stored +n in or −n out) or `count` (a tally). */
function FormHeadStepper({ name, label, sign = 1, hint }: { name: 'change' | 'count' | 'losses'; label: string; sign?: 1 | -1; hint?: string }) {
  const [field, meta, helpers] = useField<number | null | undefined>(name);
  const shown = field.value == null ? null : Math.abs(field.value);
  return (
    <Stepper
      label={label}
      value={shown}
      min={name === 'change' ? 1 : 0}
      steps={name === 'losses' ? [1] : [1, 10]}
      unit="head"
      hint={hint}
      error={meta.touched || meta.error?.startsWith('Say') ? meta.error : undefined}
      onChange={(n) => {
        helpers.setTouched(true, false);
        helpers.setValue(n == null ? null : sign * n);
      }}
    />
  );
}

const QUICK_PCT = { takenPct: [25, 40, 50, 60], trampledPct: [10, 25, 50], bareGroundPct: [0, 5, 10, 20] } as const;

function PercentField({ name, label, hint }: { name: keyof typeof QUICK_PCT; label: string; hint?: string }) {
  const [field, , helpers] = useField<number | null>(name);
  return (
    <View style={styles.gapXs}>
      <FormTextField name={name} label={label} numeric unit="%" hint={hint} />
      <View style={styles.quick}>
        {QUICK_PCT[name].map((p) => (
          <Button key={p} title={`${p} %`} variant={field.value === p ? 'primary' : 'secondary'} large aria-label={`${label}: ${p} %`} onPress={() => helpers.setValue(p)} style={styles.quickButton} />
        ))}
      </View>
    </View>
  );
}

function FormTick({ name, label }: { name: 'waterChecked' | 'fenceChecked'; label: string }) {
  const [field, , helpers] = useField<boolean | null>(name);
  // Ticked is true; unticked is "not recorded" (null), not a claim that it was left unchecked.
  return <Checkbox label={label} checked={field.value === true} onChange={(on) => helpers.setValue(on ? true : null)} />;
}

/**
 * One log entry, thumb-sized: the count prefilled (the contract's head count in, the head on the block out),
 * the time "now" unless changed, the paddock of the last entry. Saved to the phone first; the queue sends it.
 */
export function EntryForm(props: EntryFormProps) {
  const { mode, contract, fixing, onSave, onCancel } = props;
  const [initial] = useState<Values>(() => (fixing ? { ...startValues(props), ...fixing.entry } : startValues(props)));
  const [failure, setFailure] = useState<string | null>(null);
  const serverErrors = fixing ? (nestErrors(fixing.fields) as FormikErrors<Values>) : {};

  return (
    <Formik<Values>
      initialValues={initial}
      initialErrors={serverErrors}
      initialTouched={Object.fromEntries(Object.keys(serverErrors).map((k) => [k, true]))}
      validationSchema={logEntrySchema}
      validate={(v) => {
        const extra: FormikErrors<Values> = { ...timeProblems(v, contract) };
        if (v.kind === 'move' && v.change == null) extra.change = 'Say how many animals';
        if (v.kind === 'tally' && v.count == null) extra.count = 'Say how many head you counted';
        return extra;
      }}
      onSubmit={async (v) => {
        setFailure(null);
        try {
          // A fixed entry keeps the time it was given; a new one left at "now" means the moment of saving.
          await onSave(toEntry(v, !!fixing || v.at !== initial.at, contract.timeZone));
        } catch (err) {
          setFailure(err instanceof Error ? err.message : 'The entry could not be kept on this phone.');
        }
      }}
    >
      {({ handleSubmit, isSubmitting }) => {
        return (
          <Card style={styles.card} aria-label={`${ENTRY_MODE_LABELS[mode]} entry`}>
            <Text variant="heading">{fixing ? `Fix: ${ENTRY_MODE_LABELS[mode].toLowerCase()}` : ENTRY_MODE_LABELS[mode]}</Text>
            {fixing?.problem ? (
              <Notice tone="danger" title="Fieldfold refused this entry">
                {fixing.problem}
              </Notice>
            ) : null}
            {mode === 'in' ? <FormHeadStepper name="change" label="Head in" hint={`The contract is for ${formatNumber(contract.headCount)} head`} /> : null}
            {mode === 'out' ? <FormHeadStepper name="change" label="Head out" sign={-1} hint={props.headNow > 0 ? `${formatNumber(props.headNow)} on the block by the log` : undefined} /> : null}
            {mode === 'tally' ? <FormHeadStepper name="count" label="Head counted" /> : null}
            {mode === 'observation' ? (
              <>
                <FormTextField name="residualHeightIn" label="Residual height" numeric unit="in" hint="Stubble left standing" />
                <PercentField name="takenPct" label="Estimated % taken" />
                <PercentField name="trampledPct" label="Trampled residue" />
                <PercentField name="bareGroundPct" label="Bare ground" />
                <FormTick name="waterChecked" label="Water checked" />
                <FormTick name="fenceChecked" label="Fence checked" />
                {props.side !== 'grower' ? <FormHeadStepper name="losses" label="Losses" hint="Animals dead or missing since the last entry; log a move out for them too" /> : null}
                <FormTextField name="note" label={props.side === 'grower' ? 'What you saw' : 'Health and other notes'} multiline numberOfLines={3} style={styles.note} />
              </>
            ) : null}
            <FormMomentField name="at" label="Time" timeZone={contract.timeZone} hint={`Time at the block (${contract.timeZone}); left alone it is the moment you save`} />
            <FormTextField name="paddock" label="Paddock or cell" placeholder="e.g. Rows 1–20" autoCapitalize="sentences" />
            {failure ? <Notice tone="danger">{failure}</Notice> : null}
            <View style={styles.actions}>
              <Button title={fixing ? 'Save and send again' : 'Save entry'} large loading={isSubmitting} onPress={() => handleSubmit()} style={styles.save} />
              <Button title="Cancel" variant="secondary" large onPress={onCancel} />
            </View>
          </Card>
        );
      }}
    </Formik>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.md },
  gapXs: { gap: space.xs },
  quick: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
  quickButton: { minWidth: 72 },
  note: { minHeight: 88, textAlignVertical: 'top', paddingTop: space.sm },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  save: { flexGrow: 1 },
});
