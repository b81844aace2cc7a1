// One build sheet against several rulebooks: the matrix of rule areas × rulebooks, built from the
// reports the ordinary check engine wrote for each rulebook and from each compiled ruleset's own
// tube tables. Pure: no I/O; the service runs the checks and hands the results in.
//
// Rows come from the vocabularies the rules already use (member kinds, plate locations, requirement
// areas), in that order, and only where some rulebook has a finding or a tube table for them, so the
// list follows the rule registry instead of a list kept here.
// "Strictest" and "satisfies all" are defined in docs/decisions/0015-strictest-and-satisfies-all.md:
//  - a limit (atLeast / atMost a number) is ordered: the largest least value, the smallest most value;
//  - a tube table lists alternatives with no single order: per rulebook, the smallest OD any
//    alternative allows and the thinnest wall any allows are its least demands, and the strictest is
//    the largest of each; "satisfies all" is a size some rulebook lists that every rulebook's table
//    for the sheet's weight band accepts (the intersection), never a size made up here.
import type { CheckReport, Finding, FindingVerdict } from '../../contracts/report.js';
import type { RequirementArea } from '../../contracts/ruleset.js';
import { AREAS } from '../../contracts/ruleset.js';
import type { Specification } from '../../contracts/specification.js';
import type { CompiledRequirement, CompiledRuleset, AlternativeMeta } from '../rules/types.js';
import { chooseVariant, evaluateSpecification } from '../rules/evaluate.js';
import { tubeSizeText } from '../rules/reason-text.js';
import { tubeSectionProperties } from '../tube.js';
import type { Dimension, UnitSystem } from '../units.js';
import { formatQuantity } from '../units.js';
import { MEMBER_KINDS, MEMBER_KIND_LABELS, OTHER_VOCABULARY_WORDS, PLATE_LOCATIONS } from '../vocabulary.js';
import type { MemberKind, PlateLocation } from '../vocabulary.js';

const EPS = 1e-6;

/** One rulebook to compare: its compiled form, the class checked and the engine's report. */
export interface ComparedRulebook {
  key: string;
  home: boolean;
  classId: string;
  compiled: CompiledRuleset;
  report: CheckReport;
}

export type RowKind = 'member' | 'plate' | 'area';

export interface ComparisonCell {
  /** The deciding verdict of the row's findings; null: this rulebook has no rule for the row. */
  verdict: FindingVerdict | null;
  /** Mandatory when any mandatory finding decided; advisory when only advice. */
  severity: 'mandatory' | 'advisory' | null;
  /** The governing section first (the one whose finding decided), then the others. */
  sections: string[];
  findings: number;
}

/** A numeric limit several rulebooks set for the row, with the strictest marked. */
export interface ComparedLimit {
  fact: string;
  label: string;
  dimension: Dimension | null;
  direction: 'atLeast' | 'atMost';
  /** Per column (canonical units); null when the rulebook does not set it. */
  values: (number | null)[];
  strictest: number;
  strictestColumns: number[];
}

export interface TubeSize {
  odMm: number;
  wallMm: number;
}

/** What one rulebook's tube tables ask of a member kind for the sheet's weight band. */
export interface TubeDemand {
  /** The smallest OD any alternative allows, and the thinnest wall any allows (canonical mm). */
  leastOdMm: number;
  leastWallMm: number;
  /** The sizes it lists for the band (after the sheet's material and process). */
  sizes: (TubeSize & { label: string })[];
  sections: string[];
}

export interface ComparedTubes {
  demands: (TubeDemand | null)[];
  strictestOdMm: number;
  strictestOdColumns: number[];
  strictestWallMm: number;
  strictestWallColumns: number[];
  /** Listed sizes every rulebook with a table for the row accepts, lightest first; empty: none does. */
  satisfyAll: TubeSize[];
  /** Rulebooks with a table for the row whose band cannot be chosen (no weight on the class's basis, or beyond the table). */
  undecidedColumns: number[];
}

export interface ComparisonRow {
  key: string;
  kind: RowKind;
  label: string;
  cells: ComparisonCell[];
  limits: ComparedLimit[];
  tubes: ComparedTubes | null;
}

export interface ComparisonColumn {
  key: string;
  home: boolean;
  classId: string;
  className: string;
  publisher: string;
  title: string;
  edition: string;
  verdict: CheckReport['verdict'];
}

export interface RulebookComparison {
  columns: ComparisonColumn[];
  rows: ComparisonRow[];
}

