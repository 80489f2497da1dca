import { useField } from 'formik';
import { View } from 'react-native';
import { Button, Text } from '@/components/ui';
import { FieldMessage } from '@/components/ui/field-message';
import { colors, fonts, radius, space } from '@/components/ui/theme';
import { parseIsoInstant } from '@/lib/dates';
import { instantFromWallTime, isoInZone, wallTimeIn } from '@/lib/local-time';
import type { FormMomentFieldProps } from './form-moment-field';

// A real <input type="datetime-local"> gives phones their own date and time wheels. Its value is a wall
// time with no zone; it is read as the time at the block and held as an ISO instant with the block's offset.
export function FormMomentField({ name, label, timeZone, hint }: FormMomentFieldProps) {
  const [field, meta, helpers] = useField<string>(name);
  const ms = parseIsoInstant(field.value);
  const error = meta.touched ? meta.error : undefined;
  return (
    <View style={{ gap: space.xs }}>
      <Text variant="label">{label}</Text>
      <View style={{ flexDirection: 'row', gap: space.sm, alignItems: 'center' }}>
        <input
          type="datetime-local"
          aria-label={label}
          aria-invalid={!!error}
          value={ms === null ? '' : wallTimeIn(ms, timeZone)}
          onChange={(e) => {
            const at = instantFromWallTime(e.currentTarget.value, timeZone);
            if (at !== null) helpers.setValue(isoInZone(at, timeZone));
          }}
          onBlur={() => helpers.setTouched(true)}
          style={{
            flex: 1,
            minWidth: 0,
            minHeight: 56,
            padding: `0 ${space.md}px`,
            border: `1px solid ${error ? colors.danger : colors.lineStrong}`,
            borderRadius: radius.md,
            background: colors.surface,
            color: colors.ink,
            fontFamily: fonts.body,
            fontSize: 17,
            boxSizing: 'border-box',
          }}
        />
        <Button title="Now" variant="secondary" large onPress={() => helpers.setValue(isoInZone(Date.now(), timeZone))} />
      </View>
      <FieldMessage error={error} hint={hint ?? 'Time at the block'} />
    </View>
  );
}
