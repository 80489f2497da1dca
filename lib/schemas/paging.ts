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

const QUERY_INT = /^\d{1,6}$/;

/** `limit` of a keyset-paged list (1 to `max`), given as query text. */
export function pageLimit(label: string, max: number) {
  return yup
    .number()
    .transform((_v: unknown, original: unknown) => (original === undefined ? undefined : typeof original === 'string' && QUERY_INT.test(original) ? Number(original) : NaN))
    .typeError(`${label} must be a whole number`)
    .integer(`${label} must be a whole number`)
    .min(1, `${label} must be at least 1`)
    .max(max, `${label} must be at most ${max}`)
    .optional();
}

/** The opaque `cursor` a keyset-paged list gave as its `nextCursor`. */
export const pageCursor = yup.string().strict().typeError('Give cursor once').matches(/^[A-Za-z0-9_-]{1,200}$/, 'Cursor is not one this API gave').optional();

export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}
