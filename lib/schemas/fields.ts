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

/** Text that is trimmed by the sender (no leading or trailing spaces). Fields use `line()` or `paragraphs()` below, which add the control-character rule. */
export function text(label: string, max: number) {
  return yup
    .string()
    .strict()
    .typeError(`${label} must be text`)
    .trim(`${label} must not start or end with spaces`)
    .max(max, `${label} must be at most ${max} characters`);
}

// Text people type reaches mail headers (a block's name in a subject), log lines and PDFs. A line break in a
// name could start a new header or forge a log line, so single-line fields refuse every control character:
// C0 (U+0000–U+001F, which holds TAB, LF and CR), DEL (U+007F), C1 (U+0080–U+009F, which holds NEL U+0085)
// and the Unicode line and paragraph separators U+2028/U+2029. Notes may keep LF line breaks, nothing else.
const CONTROL_CHARACTERS = /[\u0000-\u001f\u007f-\u009f\u2028\u2029]/;
const CONTROL_CHARACTERS_EXCEPT_LF = /[\u0000-\u0009\u000b-\u001f\u007f-\u009f\u2028\u2029]/;

/** True when `value` holds no control character and no line or paragraph separator. */
export function isSingleLine(value: string): boolean {
  return !CONTROL_CHARACTERS.test(value);
}

/** Refuses line breaks, tabs and other control characters in a string schema (nulls and absent values pass). */
export function oneLine<S extends yup.StringSchema<string | null | undefined>>(schema: S, label: string): S {
  return schema.test('one-line', `${label} must be on one line, without line breaks, tabs or other control characters`, (v) => v == null || isSingleLine(v)) as S;
}

/** Single-line text (names, places, products): trimmed, not longer than `max`, no control characters. */
export function line(label: string, max: number) {
  return oneLine(text(label, max), label);
}

/** Multi-line text (notes): line breaks (LF) are kept; tabs, CR and other control characters are refused. */
export function paragraphs(label: string, max: number) {
  return text(label, max).test(
    'no-control',
    `${label} may hold line breaks, but no tabs or other control characters`,
    (v) => v == null || !CONTROL_CHARACTERS_EXCEPT_LF.test(v),
  );
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
