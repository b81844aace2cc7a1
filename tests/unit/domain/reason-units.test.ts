// "No reason text mixes units" (issue 9, Done when): every finding of representative runs, read in
// both unit systems, is written wholly in the reader's units — an imperial rulebook read by a metric
// steward and a metric rulebook read by an imperial builder — and without grammar slips such as
// "1 classes" or "0.095 in in mild steel". The PDF report is read back with pdftotext the same way.
// The runs are every class of every fixture and demo rulebook on a failing, a passing-ish and a sparse
// sheet, so each template and value form (tube tables, limits, k × another fact, grades, measured
// walls, member against member, per-side counts, dates) writes its sentences here.
import { execFileSync } from 'node:child_process';
import { describe, expect, test } from 'vitest';
import type { CheckReport, Finding } from '@backend/contracts/report';
import { evaluateSpecification } from '@backend/domain/index';
import type { CompiledRuleset } from '@backend/domain/index';
import { findingReason } from '@backend/domain/rules/reason-text';
import type { UnitSystem } from '@backend/domain/units';
import { parseSpecification } from '@backend/contracts/specification';
import { renderPdf } from '@backend/pdf/pdf-engine';
import { buildReportDocument } from '@backend/pdf/report-document';
import { tubeDataFor } from '@backend/services/garage/tube-data';
import { compileFile, loadJson } from './helpers';

const RULEBOOKS = [
  'tests/fixtures/rulesets/scca-gcr-quoted.json',
  'tests/fixtures/rulesets/nhra-quoted.json',
  'tests/fixtures/rulesets/msuk-ncr-2026.json',
  'tests/fixtures/rulesets/fia-art253-quoted.json',
  'rulesets/tarnwick-vale-mc-cage-regulations-2027.json',
  'rulesets/tarnwick-vale-mc-hillclimb-2027-metric.json',
] as const;

type Variant = 'failing' | 'passing' | 'sparse';

/** One sheet touching every area: members of every kind, plates, holes, geometry, dates. */
function sheet(classId: string, variant: Variant): unknown {
  const bad = variant === 'failing';
  if (variant === 'sparse') {
    return {
      vehicle: { classId },
      members: [
        { id: 'mh', kind: 'main_hoop', odMm: 44.45, wallMm: 2.41 },
        { id: 'rb-l', kind: 'rear_brace', odMm: 38.1, wallMm: 2.41 },
        { id: 'db-l', kind: 'door_bar', odMm: 38.1, wallMm: 2.41 },
      ],
      plates: [{ id: 'p1', location: 'main_hoop_foot', memberId: 'mh' }],
    };
  }
  const size = (od: number, wall: number) => (bad ? { odMm: od * 0.86, wallMm: wall * 0.66 } : { odMm: od, wallMm: wall });
  const steel = { material: 'mild_steel', process: bad ? 'erw' : 'cds', yieldMpa: bad ? 262 : 414, grade: bad ? 'AS 1163 C250' : 'AS 1163 C350' };
  const hoop = { ...size(50, 3), ...steel, bends: [{ clrMm: bad ? 90 : 160, minOdMm: bad ? 42 : 48.5, maxOdMm: 50 }], wallReadings: [{ wallMm: bad ? 1.7 : 2.95, method: 'ultrasonic' }] };
  const bar = { ...size(45, 2.8), ...steel, wallReadings: [{ wallMm: bad ? 1.6 : 2.75, method: 'ultrasonic' }] };
  return {
    vehicle: { classId, weightWithDriverKg: 1250, weightWithoutDriverKg: 1170, chassis: 'unibody', cockpit: 'closed', driverSide: 'right' },
    cage: { approvedOn: bad ? '2026-02-01' : '1994-06-01', builtOn: '1994-03-01' },
    members: [
      { id: 'mh', kind: 'main_hoop', ...hoop, continuousPiece: !bad, lengthMm: 3300, joints: bad ? [{ kind: 'removable', jointType: 'double lug' }] : [] },
      { id: 'fh', kind: 'front_hoop', ...hoop, lengthMm: 3800 },
      { id: 'rb-l', kind: 'rear_brace', ...(bad ? { ...size(45, 2.8), ...steel } : { ...hoop, bends: [] }), side: 'left', bends: bad ? [{ clrMm: 200 }] : [], lengthMm: 1100 },
      ...(bad ? [] : [{ id: 'rb-r', kind: 'rear_brace', ...hoop, bends: [], side: 'right', lengthMm: 1100 }]),
      { id: 'hb', kind: 'harness_bar', ...bar, bends: [{ clrMm: bad ? 70 : 140 }] },
      { id: 'db-l', kind: 'door_bar', ...bar, side: 'left' },
      ...(bad ? [] : [{ id: 'db-r', kind: 'door_bar', ...bar, side: 'right' }]),
      { id: 'dg', kind: 'diagonal', ...bar, bends: bad ? [{ clrMm: 300 }] : [] },
      { id: 'rf', kind: 'roof_bar', ...bar, bends: [{ clrMm: bad ? 60 : 140 }] },
      { id: 'dash', kind: 'dash_bar', ...bar },
    ],
    geometry: bad
      ? { rearBraceAttachBelowTopMm: 190, rearBraceAngleFromVerticalDeg: 22, rearBraceIncludedAngleDeg: 24, hoopAboveHelmetMm: 20, helmetBelowHoopLineMm: -8, hoopBehindHelmetMm: 230, harnessBarBelowShouldersMm: -12, diagonalLowerEndFromNodeMm: 160, diagonalUpperEndFromNodeMm: 140, nearestTubeToHelmetMm: 90, mainHoopInsideWidthMm: 340 }
      : { rearBraceAttachBelowTopMm: 90, rearBraceAngleFromVerticalDeg: 38, rearBraceIncludedAngleDeg: 36, hoopAboveHelmetMm: 90, helmetBelowHoopLineMm: 60, hoopBehindHelmetMm: 120, harnessBarBelowShouldersMm: 50, diagonalLowerEndFromNodeMm: 40, diagonalUpperEndFromNodeMm: 40, nearestTubeToHelmetMm: 200, mainHoopInsideWidthMm: 1100 },
    plates: [
      { id: 'p-mh', location: 'main_hoop_foot', memberId: 'mh', plateFixing: bad ? 'bolted' : 'welded', footFixing: 'bolted', thicknessMm: bad ? 1.6 : 3.2, sidesMm: bad ? [70, 60] : [130, 130], boltCount: bad ? 2 : 4, boltDiameterMm: bad ? 6 : 10, boltGrade: bad ? 'SAE Grade 5' : 'ISO 10.9', backingPlate: !bad, backingThicknessMm: bad ? 1.5 : 3.2 },
      { id: 'p-fh', location: 'front_hoop_foot', memberId: 'fh', plateFixing: 'welded', footFixing: bad ? 'bolted' : 'welded', thicknessMm: bad ? 1.6 : 3.2, sidesMm: bad ? [80, 80] : [150, 120], boltCount: bad ? 1 : 3 },
      { id: 'p-rb', location: 'rear_brace_foot', memberId: 'rb-l', plateFixing: 'welded', thicknessMm: 3, sidesMm: bad ? [70, 70] : [100, 80], areaMm2: bad ? 4900 : 8000 },
    ],
    inspectionHoles: [{ memberId: 'mh', diameterMm: bad ? 9 : 4.8, distanceFromWeldOrBendMm: bad ? 30 : 90 }],
    padding: { nearHelmet: !bad, ...(bad ? {} : { standard: 'fia_8857_2001' }) },
    welding: { process: bad ? 'mig' : 'tig' },
  };
}

