import { randomUUID } from 'node:crypto';
import type { IncomingMessage, ServerResponse } from 'node:http';
import type { Logger } from 'pino';
import { pinoHttp } from 'pino-http';

// One line per API request through pino-http, on the server's logger (lib/log.ts): an id (also sent back as
// X-Request-Id, so a grower quoting it can be found), the method, the path, the names of the query parameters —
// never their values, which carry photo, PDF and reset tokens —, the status and the time taken. No headers (the
// bearer token), no bodies, no client address. 2xx/3xx at info, 4xx at warn, 5xx at error. The web app's files
// are logged only when they fail (a page load fetches dozens), and health checks not at all.

/** What the log keeps of a request's URL: the path, and the query's parameter names in order (names that look like names), without values. */
export function loggedUrl(url: string): { path: string; query?: string[] } {
  const at = url.indexOf('?');
  if (at < 0) return { path: url };
  // Only names that look like names: a mis-encoded link (?access%3D<token>) would make the token part of one.
  const names = [...new URLSearchParams(url.slice(at + 1)).keys()].filter((name) => /^[\w.-]{1,32}$/.test(name));
  return names.length ? { path: url.slice(0, at), query: [...new Set(names)] } : { path: url.slice(0, at) };
}

type Req = IncomingMessage & { id?: unknown; originalUrl?: string };

/** The URL as it came in: Express rewrites req.url inside mounted routers (/api/blocks is /blocks in there). */
const urlOf = (req: Req) => req.originalUrl ?? req.url ?? '';
const isApi = (req: Req) => /^\/api(\/|\?|$)/.test(urlOf(req));
const line = (req: Req, res: ServerResponse) => `${req.method} ${loggedUrl(urlOf(req)).path} ${res.statusCode}`;

export function accessLog(logger: Logger) {
  return pinoHttp({
    logger,
    genReqId: (_req: IncomingMessage, res: ServerResponse) => {
      const id = randomUUID();
      res.setHeader('X-Request-Id', id);
      return id;
    },
    autoLogging: { ignore: (req: Req) => loggedUrl(urlOf(req)).path === '/api/health' },
    customLogLevel: (req: Req, res: ServerResponse, err?: Error) => {
      if (err || res.statusCode >= 500) return 'error';
      if (res.statusCode >= 400) return 'warn';
      return isApi(req) ? 'info' : 'silent';
    },
    // The raw request is read here, not pino's serialised copy, so no header ever reaches a serialiser.
    wrapSerializers: false,
    serializers: {
      req: (req: Req) => ({ id: req.id, method: req.method, ...loggedUrl(urlOf(req)) }),
      res: (res: ServerResponse) => ({ status: res.statusCode }),
      err: (err: Error) => ({ type: err.name, message: err.message }),
    },
    customSuccessMessage: line,
    customErrorMessage: line,
  });
}
