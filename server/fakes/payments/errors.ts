// The payments API's error objects: `{ error: { type, code?, decline_code?, message, param?, doc_url? } }` with the
// status the API uses for each kind (400 invalid request and idempotency misuse, 401 no or bad key, 402 card
// declined, 404 unknown object or URL, 409 an idempotency key still in flight). The official SDK turns these into
// StripeInvalidRequestError, StripeIdempotencyError, StripeCardError and so on by status and type.

export type ApiErrorType = 'api_error' | 'card_error' | 'idempotency_error' | 'invalid_request_error';

export interface ApiErrorBody {
  type: ApiErrorType;
  message: string;
  code?: string;
  decline_code?: string;
  param?: string;
  doc_url?: string;
  charge?: string;
  payment_method?: Record<string, unknown>;
  request_log_url?: string;
}

export class FakeApiError extends Error {
  constructor(
    readonly status: number,
    readonly body: ApiErrorBody,
    /**
     * Whether an Idempotency-Key keeps this result. The API saves results only once an endpoint began executing:
     * a request that failed parameter validation, or collided with one in flight, saves nothing and may be retried
     * with the same key.
     */
    readonly replayable = true,
  ) {
    super(body.message);
  }
}

const DOCS = 'https://stripe.com/docs/error-codes';

export const errors = {
  missingParam: (param: string) =>
    new FakeApiError(400, { type: 'invalid_request_error', code: 'parameter_missing', param, message: `Missing required param: ${param}.`, doc_url: `${DOCS}/parameter-missing` }, false),
  unknownParam: (param: string) =>
    new FakeApiError(
      400,
      { type: 'invalid_request_error', code: 'parameter_unknown', param, message: `Received unknown parameter: ${param}`, doc_url: `${DOCS}/parameter-unknown` },
      false,
    ),
  invalidInteger: (param: string, value: unknown) =>
    new FakeApiError(
      400,
      { type: 'invalid_request_error', code: 'parameter_invalid_integer', param, message: `Invalid integer: ${String(value)}`, doc_url: `${DOCS}/parameter-invalid-integer` },
      false,
    ),
  invalidParam: (param: string, message: string) => new FakeApiError(400, { type: 'invalid_request_error', param, message }, false),
  noSuch: (what: string, id: string, param = 'id') =>
    new FakeApiError(404, { type: 'invalid_request_error', code: 'resource_missing', param, message: `No such ${what}: '${id}'`, doc_url: `${DOCS}/resource-missing` }),
  state: (message: string, code?: string, param?: string) =>
    new FakeApiError(400, { type: 'invalid_request_error', message, ...(code ? { code } : {}), ...(param ? { param } : {}) }),
  unrecognizedUrl: (method: string, path: string) =>
    new FakeApiError(
      404,
      { type: 'invalid_request_error', message: `Unrecognized request URL (${method}: ${path}). This local fake implements only the endpoints Fieldfold calls.` },
      false,
    ),
  noKey: () =>
    new FakeApiError(
      401,
      {
        type: 'invalid_request_error',
        message: 'You did not provide an API key. Provide it in the Authorization header as a bearer token (Authorization: Bearer YOUR_SECRET_KEY).',
      },
      false,
    ),
  liveKey: () =>
    new FakeApiError(
      401,
      { type: 'invalid_request_error', code: 'api_key_expired', message: 'The local payments fake runs in test mode only: use a test key (sk_test_…), never a live key.' },
      false,
    ),
  idempotencyParams: (key: string) =>
    new FakeApiError(
      400,
      {
        type: 'idempotency_error',
        message: `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${key}' if you meant to execute a different request.`,
      },
      false,
    ),
  idempotencyEndpoint: (key: string, first: string, now: string) =>
    new FakeApiError(
      400,
      {
        type: 'idempotency_error',
        message: `Keys for idempotent requests can only be used for the same endpoint they were first used for ('${first}' vs '${now}'). Try using a key other than '${key}' if you meant to execute a different request.`,
      },
      false,
    ),
  idempotencyInFlight: (key: string) =>
    new FakeApiError(
      409,
      {
        type: 'idempotency_error',
        code: 'idempotency_key_in_use',
        message: `There is currently another in-progress request using this Idempotent Key (that probably means you submitted twice, and the other request is still going through): ${key}. Please try again later.`,
      },
      false,
    ),
  idempotencyKeyTooLong: () =>
    new FakeApiError(400, { type: 'invalid_request_error', param: 'Idempotency-Key', message: 'Idempotency-Key must be at most 255 characters long.' }, false),
};
