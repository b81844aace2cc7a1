// Structured logging with pino: one JSON line per event (`time`, `level`, `msg`, fields), filtered by
// level. The app's request log (middleware/request-log.ts) is pino-http on the same pino, so every line
// about a request carries its `reqId`. Secrets never reach a line: cookies, the CSRF header and any
// authorization header are replaced by "[redacted]" wherever a request or response is logged, and
// nothing here ever logs passwords, tokens or session ids.
import pino, { type Logger as Pino } from 'pino';
import type { LogLevel } from './config';

export interface Logger {
  error(msg: string, fields?: Record<string, unknown>): void;
  warn(msg: string, fields?: Record<string, unknown>): void;
  info(msg: string, fields?: Record<string, unknown>): void;
  debug(msg: string, fields?: Record<string, unknown>): void;
  /** The pino logger underneath (for pino-http and request-scoped children). */
  readonly pino: Pino;
}

export const redactedPaths = [
  'req.headers.cookie',
  'req.headers["x-csrf-token"]',
  'req.headers.authorization',
  'res.headers["set-cookie"]',
];
export const redactedText = '[redacted]';

/** A Logger over a pino logger (so request-scoped children keep the same four calls). */
export function wrapPino(p: Pino): Logger {
  return {
    error: (m, f) => p.error(f ?? {}, m),
    warn: (m, f) => p.warn(f ?? {}, m),
    info: (m, f) => p.info(f ?? {}, m),
    debug: (m, f) => p.debug(f ?? {}, m),
    pino: p,
  };
}

/** The process's logger; `write` receives each line without its newline (default: standard output). */
export function createLogger(level: LogLevel, write?: (line: string) => void): Logger {
  const destination = write ? { write: (line: string) => write(line.replace(/\n$/, '')) } : pino.destination({ fd: 1, sync: true });
  const p = pino(
    {
      level,
      base: { pid: process.pid },
      timestamp: pino.stdTimeFunctions.isoTime,
      formatters: { level: (label) => ({ level: label }) },
      redact: { paths: redactedPaths, censor: redactedText },
    },
    destination,
  );
  return wrapPino(p);
}

/** Turns an unknown thrown value into loggable fields (message and stack stay in the log only). */
export function errorFields(err: unknown): Record<string, unknown> {
  if (err instanceof Error) {
    const code = (err as { code?: unknown }).code;
    return { err: err.message, ...(code !== undefined ? { code } : {}), stack: err.stack };
  }
  return { err: String(err) };
}
