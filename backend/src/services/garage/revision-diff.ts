// What changed between two revisions of a build sheet, in words a person reads: members and plates
// are matched by id (added, removed, or field by field), inspection holes by position, and the
// vehicle-wide sections field by field. Values stay canonical with their dimension so clients can
// format them; `text` is the same change already written in the caller's units. Pure.
import type { DiffChangeWire, DiffSection, DiffValue } from '../../contracts/garage';
import type { SpecCageNode, SpecMember, SpecPlate, Specification } from '../../contracts/specification';
import { formatQuantity, type Dimension, type UnitSystem } from '../../domain/units';
import { MEMBER_KIND_LABELS } from '../../domain/vocabulary';

type Leaves = Map<string, DiffValue>;

/** Flattens nested objects and arrays into dotted leaf paths (`bends.0.clrMm`). */
export function leavesOf(value: unknown, prefix = '', out: Leaves = new Map()): Leaves {
  if (value === undefined) return out;
  if (value === null || typeof value !== 'object') {
    out.set(prefix, value as DiffValue);
    return out;
  }
  const entries = Array.isArray(value) ? value.map((v, i) => [String(i), v] as const) : Object.entries(value);
  for (const [k, v] of entries) leavesOf(v, prefix ? `${prefix}.${k}` : k, out);
  return out;
}

/** The canonical dimension a field's name declares (`wallMm` → length); null for text and flags. */
export function dimensionOfField(path: string): Dimension | null {
  const last = path.split('.').filter((p) => !/^\d+$/.test(p)).pop() ?? '';
  if (/Mm2$/.test(last)) return 'area';
  if (/Mm$/.test(last)) return 'length';
  if (/Kg$/.test(last)) return 'mass';
  if (/Deg$/.test(last)) return 'angle';
  if (/Mpa$/.test(last)) return 'stress';
  if (last === 'boltCount') return 'count';
  return null;
}

const FIELD_LABELS: Readonly<Record<string, string>> = {
  odMm: 'OD', wallMm: 'wall', lengthMm: 'length', yieldMpa: 'yield strength', clrMm: 'centreline radius',
  minOdMm: 'smallest OD', maxOdMm: 'largest OD', continuousPiece: 'one continuous piece', jointType: 'joint type',
  boltGrade: 'bolt grade', boltCount: 'bolt count', boltDiameterMm: 'bolt diameter', thicknessMm: 'thickness',
  areaMm2: 'area', backingPlate: 'backing plate', backingThicknessMm: 'backing plate thickness', memberId: 'member',
  classId: 'class', weightWithDriverKg: 'weight with driver', weightWithoutDriverKg: 'weight without driver',
  diameterMm: 'diameter', distanceFromWeldOrBendMm: 'distance from weld or bend', nearHelmet: 'near the helmet',
  rearBraceAttachBelowTopMm: 'rear brace attachment below the hoop top', rearBraceAngleFromVerticalDeg: 'rear brace angle from vertical',
  hoopAboveHelmetMm: 'main hoop above the helmet', helmetBelowHoopLineMm: 'helmet below the hoop line',
  hoopBehindHelmetMm: 'main hoop behind the helmet', mainHoopInsideWidthMm: 'main hoop inside width',
  harnessBarBelowShouldersMm: 'harness bar below the shoulders', diagonalLowerEndFromNodeMm: 'diagonal lower end from its node',
  diagonalUpperEndFromNodeMm: 'diagonal upper end from its node', nearestTubeToHelmetMm: 'nearest tube to the helmet',
};
const ITEM_LABELS: Readonly<Record<string, string>> = { bends: 'bend', wallReadings: 'wall reading', joints: 'joint', sidesMm: 'side' };

/** "wallReadings.1.wallMm" → "wall reading 2 wall"; "sidesMm.0" → "side 1". */
export function fieldLabel(path: string): string {
  const parts = path.split('.');
  const words: string[] = [];
  for (let i = 0; i < parts.length; i++) {
    const p = parts[i]!;
    const next = parts[i + 1];
    if (next !== undefined && /^\d+$/.test(next) && ITEM_LABELS[p]) {
      words.push(`${ITEM_LABELS[p]} ${Number(next) + 1}`);
      i++;
    } else if (!/^\d+$/.test(p)) words.push(FIELD_LABELS[p] ?? humanize(p));
  }
  return words.join(' ');
}

function humanize(key: string): string {
  return key.replace(/(Mm2|Mm|Kg|Deg|Mpa)$/, '').replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase();
}

// Fields whose values come from the closed vocabularies: shown as words, not as quoted text.
const VOCABULARY_FIELDS = new Set(['kind', 'material', 'process', 'method', 'location', 'fixing', 'standard', 'chassis', 'cockpit', 'fuel', 'classId', 'driverSide', 'side', 'role']);

