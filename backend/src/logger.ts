// A small structured logger: one JSON line per event, filtered by level. Enough for a single
// process behind a supervisor; nothing here ever logs passwords, tokens or session ids.
import type { LogLevel } from './config';

export interface Logger {
  error(msg: string, fields?: Record<string, unknown>): void;
  warn(msg: string, fields?: Record<string, unknown>): void;
  info(msg: string, fields?: Record<string, unknown>): void;
  debug(msg: string, fields?: Record<string, unknown>): void;
}

const rank: Record<LogLevel, number> = { silent: 0, error: 1, warn: 2, info: 3, debug: 4 };

export function createLogger(level: LogLevel, write: (line: string) => void = (l) => process.stdout.write(l + '\n')): Logger {
  const emit = (lvl: Exclude<LogLevel, 'silent'>, msg: string, fields?: Record<string, unknown>) => {
    if (rank[lvl] > rank[level]) return;
    write(JSON.stringify({ time: new Date().toISOString(), level: lvl, msg, ...fields }));
  };
  return {
    error: (m, f) => emit('error', m, f),
    warn: (m, f) => emit('warn', m, f),
    info: (m, f) => emit('info', m, f),
    debug: (m, f) => emit('debug', m, f),
  };
}

/** Turns an unknown thrown value into loggable fields (message and stack stay in the log only). */
export function errorFields(err: unknown): Record<string, unknown> {
  if (err instanceof Error) {
    const code = (err as { code?: unknown }).code;
    return { err: err.message, ...(code !== undefined ? { code } : {}), stack: err.stack };
  }
  return { err: String(err) };
}
