// What to ask for instead of a geometry measurement the cage model would give. On a sheet with a
// model, "measure the brace angle" is the wrong question: the model derives it once every brace has a
// path. So a missing geometry fact becomes what the model still needs (a member's path, the driver's
// shoulder height, the helmet), and is asked as the typed measurement only when the model cannot
// give it at all (the cage has no member of a kind the fact reads).
import type { MemberKind } from '../vocabulary.js';
import type { GeometryFactName } from './derived-facts.js';
import { GEOMETRY_FACT_NAMES } from './derived-facts.js';
import { memberNames, type NamedMember } from './names.js';
import type { CageNode, PathEntry } from './model.js';

export interface ModelAsk {
  fact: string;
  label: string;
  dimension: 'length' | null;
}

export interface ModelAskInput {
  members: readonly (NamedMember & { path?: readonly PathEntry[] })[];
  model?: { nodes: readonly CageNode[] };
  vehicle?: { driverShoulderHeightMm?: number; helmet?: unknown };
}

interface Need {
  /** Every member of each kind must have a path; a kind the cage lacks means the model cannot give it. */
  kinds: readonly MemberKind[];
  /** At least one of these kinds, and every member of those present, must have a path. */
  anyOf?: readonly MemberKind[];
  vehicle?: 'shoulders' | 'helmet';
  /** Every member must have a path (an unmodelled tube could be the nearest). */
  everyMember?: boolean;
}

/** What each derived fact reads (docs/geometry.md, "Geometry facts derived from the model"). */
const NEEDS: Readonly<Record<GeometryFactName, Need>> = {
  'geometry.rearBraceAttachBelowTopMm': { kinds: ['rear_brace', 'main_hoop'] },
  'geometry.rearBraceAngleFromVerticalDeg': { kinds: ['rear_brace'] },
  'geometry.rearBraceIncludedAngleDeg': { kinds: ['rear_brace', 'main_hoop'] },
  'geometry.hoopAboveHelmetMm': { kinds: ['main_hoop'], vehicle: 'helmet' },
  'geometry.helmetBelowHoopLineMm': { kinds: ['main_hoop'], anyOf: ['front_hoop', 'halo_hoop'], vehicle: 'helmet' },
  'geometry.hoopBehindHelmetMm': { kinds: ['main_hoop'], vehicle: 'helmet' },
  'geometry.mainHoopInsideWidthMm': { kinds: ['main_hoop'] },
  'geometry.harnessBarBelowShouldersMm': { kinds: ['harness_bar'], vehicle: 'shoulders' },
  'geometry.diagonalLowerEndFromNodeMm': { kinds: ['diagonal', 'main_hoop'] },
  'geometry.diagonalUpperEndFromNodeMm': { kinds: ['diagonal', 'rear_brace'] },
  'geometry.nearestTubeToHelmetMm': { kinds: [], everyMember: true, vehicle: 'helmet' },
};

const GEOMETRY = new Set<string>(GEOMETRY_FACT_NAMES);

export const SHOULDER_ASK: ModelAsk = { fact: 'vehicle.driverShoulderHeightMm', label: "driver's seated shoulder height (for the cage model)", dimension: 'length' };
export const HELMET_ASK: ModelAsk = { fact: 'vehicle.helmet', label: 'helmet position and size in the seat (for the cage model)', dimension: 'length' };

/** The ask for a member's path: one per member, so "measure next" lists each by the builder's name. */
export const pathAsk = (memberId: string, name: string): ModelAsk => ({ fact: `model.path.${memberId}`, label: `a path in the cage model for ${name}`, dimension: null });

/**
 * What to ask instead of `fact`, or null to ask for the fact itself (no model, not a model fact, or
 * nothing the model needs is missing, e.g. a brace whose top is not on the main hoop's path).
 */
export function modelAsks(input: ModelAskInput, fact: string): ModelAsk[] | null {
  if (!input.model || input.model.nodes.length === 0 || !GEOMETRY.has(fact)) return null;
  const need = NEEDS[fact as GeometryFactName];
  const names = memberNames(input.members);
  const unmodelled = new Set<number>();
  for (const kind of need.kinds) {
    const of = input.members.flatMap((m, i) => (m.kind === kind ? [i] : []));
    if (of.length === 0) return null;
    for (const i of of) if (!input.members[i]!.path) unmodelled.add(i);
  }
  if (need.anyOf) {
    const of = input.members.flatMap((m, i) => (need.anyOf!.includes(m.kind) ? [i] : []));
    if (of.length === 0) return null;
    for (const i of of) if (!input.members[i]!.path) unmodelled.add(i);
  }
  if (need.everyMember) input.members.forEach((m, i) => !m.path && unmodelled.add(i));
  const asks: ModelAsk[] = [];
  if (need.vehicle === 'shoulders' && input.vehicle?.driverShoulderHeightMm === undefined) asks.push(SHOULDER_ASK);
  if (need.vehicle === 'helmet' && input.vehicle?.helmet === undefined) asks.push(HELMET_ASK);
  for (const i of [...unmodelled].sort((a, b) => a - b)) asks.push(pathAsk(input.members[i]!.id, names[i]!));
  return asks.length > 0 ? asks : null;
}
