import type { RequestHandler } from 'express';
import { ValidationError, type AnyObjectSchema } from 'yup';
import { AppError, type FieldErrors } from '../errors/app-error';
import { listCapProblems } from './list-caps';

export function fieldErrorsFromYup(err: ValidationError): FieldErrors {
  const fields: FieldErrors = {};
  const list = err.inner.length ? err.inner : [err];
  for (const e of list) {
    const path = e.path || (e.params?.unknown ? String(e.params.unknown) : '_');
    if (!(path in fields)) fields[path] = e.message;
  }
  return fields;
}

// Keys that name a member every plain object inherits. No Fieldfold schema has a field by such a name, and yup
// cannot be trusted with them: an object schema's `fields` map is a plain object after any `.test()` or
// `.shape()` (yup clones it with Object.assign({}, …)), so `fields.constructor` is `Object` and the cast throws
// "field.resolve is not a function" (a 500), and its cast writes `intermediate.__proto__ = value`, swapping the
// copy's prototype; `Object.assign` in a patch merge would set a prototype too. So they are refused before yup or
// a merge sees the value, at every depth, as the unknown fields they are.
const BUILT_IN_KEYS = new Set([...Object.getOwnPropertyNames(Object.prototype), 'prototype']);

/** Every path in a parsed body or query whose key names an inherited object member ("flock.constructor"). */
export function builtInKeys(value: unknown): Array<{ path: string; key: string }> {
  const found: Array<{ path: string; key: string }> = [];
  // Iterative, not recursive: a 200 kB body can nest tens of thousands of levels.
  const stack: Array<{ v: unknown; path: string }> = [{ v: value, path: '' }];
  while (stack.length > 0 && found.length < 50) {
    const { v, path } = stack.pop()!;
    if (v === null || typeof v !== 'object') continue;
    if (Array.isArray(v)) {
      v.forEach((item, i) => stack.push({ v: item, path: `${path}[${i}]` }));
      continue;
    }
    for (const key of Object.keys(v)) {
      const at = path ? `${path}.${key}` : key;
      if (BUILT_IN_KEYS.has(key)) found.push({ path: at, key });
      else stack.push({ v: (v as Record<string, unknown>)[key], path: at });
    }
  }
  return found;
}

function builtInKeyError(value: unknown): AppError | null {
  const found = builtInKeys(value);
  if (found.length === 0) return null;
  // A null-prototype object, so a field named "__proto__" is kept as a field (and reaches the JSON answer).
  const fields: FieldErrors = Object.create(null);
  for (const b of found) fields[b.path] = `Unknown field: ${b.key}`;
  return AppError.badRequest('Some fields need attention', fields);
}

/**
 * Put right after the JSON parser: refuses built-in member names in any body or query before a service sees
 * them (a service that merges a patch with Object.assign would otherwise take `__proto__` as a prototype).
 */
export const refuseBuiltInKeys: RequestHandler = (req, _res, next) => {
  next(builtInKeyError(req.body) ?? builtInKeyError(req.query) ?? undefined);
};

/** 400 unless `value` is a plain JSON object free of built-in member keys (the checks before any schema or merge). */
export function assertJsonObject(value: unknown): asserts value is Record<string, unknown> {
  if (value === undefined || value === null || typeof value !== 'object' || Array.isArray(value)) {
    throw AppError.badRequest('The request body must be a JSON object', { _: 'Send the fields as one JSON object' });
  }
  // Also here, for callers that check a value that did not come through the API (the demo seed).
  const builtIn = builtInKeyError(value);
  if (builtIn) throw builtIn;
}

/** Validate a value against a shared schema and return the typed result, or throw a 400 naming every bad field. */
export async function check<S extends AnyObjectSchema>(schema: S, value: unknown): Promise<ReturnType<S['validateSync']>> {
  assertJsonObject(value);
  const tooLong = listCapProblems(schema, value);
  if (tooLong) throw AppError.badRequest('Some fields need attention', tooLong);
  try {
    return await schema.validate(value, { abortEarly: false, stripUnknown: false });
  } catch (err) {
    if (err instanceof ValidationError) throw AppError.badRequest('Some fields need attention', fieldErrorsFromYup(err));
    throw err;
  }
}

/** Express middleware form of `check` for JSON bodies. */
export function validateBody(schema: AnyObjectSchema): RequestHandler {
  return async (req, _res, next) => {
    try {
      req.body = await check(schema, req.body);
      next();
    } catch (err) {
      next(err);
    }
  };
}
