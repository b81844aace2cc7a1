// The supervisor `npm start` runs:   node --import tsx backend/src/supervisor.ts -- <command…>
// It starts the server as a child process and starts it again whenever it exits without being asked
// to, saying so in the log. SIGTERM and SIGINT are passed to the child; once it has stopped, the
// supervisor exits with the child's code. Restarts back off (1 s, 2 s, 4 s … at most 30 s), and the
// delay resets after a run of a minute or more, so a crash loop does not spin the CPU while a single
// crash costs a second. A child that exits with 78 (EX_CONFIG: bad configuration) is not restarted:
// it would fail the same way every time.
import { spawn, type ChildProcess } from 'node:child_process';
import { loadConfig } from './config';
import { loadDotEnv } from './dotenv';
import { createLogger, type Logger } from './logger';

export const exitCodeConfig = 78;

export interface SupervisorOptions {
  command: string;
  args: string[];
  logger: Logger;
  /** First restart delay; doubles up to maxDelayMs. */
  initialDelayMs?: number;
  maxDelayMs?: number;
  /** A run at least this long resets the delay. */
  stableAfterMs?: number;
  env?: NodeJS.ProcessEnv;
}

export interface Supervisor {
  /** Resolves with the exit code the supervisor should end with, once stop() has been called or the child may not restart. */
  done: Promise<number>;
  stop(signal: NodeJS.Signals): void;
  readonly restarts: number;
  readonly pid: number | undefined;
}

export function supervise(options: SupervisorOptions): Supervisor {
  const { logger } = options;
  const initialDelayMs = options.initialDelayMs ?? 1000;
  const maxDelayMs = options.maxDelayMs ?? 30_000;
  const stableAfterMs = options.stableAfterMs ?? 60_000;
  let child: ChildProcess | null = null;
  let stopping = false;
  let restarts = 0;
  let delayMs = initialDelayMs;
  let timer: NodeJS.Timeout | null = null;
  let finish!: (code: number) => void;
  const done = new Promise<number>((resolve) => (finish = resolve));

  function start(): void {
    const startedAt = Date.now();
    // A process group of its own: Ctrl-C in a terminal reaches only the supervisor, which passes it on
    // once (the server treats a second signal as "exit now").
    const c = spawn(options.command, options.args, { stdio: 'inherit', env: options.env ?? process.env, detached: true });
    child = c;
    logger.info('supervisor: server started', { pid: c.pid, restarts });
    c.on('error', (err) => logger.error('supervisor: cannot start the server', { err: err.message }));
    c.on('exit', (code, signal) => {
      child = null;
      if (stopping) {
        logger.info('supervisor: server stopped', { code, signal });
        finish(code ?? (signal ? 1 : 0));
        return;
      }
      if (code === exitCodeConfig) {
        logger.error('supervisor: the server refused its configuration; not restarting', { code });
        finish(code);
        return;
      }
      if (Date.now() - startedAt >= stableAfterMs) delayMs = initialDelayMs;
      logger.error('supervisor: server exited unexpectedly, restarting', { code, signal, restartInMs: delayMs, restarts: restarts + 1 });
      timer = setTimeout(() => {
        timer = null;
        restarts++;
        start();
      }, delayMs);
      delayMs = Math.min(delayMs * 2, maxDelayMs);
    });
  }

  start();
  return {
    done,
    stop(signal) {
      if (stopping) {
        // A second signal: the child gets it too (server.ts then exits at once).
        child?.kill(signal);
        return;
      }
      stopping = true;
      if (timer) {
        clearTimeout(timer);
        timer = null;
      }
      if (child) child.kill(signal);
      else finish(0);
    },
    get restarts() {
      return restarts;
    },
    get pid() {
      return child?.pid;
    },
  };
}

// Run as a program: everything after `--` is the command to supervise.
if (process.argv[1] && /supervisor\.ts$/.test(process.argv[1])) {
  const sep = process.argv.indexOf('--');
  const [command, ...args] = sep >= 0 ? process.argv.slice(sep + 1) : [];
  let level: Parameters<typeof createLogger>[0] = 'info';
  try {
    loadDotEnv();
    level = loadConfig().logLevel;
  } catch {
    // The server itself reports a bad configuration; the supervisor logs at info meanwhile.
  }
  const logger = createLogger(level);
  if (!command) {
    logger.error('supervisor: no command given (usage: supervisor.ts -- node --import tsx backend/src/server.ts)');
    process.exit(2);
  }
  const sup = supervise({ command, args, logger });
  for (const signal of ['SIGTERM', 'SIGINT'] as const) process.on(signal, () => sup.stop(signal));
  process.exit(await sup.done);
}
