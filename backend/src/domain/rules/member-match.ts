// Member against member (`member_match`): this member's OD or wall compared with every member of
// other kinds, e.g. "rear braces the same diameter and wall as the hoop" (F-NHRA-G1). "Equal" means
// within the document's length tolerance of the smallest and of the largest of them; "at least"
// means at least the largest; "at most", at most the smallest.
import type { MemberMatch, Requirement } from '../../contracts/ruleset.js';
import { MEMBER_KIND_LABELS } from '../vocabulary.js';
import { resolveFact } from './conditions.js';
import type { EngineNode, Path } from './conditions.js';
import { FRIENDLY_FROM_ENGINE } from './operators.js';
import type { EngineOperator } from './operators.js';
import { REF_FACT, peerFactName } from './references.js';
import type { PeerStat, RefParams } from './references.js';
import type { TemplateContext } from './templates.js';

const MEASURE_FACTS = { od: 'member.odMm', wall: 'member.wallMm' } as const;

export function compileMemberMatch(req: Requirement, r: MemberMatch, path: Path, ctx: TemplateContext): EngineNode | undefined {
  const own = req.scope.kind === 'member' ? req.scope.memberKinds : [];
  let ok = true;
  r.of.forEach((k, i) => {
    if (own.includes(k)) {
      ctx.problems.add([...path, 'of', i], `The ${MEMBER_KIND_LABELS[k]} is in this requirement's own scope: a member is compared with members of other kinds.`);
      ok = false;
    }
  });
  const seen = new Set<string>();
  const leaves: EngineNode[] = [];
  r.checks.forEach((c, i) => {
    if (seen.has(c.measure)) {
      ctx.problems.add([...path, 'checks', i, 'measure'], `The ${c.measure === 'od' ? 'OD' : 'wall'} is already compared.`);
      ok = false;
      return;
    }
    seen.add(c.measure);
    const fact = resolveFact(MEASURE_FACTS[c.measure], [...path, 'checks', i, 'measure'], ctx);
    if (!fact) { ok = false; return; }
    const sides: [EngineOperator, PeerStat][] =
      c.operator === 'equals' ? [['greaterThanInclusive', 'max'], ['lessThanInclusive', 'min']]
        : c.operator === 'atLeast' ? [['greaterThanInclusive', 'max']] : [['lessThanInclusive', 'min']];
    for (const [op, stat] of sides) {
      const peer = peerFactName(c.measure, stat, r.of);
      ctx.factsUsed.add(peer);
      const name = ctx.nextLeaf();
      const params: RefParams = { fact: peer, k: 1, op, tolerance: ctx.tolerance.length ?? 0 };
      ctx.leaves[name] = { fact: fact.name, label: fact.label, dimension: 'length', operator: FRIENDLY_FROM_ENGINE[op], value: { fact: peer } };
      leaves.push({ fact: fact.name, name, operator: op, value: { fact: REF_FACT, params } });
    }
  });
  return ok && leaves.length > 0 ? { all: leaves } : undefined;
}