/** Words for the rows of vehicle-scope findings, by requirement area. */
export const AREA_ROW_WORDS: Readonly<Record<RequirementArea, string>> = {
  tubes: 'Tube sizes (whole car)', members: 'Members present', geometry: 'Geometry', mounting: 'Mounting (whole car)',
  padding: 'Padding', welding: 'Welding', material: 'Material (whole car)',
};

const VERDICT_ORDER: readonly FindingVerdict[] = ['fail', 'needs_information', 'pass', 'not_applicable'];

function rowOf(f: Finding): { key: string; kind: RowKind } {
  if (f.member) return { key: `member:${f.member.kind}`, kind: 'member' };
  if (f.plate) return { key: `plate:${f.plate.location}`, kind: 'plate' };
  return { key: `area:${f.area}`, kind: 'area' };
}

const ROW_ORDER: readonly string[] = [
  ...MEMBER_KINDS.map((k) => `member:${k}`), ...PLATE_LOCATIONS.map((l) => `plate:${l}`), ...AREAS.map((a) => `area:${a}`),
];

function rowLabel(key: string): string {
  const [kind, value] = key.split(':') as [RowKind, string];
  if (kind === 'member') {
    const words = MEMBER_KIND_LABELS[value as MemberKind];
    return words.charAt(0).toUpperCase() + words.slice(1);
  }
  if (kind === 'plate') return `Plates: ${OTHER_VOCABULARY_WORDS[value as PlateLocation] ?? 'other places'}`;
  return AREA_ROW_WORDS[value as RequirementArea];
}

function cellOf(findings: readonly Finding[]): ComparisonCell {
  if (findings.length === 0) return { verdict: null, severity: null, sections: [], findings: 0 };
  const mandatory = findings.filter((f) => f.severity === 'mandatory');
  const deciding = mandatory.length > 0 ? mandatory : findings;
  const worst = [...deciding].sort((a, b) => VERDICT_ORDER.indexOf(a.verdict) - VERDICT_ORDER.indexOf(b.verdict))[0]!;
  const sections = [...new Set([worst.citation.section, ...findings.map((f) => f.citation.section)])];
  return { verdict: worst.verdict, severity: mandatory.length > 0 ? 'mandatory' : 'advisory', sections, findings: findings.length };
}

/** The vehicle weight a class's bands are read with: its listed weight, else the sheet's on its basis. */
export function bandWeightKg(compiled: CompiledRuleset, classId: string, spec: Specification): number | undefined {
  const listed = compiled.listedWeightsKg[classId];
  if (listed !== undefined) return listed;
  const basis = compiled.classes[classId]?.weightBasis;
  return basis === 'with_driver' ? spec.vehicle.weightWithDriverKg : spec.vehicle.weightWithoutDriverKg;
}

/** Names of the alternatives a compiled variant's conditions hold. */
function alternativeNames(node: unknown, req: CompiledRequirement, out: string[] = []): string[] {
  if (node === null || typeof node !== 'object') return out;
  const n = node as { name?: unknown; all?: unknown[]; any?: unknown[]; not?: unknown };
  if (typeof n.name === 'string' && req.alternatives[n.name]) out.push(n.name);
  for (const child of [...(n.all ?? []), ...(n.any ?? []), ...(n.not ? [n.not] : [])]) alternativeNames(child, req, out);
  return out;
}

interface SheetTube {
  materials: ReadonlySet<string>;
  processes: ReadonlySet<string>;
  approvedOn: string | undefined;
}

/** An alternative the sheet's members of this kind can use at all (material, process, approval date). */
function usable(a: AlternativeMeta, sheet: SheetTube): boolean {
  if (a.materials && [...sheet.materials].some((m) => !a.materials!.includes(m))) return false;
  if (a.processes && [...sheet.processes].some((p) => !a.processes!.includes(p))) return false;
  if (a.approvedBefore && !(sheet.approvedOn !== undefined && sheet.approvedOn < a.approvedBefore)) return false;
  return true;
}

/** Whether an alternative accepts a nominal size: the same comparisons the engine's leaves make. */
export function alternativeAccepts(a: AlternativeMeta, size: TubeSize): boolean {
  if (a.source === 'strength_equivalent') {
    // Bending strength needs the tube's yield, which a listed size does not carry: not counted.
    if (!a.equivalence || a.equivalence.measure !== 'section_modulus') return false;
    if (a.equivalence.minWallMm !== undefined && size.wallMm < a.equivalence.minWallMm - EPS) return false;
    return tubeSectionProperties(size).sectionModulusMm3 >= a.equivalence.requiredValue * (1 - 1e-9);
  }
  return size.odMm >= a.odMm - EPS && size.wallMm >= a.requiredWallMm - EPS;
}

