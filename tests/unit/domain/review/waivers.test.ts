// Verdict with waivers: waived mandatory findings stop blocking but show as waived, never as pass.
import { describe, expect, test } from 'vitest';
import { findingKey, overallWithWaivers } from '@backend/domain/review/waivers';
import type { ReviewFinding, Waiver } from '@backend/domain/review/waivers';

const f = (
  requirementId: string,
  verdict: ReviewFinding['verdict'],
  severity: ReviewFinding['severity'] = 'mandatory',
  memberId?: string,
): ReviewFinding => ({
  requirementId,
  verdict,
  severity,
  member: memberId ? { id: memberId } : null,
  plate: null,
});
const w = (key: string): Waiver => ({
  findingKey: key,
  reason: 'Checked in person at the bench.',
  stewardId: 'u-steward',
});

describe('findingKey', () => {
  test.each<[ReviewFinding, string]>([
    [f('tv-bends', 'fail', 'mandatory', 'm1'), 'tv-bends@member:m1'],
    [
      {
        requirementId: 'tv-plates-welded',
        verdict: 'fail',
        severity: 'mandatory',
        member: null,
        plate: { id: 'p2' },
      },
      'tv-plates-welded@plate:p2',
    ],
    [f('tv-cage-members', 'pass'), 'tv-cage-members@vehicle'],
  ])('%j → %s', (finding, key) => {
    expect(findingKey(finding)).toBe(key);
  });
});

describe('overallWithWaivers', () => {
  test.each<[string, ReviewFinding[], Waiver[], string, string[]]>([
    ['all pass', [f('a', 'pass'), f('b', 'not_applicable')], [], 'pass', []],
    ['advisory fail does not block', [f('a', 'pass'), f('b', 'fail', 'advisory')], [], 'pass', []],
    ['mandatory fail blocks', [f('a', 'fail'), f('b', 'pass')], [], 'fail', ['a@vehicle']],
    ['missing information blocks', [f('a', 'needs_information')], [], 'needs_information', ['a@vehicle']],
    [
      'fail outranks missing information',
      [f('a', 'needs_information'), f('b', 'fail')],
      [],
      'fail',
      ['b@vehicle', 'a@vehicle'],
    ],
    [
      'a waived fail passes with waivers',
      [f('a', 'fail'), f('b', 'pass')],
      [w('a@vehicle')],
      'pass_with_waivers',
      [],
    ],
    [
      'one of two fails waived',
      [f('a', 'fail'), f('b', 'fail', 'mandatory', 'm1')],
      [w('a@vehicle')],
      'fail',
      ['b@member:m1'],
    ],
    [
      'a waiver for another member does not count',
      [f('b', 'fail', 'mandatory', 'm1')],
      [w('b@member:m2')],
      'fail',
      ['b@member:m1'],
    ],
    ['a waiver on a now passing finding is unused', [f('a', 'pass')], [w('a@vehicle')], 'pass', []],
    [
      'a waived advisory fail alone is a plain pass',
      [f('a', 'fail', 'advisory')],
      [w('a@vehicle')],
      'pass',
      [],
    ],
  ])('%s', (_n, findings, waivers, verdict, blocking) => {
    const r = overallWithWaivers(findings, waivers);
    expect(r.verdict).toBe(verdict);
    expect(r.blocking).toEqual(blocking);
  });

  test('waived findings are shown as waived, with their waiver; stale waivers reported', () => {
    const stale = w('gone@vehicle');
    const r = overallWithWaivers([f('a', 'fail'), f('b', 'pass')], [w('a@vehicle'), stale]);
    expect(r.findings).toEqual([
      { key: 'a@vehicle', verdict: 'fail', shown: 'waived', severity: 'mandatory', waiver: w('a@vehicle') },
      { key: 'b@vehicle', verdict: 'pass', shown: 'pass', severity: 'mandatory' },
    ]);
    expect(r.waivedCount).toBe(1);
    expect(r.unusedWaivers).toEqual([stale]);
  });
});
