import { useField } from 'formik';
import { View } from 'react-native';
import { Text } from '@/components/ui';
import { FieldMessage } from '@/components/ui/field-message';
import { colors, fonts, radius, space } from '@/components/ui/theme';

// On the web a real <input type="date"> gives phones their own date wheel and keeps the value as YYYY-MM-DD,
// the format the API and the shared schemas use.
export function FormDateField({ name, label, hint }: { name: string; label: string; hint?: string }) {
  const [field, meta, helpers] = useField<string>(name);
  const error = meta.touched ? meta.error : undefined;
  return (
    <View style={{ gap: space.xs }}>
      <Text variant="label">{label}</Text>
      <input
        type="date"
        aria-label={label}
        aria-invalid={!!error}
        value={field.value ?? ''}
        min="2000-01-01"
        max="2100-12-31"
        onChange={(e) => helpers.setValue(e.currentTarget.value)}
        onBlur={() => helpers.setTouched(true)}
        style={{
          minHeight: 44,
          padding: `0 ${space.md}px`,
          border: `1px solid ${error ? colors.danger : colors.lineStrong}`,
          borderRadius: radius.sm,
          background: colors.surface,
          color: colors.ink,
          fontFamily: fonts.body,
          fontSize: 16,
          boxSizing: 'border-box',
          width: '100%',
        }}
      />
      <FieldMessage error={error} hint={hint} />
    </View>
  );
}
