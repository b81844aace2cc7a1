// Bench fixtures: a 40-requirement ruleset and a 15-member specification, plus the same 40 rules
// as plain functions (the baseline the engine is compared with). Reused by the API bench.
import type { RulesetDocument } from '../../backend/src/contracts/ruleset.js';
import type { Specification } from '../../backend/src/contracts/specification.js';
import type { FactSet } from '../../backend/src/domain/facts.js';

const IN = 25.4;
type Tri = true | false | 'unknown';
type Op = 'atLeast' | 'atMost';
type Check = (f: FactSet) => Tri;

const num = (f: FactSet, k: string): number | undefined => (typeof f[k] === 'number' ? (f[k] as number) : undefined);
const cmp = (v: number | undefined, op: Op, x: number): Tri => (v === undefined ? 'unknown' : op === 'atLeast' ? v >= x - 1e-9 * Math.max(1, x) : v <= x + 1e-9 * Math.max(1, x));
const and = (...xs: Tri[]): Tri => (xs.includes(false) ? false : xs.includes('unknown') ? 'unknown' : true);
const or = (...xs: Tri[]): Tri => (xs.includes(true) ? true : xs.includes('unknown') ? 'unknown' : false);

export interface BaselineRule {
  id: string;
  scope: 'vehicle' | 'member' | 'plate';
  kinds?: string[];
  check: Check;
  /** For banded tube tables: which band applies to the weight. */
  when?: Check;
}

const MEMBER_KINDS_ALL = ['main_hoop', 'front_hoop', 'rear_brace', 'door_bar', 'diagonal', 'harness_bar', 'roof_bar', 'a_pillar'];

