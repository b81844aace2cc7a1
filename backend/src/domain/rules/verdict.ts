// Three-valued reading of a json-rules-engine result tree. The engine treats a missing fact as a
// failed comparison, and `not` would turn that into a pass; here a comparison whose fact is missing
// is "unknown", so a finding can never pass on a value nobody measured (Kleene logic).
import { absentFacts, factPresent } from '../facts.js';
import type { FactSet } from '../facts.js';
import { referencedFact } from './references.js';

export type Tri = true | false | 'unknown';

export type ResultNode = Record<string, unknown> & {
  all?: ResultNode[];
  any?: ResultNode[];
  not?: ResultNode;
  name?: string;
  fact?: string;
  value?: unknown;
  result?: boolean;
  factResult?: unknown;
};


/** Evaluates a result node; every leaf whose fact is missing is added to `missing`. */
export function triState(node: ResultNode, facts: FactSet, missing: Set<string>): Tri {
  if (node.all) {
    let unknown = false;
    for (const child of node.all) {
      const r = triState(child, facts, missing);
      if (r === false) return false;
      if (r === 'unknown') unknown = true;
    }
    return unknown ? 'unknown' : true;
  }
  if (node.any) {
    let unknown = false;
    for (const child of node.any) {
      const r = triState(child, facts, missing);
      if (r === true) return true;
      if (r === 'unknown') unknown = true;
    }
    return unknown ? 'unknown' : false;
  }
  if (node.not) {
    const r = triState(node.not, facts, missing);
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
  // Not evaluated: the engine short-circuited past it. Only reachable where the outcome was
  // already settled, or settled by an unknown sibling, so "unknown" is safe.
  if (node.result === undefined) return 'unknown';
  return node.result === true;
}

/** Leaves of a result subtree, in document order. */
export function leavesOf(node: ResultNode, out: ResultNode[] = []): ResultNode[] {
  if (node.all) node.all.forEach((c) => leavesOf(c, out));
  else if (node.any) node.any.forEach((c) => leavesOf(c, out));
  else if (node.not) leavesOf(node.not, out);
  else out.push(node);
  return out;
}

/** The named child of a rule's top-level `all` ("when" or "requires"). */
export function namedPart(root: ResultNode, name: string): ResultNode | undefined {
  return root.all?.find((c) => c.name === name);
}