type TubeTables = { tables: { req: CompiledRequirement; alts: AlternativeMeta[] }[]; undecided: boolean };
// Memoised per compiled ruleset object, like the engine's plans: a pure function of it and the key.
const tubeTableMemo = new WeakMap<CompiledRuleset, Map<string, TubeTables>>();

function tubeTablesFor(col: ComparedRulebook, kind: MemberKind, spec: Specification, sheet: SheetTube): TubeTables {
  let memo = tubeTableMemo.get(col.compiled);
  if (!memo) tubeTableMemo.set(col.compiled, (memo = new Map()));
  const key = JSON.stringify([col.classId, kind, bandWeightKg(col.compiled, col.classId, spec) ?? null, [...sheet.materials].sort(), [...sheet.processes].sort(), sheet.approvedOn ?? null]);
  let found = memo.get(key);
  if (!found) {
    found = readTubeTables(col, kind, spec, sheet);
    // Bounded: a long-lived compiled ruleset meets many sheets.
    if (memo.size > 500) memo.clear();
    memo.set(key, found);
  }
  return found;
}

/** Per tube-table requirement of a kind: the usable alternatives of the band the sheet falls in. */
function readTubeTables(col: ComparedRulebook, kind: MemberKind, spec: Specification, sheet: SheetTube): { tables: { req: CompiledRequirement; alts: AlternativeMeta[] }[]; undecided: boolean } {
  const weight = bandWeightKg(col.compiled, col.classId, spec);
  const out: { req: CompiledRequirement; alts: AlternativeMeta[] }[] = [];
  let undecided = false;
  for (const req of col.compiled.requirements) {
    if (req.template !== 'tube_table' || req.severity !== 'mandatory') continue;
    if (req.classes !== null && !req.classes.includes(col.classId)) continue;
    if (req.scope.kind !== 'member' || !req.scope.memberKinds.includes(kind)) continue;
    const choice = chooseVariant(req, weight);
    if (!('variant' in choice)) {
      undecided = true;
      continue;
    }
    const alts = alternativeNames(choice.variant.rule.conditions, req).map((n) => req.alternatives[n]!).filter((a) => usable(a, sheet));
    out.push({ req, alts });
  }
  // A table whose band is unknown leaves the rulebook's demand unknown, even beside another table.
  return undecided ? { tables: [], undecided } : { tables: out, undecided };
}

const sameSize = (a: TubeSize, b: TubeSize) => Math.abs(a.odMm - b.odMm) < 1e-4 && Math.abs(a.wallMm - b.wallMm) < 1e-4;

function compareTubes(cols: readonly ComparedRulebook[], kind: MemberKind, spec: Specification): ComparedTubes | null {
  const members = spec.members.filter((m) => m.kind === kind);
  // A table for a member the sheet does not have asks nothing of this sheet.
  if (members.length === 0) return null;
  const sheet: SheetTube = {
    materials: new Set(members.flatMap((m) => (m.material ? [m.material] : []))),
    processes: new Set(members.flatMap((m) => (m.process ? [m.process] : []))),
    approvedOn: spec.cage?.approvedOn,
  };
  const found = cols.map((c) => tubeTablesFor(c, kind, spec, sheet));
  const tables = found.map((f) => f.tables);
  const undecidedColumns = found.flatMap((f, i) => (f.undecided ? [i] : []));
  if (tables.every((t) => t.length === 0)) return undecidedColumns.length > 0 ? { demands: cols.map(() => null), strictestOdMm: 0, strictestOdColumns: [], strictestWallMm: 0, strictestWallColumns: [], satisfyAll: [], undecidedColumns } : null;
  const demands: (TubeDemand | null)[] = tables.map((t) => {
    if (t.length === 0) return null;
    const sized = t.map(({ alts }) => alts.filter((a) => a.source !== 'strength_equivalent'));
    // Every table of the kind applies: its least demand is the largest of their least demands.
    const least = (pick: (a: AlternativeMeta) => number) => Math.max(...sized.map((alts) => (alts.length ? Math.min(...alts.map(pick)) : Number.POSITIVE_INFINITY)));
    const sizes: TubeDemand['sizes'] = [];
    for (const alts of sized)
      for (const a of alts)
        if ((a.source === 'table' || a.source === 'printed_equivalent') && !sizes.some((s) => sameSize(s, a))) sizes.push({ odMm: a.odMm, wallMm: a.wallMm, label: a.label });
    return { leastOdMm: least((a) => a.odMm), leastWallMm: least((a) => a.requiredWallMm), sizes, sections: t.map(({ req }) => req.section) };
  });
  const present = demands.map((d, i) => [d, i] as const).filter((x): x is readonly [TubeDemand, number] => x[0] !== null);
  const strictestOdMm = Math.max(...present.map(([d]) => d.leastOdMm));
  const strictestWallMm = Math.max(...present.map(([d]) => d.leastWallMm));
  const accepts = (i: number, size: TubeSize) => tables[i]!.every(({ alts }) => alts.some((a) => alternativeAccepts(a, size)));
  const candidates: TubeSize[] = [];
  for (const [d] of present) for (const s of d.sizes) if (!candidates.some((c) => sameSize(c, s))) candidates.push({ odMm: s.odMm, wallMm: s.wallMm });
  const satisfyAll = candidates
    .filter((size) => present.every(([, i]) => accepts(i, size)))
    .sort((a, b) => tubeSectionProperties(a).areaMm2 - tubeSectionProperties(b).areaMm2);
  return {
    demands,
    strictestOdMm,
    strictestOdColumns: present.filter(([d]) => Math.abs(d.leastOdMm - strictestOdMm) < EPS).map(([, i]) => i),
    strictestWallMm,
    strictestWallColumns: present.filter(([d]) => Math.abs(d.leastWallMm - strictestWallMm) < EPS).map(([, i]) => i),
    satisfyAll,
    undecidedColumns,
  };
}

