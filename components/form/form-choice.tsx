import { View } from 'react-native';
import { useField } from 'formik';
import { Chip, Segmented, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';

/** One of a few values, as joined buttons, bound to a Formik field. */
export function FormSegmented<T extends string>({ name, label, options }: { name: string; label: string; options: ReadonlyArray<{ value: T; label: string }> }) {
  const [field, meta, helpers] = useField<T>(name);
  return (
    <View style={{ gap: space.xs }}>
      <Segmented label={label} value={field.value} options={options} onChange={(v) => helpers.setValue(v)} />
      {meta.touched && meta.error ? (
        <Text variant="caption" tone="danger">
          {meta.error}
        </Text>
      ) : null}
    </View>
  );
}

/** Yes or no, bound to a boolean Formik field. */
export function FormYesNo({ name, label }: { name: string; label: string }) {
  const [field, , helpers] = useField<boolean>(name);
  return (
    <Segmented
      label={label}
      value={field.value ? 'yes' : 'no'}
      options={[
        { value: 'yes', label: 'Yes' },
        { value: 'no', label: 'No' },
      ]}
      onChange={(v) => helpers.setValue(v === 'yes')}
    />
  );
}

/** Chips: one value (`multiple` false) or a set of values, bound to a Formik field. */
export function FormChips<T extends string>({ name, label, options, multiple }: { name: string; label: string; options: readonly T[]; multiple?: boolean }) {
  const [field, meta, helpers] = useField<T | T[]>(name);
  const selected = (v: T) => (Array.isArray(field.value) ? field.value.includes(v) : field.value === v);
  const toggle = (v: T) => {
    helpers.setTouched(true, false);
    if (!multiple) return helpers.setValue(v);
    const current = (field.value as T[]) ?? [];
    helpers.setValue(current.includes(v) ? current.filter((x) => x !== v) : [...current, v]);
  };
  return (
    <View style={{ gap: space.xs }} role={multiple ? 'group' : 'radiogroup'} aria-label={label}>
      <Text variant="label">{label}</Text>
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.xs }}>
        {options.map((o) => (
          <Chip key={o} label={o} on={selected(o)} onPress={() => toggle(o)} />
        ))}
      </View>
      {meta.touched && typeof meta.error === 'string' ? (
        <Text variant="caption" tone="danger" role="alert">
          {meta.error}
        </Text>
      ) : null}
    </View>
  );
}
