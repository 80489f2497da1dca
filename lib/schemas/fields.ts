import * as yup from 'yup';
import { isDayKey, MAX_YEAR, MIN_YEAR } from '../day-keys';

// Field builders shared by the marketplace schemas (blocks, bids). Every leaf is strict, so "12" where a
// number belongs is refused rather than coerced, and every message names the field in the user's words.

export { rejectUnknown } from './reject-unknown';

export function num(label: string) {
  return yup.number().strict().typeError(`${label} must be a number`);
}

export function int(label: string) {
  return num(label).integer(`${label} must be a whole number`);
}

export function bool(label: string) {
  return yup.boolean().strict().typeError(`${label} must be true or false`);
}

/** Text that is trimmed by the sender (no leading or trailing spaces) and not blank. */
export function text(label: string, max: number) {
  return yup
    .string()
    .strict()
    .typeError(`${label} must be text`)
    .trim(`${label} must not start or end with spaces`)
    .max(max, `${label} must be at most ${max} characters`);
}

/** A calendar day 'YYYY-MM-DD' that exists, in a sensible range of years. */
export function day(label: string) {
  return yup
    .string()
    .strict()
    .typeError(`${label} must be a date like 2027-01-15`)
    .test('day-key', `${label} must be a real date like 2027-01-15`, (v) => v == null || isDayKey(v))
    .test('year-range', `${label} must be between ${MIN_YEAR} and ${MAX_YEAR}`, (v) => {
      if (v == null || !isDayKey(v)) return true;
      const y = Number(v.slice(0, 4));
      return y >= MIN_YEAR && y <= MAX_YEAR;
    });
}

/** True when both are real days (so order checks can skip fields already reported as invalid). */
export function bothDays(a: unknown, b: unknown): a is string {
  return isDayKey(a) && isDayKey(b);
}
