import { StyleSheet, View } from 'react-native';
import { useFormikContext } from 'formik';
import type { CalculatorValues } from '@/lib/grazing/calculator';
import { ANIMAL_CLASSES } from '@/lib/grazing/capacity';
import { Chip, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { FormTextField } from '@/components/form/form-text-field';

const UTILISATION_PRESETS = [35, 40, 45, 50];
const GRAZING_CLASSES = ANIMAL_CLASSES.filter((c) => c.species !== 'cattle');

export function BlockInputs() {
  const { values, setFieldValue } = useFormikContext<CalculatorValues>();
  return (
    <View style={styles.col}>
      <FormTextField name="acres" label="Block size" numeric unit="acres" live />
      <FormTextField name="utilizationPct" label="Take (utilisation)" numeric unit="% of standing" live />
      <View style={styles.chips}>
        {UTILISATION_PRESETS.map((p) => (
          <Chip key={p} label={`${p} %`} on={values.utilizationPct === p} onPress={() => setFieldValue('utilizationPct', p)} />
        ))}
      </View>
      <Text variant="caption" tone="muted">
        "Take half, leave half" — about 50 % — is the common rule of thumb; many orchard and vineyard growers take 40 % or so to keep trampled
        residue on the soil (common practice, no single source).
      </Text>
    </View>
  );
}

export function FlockInputs() {
  const { values, setValues } = useFormikContext<CalculatorValues>();
  return (
    <View style={styles.col}>
      <View style={styles.chips}>
        {GRAZING_CLASSES.map((c) => (
          <Chip
            key={c.id}
            label={c.label}
            on={values.bodyWeightLb === c.bodyWeightLb && values.intakePctBodyWeight === c.intake.pct}
            onPress={() => setValues({ ...values, bodyWeightLb: c.bodyWeightLb, intakePctBodyWeight: c.intake.pct })}
          />
        ))}
      </View>
      <View style={styles.row}>
        <View style={styles.cell}>
          <FormTextField name="headCount" label="Head" numeric unit="head" live />
        </View>
        <View style={styles.cell}>
          <FormTextField name="bodyWeightLb" label="Body weight" numeric unit="lb" live />
        </View>
        <View style={styles.cell}>
          <FormTextField name="intakePctBodyWeight" label="Intake" numeric unit="% BW/day" live />
        </View>
      </View>
      <Text variant="caption" tone="muted">
        Intake: dry ewes 2.5 %, lactating ewes 4.5 %, goats 4–5 % of body weight a day (NCAT ATTRA, "Grazier's Math"). Preset weights are typical
        figures from memory — enter your flock's.
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({
  col: { gap: space.md },
  row: { flexDirection: 'row', gap: space.md, flexWrap: 'wrap' },
  cell: { flex: 1, minWidth: 96 },
  chips: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
});