export function buildBenchRuleset(): { document: RulesetDocument; baseline: BaselineRule[] } {
  const requirements: unknown[] = [];
  const baseline: BaselineRule[] = [];
  const common = (id: string, area: string, scope: unknown) => ({ id, title: id, section: `B${requirements.length + 1}`, severity: 'mandatory', area, scope, explanation: 'bench' });

  // 8 banded tube tables (3 bands × 2 alternatives + thin-wall allowance)
  const tableKinds = [['main_hoop'], ['front_hoop'], ['rear_brace'], ['door_bar'], ['diagonal'], ['harness_bar'], ['roof_bar'], ['a_pillar']];
  tableKinds.forEach((kinds, i) => {
    const s = 1 - i * 0.01;
    const bands = [
      { upTo: 1700, alts: [[1.375, 0.08]] },
      { upTo: 2699, alts: [[1.5 * s, 0.095], [1.625 * s, 0.08]] },
      { alts: [[1.75 * s, 0.095], [1.625 * s, 0.12]] },
    ];
    requirements.push({
      ...common(`tube-${i}`, 'tubes', { kind: 'member', memberKinds: kinds }),
      requires: {
        template: 'tube_table',
        bands: bands.map((b) => ({ ...(b.upTo ? { upTo: b.upTo } : {}), rows: [{ materials: ['mild_steel', 'chromoly_4130'], alternatives: b.alts.map(([od, wall]) => ({ od, wall })) }] })),
        allowances: { thinWallWhenOdExceedsMinimum: { odMargin: 0.25, minWall: 0.08 } },
      },
    });
    baseline.push({
      id: `tube-${i}`, scope: 'member', kinds,
      check: (f) => {
        const w = num(f, 'vehicle.weightKg');
        if (w === undefined) return 'unknown';
        const lb = w / 0.45359237;
        const band = lb <= 1700 ? bands[0] : lb <= 2699 ? bands[1] : bands[2];
        const od = num(f, 'member.odMm');
        const wall = num(f, 'member.wallMm');
        const mat: Tri = f['member.material'] === undefined ? 'unknown' : ['mild_steel', 'chromoly_4130'].includes(f['member.material'] as string);
        const minOd = Math.min(...band.alts.map(([o]) => o * IN));
        return or(
          ...band.alts.map(([o, t]) => and(mat, cmp(od, 'atLeast', o * IN), cmp(wall, 'atLeast', t * IN))),
          and(mat, cmp(od === undefined ? undefined : od - minOd, 'atLeast', 0.25 * IN), cmp(wall, 'atLeast', 0.08 * IN)),
        );
      },
    });
  });

  // 10 member limits
  const memberLimits: [string, Op, number, string[], string | undefined][] = [
    ['member.minBendRadiusOverOd', 'atLeast', 3, ['main_hoop', 'front_hoop', 'a_pillar'], undefined],
    ['member.minOvality', 'atLeast', 0.9, ['main_hoop', 'front_hoop', 'a_pillar'], undefined],
    ['member.yieldMpa', 'atLeast', 350, MEMBER_KINDS_ALL, 'MPa'],
    ['member.minMeasuredWallMm', 'atLeast', 0.09, ['main_hoop', 'front_hoop'], 'in'],
    ['member.areaMm2', 'atLeast', 0.3, MEMBER_KINDS_ALL, 'in2'],
    ['member.sectionModulusMm3', 'atLeast', 0.1, ['main_hoop', 'front_hoop', 'rear_brace'], 'in3'],
    ['member.lengthMm', 'atMost', 200, MEMBER_KINDS_ALL, 'in'],
    ['member.massPerMetreKg', 'atMost', 3, MEMBER_KINDS_ALL, 'lb/ft'],
    ['member.maxInspectionHoleDiameterMm', 'atMost', 0.25, ['main_hoop'], 'in'],
    ['member.radiusOfGyrationMm', 'atLeast', 0.4, ['door_bar', 'diagonal'], 'in'],
  ];
  memberLimits.forEach(([fact, op, value, kinds, unit], i) => {
    requirements.push({
      ...common(`mlimit-${i}`, 'tubes', { kind: 'member', memberKinds: kinds }),
      requires: { template: 'limit', checks: [{ fact, operator: op, value, ...(unit ? { unit } : {}) }] },
    });
    const factor = unit === 'in' ? IN : unit === 'in2' ? IN * IN : unit === 'in3' ? IN ** 3 : unit === 'lb/ft' ? 0.45359237 / 0.3048 : 1;
    baseline.push({ id: `mlimit-${i}`, scope: 'member', kinds, check: (f) => cmp(num(f, fact), op, value * factor) });
  });

  // 6 allowed values
  const allowed: [string, string[], string[]][] = [
    ['member.process', ['dom', 'seamless', 'cds'], MEMBER_KINDS_ALL],
    ['member.material', ['mild_steel', 'chromoly_4130'], MEMBER_KINDS_ALL],
    ['member.process', ['dom', 'seamless'], ['main_hoop']],
    ['member.material', ['mild_steel'], ['door_bar']],
    ['welding.process', ['tig', 'mig'], []],
    ['padding.standard', ['sfi_45_1', 'fia_8857_2001'], []],
  ];
  allowed.forEach(([fact, values, kinds], i) => {
    const scope = kinds.length ? { kind: 'member', memberKinds: kinds } : { kind: 'vehicle' };
    requirements.push({ ...common(`allowed-${i}`, 'material', scope), requires: { template: 'allowed_values', fact, values } });
    baseline.push({ id: `allowed-${i}`, scope: kinds.length ? 'member' : 'vehicle', kinds, check: (f) => (f[fact] === undefined ? 'unknown' : values.includes(f[fact] as string)) });
  });

  // 10 vehicle geometry limits
  const geometry: [string, Op, number, string][] = [
    ['geometry.rearBraceAttachBelowTopMm', 'atMost', 6, 'in'],
    ['geometry.rearBraceAngleFromVerticalDeg', 'atLeast', 30, 'deg'],
    ['geometry.hoopAboveHelmetMm', 'atLeast', 2, 'in'],
    ['geometry.helmetBelowHoopLineMm', 'atLeast', 0, 'in'],
    ['geometry.hoopBehindHelmetMm', 'atMost', 6, 'in'],
    ['geometry.mainHoopInsideWidthMm', 'atLeast', 15, 'in'],
    ['geometry.harnessBarBelowShouldersMm', 'atLeast', 0, 'in'],
    ['geometry.harnessBarBelowShouldersMm', 'atMost', 4, 'in'],
    ['geometry.diagonalLowerEndFromNodeMm', 'atMost', 4, 'in'],
    ['geometry.diagonalUpperEndFromNodeMm', 'atMost', 4, 'in'],
  ];
  geometry.forEach(([fact, op, value, unit], i) => {
    requirements.push({ ...common(`geo-${i}`, 'geometry', { kind: 'vehicle' }), requires: { template: 'limit', checks: [{ fact, operator: op, value, unit }] } });
    baseline.push({ id: `geo-${i}`, scope: 'vehicle', check: (f) => cmp(num(f, fact), op, value * (unit === 'in' ? IN : 1)) });
  });

  // 3 required-members rules
  const required: [string, number][] = [['rear_brace', 2], ['door_bar', 2], ['diagonal', 1]];
  required.forEach(([kind, min], i) => {
    requirements.push({ ...common(`req-${i}`, 'members', { kind: 'vehicle' }), requires: { template: 'required_members', members: [{ kinds: [kind], min }] } });
    baseline.push({ id: `req-${i}`, scope: 'vehicle', check: (f) => ((f['vehicle.memberCounts'] as Record<string, number>)[kind] ?? 0) >= min });
  });

  // 3 plate limits
  const plates: [string, Op, number, string][] = [['plate.thicknessMm', 'atLeast', 0.08, 'in'], ['plate.areaMm2', 'atMost', 144, 'in2'], ['plate.leastSideMm', 'atLeast', 4, 'in']];
  plates.forEach(([fact, op, value, unit], i) => {
    requirements.push({ ...common(`plate-${i}`, 'mounting', { kind: 'plate', locations: ['main_hoop_foot', 'rear_brace_foot'] }), requires: { template: 'limit', checks: [{ fact, operator: op, value, unit }] } });
    baseline.push({ id: `plate-${i}`, scope: 'plate', check: (f) => cmp(num(f, fact), op, value * (unit === 'in' ? IN : IN * IN)) });
  });

  const document = {
    formatVersion: 1,
    rulebook: { publisher: 'Tarnwick Vale Motor Club', title: 'Bench Regulations', edition: '2027', effectiveDate: '2027-01-01' },
    unitSystem: 'imperial',
    measurementTolerance: {},
    acceptPrintedEquivalents: false,
    printedEquivalents: [],
    classes: [{ id: 'bench', name: 'Bench class', weightBasis: 'with_driver' }],
    requirements,
  } as unknown as RulesetDocument;
  return { document, baseline };
}