const DIRECTION: Readonly<Record<string, 'atLeast' | 'atMost'>> = { atLeast: 'atLeast', above: 'atLeast', atMost: 'atMost', below: 'atMost' };

/** Numeric limits the row's findings name (tube tables aside: they are compared by their alternatives). */
function compareLimits(cols: readonly ComparedRulebook[], perColumn: readonly (readonly Finding[])[], templates: readonly ReadonlyMap<string, string>[]): ComparedLimit[] {
  const byKey = new Map<string, ComparedLimit>();
  perColumn.forEach((findings, i) => {
    for (const f of findings) {
      if (f.verdict === 'not_applicable' || f.acceptedOnCertificate || templates[i]!.get(f.requirementId) === 'tube_table') continue;
      for (const r of f.required) {
        const direction = DIRECTION[r.operator];
        if (!direction || typeof r.value !== 'number' || r.dimension === null) continue;
        const key = `${r.fact}|${r.path ?? ''}|${direction}`;
        let limit = byKey.get(key);
        if (!limit) {
          limit = { fact: r.fact, label: r.label, dimension: r.dimension, direction, values: cols.map(() => null), strictest: r.value, strictestColumns: [] };
          byKey.set(key, limit);
        }
        const was = limit.values[i];
        // Within one rulebook, two rules on the same value both apply: the stricter one counts.
        limit.values[i] = was === null || was === undefined ? r.value : direction === 'atLeast' ? Math.max(was, r.value) : Math.min(was, r.value);
      }
    }
  });
  return [...byKey.values()].map((l) => {
    const set = l.values.filter((v): v is number => v !== null);
    const strictest = l.direction === 'atLeast' ? Math.max(...set) : Math.min(...set);
    const tol = Math.max(EPS, Math.abs(strictest) * 1e-9);
    return { ...l, strictest, strictestColumns: l.values.flatMap((v, i) => (v !== null && Math.abs(v - strictest) <= tol ? [i] : [])) };
  });
}

/** The matrix. The home rulebook is put first whatever order the columns came in. */
export function compareRulebooks(spec: Specification, rulebooks: readonly ComparedRulebook[]): RulebookComparison {
  const cols = [...rulebooks.filter((c) => c.home), ...rulebooks.filter((c) => !c.home)];
  const grouped = new Map<string, Finding[][]>();
  cols.forEach((c, i) => {
    for (const f of c.report.findings) {
      const { key } = rowOf(f);
      let per = grouped.get(key);
      if (!per) grouped.set(key, (per = cols.map(() => [])));
      per[i]!.push(f);
    }
  });
  const templates = cols.map((c) => new Map(c.compiled.requirements.map((r) => [r.id, r.template as string])));
  const rows: ComparisonRow[] = [];
  for (const key of ROW_ORDER) {
    const [kind, value] = key.split(':') as [RowKind, string];
    const tubes = kind === 'member' ? compareTubes(cols, value as MemberKind, spec) : null;
    const per = grouped.get(key);
    if (!per && !tubes) continue;
    const perColumn = per ?? cols.map(() => []);
    rows.push({ key, kind, label: rowLabel(key), cells: perColumn.map(cellOf), limits: compareLimits(cols, perColumn, templates), tubes });
  }
  return {
    columns: cols.map((c) => ({
      key: c.key, home: c.home, classId: c.classId, className: c.report.className, publisher: c.report.rulebook.publisher,
      title: c.report.rulebook.title, edition: c.report.rulebook.edition, verdict: c.report.verdict,
    })),
    rows,
  };
}

