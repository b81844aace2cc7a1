// The supervisor `npm start` runs:   node --import tsx backend/src/supervisor.ts -- <command…>
// It starts the server as a child process and starts it again whenever it exits without being asked
// to, saying so in the log. SIGTERM and SIGINT are passed to the child; once it has stopped, the
// supervisor exits with the child's code. Restarts back off (1 s, 2 s, 4 s … at most 30 s), and the
// delay resets after a run of a minute or more, so a crash loop does not spin the CPU while a single
// crash costs a second. A child that exits with 78 (EX_CONFIG: bad configuration) is not restarted:
// it would fail the same way every time.
// With SERVER_PROCESSES above 1 (or `auto`: one per core) the supervisor is a node:cluster primary
// instead: it starts that many server processes, which share the one port (the primary hands each
// new connection to the next process), and restarts each of them on its own the same way. The command
// must then be `node [flags] <script>`. Everything the processes share lives in PostgreSQL (sessions,
// jobs, the outbox) or in the photo store, so any of them can answer any request (README).
import { spawn, type ChildProcess } from 'node:child_process';
import cluster from 'node:cluster';
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
  /** Starts the child instead of spawning `command` (a cluster worker). */
  startChild?: () => ChildProcess;
  /** Says in the log which child this is ("process 2 of 4"). */
  label?: string;
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
  const label = options.label ? { process: options.label } : {};
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
    // once (the server treats a second signal as "exit now"). Cluster workers cannot have one; they
    // leave SIGINT to the primary (server.ts).
    const c = options.startChild ? options.startChild() : spawn(options.command, options.args, { stdio: 'inherit', env: options.env ?? process.env, detached: true });
    child = c;
    logger.info('supervisor: server started', { pid: c.pid, restarts, ...label });
    c.on('error', (err) => logger.error('supervisor: cannot start the server', { err: err.message }));
    c.on('exit', (code, signal) => {
      child = null;
      if (stopping) {
        logger.info('supervisor: server stopped', { code, signal, ...label });
        finish(code ?? (signal ? 1 : 0));
        return;
      }
      if (code === exitCodeConfig) {
        logger.error('supervisor: the server refused its configuration; not restarting', { code, ...label });
        finish(code);
        return;
      }
      if (Date.now() - startedAt >= stableAfterMs) delayMs = initialDelayMs;
      logger.error('supervisor: server exited unexpectedly, restarting', { code, signal, restartInMs: delayMs, restarts: restarts + 1, ...label });
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

export interface ClusterOptions extends Omit<SupervisorOptions, 'command' | 'args' | 'startChild' | 'label'> {
  /** Server processes to run; each is supervised on its own. */
  processes: number;
  /** The server's entry file and the node flags it needs (`--import tsx`). */
  script: string;
  execArgv: string[];
}

/**
 * Runs `processes` copies of `script` as node:cluster workers sharing their listening port. Each gets
 * CAGEWRIGHT_PROCESS_INDEX (0 … n−1, kept across its restarts) and CAGEWRIGHT_PROCESS_COUNT. `done`
 * resolves once every process has ended, with the first non-zero exit code (else 0).
 */
export function superviseCluster(options: ClusterOptions): Supervisor {
  const { processes, script, execArgv, ...rest } = options;
  cluster.setupPrimary({ exec: script, execArgv, args: [], silent: false });
  const members = Array.from({ length: processes }, (_v, index) =>
    supervise({
      ...rest,
      command: process.execPath,
      args: [],
      label: `${index + 1} of ${processes}`,
      startChild: () =>
        cluster.fork({ ...(rest.env ?? {}), CAGEWRIGHT_PROCESS_INDEX: String(index), CAGEWRIGHT_PROCESS_COUNT: String(processes) }).process,
    }),
  );
  const done = Promise.all(members.map((m) => m.done)).then((codes) => codes.find((c) => c !== 0) ?? 0);
  return {
    done,
    // Workers share the terminal's process group, so Ctrl-C reaches them too; they ignore SIGINT and
    // stop on the SIGTERM sent here (a second signal: they exit at once).
    stop: () => members.forEach((m) => m.stop('SIGTERM')),
    get restarts() {
      return members.reduce((n, m) => n + m.restarts, 0);
    },
    get pid() {
      return members[0]?.pid;
    },
  };
}

/** Splits `node [flags…] script` into what cluster.setupPrimary needs; null for any other command. */
export function nodeScriptOf(command: string, args: string[]): { script: string; execArgv: string[] } | null {
  const isNode = command === process.execPath || /(^|\/)node(\.exe)?$/.test(command);
  const script = args.at(-1);
  if (!isNode || !script || script.startsWith('-') || !/\.(ts|js|mjs)$/.test(script)) return null;
  return { script, execArgv: args.slice(0, -1) };
}

// Run as a program: everything after `--` is the command to supervise.
if (process.argv[1] && /supervisor\.ts$/.test(process.argv[1])) {
  const sep = process.argv.indexOf('--');
  const [command, ...args] = sep >= 0 ? process.argv.slice(sep + 1) : [];
  let level: Parameters<typeof createLogger>[0] = 'info';
  let processes = 1;
  let sessionSecret: string | undefined;
  try {
    loadDotEnv();
    const config = loadConfig();
    level = config.logLevel;
    processes = config.serverProcesses;
    sessionSecret = config.sessionSecret;
  } catch {
    // The server itself reports a bad configuration; the supervisor logs at info meanwhile.
  }
  const logger = createLogger(level);
  if (!command) {
    logger.error('supervisor: no command given (usage: supervisor.ts -- node --import tsx backend/src/server.ts)');
    process.exit(2);
  }
  let sup: Supervisor;
  if (processes > 1) {
    const node = nodeScriptOf(command, args);
    if (!node) {
      logger.error('supervisor: SERVER_PROCESSES above 1 needs the command `node [flags] <script>`', { command, args });
      process.exit(2);
    }
    logger.info('supervisor: starting server processes that share one port', { processes });
    // One secret for every process, or a session cookie signed by one would be refused by the next
    // (NODE_ENV=test makes a new one per process; development keeps one in .data/session-secret).
    sup = superviseCluster({ processes, ...node, logger, env: sessionSecret ? { SESSION_SECRET: sessionSecret } : {} });
  } else {
    sup = supervise({ command, args, logger });
  }
  for (const signal of ['SIGTERM', 'SIGINT'] as const) process.on(signal, () => sup.stop(signal));
  process.exit(await sup.done);
}
