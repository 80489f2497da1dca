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

/**
 * Keys that name a member every object has (`__proto__`, `constructor`, `toString`, `hasOwnProperty`…). JSON.parse
 * and the query parser keep them as ordinary own keys, but a schema that looks its fields up by key finds the
 * prototype's member instead (yup: "field.resolve is not a function", a 500), and `Object.assign` would set a
 * prototype. No Fieldfold field has such a name, so each one is refused as an unknown field, at its path.
 */
function isPrototypeMember(key: string): boolean {
  return Object.prototype.hasOwnProperty.call(Object.prototype, key);
}

/** Paths (as yup writes them: `a.b`, `a[0].b`) of every prototype-member key in a parsed body, without recursion. */
function prototypeKeyPaths(value: unknown): string[] {
  const found: string[] = [];
  const stack: Array<{ v: unknown; path: string }> = [{ v: value, path: '' }];
  while (stack.length > 0 && found.length < 20) {
    const { v, path } = stack.pop()!;
    if (Array.isArray(v)) v.forEach((item, i) => stack.push({ v: item, path: `${path}[${i}]` }));
    else if (v !== null && typeof v === 'object') {
      for (const key of Object.keys(v)) {
        const at = path ? `${path}.${key}` : key;
        if (isPrototypeMember(key)) found.push(at);
        else stack.push({ v: (v as Record<string, unknown>)[key], path: at });
      }
    }
  }
  return found;
}

/** 400 unless `value` is a plain JSON object free of prototype-member keys (the checks before any schema or merge). */
export function assertJsonObject(value: unknown): asserts value is Record<string, unknown> {
  if (value === undefined || value === null || typeof value !== 'object' || Array.isArray(value)) {
    throw AppError.badRequest('The request body must be a JSON object', { _: 'Send the fields as one JSON object' });
  }
  const paths = prototypeKeyPaths(value);
  if (paths.length > 0) {
    // A null-prototype object, so a field named "__proto__" is kept as a field (and reaches the JSON answer).
    const fields: FieldErrors = Object.create(null);
    for (const p of paths) fields[p] = `Unknown field: ${p.slice(p.lastIndexOf('.') + 1)}`;
    throw AppError.badRequest('Some fields need attention', fields);
  }
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
