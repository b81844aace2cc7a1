// One vocabulary (issue 13, section 6): verdict and review words, role names and the limits of
// passwords and of the steward's written reasons each live in one file of backend/src/contracts, which
// the server and the front end both read. This test reads the sources and fails when a copy comes back:
// a role list, a limit given its own number, or a verdict phrase typed out again as a string.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, test } from 'vitest';
import { CHECK_VERDICT_WORDS, FINDING_VERDICT_WORDS, SUBMISSION_STATE_IN_SENTENCE, SUBMISSION_STATE_SHORT, SUBMISSION_STATE_WORDS } from '../../backend/src/contracts/verdict-words';
import { EDITION_STATUS_WORDS } from '../../backend/src/contracts/edition-words';
import { passwordWords } from '../../backend/src/contracts/password-rules';

const root = fileURLToPath(new URL('../..', import.meta.url));

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) return name === 'node_modules' || name === 'dist' ? [] : sources(path);
    return /\.(ts|vue)$/.test(name) ? [path] : [];
  });
}

// Migrations are history: they keep the words and numbers of their day and are never edited.
const files = [...sources(join(root, 'backend/src')), ...sources(join(root, 'frontend/src'))]
  .filter((f) => !f.includes('/db/migrations/'))
  .map((f) => ({ path: relative(root, f), text: readFileSync(f, 'utf8') }));

/** Files other than `home` whose text matches `pattern`, as "path: the match". */
function copiesOutside(home: string | readonly string[], pattern: RegExp): string[] {
  const homes = typeof home === 'string' ? [home] : home;
  return files
    .filter((f) => !homes.includes(f.path))
    .flatMap((f) => [...f.text.matchAll(new RegExp(pattern.source, pattern.flags.includes('g') ? pattern.flags : `${pattern.flags}g`))].map((m) => `${f.path}: ${m[0]}`));
}

test('the sources were found', () => {
  expect(files.length).toBeGreaterThan(100);
  expect(files.some((f) => f.path === 'backend/src/contracts/roles.ts')).toBe(true);
});

describe('role names live in contracts/roles.ts', () => {
  test('no other file lists the three roles', () => {
    expect(copiesOutside('backend/src/contracts/roles.ts', /['"]builder['"],\s*['"]steward['"],\s*['"]admin['"]/)).toEqual([]);
  });
  test('no other file names a role type by its members', () => {
    expect(copiesOutside('backend/src/contracts/roles.ts', /type \w+ = 'builder' \| 'steward' \| 'admin'/)).toEqual([]);
  });
  test('no other file maps role keys to their words', () => {
    expect(copiesOutside('backend/src/contracts/roles.ts', /\bbuilder:\s*'[Bb]uilder'/)).toEqual([]);
  });
});

describe('limits live in contracts (password-rules.ts, review-limits.ts)', () => {
  const homes = ['backend/src/contracts/password-rules.ts', 'backend/src/contracts/review-limits.ts'];
  test('no other file gives a limit its own number', () => {
    expect(copiesOutside(homes, /\b(passwordMinLength|passwordMaxLength|NOTE_MIN|NOTE_MAX|WAIVER_REASON_MIN|WAIVER_REASON_MAX|REVOKE_REASON_MIN|REVOKE_REASON_MAX)\s*=\s*\d/)).toEqual([]);
  });
  test('no other file writes the password length out in words', () => {
    expect(copiesOutside(homes, /at least 10 characters/i)).toEqual([]);
  });
  test('the password hint and mismatch words are not typed again', () => {
    expect(copiesOutside(homes, new RegExp(`'${passwordWords.differ.replace('.', '\\.')}'|two new passwords differ`))).toEqual([]);
  });
});

describe('verdict, review and edition words live in contracts/verdict-words.ts and edition-words.ts', () => {
  const homes = ['backend/src/contracts/verdict-words.ts', 'backend/src/contracts/edition-words.ts'];
  // Phrases of more than one word are specific enough to find; single words ("Approved") are also
  // ordinary labels of actions and are left to review.
  const phrases = [
    ...Object.values(CHECK_VERDICT_WORDS).flatMap((w) => [w.short, w.banner, w.summary]),
    ...Object.values(FINDING_VERDICT_WORDS),
    ...Object.values(SUBMISSION_STATE_WORDS),
    ...Object.values(SUBMISSION_STATE_SHORT),
    ...Object.values(SUBMISSION_STATE_IN_SENTENCE),
    ...Object.values(EDITION_STATUS_WORDS).map((w) => w.label),
  ].filter((p) => p.includes(' '));
  test.each([...new Set(phrases)])('"%s" is written in one place only', (phrase) => {
    const quoted = new RegExp(`['"\`>]${phrase.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}['"\`<]`);
    expect(copiesOutside(homes, quoted)).toEqual([]);
  });
});
