import { useMemo, useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { Formik, useFormikContext } from 'formik';
import type { AccountView } from '@/lib/schemas/account';
import { BID_SERVICES, FLOCK_CLASSES, FLOCK_SPECIES, bidInputSchema, type BidView } from '@/lib/schemas/bid';
import type { BlockView } from '@/lib/schemas/block';
import { formatDay, formatDayRange } from '@/lib/format';
import { usePlaceBid, useUpdateBid } from '@/hooks/api/bids';
import { useLayout } from '@/hooks/use-layout';
import { Button, Card, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { FormTextField } from '@/components/form/form-text-field';
import { FormDateField } from '@/components/form/form-date-field';
import { FormChips, FormSegmented } from '@/components/form/form-choice';
import { applyServerErrors, FormError } from '@/components/form/form-error';
import { CautionList } from '@/components/safety/caution-list';
import { flaggedCautions } from '@/components/market/caution-flag';
import { BASIS_OPTIONS, RATE_UNIT } from './bid-terms';
import { blockToday, editBidValues, newBidValues, stayErrors, toBidInput, type BidFormValues } from './bid-form-values';
import { BidPreview, BidSummaryLine } from './bid-preview';
import { WithdrawBid } from './withdraw-bid';

export interface BidFormProps {
  block: BlockView;
  /** The grazier (their flock profile fills a new bid). */
  user: Pick<AccountView, 'flock'> | null;
  /** My live bid on this block, to change or withdraw; absent for a new bid. */
  bid?: BidView;
  /** After the bid is placed, changed or withdrawn. */
  onDone: (bid: BidView) => void;
}

/**
 * A grazier's bid on a block: price, flock, dates, services and a note, checked with the shared bidInputSchema
 * and against the block's dates as the server will check them; the preview shows what the grower will compare.
 */
export function BidForm({ block, user, bid, onDone }: BidFormProps) {
  const place = usePlaceBid(block.id);
  const update = useUpdateBid(bid?.id ?? '');
  const [formError, setFormError] = useState<string | null>(null);
  const today = useMemo(() => blockToday(block), [block]);
  const initialValues = useMemo(() => (bid ? editBidValues(bid) : newBidValues(block, user, today)), [bid, block, user, today]);

  return (
    <Formik<BidFormValues>
      initialValues={initialValues}
      validationSchema={bidInputSchema}
      validate={(values) => stayErrors(values, block, today)}
      onSubmit={async (values, helpers) => {
        setFormError(null);
        try {
          const body = toBidInput(values);
          onDone(bid ? await update.mutateAsync(body) : await place.mutateAsync(body));
        } catch (err) {
          setFormError(applyServerErrors(err, helpers));
        }
      }}
    >
      <BidFormBody block={block} bid={bid} formError={formError} prefilled={!bid && !!user?.flock} onDone={onDone} />
    </Formik>
  );
}

function BidFormBody({ block, bid, formError, prefilled, onDone }: { block: BlockView; bid?: BidView; formError: string | null; prefilled: boolean; onDone: (bid: BidView) => void }) {
  const { values, handleSubmit, isSubmitting, submitCount, isValid } = useFormikContext<BidFormValues>();
  const { isWide } = useLayout();
  const serious = flaggedCautions(block).filter((c) => c.tone === 'danger');

  const fields = (
    <View style={styles.col}>
      <FormError message={formError} />
      <Card style={styles.section}>
        <Text variant="heading">Price</Text>
        <FormSegmented name="basis" label="Priced" options={BASIS_OPTIONS} />
        <FormTextField
          name="rate"
          label="Rate"
          unit={RATE_UNIT[values.basis]}
          inputMode="decimal"
          autoCapitalize="none"
          placeholder={values.basis === 'head-day' ? '0.18' : values.basis === 'acre' ? '25.00' : '1500'}
          hint="Dollars, up to 6 decimals. The preview puts it on the footing growers compare: total, per acre, per head-day."
        />
      </Card>

      <Card style={styles.section}>
        <Text variant="heading">Your flock on this block</Text>
        {prefilled ? (
          <Text variant="caption" tone="muted">
            Filled in from your flock profile; change it for this bid if you would bring a different mob.
          </Text>
        ) : null}
        <FormChips name="species" label="Species" options={FLOCK_SPECIES} />
        <FormChips name="animalClass" label="Class" options={FLOCK_CLASSES} />
        <View style={styles.row}>
          <View style={styles.cell}>
            <FormTextField name="headCount" label="Head count" numeric unit="head" />
          </View>
          <View style={styles.cell}>
            <FormTextField name="bodyWeightLb" label="Typical body weight" numeric unit="lb" />
          </View>
        </View>
      </Card>

      <Card style={styles.section}>
        <Text variant="heading">Dates</Text>
        <Text variant="caption" tone="muted">
          This block is grazeable {formatDayRange(block.grazeFrom, block.grazeUntil)}; animals out by {formatDay(block.outBy)}.
        </Text>
        <View style={styles.row}>
          <View style={styles.cell}>
            <FormDateField
              name="startDate"
              label="Start date"
              hint={`Animals in from ${formatDay(block.grazeFrom)}${block.earliestSafeDate === block.grazeFrom ? ', when the spray restriction ends' : ''}`}
            />
          </View>
          <View style={styles.cell}>
            <FormDateField name="endDate" label="End date" hint={`Animals out by ${formatDay(block.grazeUntil)} at the latest`} />
          </View>
        </View>
      </Card>
      {isWide ? null : <BidSummaryLine values={values} block={block} />}

      <Card style={styles.section}>
        <Text variant="heading">Included in the price</Text>
        <FormChips name="services" label="Services" options={BID_SERVICES} multiple />
        <FormTextField
          name="note"
          label="Note to the grower"
          multiline
          numberOfLines={4}
          style={styles.note}
          hint="Optional: how you would set up, move and water the flock; anything the grower should know."
        />
      </Card>
    </View>
  );

  const submit = (
    <View style={styles.col}>
      {submitCount > 0 && !isValid ? (
        <Text tone="danger" variant="caption" role="alert">
          Some fields need attention: see the messages beside them.
        </Text>
      ) : null}
      <Button title={bid ? 'Save my bid' : 'Place bid'} onPress={() => handleSubmit()} loading={isSubmitting} />
      <Text variant="caption" tone="muted">
        {bid
          ? 'The grower sees the changed bid at once. You can change or withdraw it until the block is awarded.'
          : `The grower (${block.owner.businessName ?? block.owner.name}) sees your bid; other graziers never do. You can change or withdraw it until the block is awarded.`}
      </Text>
      {bid ? <WithdrawBid bid={bid} onWithdrawn={onDone} /> : null}
    </View>
  );

  const preview = <BidPreview values={values} block={block} />;
  const cautions = serious.length ? <CautionList cautions={serious} title="Before you commit" /> : null;

  if (isWide) {
    return (
      <View style={styles.wide}>
        <View style={styles.main}>
          {fields}
          {submit}
        </View>
        <View style={styles.side}>
          {preview}
          {cautions}
        </View>
      </View>
    );
  }
  return (
    <View style={styles.col}>
      {fields}
      {preview}
      {submit}
      {cautions}
    </View>
  );
}

const styles = StyleSheet.create({
  col: { gap: space.lg },
  section: { gap: space.md },
  row: { flexDirection: 'row', gap: space.md, flexWrap: 'wrap' },
  cell: { flex: 1, minWidth: 140 },
  note: { minHeight: 96, paddingVertical: space.sm, textAlignVertical: 'top' } as object,
  wide: { flexDirection: 'row', alignItems: 'flex-start', gap: space.xl },
  main: { flex: 3, minWidth: 0, gap: space.lg },
  side: { flex: 2, minWidth: 320, gap: space.md },
});