export function buildBenchSpecification(): Specification {
  const m = (id: string, kind: string, odIn: number, wallIn: number, extra: Record<string, unknown> = {}) => ({
    id, kind, odMm: odIn * IN, wallMm: wallIn * IN, material: 'mild_steel', process: 'dom', yieldMpa: 414, lengthMm: 1200, continuousPiece: true, ...extra,
  });
  const bends = [{ clrMm: 6 * IN, minOdMm: 1.7 * IN, maxOdMm: 1.78 * IN }];
  return {
    vehicle: { classId: 'bench', weightWithDriverKg: 2400 * 0.45359237, chassis: 'unibody', cockpit: 'closed' },
    members: [
      m('mh', 'main_hoop', 1.75, 0.12, { bends, wallReadings: [{ wallMm: 0.118 * IN, method: 'ultrasonic' }] }),
      m('fh', 'front_hoop', 1.75, 0.12, { bends, wallReadings: [{ wallMm: 0.117 * IN, method: 'ultrasonic' }] }),
      m('rb1', 'rear_brace', 1.75, 0.12), m('rb2', 'rear_brace', 1.75, 0.12),
      m('db1', 'door_bar', 1.5, 0.12), m('db2', 'door_bar', 1.5, 0.12), m('db3', 'door_bar', 1.5, 0.12), m('db4', 'door_bar', 1.5, 0.12),
      m('dg', 'diagonal', 1.5, 0.12), m('hb', 'harness_bar', 1.5, 0.12),
      m('rf1', 'roof_bar', 1.5, 0.095), m('rf2', 'roof_bar', 1.5, 0.095),
      m('ap1', 'a_pillar', 1.5, 0.095, { bends }), m('ap2', 'a_pillar', 1.5, 0.095, { bends }),
      m('gs', 'gusset', 1.0, 0.065),
    ],
    geometry: {
      rearBraceAttachBelowTopMm: 3 * IN, rearBraceAngleFromVerticalDeg: 40, hoopAboveHelmetMm: 3 * IN, helmetBelowHoopLineMm: 1 * IN,
      hoopBehindHelmetMm: 4 * IN, mainHoopInsideWidthMm: 40 * IN, harnessBarBelowShouldersMm: 1 * IN, diagonalLowerEndFromNodeMm: 2 * IN, diagonalUpperEndFromNodeMm: 2 * IN,
    },
    plates: [
      { id: 'p1', location: 'main_hoop_foot', memberId: 'mh', fixing: 'welded', sidesMm: [6 * IN, 6 * IN], thicknessMm: 0.125 * IN },
      { id: 'p2', location: 'main_hoop_foot', memberId: 'mh', fixing: 'welded', sidesMm: [6 * IN, 6 * IN], thicknessMm: 0.125 * IN },
    ],
    inspectionHoles: [{ memberId: 'mh', diameterMm: 0.1875 * IN, distanceFromWeldOrBendMm: 4 * IN }],
    padding: { nearHelmet: true, standard: 'sfi_45_1' },
    welding: { process: 'tig' },
  } as Specification;
}
