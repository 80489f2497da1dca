import * as yup from 'yup';

/**
 * A list whose length bounds the work done on it: longer than `max`, it is refused by its length alone, before
 * any item is looked at. (yup's own `.max()` validates every item of a list of a hundred thousand first, and
 * an over-long request then costs what it would if it were allowed.)
 */
export function boundedList<S extends yup.AnySchema>(schema: S & { max(limit: number, message: string): S }, max: number, message: string): S {
  const tooLong = yup.array().max(max, message);
  return yup.lazy((value: unknown) => (Array.isArray(value) && value.length > max ? tooLong : schema.max(max, message))) as unknown as S;
}
