// Where the model meets the fact catalogue. With a model, every geometry fact it gives feeds the
// rules; where the sheet types the same value too, both readings are kept and the check runs with
// each, the less favourable verdict deciding (so no direction table can be wrong about which way a
// fact is "worse"). A typed value that disagrees beyond an agreement tolerance of its own (not the
// ruleset's measurementTolerance, which loosens limits) is reported as a disagreement.
import type { Specification, SpecMember } from '../contracts/specification.js';
import type { FactSet } from './facts.js';
import { FACTS_BY_NAME, memberFacts, memberTubeData } from './facts.js';
import { deriveCageGeometry } from './geometry/derive.js';
import type { CageGeometry, DerivedMember } from './geometry/derive.js';
import { GEOMETRY_FACT_NAMES } from './geometry/derived-facts.js';
import type { Dimension } from './units.js';
import { bendRadiusRatio } from './tube.js';

/** How far a typed value may be from the model's before they "disagree" (canonical units). */
export const AGREEMENT_TOLERANCE: Partial<Record<Dimension, number>> = { length: 10, angle: 2, count: 0 };

export interface FactReading {
  facts: FactSet;
  /** Fact names whose value in `facts` came from the model. */
  fromModel: ReadonlySet<string>;
}

export interface Disagreement {
  fact: string;
  label: string;
  dimension: Dimension;
  modelValue: number;
  sheetValue: number;
  toleranceCanonical: number;
  /** The member the fact belongs to (member facts), else null. */
  memberId: string | null;
  /** Members the model value was read from, by the builder's names. */
  members: string[];
}

export interface Readings {
  /** Model values wherever the model gives one. */
  model: FactReading;
  /** Typed values wherever the sheet gives one (model values elsewhere); null when no value differs. */
  sheet: FactReading | null;
  disagreements: Disagreement[];
}

function combine(typed: FactSet, modelValues: Record<string, { value: number; members: string[] }>, memberId: string | null): Readings {
  const model: FactSet = { ...typed };
  const sheet: FactSet = { ...typed };
  const fromModel = new Set<string>();
  const fromModelInSheet = new Set<string>();
  const disagreements: Disagreement[] = [];
  let differs = false;
  for (const [name, mv] of Object.entries(modelValues)) {
    model[name] = mv.value;
    fromModel.add(name);
    const t = typed[name];
    if (typeof t !== 'number') {
      sheet[name] = mv.value;
      fromModelInSheet.add(name);
      continue;
    }
    if (t !== mv.value) differs = true;
    const def = FACTS_BY_NAME.get(name);
    const dim = def?.dimension;
    const tol = dim === undefined ? undefined : AGREEMENT_TOLERANCE[dim];
    if (dim !== undefined && tol !== undefined && Math.abs(t - mv.value) > tol + 1e-9)
      disagreements.push({ fact: name, label: def?.label ?? name, dimension: dim, modelValue: mv.value, sheetValue: t, toleranceCanonical: tol, memberId, members: mv.members });
  }
  return { model: { facts: model, fromModel }, sheet: differs ? { facts: sheet, fromModel: fromModelInSheet } : null, disagreements };
}

/** Vehicle-scope readings: the typed facts with the model's geometry facts. */
export function vehicleReadings(typed: FactSet, geo: CageGeometry | null): Readings {
  const values: Record<string, { value: number; members: string[] }> = {};
  for (const name of GEOMETRY_FACT_NAMES) {
    const f = geo?.facts[name];
    if (f) values[name] = f;
  }
  return combine(typed, values, null);
}

/** Member-scope readings: the model's length and bends; typed bends keep their ovality readings. */
export function memberReadings(typed: FactSet, m: SpecMember, dm: DerivedMember | undefined): Readings {
  if (!dm) return combine(typed, {}, m.id);
  const values: Record<string, { value: number; members: string[] }> = {
    'member.lengthMm': { value: dm.developedLengthMm, members: [dm.name] },
    'member.bendCount': { value: dm.bends.length, members: [dm.name] },
  };
  if (dm.bends.length > 0) {
    const minClr = Math.min(...dm.bends.map((b) => b.clrMm));
    values['member.minBendClrMm'] = { value: minClr, members: [dm.name] };
    values['member.minBendRadiusOverOd'] = { value: bendRadiusRatio(minClr, m.odMm), members: [dm.name] };
  }
  const r = combine(typed, values, m.id);
  // A straight tube has nothing to be oval; with model bends and no typed diameters it stays unknown.
  if (dm.bends.length === 0 && (m.bends === undefined || m.bends.length === 0)) {
    r.model.facts['member.minOvality'] = 1;
    if (r.sheet) r.sheet.facts['member.minOvality'] = 1;
  }
  // The ratio follows the radius: one disagreement is enough to report.
  r.disagreements = r.disagreements.filter((d) => d.fact !== 'member.minBendRadiusOverOd');
  return r;
}

/** The model's developed length per member id, for tube data and masses. */
export function modelLengths(spec: Specification, geo: CageGeometry | null): Map<string, number> {
  const out = new Map<string, number>();
  if (!geo) return out;
  for (const m of geo.members) if (spec.members[m.index]?.id === m.memberId) out.set(m.memberId, m.developedLengthMm);
  return out;
}

/**
 * The model's derived values with the sheet's disagreements, without a ruleset: what
 * report.geometry carries and POST /api/geometry/derive returns.
 */
export function describeCageGeometry(spec: Specification): CageGeometry & { disagreements: Disagreement[] } {
  const geo = deriveCageGeometry(spec);
  const typed: FactSet = {};
  const g = (spec.geometry ?? {}) as Record<string, number | undefined>;
  for (const name of GEOMETRY_FACT_NAMES) typed[name] = g[name.slice('geometry.'.length)];
  const disagreements = [...vehicleReadings(typed, geo).disagreements];
  const byId = new Map(geo.members.map((d) => [d.memberId, d]));
  spec.members.forEach((m, i) => {
    const dm = byId.get(m.id);
    if (dm) disagreements.push(...memberReadings(memberFacts(spec, m, memberTubeData(m, i, dm.developedLengthMm)), m, dm).disagreements);
  });
  return { ...geo, disagreements };
}
