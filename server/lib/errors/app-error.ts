// The one error type the services throw. The error middleware turns it into
// `{ error: { code, message, fields? } }` (shared/API.md) with the status it carries.
export type FieldErrors = Record<string, string>;

export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: FieldErrors,
    readonly headers?: Record<string, string>,
  ) {
    super(message);
    this.name = 'AppError';
  }

  static badRequest(message: string, fields?: FieldErrors) {
    return new AppError(400, 'invalid_input', message, fields);
  }
  static unauthenticated(message = 'Sign in to continue') {
    return new AppError(401, 'unauthenticated', message);
  }
  static forbidden(message = 'Your account may not do this') {
    return new AppError(403, 'forbidden', message);
  }
  static notFound(what = 'Record') {
    return new AppError(404, 'not_found', `${what} not found`);
  }
  static conflict(message: string, code = 'conflict') {
    return new AppError(409, code, message);
  }
}