async function run(compiled: CompiledRuleset, classId: string, variant: Variant): Promise<CheckReport> {
  const parsed = parseSpecification(sheet(classId, variant));
  if (!parsed.ok) throw new Error(`${classId}/${variant}: ${JSON.stringify(parsed.problems)}`);
  return evaluateSpecification(compiled, classId, parsed.value);
}

// A number followed by a unit of one system. "in" only after a digit, so words like "in total" stay out.
const METRIC = /\d\s?(mm²|mm|cm²|cm2|cm|kg\/m|kg|MPa|N\/mm²|N\/mm2)(?![A-Za-z])/;
const IMPERIAL = /\d\s?(in²|in|lb\/ft|lb|psi|ft)(?![A-Za-z])(?! (total|each|all|any|the|a|an|one|place|front|line)\b)/;
const FOREIGN: Record<UnitSystem, RegExp> = { metric: IMPERIAL, imperial: METRIC };

/** Grammar slips a sentence writer makes: a plural after one, a unit twice, stray spaces and stops. */
function slips(text: string): string[] {
  const out: string[] = [];
  const plural = /(?<![\d.,])\b1 (?!is\b|was\b|has\b|plus\b|as\b|less\b|this\b)([a-z]+s)\b/.exec(text);
  if (plural && !/^(?:\w*ss|\w*us)$/.test(plural[1]!)) out.push(`plural after 1: "${plural[0]}"`);
  for (const [re, what] of [
    [/\b(in|mm|lb|kg) \1\b/, 'a unit written twice'],
    [/ {2,}/, 'two spaces'],
    [/ [.,;)]/, 'a space before a stop'],
    [/\.\./, 'two full stops'],
    [/\(\s*\)/, 'empty brackets'],
    [/\b(undefined|NaN|null|\[object Object\])\b/, 'a missing value'],
    [/\b[a-z]+_[a-z0-9_]+\b/, 'a raw vocabulary word'],
  ] as const) {
    const m = re.exec(text);
    if (m) out.push(`${what}: "${m[0]}"`);
  }
  return out;
}

const label = (f: Finding) => `${f.requirementId}/${f.member?.id ?? f.plate?.id ?? 'car'} (${f.verdict})`;

