// The supervisor `npm start` runs (backend/src/supervisor.ts): a server that exits unexpectedly is
// started again and the log says so; a stop signal reaches the server and ends both; a server that
// refuses its configuration (exit 78) is not restarted.
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { createLogger } from '../../../backend/src/logger';
import { supervise } from '../../../backend/src/supervisor';

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