/** A rulebook to evaluate the sheet against, before its report exists. */
export type RulebookToCompare = Omit<ComparedRulebook, 'report'>;

/** The matrix and its one line, together: what the side-by-side screen shows. */
export interface SideBySideResult {
  comparison: RulebookComparison;
  line: string;
}

/**
 * The sheet evaluated under each rulebook (in its column's class) and the reports laid side by side,
 * in one go: the reports are read here and never serialised, so the five cost five evaluations and
 * one comparison. The specification is trusted (parsed by the caller) and names its own class.
 */
export async function evaluateSideBySide(spec: Specification, rulebooks: readonly RulebookToCompare[], system: UnitSystem): Promise<SideBySideResult> {
  const compared: ComparedRulebook[] = [];
  for (const r of rulebooks) {
    const asChecked = r.classId === spec.vehicle.classId ? spec : { ...spec, vehicle: { ...spec.vehicle, classId: r.classId } };
    compared.push({ ...r, report: await evaluateSpecification(r.compiled, r.classId, asChecked, { unitSystem: system }) });
  }
  const comparison = compareRulebooks(spec, compared);
  return { comparison, line: satisfyAllLine(comparison, system) };
}

/**
 * One line: what would satisfy every rulebook at once, or that nothing in the listed sizes does.
 * Limits need no words of their own: the strictest value of each satisfies every rulebook that sets it.
 */
export function satisfyAllLine(comparison: RulebookComparison, system: UnitSystem): string {
  const n = comparison.columns.length;
  const tubeRows = comparison.rows.filter((r) => r.tubes !== null);
  // Members that can share a size are named together: "1.750 × 0.095 in for the main hoop and rear brace".
  const bySize = new Map<string, string[]>();
  for (const r of tubeRows) {
    const first = r.tubes!.satisfyAll[0];
    if (!first) continue;
    const size = tubeSizeText(first.odMm, first.wallMm, system);
    bySize.set(size, [...(bySize.get(size) ?? []), r.label.toLowerCase()]);
  }
  const met = [...bySize].map(([size, labels]) => `${size} for the ${joinWords(labels)}`);
  const limits = comparison.rows.some((r) => r.limits.length > 0) ? ' Every other limit at its strictest value (marked) meets them all.' : '';
  const undecided = [...new Set(comparison.rows.flatMap((r) => r.tubes?.undecidedColumns ?? []))].map((i) => comparison.columns[i]!.title);
  const unknown = undecided.length > 0 ? ` ${joinWords(undecided)} cannot be read without the car's weight on ${undecided.length === 1 ? 'its class’s' : 'their classes’'} basis, so ${undecided.length === 1 ? 'it is' : 'they are'} left out of the tube sizes.` : '';
  if (tubeRows.length === 0) return `None of the ${n} rulebooks lists tube sizes for this sheet's members.${limits}`;
  const decided = tubeRows.filter((r) => r.tubes!.demands.some((d) => d !== null));
  if (decided.length === 0) return `The tube sizes cannot be compared yet.${unknown}${limits}`;
  const known = n - undecided.length;
  const scope = undecided.length === 0 ? `all ${n} rulebooks at once` : known === 1 ? 'the one rulebook that gives a size for this car' : `all ${known} rulebooks that give a size for this car at once`;
  const none = decided.filter((r) => r.tubes!.satisfyAll.length === 0).map((r) => r.label.toLowerCase());
  if (none.length > 0) {
    const rest = met.length > 0 ? ` For the rest: ${met.join('; ')}.` : '';
    return `Nothing in the listed sizes satisfies ${scope} for the ${joinWords(none)}.${rest}${unknown}${limits}`;
  }
  return `To satisfy ${scope}: ${met.join('; ')}.${unknown}${limits}`;
}

function joinWords(words: readonly string[]): string {
  return words.length <= 1 ? (words[0] ?? '') : `${words.slice(0, -1).join(', ')} and ${words[words.length - 1]}`;
}

/** A limit's value in the reader's units, for the line and the cells. */
export function limitText(value: number, dimension: Dimension | null, system: UnitSystem): string {
  return dimension ? formatQuantity(value, dimension, system).text : String(value);
}
