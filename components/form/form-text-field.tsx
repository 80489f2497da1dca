import { useEffect, useState } from 'react';
import { useField } from 'formik';
import { TextField, type TextFieldProps } from '@/components/ui/text-field';

type Props = Omit<TextFieldProps, 'value' | 'onChangeText' | 'error'> & {
  name: string;
  /** Numeric fields keep the typed text while editing ("2." on the way to "2.5") and hand the form a number, or null when blank. */
  numeric?: boolean;
  /** Show the field's message while typing (the calculator), not only after the field was left. */
  live?: boolean;
};

function parseNumber(text: string): number | null | string {
  const t = text.trim();
  if (t === '') return null;
  if (!/^-?(\d+\.?\d*|\.\d+)$/.test(t)) return text; // left as text: the schema says "must be a number"
  return Number(t);
}

/** A TextField bound to a Formik field; shows the schema's message, or the server's for that field. */
export function FormTextField({ name, numeric, live, ...rest }: Props) {
  const [field, meta, helpers] = useField<string | number | null>(name);
  const [text, setText] = useState(field.value == null ? '' : String(field.value));

  // Follow outside changes (a preset chosen, the form reset) without fighting the user's own typing.
  useEffect(() => {
    const current = numeric ? parseNumber(text) : text;
    if (current !== field.value && !(field.value == null && current === null)) setText(field.value == null ? '' : String(field.value));
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [field.value]);

  return (
    <TextField
      {...rest}
      value={text}
      onChangeText={(next) => {
        setText(next);
        helpers.setValue(numeric ? (parseNumber(next) as never) : next);
      }}
      onBlur={() => helpers.setTouched(true)}
      error={live || meta.touched ? meta.error : undefined}
      keyboardType={numeric ? 'decimal-pad' : rest.keyboardType}
      inputMode={numeric ? 'decimal' : rest.inputMode}
    />
  );
}
