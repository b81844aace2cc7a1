// The supervisor `npm start` runs (backend/src/supervisor.ts): a server that exits unexpectedly is
// started again and the log says so; a stop signal reaches the server and ends both; a server that
// refuses its configuration (exit 78) is not restarted. With SERVER_PROCESSES above 1 it runs that many
// processes behind one port (node:cluster), restarts each on its own, and stops them all.
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { createLogger } from '../../../backend/src/logger';
import { nodeScriptOf, superviseCluster, supervise } from '../../../backend/src/supervisor';

function captured() {
  const lines: { msg: string; [k: string]: unknown }[] = [];
  return { lines, logger: createLogger('info', (l) => lines.push(JSON.parse(l) as { msg: string })) };
}

// A stand-in server: counts its starts in a file, crashes on the first two, then runs until SIGTERM.
const script = `
const fs = require('node:fs');
const file = process.argv[1];
const n = (fs.existsSync(file) ? Number(fs.readFileSync(file, 'utf8')) : 0) + 1;
fs.writeFileSync(file, String(n));
if (n <= 2) process.exit(3);
process.on('SIGTERM', () => { fs.writeFileSync(file + '.stopped', 'yes'); process.exit(0); });
fs.writeFileSync(file + '.ready', 'yes');
setInterval(() => {}, 1000);
`;

describe('supervisor', () => {
  it('restarts a server that exits unexpectedly, says so, and passes a stop signal on', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'cw-supervisor-'));
    const counter = join(dir, 'starts');
    const { lines, logger } = captured();
    const sup = supervise({ command: process.execPath, args: ['-e', script, counter], logger, initialDelayMs: 50, maxDelayMs: 200 });
    // The third run is up once it has installed its SIGTERM handler (the machine may be slow).
    const deadline = Date.now() + 20_000;
    while (!existsSync(`${counter}.ready`)) {
      if (Date.now() > deadline) throw new Error('no third run');
      await new Promise((r) => setTimeout(r, 20));
    }
    expect(sup.restarts).toBe(2);
    expect(readFileSync(counter, 'utf8')).toBe('3');
    const unexpected = lines.filter((l) => l.msg === 'supervisor: server exited unexpectedly, restarting');
    expect(unexpected).toHaveLength(2);
    expect(unexpected[0]).toMatchObject({ level: 'error', code: 3, restartInMs: 50 });
    expect(unexpected[1]).toMatchObject({ code: 3, restartInMs: 100 });

    sup.stop('SIGTERM');
    expect(await sup.done).toBe(0);
    expect(readFileSync(`${counter}.stopped`, 'utf8')).toBe('yes');
    expect(lines.at(-1)).toMatchObject({ msg: 'supervisor: server stopped', code: 0 });
  });

  it('does not restart a server that refuses its configuration (exit 78)', async () => {
    const { lines, logger } = captured();
    const sup = supervise({ command: process.execPath, args: ['-e', 'process.exit(78)'], logger, initialDelayMs: 50 });
    expect(await sup.done).toBe(78);
    expect(sup.restarts).toBe(0);
    expect(lines.map((l) => l.msg)).toContain('supervisor: the server refused its configuration; not restarting');
  });
});

// A stand-in server for the cluster: answers which process it is, on the port all of them share.
const clusterScript = `
const http = require('node:http');
const server = http.createServer((req, res) => { res.setHeader('connection', 'close'); res.end(JSON.stringify({ pid: process.pid, index: process.env.CAGEWRIGHT_PROCESS_INDEX, count: process.env.CAGEWRIGHT_PROCESS_COUNT, secret: process.env.SESSION_SECRET })); });
server.listen(Number(process.env.CLUSTER_TEST_PORT), '127.0.0.1');
process.on('SIGINT', () => {});
process.on('SIGTERM', () => server.close(() => process.exit(0)));
`;

function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = createServer().listen(0, '127.0.0.1', () => {
      const { port } = s.address() as { port: number };
      s.close(() => resolve(port));
    });
  });
}

async function ask(port: number): Promise<{ pid: number; index: string; count: string; secret: string } | null> {
  try {
    return (await (await fetch(`http://127.0.0.1:${port}/`, { signal: AbortSignal.timeout(2000) })).json()) as { pid: number; index: string; count: string; secret: string };
  } catch {
    return null;
  }
}

describe('supervisor with more than one server process', () => {
  it('runs them behind one port, restarts the one that dies, and stops them all', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'cw-cluster-'));
    const script = join(dir, 'server.cjs');
    writeFileSync(script, clusterScript);
    const port = await freePort();
    const { lines, logger } = captured();
    const sup = superviseCluster({ processes: 2, script, execArgv: [], logger, initialDelayMs: 50, env: { CLUSTER_TEST_PORT: String(port), SESSION_SECRET: 's'.repeat(40) } });
    // Both answer on the one port (the primary hands connections to each in turn).
    const seen = new Map<string, number>();
    const deadline = Date.now() + 20_000;
    while (seen.size < 2) {
      if (Date.now() > deadline) throw new Error(`only ${seen.size} process(es) answered`);
      const got = await ask(port);
      if (got) {
        expect([got.count, got.secret]).toEqual(['2', 's'.repeat(40)]);
        seen.set(got.index, got.pid);
      }
    }
    expect([...seen.keys()].sort()).toEqual(['0', '1']);

    // The second one dies: it is started again, under the same index, and says so.
    process.kill(seen.get('1')!, 'SIGKILL');
    const restarted = Date.now() + 20_000;
    for (;;) {
      if (Date.now() > restarted) throw new Error('process 2 was not restarted');
      const got = await ask(port);
      if (got?.index === '1' && got.pid !== seen.get('1')) break;
      await new Promise((r) => setTimeout(r, 20));
    }
    expect(sup.restarts).toBe(1);
    expect(lines.find((l) => l.msg === 'supervisor: server exited unexpectedly, restarting')).toMatchObject({ signal: 'SIGKILL', process: '2 of 2' });

    sup.stop('SIGINT');
    expect(await sup.done).toBe(0);
    expect(lines.filter((l) => l.msg === 'supervisor: server stopped').map((l) => l.process).sort()).toEqual(['1 of 2', '2 of 2']);
    expect(await ask(port)).toBeNull();
  }, 60_000);

  it('takes `node [flags] script` apart for the cluster, and nothing else', () => {
    expect(nodeScriptOf('node', ['--import', 'tsx', 'backend/src/server.ts'])).toEqual({ script: 'backend/src/server.ts', execArgv: ['--import', 'tsx'] });
    expect(nodeScriptOf(process.execPath, ['server.js'])).toEqual({ script: 'server.js', execArgv: [] });
    expect(nodeScriptOf('bash', ['start.sh'])).toBeNull();
    expect(nodeScriptOf('node', ['-e', 'console.log(1)'])).toBeNull();
  });
});
