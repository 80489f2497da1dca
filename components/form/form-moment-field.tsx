import { useEffect, useState } from 'react';
import { useField } from 'formik';
import { View } from 'react-native';
import { Button } from '@/components/ui';
import { TextField } from '@/components/ui/text-field';
import { space } from '@/components/ui/theme';
import { parseIsoInstant } from '@/lib/dates';
import { instantFromWallTime, isoInZone, wallTimeIn } from '@/lib/local-time';

export interface FormMomentFieldProps {
  name: string;
  label: string;
  /** The block's zone: the wall time typed and shown is the time where the animals are. */
  timeZone: string;
  hint?: string;
}

// Native builds type the wall time as text; the web sibling (form-moment-field.web.tsx) uses the browser's
// date-and-time picker. Both hold the Formik value as an ISO instant with the block's offset.
export function FormMomentField({ name, label, timeZone, hint }: FormMomentFieldProps) {
  const [field, meta, helpers] = useField<string>(name);
  const ms = parseIsoInstant(field.value);
  const [text, setText] = useState(ms === null ? '' : wallTimeIn(ms, timeZone));
  useEffect(() => {
    if (ms !== null && instantFromWallTime(text, timeZone) !== ms) setText(wallTimeIn(ms, timeZone));
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [field.value]);
  return (
    <View style={{ gap: space.xs }}>
      <TextField
        label={label}
        value={text}
        placeholder="2027-01-20T07:30"
        autoCapitalize="none"
        hint={hint ?? 'YYYY-MM-DDTHH:MM at the block'}
        error={meta.touched ? meta.error : undefined}
        onChangeText={(t) => {
          setText(t);
          const at = instantFromWallTime(t.trim(), timeZone);
          helpers.setValue(at === null ? t : isoInZone(at, timeZone));
        }}
        onBlur={() => helpers.setTouched(true)}
      />
      <Button title="Now" variant="secondary" large onPress={() => helpers.setValue(isoInZone(Date.now(), timeZone))} style={{ alignSelf: 'flex-start' }} />
    </View>
  );
}
