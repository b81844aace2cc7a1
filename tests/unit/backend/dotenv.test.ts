// The project's .env: read by the shell scripts (scripts/dotenv-exports.mjs, through lib.sh) and by the
// server when started directly (loadDotEnv). The environment always wins over the file, values with
// spaces, quotes and angle brackets survive the trip through the shell, and CAGEWRIGHT_DOTENV=off skips it.
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadDotEnv } from '@backend/dotenv';

const root = resolve(__dirname, '../../..');
const file = join(mkdtempSync(join(tmpdir(), 'cw-dotenv-')), '.env');
writeFileSync(
  file,
  [
    '# comment',
    'PORT=3456',
    'MAIL_FROM=Cagewright <no-reply@club.example>',
    `LOG_LEVEL="debug"`,
    "ODD=it's $HOME `x`",
    'HOST=10.0.0.1',
  ].join('\n'),
);

/** What a shell sees after lib.sh's load_dotenv, as `KEY=value` lines. */
function throughShell(env: NodeJS.ProcessEnv): Record<string, string> {
  const out = execFileSync(
    'bash',
    ['-c', `eval "$(node ${root}/scripts/dotenv-exports.mjs "$1")"; for k in PORT MAIL_FROM LOG_LEVEL ODD HOST; do printf '%s=%s\\n' "$k" "\${!k-<unset>}"; done`, '_', file],
    { env: { PATH: process.env.PATH, ...env }, encoding: 'utf8' },
  );
  return Object.fromEntries(out.trim().split('\n').map((l) => [l.slice(0, l.indexOf('=')), l.slice(l.indexOf('=') + 1)]));
}

describe('.env for the shell scripts', () => {
  it('exports every value as written, the environment winning', () => {
    expect(throughShell({ HOST: '127.0.0.1' })).toEqual({
      PORT: '3456',
      MAIL_FROM: 'Cagewright <no-reply@club.example>',
      LOG_LEVEL: 'debug',
      ODD: "it's $HOME `x`",
      HOST: '127.0.0.1',
    });
  });

  it('reads nothing with CAGEWRIGHT_DOTENV=off', () => {
    expect(throughShell({ CAGEWRIGHT_DOTENV: 'off' }).PORT).toBe('<unset>');
  });
});

describe('loadDotEnv for a server started directly', () => {
  it('fills only what the environment leaves unset', () => {
    const saved = { ...process.env };
    try {
      process.env.HOST = '127.0.0.1';
      delete process.env.PORT;
      expect(loadDotEnv(file)).toBe(true);
      expect([process.env.PORT, process.env.HOST, process.env.MAIL_FROM]).toEqual([
        '3456',
        '127.0.0.1',
        'Cagewright <no-reply@club.example>',
      ]);
    } finally {
      process.env = saved;
    }
  });

  it('skips a missing file and CAGEWRIGHT_DOTENV=off', () => {
    expect(loadDotEnv(join(tmpdir(), 'no-such-dir', '.env'))).toBe(false);
    expect(loadDotEnv(file, { CAGEWRIGHT_DOTENV: 'off' })).toBe(false);
  });
});