describe('every reason sentence is in the reader\'s units, in both directions', () => {
  for (const file of RULEBOOKS) {
    const doc = loadJson(file) as { unitSystem: UnitSystem; classes: { id: string }[] };
    const compiled = compileFile(file);
    test(`${file} (${doc.unitSystem} rulebook): every class, failing, passing and sparse sheets, read metric and imperial`, async () => {
      const seen = { fail: 0, pass: 0, needs_information: 0 };
      for (const { id } of doc.classes) {
        for (const variant of ['failing', 'passing', 'sparse'] as const) {
          const report = await run(compiled, id, variant);
          for (const f of report.findings) {
            if (f.verdict in seen) seen[f.verdict as keyof typeof seen] += 1;
            for (const reader of ['metric', 'imperial'] as const) {
              const text = findingReason(f, reader);
              expect(text, `${label(f)} read ${reader}: "${text}"`).not.toMatch(FOREIGN[reader]);
              expect(slips(text), `${label(f)} read ${reader}: "${text}"`).toEqual([]);
            }
          }
        }
      }
      // The runs are representative only if they reach every verdict.
      expect(seen.fail).toBeGreaterThan(3);
      expect(seen.pass).toBeGreaterThan(3);
      expect(seen.needs_information).toBeGreaterThan(0);
    });
  }

  test('the stored sentence (the run\'s own units) is the parts written in those units', async () => {
    const report = await run(compileFile('tests/fixtures/rulesets/nhra-quoted.json'), 'roll_bar', 'failing');
    for (const f of report.findings) expect(findingReason(f, 'imperial'), label(f)).toBe(f.reason);
  });

  test('the slip detector finds the slips it is for', () => {
    expect(slips('Counted 1 classes.')).toHaveLength(1);
    expect(slips('Nearest: 1.750 × 0.095 in in mild steel.')).toHaveLength(1);
    expect(slips('Material mild_steel is not allowed.')).toHaveLength(1);
    expect(slips('Needs 1 bolt and 2 bolts; 1.5 in is under 1.75 in.')).toEqual([]);
    expect('OD 1.5 in (required at least 45 mm)').toMatch(METRIC);
    expect('OD 1.5 in (required at least 45 mm)').toMatch(IMPERIAL);
    expect('Add 1 in total').not.toMatch(IMPERIAL);
  });
});

describe('the PDF report, read back with pdftotext, is in the reader\'s units', () => {
  // A requirement's title and explanation are the rulebook's own words, printed as the rulebook wrote
  // them (an imperial rulebook's "1-5/8 in OD" stays so); everything Cagewright writes — measured and
  // required values, reasons, tube data, the cut list — must be in the reader's units.
  const pdfText = async (report: CheckReport, units: UnitSystem, spec: unknown): Promise<string> => {
    const parsed = parseSpecification(spec);
    if (!parsed.ok) throw new Error('bad spec');
    const withoutRulebookWords = { ...report, findings: report.findings.map((f) => ({ ...f, title: `Rule ${f.requirementId}`, explanation: '' })) };
    const pdf = await renderPdf(buildReportDocument({
      report: withoutRulebookWords, units, car: { name: 'Test car', raceNumber: null, make: null, model: null, year: null }, builderName: null, sheetName: null,
      revisionNumber: null, verificationCode: 'K7QM-2X9P-DR4T-V8WZ-3HNB-6CJE-0000', checkedAt: new Date('2026-12-01T10:00:00Z'), tubeData: tubeDataFor(parsed.value), photos: [],
    }));
    return execFileSync('pdftotext', ['-', '-'], { input: pdf, encoding: 'utf8' }).replace(/\s+/g, ' ');
  };

  test.each<[string, string, UnitSystem]>([
    ['an imperial rulebook (SCCA fixture) read by a metric steward', 'tests/fixtures/rulesets/scca-gcr-quoted.json', 'metric'],
    ['a metric rulebook (Motorsport UK fixture) read by an imperial builder', 'tests/fixtures/rulesets/msuk-ncr-2026.json', 'imperial'],
    ['the demo cage regulations (imperial) read in metric', 'rulesets/tarnwick-vale-mc-cage-regulations-2027.json', 'metric'],
    ['the demo hillclimb rulebook (metric) read in imperial', 'rulesets/tarnwick-vale-mc-hillclimb-2027-metric.json', 'imperial'],
  ])('%s', async (_n, file, reader) => {
    const doc = loadJson(file) as { classes: { id: string }[] };
    const classId = doc.classes[0]!.id;
    const report = await run(compileFile(file), classId, 'failing');
    const text = await pdfText(report, reader, sheet(classId, 'failing'));
    expect(text).toContain('To pass');
    const foreign = [...text.matchAll(new RegExp(FOREIGN[reader].source, 'g'))].map((m) => text.slice(Math.max(0, m.index - 60), m.index + 20));
    expect(foreign).toEqual([]);
    expect(slips(text)).toEqual([]);
    // The numbers are there, in the reader's units: the failing main hoop's size in the tube table.
    // 43 × 1.98 mm = 1.693 × 0.078 in (F-UNIT-1, computed)
    expect(text).toContain(reader === 'metric' ? '43.0 × 1.98 mm' : '1.693 × 0.078 in');
  });
});
