import pino, { type DestinationStream, type Logger } from 'pino';

// The server's own log: one JSON line per event on stdout (pino), for the operator's log collector. Levels from
// LOG_LEVEL (server/config/env.ts); the access log (lib/http/access-log.ts) writes through the same logger.
// What goes in: start-up lines, a 500's name, message and stack, mail failures by subject, one line per API
// request (method, path, the names of its query parameters, status, time). Never bodies, headers, tokens or
// query values: photo, PDF and reset links carry their secret in the query string.

export const LOG_LEVELS = ['fatal', 'error', 'warn', 'info', 'debug', 'silent'] as const;
export type LogLevel = (typeof LOG_LEVELS)[number];

/** The process's logger; `destination` is for tests (defaults to stdout). */
export function serverLogger(level: LogLevel, destination?: DestinationStream): Logger {
  const options = { level, base: { service: 'fieldfold', pid: process.pid }, timestamp: pino.stdTimeFunctions.isoTime };
  return destination ? pino(options, destination) : pino(options);
}

/** The one-argument log the services and the error handler take (`ServiceContext.log`), at error level. */
export function errorLine(logger: Logger): (msg: string) => void {
  return (msg) => logger.error(msg);
}