export function formatDiffValue(value: DiffValue, dimension: Dimension | null, system: UnitSystem, path = ''): string {
  if (value === null) return 'none';
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (typeof value === 'number') return dimension ? formatQuantity(value, dimension, system).text : String(value);
  const last = path.split('.').filter((p) => !/^\d+$/.test(p)).pop() ?? '';
  return VOCABULARY_FIELDS.has(last) ? value.replace(/_/g, ' ') : `"${value}"`;
}

interface Subject {
  section: DiffSection;
  id: string | null;
  label: string;
}

function fieldChanges(subject: Subject, before: unknown, after: unknown, system: UnitSystem, skip: ReadonlySet<string> = new Set()): DiffChangeWire[] {
  const a = leavesOf(before);
  const b = leavesOf(after);
  const paths = [...new Set([...a.keys(), ...b.keys()])].filter((p) => !skip.has(p));
  const changes: DiffChangeWire[] = [];
  for (const path of paths) {
    const old = a.has(path) ? a.get(path)! : null;
    const now = b.has(path) ? b.get(path)! : null;
    if (old === now) continue;
    const dimension = dimensionOfField(path);
    const label = fieldLabel(path);
    const show = (v: DiffValue) => formatDiffValue(v, dimension, system, path);
    const text =
      old === null ? `${subject.label}: ${label} set to ${show(now)}`
      : now === null ? `${subject.label}: ${label} cleared (was ${show(old)})`
      : `${subject.label}: ${label} ${show(old)} → ${show(now)}`;
    changes.push({ kind: 'changed', section: subject.section, subjectId: subject.id, subjectLabel: subject.label, field: path, fieldLabel: label, before: old, after: now, dimension, text });
  }
  return changes;
}

function whole(kind: 'added' | 'removed', subject: Subject, detail: string): DiffChangeWire {
  const verb = kind === 'added' ? 'Added' : 'Removed';
  return { kind, section: subject.section, subjectId: subject.id, subjectLabel: subject.label, field: null, fieldLabel: null, before: null, after: null, dimension: null, text: `${verb} ${subject.label}${detail}` };
}

// The builder's own name for a member when they gave one ("backstay left"), else its kind and id.
const memberSubject = (m: SpecMember): Subject => ({ section: 'members', id: m.id, label: m.label?.trim() ? m.label.trim() : `${MEMBER_KIND_LABELS[m.kind]} "${m.id}"` });
const plateSubject = (p: SpecPlate): Subject => ({ section: 'plates', id: p.id, label: `plate "${p.id}" (${p.location.replace(/_/g, ' ')})` });
const tubeSize = (m: SpecMember, system: UnitSystem) =>
  ` (${formatQuantity(m.odMm, 'length', system).text.replace(/ (mm|in)$/, '')} × ${formatQuantity(m.wallMm, 'length', system).text})`;

function byId<T extends { id: string }>(
  before: readonly T[], after: readonly T[], subjectOf: (x: T) => Subject, detail: (x: T) => string, system: UnitSystem,
  extra: (subject: Subject, prior: T, x: T) => DiffChangeWire[] = () => [],
): DiffChangeWire[] {
  const old = new Map(before.map((x) => [x.id, x]));
  const now = new Map(after.map((x) => [x.id, x]));
  const changes: DiffChangeWire[] = [];
  for (const x of before) if (!now.has(x.id)) changes.push(whole('removed', subjectOf(x), ''));
  for (const x of after) {
    const prior = old.get(x.id);
    if (!prior) changes.push(whole('added', subjectOf(x), detail(x)));
    else {
      const skip = new Set([...leavesOf({ path: (prior as { path?: unknown }).path }).keys(), ...leavesOf({ path: (x as { path?: unknown }).path }).keys()]);
      changes.push(...fieldChanges(subjectOf(x), { ...prior, id: undefined }, { ...x, id: undefined }, system, skip));
      changes.push(...extra(subjectOf(x), prior, x));
    }
  }
  return changes;
}

// ---------------------------------------------------------------- the cage model

type NodeNames = (id: string) => string;
const nodeNamer = (...specs: Specification[]): NodeNames => {
  const labels = new Map<string, string>();
  for (const s of specs) for (const n of s.model?.nodes ?? []) if (n.label?.trim() && !labels.has(n.id)) labels.set(n.id, n.label.trim());
  return (id) => `'${labels.get(id) ?? id}'`;
};

/** A node's move in the builder's words: "12 mm up and 5 mm forward" (x forward, y left, z up). */
export function describeMove(before: SpecCageNode, after: SpecCageNode, system: UnitSystem): string | null {
  const parts: string[] = [];
  const axis = (d: number, plus: string, minus: string) => {
    if (Math.abs(d) < 0.05) return;
    // Whole millimetres read as a tape does ("12 mm"); inches keep the house's decimals.
    const mm = Math.round(Math.abs(d) * 10) / 10;
    const opts = system === 'metric' && Number.isInteger(mm) ? { decimals: 0 } : {};
    parts.push(`${formatQuantity(Math.abs(d), 'length', system, opts).text} ${d > 0 ? plus : minus}`);
  };
  axis(after.zMm - before.zMm, 'up', 'down');
  axis(after.xMm - before.xMm, 'forward', 'back');
  axis(after.yMm - before.yMm, 'to the left', 'to the right');
  if (parts.length === 0) return null;
  return parts.length === 1 ? parts[0]! : `${parts.slice(0, -1).join(', ')} and ${parts[parts.length - 1]}`;
}

