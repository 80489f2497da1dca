import type { RequestHandler } from 'express';
import { ValidationError, type AnyObjectSchema } from 'yup';
import { AppError, type FieldErrors } from '../errors/app-error';

export function fieldErrorsFromYup(err: ValidationError): FieldErrors {
  const fields: FieldErrors = {};
  const list = err.inner.length ? err.inner : [err];
  for (const e of list) {
    const path = e.path || (e.params?.unknown ? String(e.params.unknown) : '_');
    if (!(path in fields)) fields[path] = e.message;
  }
  return fields;
}

/** Validate a value against a shared schema and return the typed result, or throw a 400 naming every bad field. */
export async function check<S extends AnyObjectSchema>(schema: S, value: unknown): Promise<ReturnType<S['validateSync']>> {
  if (value === undefined || value === null || typeof value !== 'object' || Array.isArray(value)) {
    throw AppError.badRequest('The request body must be a JSON object');
  }
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
