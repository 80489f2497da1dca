import { useMemo, useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { FieldArray, Formik, useFormikContext } from 'formik';
import { BLOCK_CROPS, PERIMETER_FENCES, SUGGESTED_UTILIZATION_PCT } from '@/lib/schemas/block';
import { GRAZING_SPECIES } from '@/lib/grazing/flock-intake';
import { computeCalculator } from '@/lib/grazing/calculator';
import { earliestSafeDate } from '@/lib/grazing/safety';
import { INTAKE_RULES_OF_THUMB } from '@/lib/grazing/capacity';
import { formatDay, formatNumber } from '@/lib/format';
import { Button, Card, Chip, Notice, Text, TwoPane } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { FormTextField } from '@/components/form/form-text-field';
import { FormDateField } from '@/components/form/form-date-field';
import { FormChips, FormSegmented, FormYesNo } from '@/components/form/form-choice';
import { applyServerErrors, FormError } from '@/components/form/form-error';
import { ForageInputs } from '@/components/calculator/forage-inputs';
import type { BlockInput } from '@/lib/schemas/block';
import { formPath, toBlockInput, validateBlockForm, type BlockFormValues } from './block-form-values';

// Capacity on the form is shown for a reference animal so growers without a flock can read it: a 150 lb dry
// ewe eating 2.5 % of body weight (ATTRA, "Grazier's Math"; the weight is a typical figure from memory).
const REFERENCE_EWE = { bodyWeightLb: 150, intakePctBodyWeight: INTAKE_RULES_OF_THUMB.dryEwe.pct };

function Section({ title, children, note }: { title: string; note?: string; children: React.ReactNode }) {
  return (
    <Card style={styles.section}>
      <Text variant="heading">{title}</Text>
      {note ? (
        <Text variant="caption" tone="muted">
          {note}
        </Text>
      ) : null}
      {children}
    </Card>
  );
}

function Row({ children }: { children: React.ReactNode }) {
  return <View style={styles.row}>{children}</View>;
}

function Cell({ children }: { children: React.ReactNode }) {
  return <View style={styles.cell}>{children}</View>;
}

function ForagePreview() {
  const { values } = useFormikContext<BlockFormValues>();
  const r = useMemo(
    () =>
      computeCalculator({
        ...values,
        acres: values.acres,
        utilizationPct: values.targetUtilizationPct,
        headCount: null,
        bodyWeightLb: REFERENCE_EWE.bodyWeightLb,
        intakePctBodyWeight: REFERENCE_EWE.intakePctBodyWeight,
      }),
    [values],
  );
  return (
    <View style={styles.preview} aria-live="polite">
      <Text variant="label" tone="muted">
        What this block carries
      </Text>
      {r.forage ? (
        <Text variant="bodyStrong" testID="block-form-lb-dm">
          {formatNumber(r.forage.lbDmPerAcre)} lb DM/ac ({r.forage.note})
        </Text>
      ) : (
        <Text tone="muted">Enter the forage to see it per acre.</Text>
      )}
      {r.capacity ? (
        <>
          <Text variant="figure" testID="block-form-capacity">
            {formatNumber(Math.floor(r.capacity.headDays))} head-days
          </Text>
          <Text variant="caption" tone="muted">
            at a {formatNumber(values.targetUtilizationPct ?? 0)} % take, for {REFERENCE_EWE.bodyWeightLb} lb dry ewes eating {REFERENCE_EWE.intakePctBodyWeight} % of
            body weight a day · {formatNumber(r.capacity.aum, 1)} AUM (26 lb DM per AU-day, 30-day month). Graziers see it for their own flock.
          </Text>
        </>
      ) : null}
    </View>
  );
}

function SprayRecords() {
  const { values } = useFormikContext<BlockFormValues>();
  const complete = values.sprayRecords.filter((r) => r.appliedOn && r.grazingRestrictionDays != null) as Parameters<typeof earliestSafeDate>[0];
  const safe = earliestSafeDate(complete);
  return (
    <FieldArray name="sprayRecords">
      {({ push, remove }) => (
        <View style={styles.col}>
          {values.sprayRecords.map((_, i) => (
            <View key={i} style={styles.spray}>
              <Row>
                <Cell>
                  <FormTextField name={`sprayRecords[${i}].product`} label={`Spray ${i + 1} product`} />
                </Cell>
                <Cell>
                  <FormDateField name={`sprayRecords[${i}].appliedOn`} label={`Spray ${i + 1} date applied`} />
                </Cell>
              </Row>
              <Row>
                <Cell>
                  <FormTextField
                    name={`sprayRecords[${i}].grazingRestrictionDays`}
                    label={`Spray ${i + 1} grazing restriction`}
                    numeric
                    unit="days"
                    hint="From the label: 'do not graze within N days'"
                  />
                </Cell>
                <Cell>
                  <FormYesNo name={`sprayRecords[${i}].containsCopper`} label="Contains copper" />
                </Cell>
              </Row>
              <Button title="Remove this spray" variant="quiet" compact onPress={() => remove(i)} style={{ alignSelf: 'flex-start' }} />
            </View>
          ))}
          <Button
            title="Add a spray record"
            variant="secondary"
            compact
            style={{ alignSelf: 'flex-start' }}
            onPress={() => push({ product: '', appliedOn: '', grazingRestrictionDays: null, containsCopper: false })}
          />
          {safe ? (
            <Notice tone="caution" title={`Earliest safe grazing date: ${formatDay(safe)}`}>
              Set by the spray whose label restriction ends last. Fieldfold refuses bids that bring animals in sooner — but the label is the law: read it.
            </Notice>
          ) : (
            <Text variant="caption" tone="muted">
              List every product applied since the last harvest. Labels can forbid grazing for up to 18 months (US EPA Label Review Manual, ch. 11).
            </Text>
          )}
        </View>
      )}
    </FieldArray>
  );
}

export function BlockForm({
  initialValues,
  submitLabel,
  onSubmit,
  home,
}: {
  initialValues: BlockFormValues;
  submitLabel: string;
  onSubmit: (input: BlockInput) => Promise<unknown>;
  home?: { latitude: number | null; longitude: number | null; place: string | null };
}) {
  const [formError, setFormError] = useState<string | null>(null);
  return (
    <Formik<BlockFormValues>
      initialValues={initialValues}
      validate={validateBlockForm}
      onSubmit={async (values, helpers) => {
        setFormError(null);
        try {
          await onSubmit(toBlockInput(values));
        } catch (err) {
          setFormError(applyServerErrors(err, helpers, formPath));
        }
      }}
    >
      {({ handleSubmit, isSubmitting, setValues, values, submitCount, isValid }) => (
        <TwoPane
          main={
            <>
              <Section title="The block">
                <FormTextField name="name" label="Block name" placeholder="North walnut middles" />
                <FormChips name="crop" label="Crop or cover" options={BLOCK_CROPS} />
                <FormTextField name="acres" label="Acres" numeric unit="acres" />
                <FormTextField name="placeName" label="Place" hint="A name the grazier will recognise: road, ranch, gate." />
                <Row>
                  <Cell>
                    <FormTextField name="latitude" label="Latitude" numeric unit="°N" />
                  </Cell>
                  <Cell>
                    <FormTextField name="longitude" label="Longitude" numeric unit="°E" hint="West is negative" />
                  </Cell>
                </Row>
                {home?.latitude != null ? (
                  <Chip
                    label="Use my home base"
                    onPress={() => setValues({ ...values, latitude: home.latitude, longitude: home.longitude, placeName: values.placeName || (home.place ?? '') })}
                  />
                ) : null}
              </Section>
              <Section title="Forage standing on it">
                <ForageInputs />
              </Section>
              <Section title="How much to take" note="Take half, leave half is the rule of thumb; many orchard and vineyard growers take about 40 % to keep residue on the soil (common practice).">
                <FormTextField name="targetUtilizationPct" label="Target utilisation" numeric unit="% of standing" />
                <View style={styles.chips}>
                  {[SUGGESTED_UTILIZATION_PCT.min, 45, SUGGESTED_UTILIZATION_PCT.max].map((p) => (
                    <Chip key={p} label={`${p} %`} on={values.targetUtilizationPct === p} onPress={() => setValues({ ...values, targetUtilizationPct: p })} />
                  ))}
                </View>
                <FormTextField name="residualHeightIn" label="Residual to leave" numeric unit="in" hint="Stubble height the grazier must not go below (2–3 in is usual)." />
              </Section>
              <Section title="When animals may be on it">
                <Row>
                  <Cell>
                    <FormDateField name="windowStart" label="Earliest in" />
                  </Cell>
                  <Cell>
                    <FormDateField name="windowEnd" label="Latest out" />
                  </Cell>
                </Row>
                <Row>
                  <Cell>
                    <FormDateField name="outBy" label="Animals out by" hint="Before bloom, bud break and harvest — enforced on every bid." />
                  </Cell>
                  <Cell>
                    <FormDateField name="harvestDate" label="Harvest starts (optional)" />
                  </Cell>
                </Row>
              </Section>
              <Section title="Spray records">
                <SprayRecords />
              </Section>
              <Section title="The site">
                <Row>
                  <Cell>
                    <FormYesNo name="waterOnSite" label="Water on site" />
                  </Cell>
                  <Cell>
                    <FormYesNo name="truckAccess" label="Truck and trailer access" />
                  </Cell>
                </Row>
                <FormSegmented name="perimeterFence" label="Perimeter fence" options={PERIMETER_FENCES.map((f) => ({ value: f, label: f }))} />
                <FormChips name="speciesAllowed" label="Species allowed" options={GRAZING_SPECIES} multiple />
                <FormYesNo name="youngPlantings" label="Young trees or vines on the block" />
                <FormTextField name="notes" label="Notes for graziers" multiline numberOfLines={4} style={{ minHeight: 96, paddingTop: space.sm }} />
              </Section>
            </>
          }
          side={
            <View style={styles.sticky}>
              <ForagePreview />
              <FormError message={formError} />
              {submitCount > 0 && !isValid ? <Notice tone="danger">Some fields need attention — they are marked in red.</Notice> : null}
              <Button title={submitLabel} onPress={() => handleSubmit()} loading={isSubmitting} testID="block-form-submit" />
              <Text variant="caption" tone="muted">
                Saved blocks stay drafts, seen only by you, until you open them for bids.
              </Text>
            </View>
          }
        />
      )}
    </Formik>
  );
}

const styles = StyleSheet.create({
  section: { gap: space.md },
  col: { gap: space.md },
  row: { flexDirection: 'row', gap: space.md, flexWrap: 'wrap' },
  cell: { flex: 1, minWidth: 150 },
  chips: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
  spray: { gap: space.sm, padding: space.md, borderRadius: radius.md, backgroundColor: colors.paper },
  preview: { gap: space.xs, padding: space.lg, borderRadius: radius.lg, backgroundColor: colors.coverWash },
  sticky: { gap: space.md },
});
