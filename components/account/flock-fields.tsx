import { StyleSheet, View } from 'react-native';
import { useField } from 'formik';
import { FLOCK_CLASSES, FLOCK_SPECIES } from '@/lib/schemas/account';
import { Chip, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { FormTextField } from '@/components/form/form-text-field';

function Choice<T extends string>({ name, label, options }: { name: string; label: string; options: readonly T[] }) {
  const [field, meta, helpers] = useField<T>(name);
  return (
    <View style={{ gap: space.xs }} role="radiogroup" aria-label={label}>
      <Text variant="label">{label}</Text>
      <View style={styles.chips}>
        {options.map((o) => (
          <Chip key={o} label={o} on={field.value === o} onPress={() => helpers.setValue(o)} />
        ))}
      </View>
      {meta.error && meta.touched ? (
        <Text variant="caption" tone="danger">
          {meta.error}
        </Text>
      ) : null}
    </View>
  );
}

export function FlockFields() {
  return (
    <View style={{ gap: space.md }}>
      <Text variant="heading">Your flock</Text>
      <Choice name="flock.species" label="Species" options={FLOCK_SPECIES} />
      <Choice name="flock.animalClass" label="Class" options={FLOCK_CLASSES} />
      <View style={{ flexDirection: 'row', gap: space.md }}>
        <View style={{ flex: 1 }}>
          <FormTextField name="flock.headCount" label="Head count" numeric unit="head" />
        </View>
        <View style={{ flex: 1 }}>
          <FormTextField name="flock.bodyWeightLb" label="Typical body weight" numeric unit="lb" />
        </View>
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  chips: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
});
