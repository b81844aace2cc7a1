// The build sheet as the editor holds it: the specification's shape with every measurement optional
// (a new member row has no OD yet), canonical units inside. Turning it into a Specification checks it
// with the server's own schema, so the messages and paths (`members.0.wallMm`) match what the API says.
import { specificationSchema, issuesToProblems } from '@contracts/specification';
import type { FieldProblem, Specification, SpecMember, SpecPlate } from '@contracts/specification';
import { formatQuantity } from '@domain/units';
import type { UnitSystem } from '@domain/units';
import type { MemberKind } from '@domain/vocabulary';

export type MemberDraft = Omit<SpecMember, 'odMm' | 'wallMm'> & { odMm?: number; wallMm?: number };
export type PlateDraft = SpecPlate;

/** The helmet may be half typed (x given, radius not yet); checkDraft asks for all four or none. */
export type VehicleDraft = Omit<Specification['vehicle'], 'helmet'> & { helmet?: Partial<NonNullable<Specification['vehicle']['helmet']>> };
export const HELMET_KEYS = ['xMm', 'yMm', 'zMm', 'radiusMm'] as const;

/** The helmet when all four values are typed, else undefined (what the drawing may use). */
export function completeHelmet(v: VehicleDraft): Specification['vehicle']['helmet'] {
  const h = v.helmet;
  return h && HELMET_KEYS.every((k) => typeof h[k] === 'number') ? (h as Specification['vehicle']['helmet']) : undefined;
}

export interface SheetDraft {
  vehicle: VehicleDraft;
  members: MemberDraft[];
  geometry: NonNullable<Specification['geometry']>;
  plates: PlateDraft[];
  inspectionHoles: NonNullable<Specification['inspectionHoles']>;
  padding: NonNullable<Specification['padding']>;
  welding: NonNullable<Specification['welding']>;
  /** Approval and build dates and a maker's certificate (issue 9). */
  cage: CageDraft;
  /** The cage model's nodes (issue 10); absent on a sheet typed the old way. */
  model?: NonNullable<Specification['model']>;
}

/** The certificate's number may be blank while typing; the schema asks for it once an issuer is given. */
export type CageDraft = Omit<NonNullable<Specification['cage']>, 'certificate'> & { certificate?: { issuer?: string; number?: string } };

export function emptyDraft(classId: string): SheetDraft {
  return { vehicle: { classId }, members: [], geometry: {}, plates: [], inspectionHoles: [], padding: {}, welding: {}, cage: {} };
}

/**
 * A deep copy of plain JSON data. The draft lives in Vue's reactive proxies, which structuredClone
 * refuses ("could not be cloned"); a JSON round trip reads through them, and the sheet is JSON by
 * contract (no dates, no undefined worth keeping).
 */
export function plainCopy<T>(value: T): T {
  return JSON.parse(JSON.stringify(value)) as T;
}

/** A saved specification as an editable draft (deep copy: the draft never aliases a saved revision). */
export function draftFromSpecification(spec: Specification, classId = spec.vehicle.classId): SheetDraft {
  const copy = plainCopy(spec);
  return {
    vehicle: { ...copy.vehicle, classId },
    members: copy.members,
    geometry: copy.geometry ?? {},
    plates: copy.plates ?? [],
    inspectionHoles: copy.inspectionHoles ?? [],
    padding: copy.padding ?? {},
    welding: copy.welding ?? {},
    cage: copy.cage ?? {},
    ...(copy.model ? { model: copy.model } : {}),
  };
}

/** The first free id like `main_hoop-2`, so ids stay readable in reports and photos. */
export function nextId(prefix: string, taken: Iterable<string>): string {
  const used = new Set(taken);
  for (let n = 1; ; n += 1) {
    const id = `${prefix}-${n}`;
    if (!used.has(id)) return id;
  }
}

export function newMember(kind: MemberKind, draft: SheetDraft): MemberDraft {
  return { id: nextId(kind.replace(/_/g, '-'), draft.members.map((m) => m.id)), kind };
}

/** A copy of a row under a new id, placed by the caller right after the original. */
export function copyMember(member: MemberDraft, draft: SheetDraft): MemberDraft {
  const copy = plainCopy(member);
  copy.id = nextId(member.kind.replace(/_/g, '-'), draft.members.map((m) => m.id));
  return copy;
}

