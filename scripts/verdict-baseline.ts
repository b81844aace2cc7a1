// Records the verdicts of published ruleset documents as an older engine gives them, so a test can
// show today's engine gives the same (issue 9: "Published versions never change their verdicts").
// Run it against a copy of an older tree:
//   git archive <commit> backend rulesets tests/fixtures tsconfig.json tsconfig.base.json package.json | tar -x -C /tmp/old
//   ln -s "$PWD/node_modules" /tmp/old/node_modules
//   npx tsx --tsconfig /tmp/old/tsconfig.json scripts/verdict-baseline.ts /tmp/old <commit> > tests/fixtures/verdicts/before-issue-9.json
// The documents are read from that tree (as they were published then) and written into the output
// with the sheets and the findings' verdicts; tests/unit/domain/published-verdicts.test.ts replays them.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';

interface Finding { requirementId: string; member: { id: string } | null; plate: { id: string } | null; verdict: string }
interface Domain {
  validateRulesetDocument(doc: unknown): { ok: true; document: unknown } | { ok: false; problems: unknown };
  compileRuleset(doc: unknown): unknown;
  evaluateSpecification(compiled: unknown, classId: string, spec: unknown): Promise<{ verdict: string; findings: Finding[] }>;
}
interface Contracts { parseSpecification(spec: unknown): { ok: true; value: unknown } | { ok: false; problems: unknown } }

const [root, commit] = process.argv.slice(2);
if (!root || !commit) throw new Error('usage: verdict-baseline.ts <old tree> <commit>');

const DOCUMENTS = [
  'rulesets/tarnwick-vale-mc-cage-regulations-2027.json',
  'rulesets/tarnwick-vale-mc-hillclimb-2027-metric.json',
  'tests/fixtures/rulesets/scca-gcr-quoted.json',
  'tests/fixtures/rulesets/nhra-quoted.json',
  'tests/fixtures/rulesets/msuk-ncr-2026.json',
  'tests/fixtures/rulesets/fia-art253-quoted.json',
];

type Variant = 'thin' | 'sound' | 'sparse' | 'sound_with_new_fields' | 'edges';

/**
 * Sheets an older builder could have saved (every field existed then), plus one with the fields added
 * since (sides, dates, the included angle, two fixings): an older document must not read them.
 */
