import { StyleSheet, View } from 'react-native';
import { FieldArray, useFormikContext } from 'formik';
import type { CalculatorValues } from '@/lib/grazing/calculator';
import { FRAME_PRESETS } from '@/lib/grazing/calculator';
import { STAND_HEIGHT_FACTORS } from '@/lib/grazing/forage';
import { Button, Chip, Segmented, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { FormTextField } from '@/components/form/form-text-field';

const METHODS = [
  { value: 'samples', label: 'Clipped samples' },
  { value: 'height', label: 'Stand height' },
  { value: 'direct', label: 'I know it' },
] as const;

export function ForageInputs() {
  const { values, setFieldValue } = useFormikContext<CalculatorValues>();
  return (
    <View style={styles.col}>
      <Segmented label="How do you know the forage?" value={values.method} options={METHODS} onChange={(m) => setFieldValue('method', m)} />
      {values.method === 'samples' ? <SampleInputs /> : null}
      {values.method === 'height' ? (
        <View style={styles.col}>
          <View style={styles.row}>
            <View style={styles.cell}>
              <FormTextField name="heightIn" label="Average stand height" numeric unit="in" live />
            </View>
            <View style={styles.cell}>
              <FormTextField name="residualIn" label="Residual to leave" numeric unit="in" live hint="2–3 in is the usual stop (rule of thumb)" />
            </View>
          </View>
          <FormTextField name="lbDmPerAcrePerInch" label="Stand density" numeric unit="lb DM/ac per in" live hint="Edit to suit your stand; presets below." />
          <View style={styles.chips}>
            {STAND_HEIGHT_FACTORS.map((f) => (
              <Chip
                key={f.id}
                label={`${f.stand}, ${f.condition}: ${f.lbDmPerAcrePerInchMin}–${f.lbDmPerAcrePerInchMax}`}
                on={values.lbDmPerAcrePerInch === f.lbDmPerAcrePerInch}
                onPress={() => setFieldValue('lbDmPerAcrePerInch', f.lbDmPerAcrePerInch)}
              />
            ))}
          </View>
          <Text variant="caption" tone="muted">
            Presets: University of Maine Cooperative Extension, Pasture Course, Lesson 1, Appendix D (visual method). Winter covers and orchard
            middles differ; a clipped sample beats any table.
          </Text>
        </View>
      ) : null}
      {values.method === 'direct' ? <FormTextField name="lbDmPerAcre" label="Standing forage" numeric unit="lb DM/ac" live /> : null}
    </View>
  );
}

function SampleInputs() {
  const { values, setFieldValue } = useFormikContext<CalculatorValues>();
  return (
    <View style={styles.col}>
      <FormTextField name="frameAreaM2" label="Frame area" numeric unit="m²" live />
      <View style={styles.chips}>
        {FRAME_PRESETS.map((p) => (
          <Chip key={p.label} label={p.label} on={values.frameAreaM2 === p.frameAreaM2} onPress={() => setFieldValue('frameAreaM2', p.frameAreaM2)} />
        ))}
      </View>
      <Segmented
        label="Weighed"
        value={values.weighing}
        options={[
          { value: 'fresh', label: 'Fresh, with DM %' },
          { value: 'dry', label: 'Oven-dry' },
        ]}
        onChange={(w) => setFieldValue('weighing', w)}
      />
      <FieldArray name="samples">
        {({ push, remove }) => (
          <View style={styles.col}>
            {values.samples.map((_, i) => (
              <View key={i} style={styles.sampleRow}>
                <Text variant="label" tone="muted" style={styles.sampleNo}>
                  #{i + 1}
                </Text>
                {values.weighing === 'fresh' ? (
                  <>
                    <View style={styles.sampleCell}>
                      <FormTextField name={`samples[${i}].freshGrams`} label={`Sample ${i + 1} fresh`} numeric unit="g" live />
                    </View>
                    <View style={styles.sampleCell}>
                      <FormTextField name={`samples[${i}].dryMatterPct`} label={`Sample ${i + 1} dry matter`} numeric unit="%" live />
                    </View>
                  </>
                ) : (
                  <View style={styles.sampleCell}>
                    <FormTextField name={`samples[${i}].dryGrams`} label={`Sample ${i + 1} dry`} numeric unit="g" live />
                  </View>
                )}
                {values.samples.length > 1 ? (
                  <Button title="✕" aria-label={`Remove sample ${i + 1}`} variant="quiet" compact onPress={() => remove(i)} style={styles.remove} />
                ) : null}
              </View>
            ))}
            <View style={styles.actions}>
              <Button
                title="Add a sample"
                variant="secondary"
                compact
                onPress={() => push({ freshGrams: null, dryMatterPct: values.samples.at(-1)?.dryMatterPct ?? 20, dryGrams: null })}
              />
            </View>
            <Text variant="caption" tone="muted">
              Clip everything inside the frame to the height the animals would graze to, in several typical spots. Fresh winter forage is often
              15–25 % dry matter [from memory — dry a sample to know yours].
            </Text>
          </View>
        )}
      </FieldArray>
    </View>
  );
}

const styles = StyleSheet.create({
  col: { gap: space.md },
  row: { flexDirection: 'row', gap: space.md, flexWrap: 'wrap' },
  cell: { flex: 1, minWidth: 130 },
  chips: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
  sampleRow: { flexDirection: 'row', gap: space.sm, alignItems: 'flex-end' },
  sampleCell: { flex: 1, minWidth: 0 },
  sampleNo: { width: 26, paddingBottom: space.md },
  remove: { paddingHorizontal: space.sm, minHeight: 44 },
  actions: { flexDirection: 'row' },
});
