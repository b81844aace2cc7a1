// Which inputs a finding concerns: a failing or undecided finding marks the inputs the builder typed
// its measured facts into (the wall of the member whose tube check fails, the plate's thickness…),
// so the problem shows where it can be fixed, not only in the panel.
import type { CheckReport, Finding, MeasuredValue, RequiredValue } from '@contracts/report';

export interface InputMark {
  verdict: 'fail' | 'needs_information';
  /** The rule's section and the finding's short reason, shown under the input. */
  message: string;
}

const SECTION_FACTS: Record<string, string[]> = {
  areaMm2: ['odMm', 'wallMm'],
  secondMomentMm4: ['odMm', 'wallMm'],
  sectionModulusMm3: ['odMm', 'wallMm'],
  radiusOfGyrationMm: ['odMm', 'wallMm'],
  torsionalConstantMm4: ['odMm', 'wallMm'],
  massPerMetreKg: ['odMm', 'wallMm'],
  odMarginOverTableMinimumMm: ['odMm'],
  massKg: ['lengthMm'],
  minMeasuredWallMm: ['wallReadings'],
  wallReadingCount: ['wallReadings'],
  bendCount: ['bends'],
  minBendClrMm: ['bends'],
  minBendRadiusOverOd: ['bends'],
  minOvality: ['bends'],
};

const PLATE_FACTS: Record<string, string[]> = {
  areaMm2: ['sidesMm.0', 'sidesMm.1', 'areaMm2'],
  leastSideMm: ['sidesMm.0', 'sidesMm.1'],
  longestSideMm: ['sidesMm.0', 'sidesMm.1'],
  attachedWallMm: [],
  attachedOdMm: [],
};

const DIRECT_VEHICLE_FACTS = new Set(['weightWithDriverKg', 'weightWithoutDriverKg', 'chassis', 'cockpit', 'fuel', 'driverShoulderHeightMm']);

/** The input paths a fact was typed into, for a finding about a member, a plate or the vehicle. */
export function inputPathsForFact(fact: string, finding: Pick<Finding, 'member' | 'plate'>): string[] {
  const [scope, name] = fact.split('.', 2) as [string, string];
  if (scope === 'member' && finding.member) {
    return (SECTION_FACTS[name] ?? [name]).map((n) => `members.${finding.member!.index}.${n}`);
  }
  if (scope === 'plate' && finding.plate) {
    return (PLATE_FACTS[name] ?? [name]).map((n) => `plates.${finding.plate!.index}.${n}`);
  }
  if (fact === 'vehicle.weightKg') return ['vehicle.weightWithDriverKg', 'vehicle.weightWithoutDriverKg'];
  // What the cage model asks for instead of a helmet clearance (domain/geometry/model-asks.ts).
  if (fact === 'vehicle.helmet') return ['vehicle.helmet.xMm', 'vehicle.helmet.yMm', 'vehicle.helmet.zMm', 'vehicle.helmet.radiusMm'];
  // Counts, kinds present and estimated mass are worked out from the members, not typed anywhere.
  if (scope === 'vehicle') return DIRECT_VEHICLE_FACTS.has(name) ? [fact] : [];
  if (['geometry', 'padding', 'welding'].includes(scope)) return [fact];
  return [];
}

function violates(measured: MeasuredValue, required: RequiredValue): boolean {
  const m = measured.value;
  const r = required.value;
  if (typeof m === 'number' && typeof r === 'number') {
    switch (required.operator) {
      case 'atLeast': return m < r;
      case 'atMost': return m > r;
      case 'above': return m <= r;
      case 'below': return m >= r;
      case 'equals': return m !== r;
      case 'notEquals': return m === r;
      default: return false;
    }
  }
  if (Array.isArray(r) && typeof m === 'string') {
    if (required.operator === 'oneOf') return !r.includes(m);
    if (required.operator === 'noneOf') return r.includes(m);
  }
  if (typeof r !== 'object') return required.operator === 'notEquals' ? m === r : required.operator === 'equals' && m !== r;
  return false;
}

/** The facts of a finding that are to blame: those that miss what is required, else all it measured. */
function blamedFacts(f: Finding): string[] {
  if (f.verdict === 'needs_information') return f.missing.map((m) => m.fact);
  const failing = f.measured.filter((m) => f.required.some((r) => r.fact === m.fact && (r.path ?? '') === (m.path ?? '') && violates(m, r)));
  return (failing.length > 0 ? failing : f.measured.filter((m) => typeof m.value === 'number')).map((m) => m.fact);
}

/** Marks by input path; a fail outranks "needs information", and the first finding per input wins. */
export function findingMarks(report: CheckReport | null): Record<string, InputMark> {
  const marks: Record<string, InputMark> = {};
  if (!report) return marks;
  const ordered = [...report.findings].sort((a, b) => rank(a) - rank(b));
  for (const f of ordered) {
    if (f.severity !== 'mandatory' || (f.verdict !== 'fail' && f.verdict !== 'needs_information')) continue;
    const message = `§ ${f.citation.section}: ${f.verdict === 'fail' ? f.reason : `needed for “${f.title}”`}`;
    for (const fact of blamedFacts(f)) {
      for (const path of inputPathsForFact(fact, f)) marks[path] ??= { verdict: f.verdict, message };
    }
  }
  return marks;
}

function rank(f: Finding): number {
  return f.verdict === 'fail' ? 0 : 1;
}
