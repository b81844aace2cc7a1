// The one verdict → mark map: each verdict differs from the others in pattern or symbol as well as
// colour (colour is never the only cue), and a member takes the mark of its worst finding.
import { describe, expect, it } from 'vitest';
import { dashArrayMm, findingMark, LEGEND_MARKS, memberMarks, VERDICT_MARKS } from '@backend/domain/geometry/verdict-marks';
import type { Finding } from '@backend/contracts/report';

type F = Parameters<typeof memberMarks>[0][number];
const f = (requirementId: string, memberId: string | null, verdict: Finding['verdict'], severity: Finding['severity'] = 'mandatory'): F => ({
  requirementId, verdict, severity, title: `Rule ${requirementId}`, reason: `why ${requirementId}`,
  citation: { publisher: 'Demo', rulebookTitle: 'Demo', edition: '1', section: requirementId },
  member: memberId ? { id: memberId, kind: 'rear_brace', index: 0 } : null, plate: null,
});

/** WCAG relative luminance contrast of a colour against white. */
function contrastOnWhite(hex: string): number {
  const c = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255).map((v) => (v <= 0.03928 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4));
  const l = 0.2126 * c[0]! + 0.7152 * c[1]! + 0.0722 * c[2]!;
  return 1.05 / (l + 0.05);
}

describe('VERDICT_MARKS', () => {
  it('gives every verdict a pattern-and-symbol pair of its own', () => {
    const pairs = LEGEND_MARKS.map((m) => `${m.dashPerOd.join(',')}|${m.symbol}`);
    expect(new Set(pairs).size).toBe(LEGEND_MARKS.length);
  });

  it.each(LEGEND_MARKS.map((m) => [m.verdict, m.colour] as const))('%s colour %s reads on white (at least 4.5:1)', (_v, colour) => {
    expect(contrastOnWhite(colour)).toBeGreaterThanOrEqual(4.5);
  });

  it('scales the dash pattern with the tube OD', () => {
    expect(dashArrayMm(VERDICT_MARKS.fail, 40)).toEqual([64, 32]);
    expect(dashArrayMm(VERDICT_MARKS.pass, 40)).toEqual([]);
  });
});

describe('memberMarks', () => {
  it('marks a member by its worst finding, worst first, with the failing rule', () => {
    const marks = memberMarks([f('4.1', 'rb-l', 'pass'), f('4.2', 'rb-l', 'fail'), f('4.3', 'rb-l', 'needs_information'), f('4.1', 'mh', 'pass')]);
    expect(marks.get('rb-l')!.verdict).toBe('fail');
    expect(marks.get('rb-l')!.findings.map((x) => x.requirementId)).toEqual(['4.2', '4.3', '4.1']);
    expect(marks.get('rb-l')!.worstRule).toBe('§ 4.2 Rule 4.2: why 4.2');
    expect(marks.get('mh')).toMatchObject({ verdict: 'pass', worstRule: null });
  });

  it('shows a waived fail as waived (never as a pass) and lets an open measurement outrank it', () => {
    const waived = new Set(['4.2@member:rb-l']);
    expect(memberMarks([f('4.2', 'rb-l', 'fail')], waived).get('rb-l')!.verdict).toBe('waived');
    expect(memberMarks([f('4.2', 'rb-l', 'fail'), f('4.3', 'rb-l', 'needs_information')], waived).get('rb-l')!.verdict).toBe('needs_information');
  });

  it('does not let an advisory finding mark a tube as failing, and ignores rules that do not apply', () => {
    expect(findingMark(f('9.9', 'mh', 'fail', 'advisory'))).toBe('pass');
    expect(memberMarks([f('4.4', 'mh', 'not_applicable')]).has('mh')).toBe(false);
    expect(memberMarks([f('1.1', null, 'fail')]).size).toBe(0);
  });
});
