import { useField } from 'formik';
import { TextField, type TextFieldProps } from '@/components/ui/text-field';

type Props = Omit<TextFieldProps, 'value' | 'onChangeText' | 'error'> & {
  name: string;
  /** Numeric fields keep the typed text while editing and hand the form a number (or null when blank). */
  numeric?: boolean;
};

/** A TextField bound to a Formik field; shows the schema's message, or the server's for that field. */
export function FormTextField({ name, numeric, ...rest }: Props) {
  const [field, meta, helpers] = useField<string | number | null>(name);
  const shown = meta.touched || meta.initialError !== meta.error ? meta.error : undefined;
  return (
    <TextField
      {...rest}
      value={field.value == null ? '' : String(field.value)}
      onChangeText={(text) => {
        if (!numeric) return helpers.setValue(text);
        const trimmed = text.trim();
        const n = Number(trimmed);
        helpers.setValue(trimmed === '' ? null : Number.isFinite(n) && /^-?\d*\.?\d*$/.test(trimmed) ? n : (text as never));
      }}
      onBlur={() => helpers.setTouched(true)}
      error={meta.touched ? shown : undefined}
      keyboardType={numeric ? 'decimal-pad' : rest.keyboardType}
    />
  );
}
