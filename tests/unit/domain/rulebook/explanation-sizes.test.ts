// Sizes quoted in a requirement's explanation, and which of them a changed tube table no longer lists
// (the rulebook editor's warning). 1 in = 25.4 mm exactly (F-UNIT-1).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { quotedSizes, staleQuotedSizes, tableSizes, type SizeMm } from '../../../../backend/src/domain/rulebook/explanation-sizes';
import type { RulesetDocument, TubeTable } from '../../../../backend/src/contracts/ruleset';

const inch = (od: number, wall: number): SizeMm => ({ odMm: od * 25.4, wallMm: wall * 25.4 }); // F-UNIT-1
const mm = (od: number, wall: number): SizeMm => ({ odMm: od, wallMm: wall });

describe('quotedSizes', () => {
  it.each([
    ['Light cars may use 1.500 × 0.095 in.', 'in', [['1.500 × 0.095 in', inch(1.5, 0.095)]]],
    ['Hoops 45 × 2.5 mm or 50 × 2.0 mm.', 'mm', [['45 × 2.5 mm', mm(45, 2.5)], ['50 × 2.0 mm', mm(50, 2)]]],
    // One unit after two sizes belongs to both.
    ['Other parts 38 × 2.5 / 40 × 2.0 mm.', 'in', [['38 × 2.5 mm', mm(38, 2.5)], ['40 × 2.0 mm', mm(40, 2)]]],
    ['Tubing 1-5/8 in OD × 0.118 in mild steel.', 'in', [['1-5/8 in OD × 0.118 in', inch(1.625, 0.118)]]],
    // "or" between two sizes shares the unit written after the second.
    ['Use 1.5 x .095 or 1.75x0.120"', 'mm', [['1.5 x .095 in', inch(1.5, 0.095)], ['1.75x0.120"', inch(1.75, 0.12)]]],
    // A size without any unit is read in the document's units.
    ['At least 40 × 2 where the class allows.', 'mm', [['40 × 2', mm(40, 2)]]],
    ['An OD 0.250 in over the band minimum may use 0.095 in wall.', 'in', []],
  ] as const)('%s', (text, unit, expected) => {
    const found = quotedSizes(text, unit);
    expect(found.map((q) => q.text)).toEqual(expected.map(([t]) => t));
    found.forEach((q, i) => {
      expect(q.odMm).toBeCloseTo(expected[i]![1].odMm, 6);
      expect(q.wallMm).toBeCloseTo(expected[i]![1].wallMm, 6);
    });
  });
});

describe('staleQuotedSizes', () => {
  const explanation = 'Light cars may use 1.500 × 0.095 in; heavier ones 1.750 × 0.120 in.';

  it.each([
    ['the quoted size was changed in the table', [inch(1.5, 0.095), inch(1.75, 0.12)], [inch(1.5, 0.12), inch(1.75, 0.12)], ['1.500 × 0.095 in']],
    ['both quoted sizes were removed', [inch(1.5, 0.095), inch(1.75, 0.12)], [inch(2, 0.12)], ['1.500 × 0.095 in', '1.750 × 0.120 in']],
    ['nothing quoted was removed (a size was added)', [inch(1.5, 0.095), inch(1.75, 0.12)], [inch(1.5, 0.095), inch(1.75, 0.12), inch(2, 0.083)], []],
    // Sizes the table never listed are not the table's to answer for (another rule's sizes, say).
    ['the quoted sizes were never in the table', [inch(2, 0.12)], [], []],
    // The same size written in millimetres in a metric table: 38.1 × 2.413 mm is 1.500 × 0.095 in.
    ['a metric table listing the same size', [mm(38.1, 2.413)], [mm(38, 2.5)], ['1.500 × 0.095 in']],
  ] as const)('%s', (_, before, now, expected) => {
    expect(staleQuotedSizes(explanation, before, now, 'in').map((q) => q.text)).toEqual(expected);
  });

  it('keeps quiet about a printed imperial equivalent in a metric table', () => {
    // The demo hillclimb rulebook quotes 1.75 × 0.095 in beside 45 × 2.5 mm; they differ (F-UNIT-2).
    const text = 'Hoops 45 × 2.5 mm or 50 × 2.0 mm; the printed imperial size 1.75 × 0.095 in is accepted.';
    expect(staleQuotedSizes(text, [mm(45, 2.5), mm(50, 2)], [mm(50, 2)], 'mm').map((q) => q.text)).toEqual(['45 × 2.5 mm']);
  });
});

describe('the demo and fixture rulebooks', () => {
  const files = [
    'rulesets/tarnwick-vale-mc-cage-regulations-2027.json',
    'rulesets/tarnwick-vale-mc-hillclimb-2027-metric.json',
    'tests/fixtures/rulesets/msuk-ncr-2026.json',
    'tests/fixtures/rulesets/nhra-quoted.json',
    'tests/fixtures/rulesets/fia-art253-quoted.json',
  ];
  const tubeRules = files.flatMap((file) => {
    const doc = JSON.parse(readFileSync(file, 'utf8')) as RulesetDocument;
    const unit = doc.unitSystem === 'metric' ? 'mm' : 'in';
    return doc.requirements
      .filter((r) => r.requires.template === 'tube_table')
      .map((r) => ({ file, id: r.id, explanation: r.explanation, unit, sizes: tableSizes(r.requires as TubeTable, unit) }));
  });

  it.each(tubeRules.map((r) => [`${r.file} ${r.id}`, r] as const))('%s: untouched, nothing is stale', (_, r) => {
    expect(staleQuotedSizes(r.explanation, r.sizes, r.sizes, r.unit as 'in' | 'mm')).toEqual([]);
  });

  it('finds the listed sizes their explanations quote, so removing one would be noticed', () => {
    const sprint = tubeRules.find((r) => r.id === 'tv-sprint-tubes')!;
    expect(staleQuotedSizes(sprint.explanation, sprint.sizes, [], 'in').map((q) => q.text)).toEqual(['1.500 × 0.095 in']);
    const nhra = tubeRules.find((r) => r.id === 'nhra-cage-tubing')!;
    expect(staleQuotedSizes(nhra.explanation, nhra.sizes, [], 'in').map((q) => q.text)).toEqual(['1-5/8 in OD × 0.118 in', '1-5/8 in × 0.083 in']);
  });
});