function modelChanges(before: Specification, after: Specification, system: UnitSystem, name: NodeNames): DiffChangeWire[] {
  const a = before.model?.nodes ?? [];
  const b = after.model?.nodes ?? [];
  const old = new Map(a.map((n) => [n.id, n]));
  const now = new Map(b.map((n) => [n.id, n]));
  const changes: DiffChangeWire[] = [];
  const at = (n: SpecCageNode) => ` at (${[n.xMm, n.yMm, n.zMm].map((v) => formatQuantity(v, 'length', system).text.replace(/ (mm|in)$/, '')).join(', ')}) ${system === 'imperial' ? 'in' : 'mm'}`;
  for (const n of a) if (!now.has(n.id)) changes.push(whole('removed', { section: 'model', id: n.id, label: `node ${name(n.id)}` }, ''));
  for (const n of b) {
    const subject: Subject = { section: 'model', id: n.id, label: `node ${name(n.id)}` };
    const prior = old.get(n.id);
    if (!prior) {
      changes.push(whole('added', subject, at(n)));
      continue;
    }
    const move = describeMove(prior, n, system);
    if (move) changes.push({ kind: 'changed', section: 'model', subjectId: n.id, subjectLabel: subject.label, field: 'position', fieldLabel: 'position', before: null, after: null, dimension: 'length', text: `${subject.label} moved ${move}` });
    changes.push(...fieldChanges(subject, { label: prior.label, role: prior.role }, { label: n.label, role: n.role }, system));
  }
  return changes;
}

/** A member's path: which nodes it runs through, and the bend radius at each. */
function pathChanges(name: NodeNames, system: UnitSystem) {
  return (subject: Subject, prior: SpecMember, m: SpecMember): DiffChangeWire[] => {
    const a = prior.path ?? [];
    const b = m.path ?? [];
    const route = (p: typeof a) => p.map((e) => name(e.nodeId)).join(' → ');
    const change = (text: string): DiffChangeWire => ({ kind: 'changed', section: 'members', subjectId: m.id, subjectLabel: subject.label, field: 'path', fieldLabel: 'path', before: null, after: null, dimension: null, text });
    if (route(a) !== route(b)) {
      if (a.length === 0) return [change(`${subject.label}: path set to ${route(b)}`)];
      if (b.length === 0) return [change(`${subject.label}: path cleared (was ${route(a)})`)];
      return [change(`${subject.label}: path now runs ${route(b)} (was ${route(a)})`)];
    }
    const out: DiffChangeWire[] = [];
    b.forEach((e, i) => {
      const was = a[i]!.clrMm;
      if (was === e.clrMm) return;
      const r = (v: number | undefined) => (v === undefined ? 'none' : formatQuantity(v, 'length', system).text);
      out.push(change(`${subject.label}: bend at ${name(e.nodeId)} radius ${r(was)} → ${r(e.clrMm)}`));
    });
    return out;
  };
}

/** Every change from `before` to `after`, in the order a reader scans a sheet. */
export function diffSpecifications(before: Specification, after: Specification, system: UnitSystem): DiffChangeWire[] {
  const changes: DiffChangeWire[] = [];
  changes.push(...fieldChanges({ section: 'vehicle', id: null, label: 'vehicle' }, before.vehicle, after.vehicle, system));
  const names = nodeNamer(after, before);
  changes.push(...modelChanges(before, after, system, names));
  changes.push(...byId(before.members, after.members, memberSubject, (m) => tubeSize(m, system), system, pathChanges(names, system)));
  changes.push(...fieldChanges({ section: 'geometry', id: null, label: 'geometry' }, before.geometry, after.geometry, system));
  changes.push(...byId(before.plates ?? [], after.plates ?? [], plateSubject, () => '', system));
  const holesBefore = before.inspectionHoles ?? [];
  const holesAfter = after.inspectionHoles ?? [];
  for (let i = 0; i < Math.max(holesBefore.length, holesAfter.length); i++) {
    const subject: Subject = { section: 'inspectionHoles', id: String(i + 1), label: `inspection hole ${i + 1}` };
    const [a, b] = [holesBefore[i], holesAfter[i]];
    if (!b) changes.push(whole('removed', subject, ''));
    else if (!a) changes.push(whole('added', subject, ` on "${b.memberId}"`));
    else changes.push(...fieldChanges(subject, a, b, system));
  }
  changes.push(...fieldChanges({ section: 'padding', id: null, label: 'padding' }, before.padding, after.padding, system));
  changes.push(...fieldChanges({ section: 'welding', id: null, label: 'welding' }, before.welding, after.welding, system));
  return changes;
}
