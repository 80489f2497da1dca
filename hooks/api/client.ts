// The one HTTP client. Errors arrive as ApiError carrying the server's `{ code, message, fields }`.
// Anything in the client bundle is public: no secrets here, only the API's base URL.

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields: Record<string, string> = {},
  ) {
    super(message);
    this.name = 'ApiError';
  }
}

// Same origin in production (Express serves the app and the API); the dev server sets EXPO_PUBLIC_API_URL.
const BASE_URL = (process.env.EXPO_PUBLIC_API_URL ?? '').replace(/\/$/, '');

let currentToken: string | null = null;
let onUnauthorized: (() => void) | null = null;

/** The session provider keeps the client's token in step with sign-in and sign-out. */
export function setAuthToken(token: string | null) {
  currentToken = token;
}
export function setUnauthorizedHandler(handler: (() => void) | null) {
  onUnauthorized = handler;
}

export function apiUrl(path: string) {
  return `${BASE_URL}/api${path}`;
}

export async function api<T>(
  path: string,
  init: { method?: string; body?: unknown; form?: FormData; token?: string | null } = {},
): Promise<T> {
  const token = init.token === undefined ? currentToken : init.token;
  const json = init.body !== undefined;
  let res: Response;
  try {
    res = await fetch(apiUrl(path), {
      method: init.method ?? (json || init.form ? 'POST' : 'GET'),
      headers: {
        Accept: 'application/json',
        // A multipart body sets its own Content-Type with the boundary.
        ...(json ? { 'Content-Type': 'application/json' } : {}),
        ...(token ? { Authorization: `Bearer ${token}` } : {}),
      },
      body: init.form ?? (json ? JSON.stringify(init.body) : undefined),
    });
  } catch {
    throw new ApiError(0, 'offline', 'Fieldfold could not be reached. Check the connection and try again.');
  }
  if (res.status === 204) return undefined as T;
  const data = await res.json().catch(() => null);
  if (!res.ok) {
    const e = data?.error;
    if (res.status === 401 && token) onUnauthorized?.();
    throw new ApiError(res.status, e?.code ?? 'http_error', e?.message ?? `The server answered ${res.status}`, e?.fields ?? {});
  }
  return data as T;
}

/** A file the API serves behind sign-in (a PDF): the same bearer token and error handling, the body as a Blob. */
export async function apiBlob(path: string): Promise<Blob> {
  const token = currentToken;
  let res: Response;
  try {
    res = await fetch(apiUrl(path), { headers: token ? { Authorization: `Bearer ${token}` } : {} });
  } catch {
    throw new ApiError(0, 'offline', 'Fieldfold could not be reached. Check the connection and try again.');
  }
  if (!res.ok) {
    const e = (await res.json().catch(() => null))?.error;
    if (res.status === 401 && token) onUnauthorized?.();
    throw new ApiError(res.status, e?.code ?? 'http_error', e?.message ?? `The server answered ${res.status}`, e?.fields ?? {});
  }
  return res.blob();
}

/** Query text from a filter object: undefined, null and '' are left out. */
export function queryString(params: Record<string, string | number | undefined | null>): string {
  const q = Object.entries(params)
    .filter(([, v]) => v !== undefined && v !== null && v !== '')
    .map(([k, v]) => `${encodeURIComponent(k)}=${encodeURIComponent(String(v))}`)
    .join('&');
  return q ? `?${q}` : '';
}
