// Helpers for tests that run real processes: a PostgreSQL cluster of the test's own (scripts/pg.sh with
// a cluster name of its own under .data/, never the shared test cluster, so stopping it harms no other
// test), free ports, and the real server (`node --import tsx backend/src/server.ts`) as a child process.
import { execFileSync, spawn, type ChildProcess } from 'node:child_process';
import { createServer } from 'node:net';
import { resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

export const projectRoot = fileURLToPath(new URL('../../..', import.meta.url));

/** A free TCP port on loopback: the first of `candidates` nobody listens on, else one the OS picks. */
export async function freePort(candidates: number[] = []): Promise<number> {
  const tryPort = (port: number) =>
    new Promise<number | null>((done) => {
      const s = createServer();
      s.once('error', () => done(null));
      s.listen(port, '127.0.0.1', () => {
        const got = (s.address() as { port: number }).port;
        s.close(() => done(got));
      });
    });
  for (const p of candidates) {
    const got = await tryPort(p);
    if (got !== null) return got;
  }
  const any = await tryPort(0);
  if (any === null) throw new Error('no free port');
  return any;
}

export interface OwnCluster {
  port: number;
  url: string;
  /** Stops PostgreSQL the way an administrator would (`pg_ctl stop -m fast`: sessions are terminated). */
  stop(): void;
  start(): void;
}

/**
 * Starts (idempotently) a cluster named `name` under .data/ on `port`, with a fresh database `dbName`.
 * `CAGEWRIGHT_OUTAGE_PG_PORT` chooses the port; otherwise the first free one of 55483–55489.
 */
export async function ownCluster(name: string, dbName: string): Promise<OwnCluster> {
  const fixed = Number(process.env.CAGEWRIGHT_OUTAGE_PG_PORT);
  const port = Number.isInteger(fixed) && fixed > 0 ? fixed : await freePort([55483, 55484, 55485, 55486, 55487, 55488, 55489]);
  const env = { ...process.env, CAGEWRIGHT_PG_CLUSTER: name, CAGEWRIGHT_TEST_PG_PORT: String(port), CAGEWRIGHT_TEST_DB_NAME: dbName };
  const pg = (...args: string[]) =>
    execFileSync('bash', [resolve(projectRoot, 'scripts/pg.sh'), ...args, '--test'], { cwd: projectRoot, env, encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] }).trim();
  pg('start');
  pg('reset');
  return { port, url: pg('url'), stop: () => void pg('stop'), start: () => void pg('start') };
}

export interface ServerProcess {
  child: ChildProcess;
  baseUrl: string;
  /** Everything the server wrote to stdout and stderr. */
  output(): string;
  /** Stops it with `signal` and waits for it to exit. */
  kill(signal?: NodeJS.Signals): Promise<void>;
}

/** Starts the real server on a free port and waits until /api/health answers (any status). */
export async function startServer(env: Record<string, string>, timeoutMs = 60_000): Promise<ServerProcess> {
  const port = await freePort();
  const smtpPort = await freePort();
  const child = spawn(process.execPath, ['--import', 'tsx', 'backend/src/server.ts'], {
    cwd: projectRoot,
    env: {
      ...process.env,
      NODE_ENV: 'test',
      HOST: '127.0.0.1',
      PORT: String(port),
      PUBLIC_URL: `http://127.0.0.1:${port}`,
      // The server's own fake SMTP on a free port: mail never reaches anyone else's.
      FAKE_SMTP: 'true',
      SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
      LOG_LEVEL: 'warn',
      ...env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  child.stdout!.on('data', (d: Buffer) => (out += d.toString()));
  child.stderr!.on('data', (d: Buffer) => (out += d.toString()));
  const baseUrl = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`server exited with ${child.exitCode} before answering:\n${out}`);
    try {
      await fetch(`${baseUrl}/api/health`);
      break;
    } catch {
      if (Date.now() > deadline) throw new Error(`server did not answer within ${timeoutMs} ms:\n${out}`);
      await new Promise((r) => setTimeout(r, 200));
    }
  }
  return {
    child,
    baseUrl,
    output: () => out,
    kill: async (signal = 'SIGTERM') => {
      if (child.exitCode !== null || child.signalCode !== null) return;
      const exited = new Promise<void>((r) => child.once('exit', () => r()));
      child.kill(signal);
      await exited;
    },
  };
}

/** A signed-in HTTP client over fetch with the session cookie and CSRF token (no supertest: a real socket). */
export interface HttpClient {
  request(method: string, path: string, body?: unknown): Promise<{ status: number; body: unknown }>;
}

export async function signedInClient(baseUrl: string, email: string, password: string): Promise<HttpClient> {
  // The session cookie (cw.sid) and, before signing in, the anonymous CSRF cookie (cw.csrf).
  const jar = new Map<string, string>();
  let token = '';
  const keepCookie = (res: Response) => {
    for (const set of res.headers.getSetCookie()) {
      const [pair] = set.split(';');
      const at = pair!.indexOf('=');
      jar.set(pair!.slice(0, at), pair!.slice(at + 1));
    }
  };
  const call = async (method: string, path: string, body?: unknown) => {
    const cookie = [...jar].filter(([, v]) => v !== '').map(([k, v]) => `${k}=${v}`).join('; ');
    const res = await fetch(`${baseUrl}${path}`, {
      method,
      headers: { ...(cookie ? { cookie } : {}), ...(token ? { 'x-csrf-token': token } : {}), ...(body !== undefined ? { 'content-type': 'application/json' } : {}) },
      ...(body !== undefined ? { body: JSON.stringify(body) } : {}),
    });
    keepCookie(res);
    const text = await res.text();
    let parsed: unknown = text;
    try {
      parsed = text ? JSON.parse(text) : null;
    } catch {
      // not JSON: kept as text
    }
    return { status: res.status, body: parsed };
  };
  token = ((await call('GET', '/api/auth/csrf')).body as { token: string }).token;
  const login = await call('POST', '/api/auth/login', { email, password });
  if (login.status !== 200) throw new Error(`sign-in failed: ${login.status} ${JSON.stringify(login.body)}`);
  token = ((await call('GET', '/api/auth/csrf')).body as { token: string }).token;
  return { request: call };
}
