// Words for a comparison with another value of the check: k × another fact ("2 × OD of the
// attached member") or another member's size ("the largest OD of the main hoop"), and the names of
// those other members' size facts. No engine code here: the report screens and the PDF use it too.
import { FACTS_BY_NAME } from '../facts.js';
import { formatQuantity } from '../units.js';
import type { Dimension, UnitSystem } from '../units.js';
import { MEMBER_KINDS, MEMBER_KIND_LABELS } from '../vocabulary.js';
import type { MemberKind } from '../vocabulary.js';

export type PeerMeasure = 'od' | 'wall';
export type PeerStat = 'min' | 'max';
const PEER = /^peer\.(od|wall)\.(min|max)\.([a-z_+]+)$/;

export function peerFactName(measure: PeerMeasure, stat: PeerStat, kinds: readonly MemberKind[]): string {
  return `peer.${measure}.${stat}.${[...new Set(kinds)].sort().join('+')}`;
}

export function parsePeer(name: string): { measure: PeerMeasure; stat: PeerStat; kinds: MemberKind[] } | undefined {
  const m = PEER.exec(name);
  if (!m) return undefined;
  const kinds = m[3].split('+');
  if (!kinds.every((k) => (MEMBER_KINDS as readonly string[]).includes(k))) return undefined;
  return { measure: m[1] as PeerMeasure, stat: m[2] as PeerStat, kinds: kinds as MemberKind[] };
}

const kindsWords = (kinds: readonly MemberKind[]) => kinds.map((k) => MEMBER_KIND_LABELS[k]).join(' / ');

/** Words for a fact that is not in the catalogue (another member's size), or undefined. */
export function referenceLabel(name: string): string | undefined {
  const p = parsePeer(name);
  if (!p) return undefined;
  const what = p.measure === 'od' ? 'OD' : 'wall';
  return `${p.stat === 'min' ? 'smallest' : 'largest'} ${what} of the ${kindsWords(p.kinds)}`;
}

export const factLabel = (name: string): string => FACTS_BY_NAME.get(name)?.label ?? referenceLabel(name) ?? name;

/** A compared-with value in words, without its measured value: "2 × OD of the attached member". */
export function referenceWords(value: { fact: string; times?: number; timesDimension?: Dimension | null }, system: UnitSystem): string {
  const label = factLabel(value.fact);
  if (value.times === undefined) return `the ${label}`;
  const k = value.timesDimension ? formatQuantity(value.times, value.timesDimension, system).text : String(value.times);
  return `${k} × ${label}`;
}
