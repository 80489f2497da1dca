import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ValidationError } from 'yup';
import { AppError } from './app-error';
import { fieldErrorsFromYup } from '../http/validate';
import { GrazingInputError } from '../../../lib/grazing/errors';

export const notFoundHandler: RequestHandler = (req, _res, next) => {
  next(new AppError(404, 'not_found', `No route for ${req.method} ${req.path}`));
};

// Never leaks stacks or request bodies: unknown errors become a plain 500 and are logged by message only.
export function errorHandler(log: (msg: string) => void = console.error): ErrorRequestHandler {
  return (err, _req, res, _next) => {
    let e: AppError;
    if (err instanceof AppError) e = err;
    else if (err instanceof GrazingInputError) e = AppError.badRequest(err.message, { [err.field]: err.message });
    else if (err instanceof ValidationError) e = AppError.badRequest('Some fields need attention', fieldErrorsFromYup(err));
    else if (err?.type === 'entity.parse.failed') e = new AppError(400, 'invalid_json', 'The request body is not valid JSON');
    else if (err?.type === 'entity.too.large') e = new AppError(413, 'too_large', 'The request body is too large');
    else if (typeof err?.status === 'number' && err.status >= 400 && err.status < 500) e = new AppError(err.status, 'bad_request', String(err.message ?? 'Bad request'));
    else {
      log(`[error] ${err?.name ?? 'Error'}: ${err?.message ?? String(err)}\n${err?.stack ?? ''}`);
      e = new AppError(500, 'internal', 'Something went wrong on our side. Nothing was saved twice; please try again.');
    }
    if (e.headers) res.set(e.headers);
    res.status(e.status).json({ error: { code: e.code, message: e.message, ...(e.fields ? { fields: e.fields } : {}) } });
  };
}
