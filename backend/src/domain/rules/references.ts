// Comparisons whose limit is another value of the same check: k × another fact (proportional
// limits) and the OD or wall of other members (member against member). The engine sees one dynamic
// fact, REF_FACT, that reads the other value at run time and returns it scaled and shifted by the
// document's tolerance the same way numericComparison shifts a fixed limit; the other members'
// sizes are facts of the vehicle computed in plain code (peerFacts), named by peerFactName.
import type { Specification } from '../../contracts/specification.js';
import type { FactSet } from '../facts.js';
import { FACTS_BY_NAME } from '../facts.js';
import { formatQuantity } from '../units.js';
import type { Dimension, UnitSystem } from '../units.js';
import { factLabel, parsePeer, peerFactName, referenceLabel } from './reference-words.js';
import type { PeerMeasure, PeerStat } from './reference-words.js';
import { numericComparison } from './operators.js';
import type { EngineOperator } from './operators.js';

export const REF_FACT = 'rule.reference';

export interface RefParams {
  /** The fact the limit is a multiple of. */
  fact: string;
  /** k, canonical (a plain factor, or canonical mm when k is a length). */
  k: number;
  op: EngineOperator;
  tolerance: number;
}

/** The value the engine compares with: k × the other value, shifted like a fixed limit. */
export function referenceValue(params: RefParams, other: unknown): number | undefined {
  if (typeof other !== 'number' || !Number.isFinite(other)) return undefined;
  return numericComparison(params.op, params.k * other, params.tolerance).value as number;
}

/** The fact a compared value depends on: `{ fact }`, or the other fact behind REF_FACT. */
export function referencedFact(value: unknown): string | undefined {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) return undefined;
  const v = value as { fact?: unknown; params?: { fact?: unknown } };
  if (v.fact === REF_FACT) return typeof v.params?.fact === 'string' ? v.params.fact : undefined;
  return typeof v.fact === 'string' ? v.fact : undefined;
}

// Other members ---------------------------------------------------------------------------------

export { factLabel, peerFactName, referenceLabel };
export type { PeerMeasure, PeerStat };

/** The smallest / largest OD or wall of the members of some kinds; missing when there are none. */
export function peerFacts(spec: Specification, names: Iterable<string>): FactSet {
  const out: FactSet = {};
  for (const name of names) {
    const p = parsePeer(name);
    if (!p) continue;
    const values = spec.members.filter((m) => p.kinds.includes(m.kind)).map((m) => (p.measure === 'od' ? m.odMm : m.wallMm));
    out[name] = values.length === 0 ? undefined : p.stat === 'min' ? Math.min(...values) : Math.max(...values);
  }
  return out;
}

/** The limit side of a comparison with another value, in the reader's units: "2 × OD of the attached member (1.500 in)". */
export function describeReference(value: { fact: string; times?: number; timesDimension?: Dimension | null }, facts: FactSet, dimension: Dimension | null, system: UnitSystem): string {
  const label = factLabel(value.fact);
  const other = facts[value.fact];
  const otherDim = FACTS_BY_NAME.get(value.fact)?.dimension ?? (parsePeer(value.fact) ? 'length' : null);
  const shown = typeof other === 'number' && otherDim ? ` (${formatQuantity(other, otherDim, system).text})` : '';
  if (value.times === undefined) return `the ${label}${shown}`;
  const k = value.timesDimension ? formatQuantity(value.times, value.timesDimension, system).text : String(value.times);
  const product = typeof other === 'number' && dimension ? ` = ${formatQuantity(value.times * other, dimension, system).text}` : '';
  return `${k} × ${label}${shown}${product}`;
}
