import * as yup from 'yup';

// Query-string numbers and the page fields every list shares. A list's work grows with its page, never with
// the table: each list has a page-size cap, checked here for the app and the server alike.

const QUERY_NUMBER = /^\s*\d+(\.\d+)?\s*$/;

/** A number given as query text; "12abc", "", "-3" and repeated parameters are refused, not coerced. */
export function queryNumber(label: string) {
  return yup
    .number()
    .transform((_v: unknown, original: unknown) => (typeof original === 'string' && QUERY_NUMBER.test(original) ? Number(original) : original === undefined ? undefined : NaN))
    .typeError(`${label} must be a number`);
}

/**
 * The highest page any list serves. Far past every list's end, and low enough that page × page size stays a
 * whole number the database takes as an offset (page 99999999999999999999 made an offset SQLite could not read: a 500).
 */
export const MAX_PAGE = 100_000;

/** `page` (1 to MAX_PAGE) and `pageSize` (1 to `maxPageSize`), both optional. */
export function pageFields(maxPageSize: number) {
  return {
    page: queryNumber('Page').integer('Page must be a whole number').min(1, 'Page must be 1 or more').max(MAX_PAGE, `Page must be at most ${MAX_PAGE}`).optional(),
    pageSize: queryNumber('Page size')
      .integer('Page size must be a whole number')
      .min(1, 'Page size must be at least 1')
      .max(maxPageSize, `Page size must be at most ${maxPageSize}`)
      .optional(),
  };
}

export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}