export function newPlate(draft: SheetDraft): PlateDraft {
  return { id: nextId('plate', draft.plates.map((p) => p.id)), location: 'main_hoop_foot' };
}

/** Drops empty strings, undefined values and empty objects, so the wire carries only what was entered. */
function prune<T>(value: T): T {
  if (Array.isArray(value)) return value.map(prune) as T;
  if (value && typeof value === 'object') {
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(value)) {
      if (v === undefined || v === null || v === '') continue;
      const pruned = prune(v);
      if (pruned && typeof pruned === 'object' && !Array.isArray(pruned) && Object.keys(pruned).length === 0) continue;
      out[k] = pruned;
    }
    return out as T;
  }
  return value;
}

export type DraftCheck = { ok: true; specification: Specification; problems: [] } | { ok: false; problems: FieldProblem[] };

/** The draft as a specification, or every problem with the path of the input it belongs to. */
export function checkDraft(draft: SheetDraft, units: UnitSystem = 'metric'): DraftCheck {
  const problems: FieldProblem[] = [];
  const len = (mm: number) => formatQuantity(mm, 'length', units).text;
  draft.members.forEach((m, i) => {
    if (m.odMm === undefined) problems.push({ path: `members.${i}.odMm`, message: 'Enter the outside diameter.' });
    if (m.wallMm === undefined) problems.push({ path: `members.${i}.wallMm`, message: 'Enter the wall thickness.' });
    // Said here in the builder's units; the schema says the same in millimetres.
    if (m.odMm !== undefined && m.wallMm !== undefined && m.odMm > 0 && m.wallMm >= m.odMm / 2)
      problems.push({ path: `members.${i}.wallMm`, message: `A wall of ${len(m.wallMm)} is half the OD (${len(m.odMm)}) or more: that is a solid bar, not a tube.` });
  });
  draft.plates.forEach((p, i) => {
    if (p.sidesMm && (p.sidesMm[0] === undefined || p.sidesMm[1] === undefined))
      problems.push({ path: `plates.${i}.sidesMm`, message: 'Enter both sides, or neither.' });
  });
  const helmet = draft.vehicle.helmet;
  if (helmet && HELMET_KEYS.some((k) => helmet[k] !== undefined)) {
    for (const k of HELMET_KEYS)
      if (helmet[k] === undefined) problems.push({ path: `vehicle.helmet.${k}`, message: 'Enter all four helmet values (centre x, y, z and radius), or clear them.' });
  }
  if (draft.cage.certificate && !draft.cage.certificate.number)
    problems.push({ path: 'cage.certificate.number', message: 'Enter the certificate number, or clear the issuer.' });
  const candidate = prune({
    vehicle: draft.vehicle,
    members: draft.members,
    geometry: draft.geometry,
    plates: draft.plates.length ? draft.plates : undefined,
    inspectionHoles: draft.inspectionHoles.length ? draft.inspectionHoles : undefined,
    padding: draft.padding,
    welding: draft.welding,
    cage: draft.cage,
    model: draft.model,
  });
  // members must stay even when empty: an empty cage is a valid (if failing) specification.
  (candidate as { members: unknown }).members = prune(draft.members);
  const parsed = specificationSchema.safeParse(candidate);
  if (!parsed.success) {
    const known = new Set(problems.map((p) => p.path));
    for (const p of issuesToProblems(parsed.error.issues)) {
      // The "required number" issue for a missing OD/wall is already worded above.
      if (!known.has(p.path)) problems.push({ path: p.path, message: reword(p.message) });
    }
  }
  if (problems.length > 0 || !parsed.success) return { ok: false, problems };
  return { ok: true, specification: parsed.data, problems: [] };
}

/** zod's words for a missing number are for programmers; these are for the bench. */
function reword(message: string): string {
  return /expected (number|tuple), received undefined/i.test(message) ? 'Enter a value, or remove the line.' : message;
}

export function problemsByPath(problems: readonly FieldProblem[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const p of problems) if (!(p.path in out)) out[p.path] = p.message;
  return out;
}
