// Plain-code reading of a compiled condition node, with the same three-valued logic the evaluator
// applies to engine results (verdict.ts): a comparison whose fact is missing is "unknown". Used where
// running json-rules-engine per candidate would be too slow (the tube chooser tries hundreds of
// sizes); the engine stays the authority for every report, and tests compare the two.
import { absentFacts, countOnSide, factPresent } from '../facts.js';
import type { FactSet, SideParam } from '../facts.js';
import { DATE_COMPARISONS, NEAR, NOT_NEAR, isDateText } from './operators.js';
import type { Tri } from './verdict.js';
import { walkPath } from './evaluate.js';
import { REF_FACT, referencedFact, referenceValue } from './references.js';
import type { RefParams } from './references.js';

/** A compiled node as compile.ts/templates.ts build it (all / any / not / comparison). */
export interface PlainNode {
  all?: PlainNode[];
  any?: PlainNode[];
  not?: PlainNode;
  name?: string;
  fact?: string;
  operator?: string;
  value?: unknown;
  path?: string;
  params?: Record<string, unknown>;
}

const isFactRef = (v: unknown): v is { fact: string } =>
  typeof v === 'object' && v !== null && !Array.isArray(v) && typeof (v as { fact?: unknown }).fact === 'string';

const num = (x: unknown): x is number => typeof x === 'number' && Number.isFinite(x);

/** The facts json-rules-engine computes at run time (evaluate.ts registers the same two). */
function factValue(facts: FactSet, node: PlainNode): unknown {
  const name = node.fact as string;
  if (name === 'member.odMarginOverTableMinimumMm') {
    const od = facts['member.odMm'];
    return typeof od === 'number' ? od - Number(node.params?.tableMinimumOdMm) : undefined;
  }
  if (name === 'vehicle.memberCountOnSide') {
    const r = countOnSide(facts, (node.params?.kinds as string[] | undefined) ?? [], (node.params?.side as SideParam | undefined) ?? 'left');
    return 'count' in r ? r.count : undefined;
  }
  if (name === 'vehicle.memberCountOfKinds') {
    const counts = (facts['vehicle.memberCounts'] ?? {}) as Record<string, number>;
    return ((node.params?.kinds as string[] | undefined) ?? []).reduce((s, k) => s + (counts[k] ?? 0), 0);
  }
  const v = facts[name];
  return node.path !== undefined && v !== null && typeof v === 'object' ? walkPath(v, node.path) : v;
}

function compare(op: string, a: unknown, b: unknown): boolean {
  switch (op) {
    case 'equal': return a === b;
    case 'notEqual': return a !== b;
    case 'lessThan': return num(a) && num(b) && a < b;
    case 'lessThanInclusive': return num(a) && num(b) && a <= b;
    case 'greaterThan': return num(a) && num(b) && a > b;
    case 'greaterThanInclusive': return num(a) && num(b) && a >= b;
    case 'in': return Array.isArray(b) && b.includes(a);
    case 'notIn': return Array.isArray(b) && !b.includes(a);
    case 'contains': return Array.isArray(a) && a.includes(b);
    case 'doesNotContain': return Array.isArray(a) && !a.includes(b);
    case NEAR:
    case NOT_NEAR: {
      if (!num(a) || !Array.isArray(b) || !num(b[0]) || !num(b[1])) return false;
      const near = Math.abs(a - b[0]) <= b[1];
      return op === NEAR ? near : !near;
    }
    default: {
      const date = DATE_COMPARISONS[op];
      if (date) return isDateText(a) && isDateText(b) && date(a, b);
      throw new Error(`Unknown compiled operator "${op}"`);
    }
  }
}

/** Evaluates a compiled node against facts; each missing fact it meets is added to `missing`. */
export function evaluatePlain(node: PlainNode, facts: FactSet, missing: Set<string>): Tri {
  if (node.all) {
    let unknown = false;
    for (const child of node.all) {
      const r = evaluatePlain(child, facts, missing);
      if (r === false) return false;
      if (r === 'unknown') unknown = true;
    }
    return unknown ? 'unknown' : true;
  }
  if (node.any) {
    let unknown = false;
    for (const child of node.any) {
      const r = evaluatePlain(child, facts, missing);
      if (r === true) return true;
      if (r === 'unknown') unknown = true;
    }
    return unknown ? 'unknown' : false;
  }
  if (node.not) {
    const r = evaluatePlain(node.not, facts, missing);
    return r === 'unknown' ? 'unknown' : !r;
  }
  const fact = node.fact as string;
  let absent = false;
  const needed = absentFacts(facts, fact, node.params);
  if (needed.length > 0) {
    for (const n of needed) missing.add(n);
    absent = true;
  }
  const ref = referencedFact(node.value);
  if (ref !== undefined && !factPresent(facts, ref)) {
    missing.add(ref);
    absent = true;
  }
  if (absent) return 'unknown';
  // k × another fact / another member's size: the same value the engine's REF_FACT computes.
  const b = isFactRef(node.value)
    ? node.value.fact === REF_FACT ? referenceValue((node.value as unknown as { params: RefParams }).params, facts[ref!]) : facts[node.value.fact]
    : node.value;
  return compare(node.operator as string, factValue(facts, node), b);
}