function baselineSheet(classId: string, variant: Variant): Record<string, unknown> {
  if (variant === 'edges') {
    // Where the new options would read a sheet differently: an OD between the two readings of the
    // thin-wall allowance (F-SCCA-T1: 1.875 in at 2,750 lb clears 1.625 + 0.250, not 1.750 + 0.250), a
    // sonic reading under the nominal wall (0.070 in on 1.500 × 0.095 in), and both door bars on one side.
    const inch = 25.4;
    const dom = { material: 'mild_steel', process: 'dom' };
    return {
      vehicle: { classId, weightWithDriverKg: 2750 * 0.45359237, weightWithoutDriverKg: 2600 * 0.45359237, chassis: 'unibody', cockpit: 'closed' },
      members: [
        { id: 'mh', kind: 'main_hoop', odMm: 1.875 * inch, wallMm: 0.08 * inch, ...dom },
        { id: 'fh', kind: 'front_hoop', odMm: 1.75 * inch, wallMm: 0.095 * inch, ...dom, wallReadings: [{ wallMm: 0.07 * inch, method: 'ultrasonic' }] },
        { id: 'rb-l', kind: 'rear_brace', odMm: 1.75 * inch, wallMm: 0.12 * inch, ...dom },
        { id: 'rb-r', kind: 'rear_brace', odMm: 1.75 * inch, wallMm: 0.12 * inch, ...dom },
        { id: 'db-1', kind: 'door_bar', odMm: 1.5 * inch, wallMm: 0.095 * inch, ...dom, side: 'left' },
        { id: 'db-2', kind: 'door_bar', odMm: 1.5 * inch, wallMm: 0.095 * inch, ...dom, side: 'left' },
        { id: 'dg', kind: 'diagonal', odMm: 1.5 * inch, wallMm: 0.095 * inch, ...dom, bends: [] },
      ],
    };
  }
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
  const thin = variant === 'thin';
  const added = variant === 'sound_with_new_fields';
  const size = (od: number, wall: number) => (thin ? { odMm: od * 0.86, wallMm: wall * 0.66 } : { odMm: od, wallMm: wall });
  const steel = { material: 'mild_steel', process: thin ? 'erw' : 'cds', yieldMpa: thin ? 262 : 414, grade: thin ? 'AS 1163 C250' : 'AS 1163 C350' };
  const hoop = { ...size(50, 3), ...steel, bends: [{ clrMm: thin ? 90 : 160, minOdMm: thin ? 42 : 48.5, maxOdMm: 50 }], wallReadings: [{ wallMm: thin ? 1.7 : 2.95, method: 'ultrasonic' }] };
  const bar = { ...size(45, 2.8), ...steel, wallReadings: [{ wallMm: thin ? 1.6 : 2.75, method: 'ultrasonic' }] };
  const side = (s: string) => (added ? { side: s } : {});
  return {
    vehicle: { classId, weightWithDriverKg: 1250, weightWithoutDriverKg: 1170, chassis: 'unibody', cockpit: 'closed', ...(added ? { driverSide: 'right' } : {}) },
    ...(added ? { cage: { approvedOn: '1994-06-01', builtOn: '1994-03-01', certificate: { number: 'EX-0001' } } } : {}),
    members: [
      { id: 'mh', kind: 'main_hoop', ...hoop, continuousPiece: !thin, lengthMm: 3300, joints: thin ? [{ kind: 'removable', jointType: 'double lug' }] : [] },
      { id: 'fh', kind: 'front_hoop', ...hoop, lengthMm: 3800 },
      { id: 'rb-l', kind: 'rear_brace', ...hoop, bends: [], ...side('left'), lengthMm: 1100 },
      { id: 'rb-r', kind: 'rear_brace', ...hoop, bends: [], ...side('right'), lengthMm: 1100 },
      { id: 'hb', kind: 'harness_bar', ...bar, bends: [{ clrMm: thin ? 70 : 140 }] },
      { id: 'db-l', kind: 'door_bar', ...bar, ...side('left') },
      { id: 'db-r', kind: 'door_bar', ...bar, ...side('right') },
      { id: 'dg', kind: 'diagonal', ...bar, bends: thin ? [{ clrMm: 300 }] : [] },
      { id: 'rf', kind: 'roof_bar', ...bar, bends: [{ clrMm: thin ? 60 : 140 }] },
    ],
    geometry: {
      ...(thin
        ? { rearBraceAttachBelowTopMm: 190, rearBraceAngleFromVerticalDeg: 22, hoopAboveHelmetMm: 20, helmetBelowHoopLineMm: -8, hoopBehindHelmetMm: 230, harnessBarBelowShouldersMm: -12, diagonalLowerEndFromNodeMm: 160, diagonalUpperEndFromNodeMm: 140, nearestTubeToHelmetMm: 90, mainHoopInsideWidthMm: 340 }
        : { rearBraceAttachBelowTopMm: 90, rearBraceAngleFromVerticalDeg: 38, hoopAboveHelmetMm: 90, helmetBelowHoopLineMm: 60, hoopBehindHelmetMm: 120, harnessBarBelowShouldersMm: 50, diagonalLowerEndFromNodeMm: 40, diagonalUpperEndFromNodeMm: 40, nearestTubeToHelmetMm: 200, mainHoopInsideWidthMm: 1100 }),
      ...(added ? { rearBraceIncludedAngleDeg: 36 } : {}),
    },
    plates: [
      { id: 'p-mh', location: 'main_hoop_foot', memberId: 'mh', fixing: thin ? 'bolted' : 'welded', ...(added ? { plateFixing: 'welded', footFixing: 'bolted' } : {}), thicknessMm: thin ? 1.6 : 3.2, sidesMm: thin ? [70, 60] : [130, 130], boltCount: thin ? 2 : 4, boltDiameterMm: thin ? 6 : 10, boltGrade: thin ? 'SAE Grade 5' : 'ISO 10.9', backingPlate: !thin, backingThicknessMm: thin ? 1.5 : 3.2 },
      { id: 'p-fh', location: 'front_hoop_foot', memberId: 'fh', fixing: 'welded', ...(added ? { plateFixing: 'welded', footFixing: 'welded' } : {}), thicknessMm: thin ? 1.6 : 3.2, sidesMm: thin ? [80, 80] : [150, 120], boltCount: thin ? 1 : 3 },
      { id: 'p-rb', location: 'rear_brace_foot', memberId: 'rb-l', fixing: 'welded', thicknessMm: 3, sidesMm: thin ? [70, 70] : [100, 80] },
    ],
    inspectionHoles: [{ memberId: 'mh', diameterMm: thin ? 9 : 4.8, distanceFromWeldOrBendMm: thin ? 30 : 90 }],
    padding: { nearHelmet: !thin, ...(thin ? {} : { standard: 'fia_8857_2001' }) },
    welding: { process: thin ? 'mig' : 'tig' },
  };
}

async function main(): Promise<void> {
  const domain = (await import(pathToFileURL(join(root!, 'backend/src/domain/index.ts')).href)) as Domain;
  const contracts = (await import(pathToFileURL(join(root!, 'backend/src/contracts/specification.ts')).href)) as Contracts;
  const cases: unknown[] = [];
  for (const file of DOCUMENTS) {
    const document = JSON.parse(readFileSync(join(root!, file), 'utf8')) as { classes: { id: string }[] };
    const v = domain.validateRulesetDocument(document);
    if (!v.ok) throw new Error(`${file}: ${JSON.stringify(v.problems)}`);
    const compiled = domain.compileRuleset(v.document);
    for (const { id: classId } of document.classes) {
      for (const variant of ['thin', 'sound', 'sparse', 'sound_with_new_fields', 'edges'] as const) {
        const specification = baselineSheet(classId, variant);
        const parsed = contracts.parseSpecification(specification);
        if (!parsed.ok) throw new Error(`${file} ${classId} ${variant}: ${JSON.stringify(parsed.problems)}`);
        const report = await domain.evaluateSpecification(compiled, classId, parsed.value);
        cases.push({
          file, classId, variant, specification,
          verdict: report.verdict,
          findings: report.findings.map((f) => [f.requirementId, f.member?.id ?? f.plate?.id ?? null, f.verdict]),
        });
      }
    }
  }
  const documents = Object.fromEntries(DOCUMENTS.map((f) => [f, JSON.parse(readFileSync(join(root!, f), 'utf8')) as unknown]));
  process.stdout.write(`${JSON.stringify({ note: 'Verdicts of the engine before issue 9, made by scripts/verdict-baseline.ts; do not edit by hand.', commit, documents, cases })}\n`);
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) await main();
