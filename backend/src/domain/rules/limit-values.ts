// The `limit` template's two richer value forms: k × another fact (proportional limits) and a
// grade from the ordered grade vocabulary. Plain numbers and yes/no go through compileLeaf.
import type { LimitCheck, ProportionalValue } from '../../contracts/ruleset.js';
import { toCanonical } from '../units.js';
import { GRADES, findGrade } from '../grades.js';
import { compileLeaf, resolveFact, resolveUnit } from './conditions.js';
import type { CompileContext, EngineNode, Path } from './conditions.js';
import { ENGINE_FROM_LIMIT, FRIENDLY_FROM_ENGINE } from './operators.js';
import { GRADE_FACTS, factorDimension } from './limit-forms.js';
import { REF_FACT } from './references.js';
import type { RefParams } from './references.js';

type Limit = LimitCheck['operator'];
const ORDER_OPERATORS: ReadonlySet<Limit> = new Set(['atLeast', 'atMost', 'above', 'below']);

export function compileProportional(c: LimitCheck & { value: ProportionalValue }, path: Path, ctx: CompileContext): EngineNode | undefined {
  const valuePath = [...path, 'value'];
  const fact = resolveFact(c.fact, [...path, 'fact'], ctx);
  const other = resolveFact(c.value.of, [...valuePath, 'of'], ctx);
  if (!fact || !other) return undefined;
  if (!ORDER_OPERATORS.has(c.operator)) {
    ctx.problems.add([...path, 'operator'], 'A limit of k × another value takes at least, at most, more than or less than.');
    return undefined;
  }
  if (c.unit !== undefined) {
    ctx.problems.add([...path, 'unit'], 'Give the unit of k inside the value: { "times": …, "unit": …, "of": … }.');
    return undefined;
  }
  const plain = (f: typeof fact) => f.type === 'number' && f.dimension !== undefined && f.params === undefined;
  if (!plain(fact)) {
    ctx.problems.add([...path, 'fact'], `"${fact.name}" is not a measurement, so it cannot be a multiple of another.`);
    return undefined;
  }
  if (!plain(other)) {
    ctx.problems.add([...valuePath, 'of'], `"${other.name}" is not a measurement a limit can be a multiple of.`);
    return undefined;
  }
  const a = fact.dimension!;
  const b = other.dimension!;
  const need = factorDimension(a, b);
  if (!need) {
    ctx.problems.add([...valuePath, 'of'], `"${fact.name}" is a ${a} and "${other.name}" a ${b}: a ${a} cannot be k × a ${b}. Compare with a fact of the same dimension, or an area with k × a length.`);
    return undefined;
  }
  let k = c.value.times;
  if (need === 'ratio' && c.value.unit !== undefined) {
    ctx.problems.add([...valuePath, 'unit'], `Both are ${a === 'ratio' ? 'ratios' : `${a}s`}, so k is a plain number: remove the unit.`);
    return undefined;
  }
  if (need === 'length') {
    if (c.value.unit === undefined) {
      ctx.problems.add([...valuePath, 'unit'], `An area as k × a length makes k a length: give its unit (e.g. "unit": "in" for "area at least 10 × OD" printed in inches).`);
      return undefined;
    }
    const unit = resolveUnit('length', c.value.unit, [...valuePath, 'unit'], ctx);
    if (!unit) return undefined;
    k = toCanonical(k, unit);
  }
  const op = ENGINE_FROM_LIMIT[c.operator];
  const name = ctx.nextLeaf();
  const params: RefParams = { fact: other.name, k, op, tolerance: ctx.tolerance[a] ?? 0 };
  ctx.leaves[name] = {
    fact: fact.name, label: c.label ?? fact.label, dimension: a, operator: FRIENDLY_FROM_ENGINE[op],
    value: { fact: other.name, times: k, timesDimension: need === 'ratio' ? null : 'length' },
  };
  return { fact: fact.name, name, operator: op, value: { fact: REF_FACT, params } };
}

/** "At least grade G": the grade's minimum yield and tensile strength must both reach G's. */
export function compileGradeFloor(c: LimitCheck, path: Path, ctx: CompileContext): EngineNode[] | undefined {
  const def = GRADE_FACTS[c.fact]!;
  if (!resolveFact(c.fact, [...path, 'fact'], ctx)) return undefined;
  if (c.operator !== 'atLeast') {
    ctx.problems.add([...path, 'operator'], 'A grade is compared with "at least": the grade on the sheet must be as strong as this one or stronger.');
    return undefined;
  }
  const grade = typeof c.value === 'string' ? findGrade(def.family, c.value) : undefined;
  if (!grade) {
    const known = GRADES[def.family].map((g) => g.name).join(', ');
    ctx.problems.add([...path, 'value'], `"${String(typeof c.value === 'object' ? JSON.stringify(c.value) : c.value)}" is not a ${def.family} grade in the vocabulary. Known, weakest first: ${known}.`);
    return undefined;
  }
  if (c.unit !== undefined) {
    ctx.problems.add([...path, 'unit'], 'A grade has no unit.');
    return undefined;
  }
  const what = def.family === 'bolt' ? 'bolt grade' : 'material grade';
  const yieldLeaf = compileLeaf({ fact: def.yieldFact, operator: 'greaterThanInclusive', value: grade.minYieldMpa, unit: 'MPa' }, path, ctx, `minimum yield of the ${what} (at least ${grade.name})`);
  const tensileLeaf = compileLeaf({ fact: def.tensileFact, operator: 'greaterThanInclusive', value: grade.minTensileMpa, unit: 'MPa' }, path, ctx, `minimum tensile strength of the ${what} (at least ${grade.name})`);
  return yieldLeaf && tensileLeaf ? [yieldLeaf, tensileLeaf] : undefined;
}
