import { FormTextField } from './form-text-field';

// Native builds type the day as text; the web sibling (form-date-field.web.tsx) uses the browser's date picker.
export function FormDateField({ name, label, hint }: { name: string; label: string; hint?: string }) {
  return <FormTextField name={name} label={label} hint={hint ?? 'YYYY-MM-DD'} placeholder="2027-01-15" autoCapitalize="none" />;
}
