// Checks and compiles json-rules-engine conditions written in a ruleset document (the `conditions`
// template and `appliesTo.when`): every fact must be in the catalogue and in scope, every operator
// must suit the fact, values are converted from document units to canonical once, and each leaf
// gets a name so the evaluator can find its metadata in the engine's result tree.
import type { Dimension, UnitSystem } from '../units.js';
import { DEFAULT_UNIT, isUnitName, toCanonical, unitDimension } from '../units.js';
import { FACTS_BY_NAME, SIDE_PARAMS, factAvailableIn } from '../facts.js';
import { isIsoDate } from '../dates.js';
import type { FactDefinition, FactScope } from '../facts.js';
import { MEMBER_KINDS, MEMBER_KIND_PLURAL_LABELS } from '../vocabulary.js';
import type { MemberKind } from '../vocabulary.js';
import { DATE_OPERATORS, ENGINE_OPERATORS, EQUALITY_OPERATORS, FRIENDLY_FROM_ENGINE, LIST_OPERATORS, MEMBERSHIP_OPERATORS, NUMERIC_OPERATORS, numericComparison } from './operators.js';
import type { EngineOperator } from './operators.js';
import type { LeafMeta } from './types.js';
import { RULESET_LIMITS } from '../../contracts/ruleset.js';

export type Path = (string | number)[];

export interface Problems {
  add(path: Path, message: string): void;
}

export interface CompileContext {
  system: UnitSystem;
  scope: FactScope;
  tolerance: Partial<Record<Dimension, number>>;
  problems: Problems;
  leaves: Record<string, LeafMeta>;
  factsUsed: Set<string>;
  nextLeaf: () => string;
  leafCount: number;
}

/** A compiled condition node as json-rules-engine takes it. */
export type EngineNode = Record<string, unknown>;

const LEAF_KEYS = new Set(['fact', 'operator', 'value', 'path', 'params', 'unit', 'priority']);
const BOOL_KEYS = new Set(['all', 'any', 'not', 'priority']);

const isRecord = (x: unknown): x is Record<string, unknown> => typeof x === 'object' && x !== null && !Array.isArray(x);

/** Looks a fact up and reports why it cannot be used here; undefined when unusable. */
export function resolveFact(name: unknown, path: Path, ctx: CompileContext): FactDefinition | undefined {
  if (typeof name !== 'string' || name === '') {
    ctx.problems.add(path, 'A fact name is required.');
    return undefined;
  }
  const fact = FACTS_BY_NAME.get(name);
  if (!fact) {
    ctx.problems.add(path, `Unknown fact "${name}". See the fact catalogue in docs/rulesets.md.`);
    return undefined;
  }
  if (!factAvailableIn(fact, ctx.scope)) {
    ctx.problems.add(path, `"${name}" is a ${fact.scope} fact; this requirement is scoped to ${ctx.scope === 'vehicle' ? 'the vehicle' : `each ${ctx.scope}`}.`);
    return undefined;
  }
  ctx.factsUsed.add(name);
  return fact;
}

/** Checks `path`/`params` for the facts that take them; returns the engine's copies. */
function factAddressing(fact: FactDefinition, node: Record<string, unknown>, path: Path, ctx: CompileContext): { path?: string; params?: Record<string, unknown> } | undefined {
  const out: { path?: string; params?: Record<string, unknown> } = {};
  let ok = true;
  if (fact.type === 'counts') {
    if (typeof node.path !== 'string' || !(MEMBER_KINDS as readonly string[]).includes(node.path)) {
      ctx.problems.add([...path, 'path'], `"${fact.name}" needs \`path\` set to a member kind (${MEMBER_KINDS.join(', ')}).`);
      ok = false;
    } else out.path = node.path;
  } else if (node.path !== undefined) {
    ctx.problems.add([...path, 'path'], `"${fact.name}" does not take a path.`);
    ok = false;
  }
  if (fact.params === 'kinds') {
    const kinds = isRecord(node.params) ? node.params.kinds : undefined;
    if (!Array.isArray(kinds) || kinds.length === 0 || !kinds.every((k) => (MEMBER_KINDS as readonly unknown[]).includes(k))) {
      ctx.problems.add([...path, 'params', 'kinds'], `"${fact.name}" needs params.kinds: a list of member kinds.`);
      ok = false;
    } else out.params = { kinds: [...new Set(kinds as string[])].sort() };
  } else if (fact.params === 'kindsOnSide') {
    const kinds = isRecord(node.params) ? node.params.kinds : undefined;
    const side = isRecord(node.params) ? node.params.side : undefined;
    if (!Array.isArray(kinds) || kinds.length === 0 || !kinds.every((k) => (MEMBER_KINDS as readonly unknown[]).includes(k))) {
      ctx.problems.add([...path, 'params', 'kinds'], `"${fact.name}" needs params.kinds: a list of member kinds.`);
      ok = false;
    }
    if (typeof side !== 'string' || !(SIDE_PARAMS as readonly string[]).includes(side)) {
      ctx.problems.add([...path, 'params', 'side'], `"${fact.name}" needs params.side: one of ${SIDE_PARAMS.join(', ')}.`);
      ok = false;
    }
    if (ok) out.params = { kinds: [...new Set(kinds as string[])].sort(), side };
  } else if (fact.params === 'tableMinimumOdMm') {
    const min = isRecord(node.params) ? node.params.tableMinimumOdMm : undefined;
    if (typeof min !== 'number' || !(min > 0)) {
      ctx.problems.add([...path, 'params', 'tableMinimumOdMm'], `"${fact.name}" needs params.tableMinimumOdMm (mm, greater than zero).`);
      ok = false;
    } else out.params = { tableMinimumOdMm: min };
  } else if (node.params !== undefined) {
    ctx.problems.add([...path, 'params'], `"${fact.name}" does not take params.`);
    ok = false;
  }
  return ok ? out : undefined;
}

/** "on the left", "on the driver's side"… for per-side counts. */
export function sideWords(side: string): string {
  return side === 'driver' ? "on the driver's side" : side === 'passenger' ? "on the passenger's side" : `on the ${side}`;
}

/** Resolves the unit a numeric value is written in; reports a bad one. */
export function resolveUnit(dimension: Dimension, unit: unknown, path: Path, ctx: Pick<CompileContext, 'system' | 'problems'>): string | undefined {
  if (unit === undefined) return DEFAULT_UNIT[ctx.system][dimension];
  if (typeof unit !== 'string' || !isUnitName(unit)) {
    ctx.problems.add(path, `Unknown unit "${String(unit)}".`);
    return undefined;
  }
  if (unitDimension(unit) !== dimension) {
    ctx.problems.add(path, `"${unit}" is not a unit of ${dimension.replace(/_/g, ' ')}.`);
    return undefined;
  }
  return unit;
}

export interface LeafInput {
  fact: unknown;
  operator: unknown;
  value: unknown;
  path?: unknown;
  params?: unknown;
  unit?: unknown;
  priority?: unknown;
}

/** Validates and compiles one comparison. `operator` must already be an engine operator name. */
export function compileLeaf(input: LeafInput, path: Path, ctx: CompileContext, label?: string): EngineNode | undefined {
  const fact = resolveFact(input.fact, [...path, 'fact'], ctx);
  const op = input.operator;
  if (typeof op !== 'string' || !(ENGINE_OPERATORS as readonly string[]).includes(op)) {
    ctx.problems.add([...path, 'operator'], `Unknown operator "${String(op)}". Use one of: ${ENGINE_OPERATORS.join(', ')}.`);
    return undefined;
  }
  if (!fact) return undefined;
  const operator = op as EngineOperator;
  const addressing = factAddressing(fact, input as unknown as Record<string, unknown>, path, ctx);
  if (!addressing) return undefined;
  const valuePath = [...path, 'value'];
  const name = ctx.nextLeaf();
  const base: EngineNode = { fact: fact.name, name, ...addressing };
  if (typeof input.priority === 'number' && Number.isInteger(input.priority) && input.priority > 0) base.priority = input.priority;
  const onSide = fact.params === 'kindsOnSide' && addressing.params ? (addressing.params as { kinds: MemberKind[]; side: string }) : undefined;
  const defaultLabel = addressing.path
    ? `number of ${MEMBER_KIND_PLURAL_LABELS[addressing.path as MemberKind]}`
    : onSide ? `number of ${onSide.kinds.map((k) => MEMBER_KIND_PLURAL_LABELS[k]).join(' / ')} ${sideWords(onSide.side)}` : fact.label;
  const metaBase = {
    fact: fact.name, label: label ?? defaultLabel, operator: FRIENDLY_FROM_ENGINE[operator], ...(addressing.path ? { path: addressing.path } : {}),
    ...(onSide ? { paramsKey: `${onSide.kinds.join(',')}@${onSide.side}` } : {}),
  };
  const value = input.value;
  const isNumericFact = fact.type === 'number' || fact.type === 'counts';

  // A value may name another fact of the same kind (compared as is, without tolerance).
  if (isRecord(value)) {
    const keys = Object.keys(value);
    if (keys.length !== 1 || keys[0] !== 'fact') {
      ctx.problems.add(valuePath, 'A value object may only be { "fact": "<name>" }.');
      return undefined;
    }
    const other = resolveFact(value.fact, [...valuePath, 'fact'], ctx);
    if (!other) return undefined;
    if (other.type !== fact.type || other.dimension !== fact.dimension || other.type === 'counts' || other.params) {
      ctx.problems.add([...valuePath, 'fact'], `"${other.name}" cannot be compared with "${fact.name}" (different kind of value).`);
      return undefined;
    }
    if (!(NUMERIC_OPERATORS.has(operator) || (EQUALITY_OPERATORS.has(operator) && fact.type !== 'list'))) {
      ctx.problems.add([...path, 'operator'], `"${operator}" cannot compare two facts.`);
      return undefined;
    }
    ctx.leaves[name] = { ...metaBase, dimension: fact.dimension ?? null, value: { fact: other.name } };
    return { ...base, operator, value: { fact: other.name } };
  }
  if (fact.type === 'date') {
    if (input.unit !== undefined) {
      ctx.problems.add([...path, 'unit'], `"${fact.name}" is a date and has no unit.`);
      return undefined;
    }
    if (!DATE_OPERATORS[operator]) {
      ctx.problems.add([...path, 'operator'], `"${operator}" does not apply to the date "${fact.name}": compare it before / after a date.`);
      return undefined;
    }
    if (!isIsoDate(value)) {
      ctx.problems.add(valuePath, `"${fact.name}" is compared with a date written YYYY-MM-DD (got ${JSON.stringify(value)}).`);
      return undefined;
    }
    ctx.leaves[name] = { ...metaBase, dimension: null, value, date: true };
    return { ...base, operator: DATE_OPERATORS[operator], value };
  }
  if (input.unit !== undefined && !(isNumericFact && fact.dimension)) {
    ctx.problems.add([...path, 'unit'], `"${fact.name}" has no unit.`);
    return undefined;
  }

  if (isNumericFact) {
    if (!NUMERIC_OPERATORS.has(operator)) {
      ctx.problems.add([...path, 'operator'], `"${operator}" does not apply to the number "${fact.name}".`);
      return undefined;
    }
    if (typeof value !== 'number' || !Number.isFinite(value)) {
      ctx.problems.add(valuePath, `"${fact.name}" is compared with a number.`);
      return undefined;
    }
    const dimension = fact.dimension ?? 'count';
    const unit = resolveUnit(dimension, input.unit, [...path, 'unit'], ctx);
    if (!unit) return undefined;
    const canonical = toCanonical(value, unit);
    const { operator: engineOp, value: engineValue } = numericComparison(operator, canonical, ctx.tolerance[dimension] ?? 0);
    ctx.leaves[name] = { ...metaBase, dimension, value: canonical };
    return { ...base, operator: engineOp, value: engineValue };
  }
  if (fact.type === 'boolean') {
    if (!EQUALITY_OPERATORS.has(operator) || typeof value !== 'boolean') {
      ctx.problems.add(typeof value !== 'boolean' ? valuePath : [...path, 'operator'], `"${fact.name}" is true or false: use equal / notEqual with true or false.`);
      return undefined;
    }
    ctx.leaves[name] = { ...metaBase, dimension: null, value };
    return { ...base, operator, value };
  }
  if (fact.type === 'list') {
    if (!LIST_OPERATORS.has(operator)) {
      ctx.problems.add([...path, 'operator'], `"${fact.name}" is a list: use contains / doesNotContain.`);
      return undefined;
    }
    if (typeof value !== 'string' || (fact.values && !fact.values.includes(value))) {
      ctx.problems.add(valuePath, `"${String(value)}" is not a possible entry of "${fact.name}"${fact.values ? ` (${fact.values.join(', ')})` : ''}.`);
      return undefined;
    }
    ctx.leaves[name] = { ...metaBase, dimension: null, value };
    return { ...base, operator, value };
  }
  // enum and text
  const allowedText = (v: unknown): v is string => typeof v === 'string' && v.length > 0 && v.length <= 60 && (!fact.values || fact.values.includes(v));
  const bad = (v: unknown) => `"${String(v)}" is not a value of "${fact.name}"${fact.values ? ` (${fact.values.join(', ')})` : ''}.`;
  if (EQUALITY_OPERATORS.has(operator)) {
    if (!allowedText(value)) {
      ctx.problems.add(valuePath, bad(value));
      return undefined;
    }
    ctx.leaves[name] = { ...metaBase, dimension: null, value };
    return { ...base, operator, value };
  }
  if (MEMBERSHIP_OPERATORS.has(operator)) {
    if (!Array.isArray(value) || value.length === 0 || value.length > RULESET_LIMITS.values) {
      ctx.problems.add(valuePath, `"${operator}" needs a list of 1–${RULESET_LIMITS.values} values.`);
      return undefined;
    }
    const wrong = value.findIndex((v) => !allowedText(v));
    if (wrong >= 0) {
      ctx.problems.add([...valuePath, wrong], bad(value[wrong]));
      return undefined;
    }
    const list = value as string[];
    ctx.leaves[name] = { ...metaBase, dimension: null, value: list };
    return { ...base, operator, value: list };
  }
  ctx.problems.add([...path, 'operator'], `"${operator}" does not apply to "${fact.name}".`);
  return undefined;
}

/** Validates and compiles a raw condition tree (all / any / not / comparisons). */
export function compileConditionTree(node: unknown, path: Path, ctx: CompileContext, depth = 1, topLevel = true): EngineNode | undefined {
  if (depth > RULESET_LIMITS.conditionDepth) {
    ctx.problems.add(path, `Conditions may nest at most ${RULESET_LIMITS.conditionDepth} levels deep.`);
    return undefined;
  }
  if (!isRecord(node)) {
    ctx.problems.add(path, 'A condition must be an object: { "all": [...] }, { "any": [...] }, { "not": {...} } or a comparison.');
    return undefined;
  }
  if ('condition' in node) {
    ctx.problems.add([...path, 'condition'], 'Named condition references are not supported; write the condition out.');
    return undefined;
  }
  const bools = ['all', 'any', 'not'].filter((k) => k in node);
  if (bools.length > 1) {
    ctx.problems.add(path, 'Use only one of "all", "any" or "not" in one condition.');
    return undefined;
  }
  if (bools.length === 0) {
    if (topLevel) {
      ctx.problems.add(path, 'The top level must be { "all": [...] }, { "any": [...] } or { "not": {...} }.');
      return undefined;
    }
    for (const key of Object.keys(node)) if (!LEAF_KEYS.has(key)) ctx.problems.add([...path, key], `Unknown property "${key}" in a comparison.`);
    for (const key of ['fact', 'operator', 'value']) if (!(key in node)) ctx.problems.add([...path, key], 'Required');
    if (!('fact' in node && 'operator' in node && 'value' in node)) return undefined;
    ctx.leafCount += 1;
    if (ctx.leafCount > RULESET_LIMITS.conditionLeaves) {
      ctx.problems.add(path, `A requirement may hold at most ${RULESET_LIMITS.conditionLeaves} comparisons.`);
      return undefined;
    }
    return compileLeaf(node as unknown as LeafInput, path, ctx);
  }
  const op = bools[0] as 'all' | 'any' | 'not';
  for (const key of Object.keys(node)) if (!BOOL_KEYS.has(key)) ctx.problems.add([...path, key], `Unknown property "${key}".`);
  const priority = typeof node.priority === 'number' && Number.isInteger(node.priority) && node.priority > 0 ? { priority: node.priority } : {};
  if (op === 'not') {
    const inner = compileConditionTree(node.not, [...path, 'not'], ctx, depth + 1, false);
    return inner ? { not: inner, ...priority } : undefined;
  }
  const list = node[op];
  if (!Array.isArray(list) || list.length === 0) {
    ctx.problems.add([...path, op], `"${op}" needs a non-empty list of conditions.`);
    return undefined;
  }
  const children = list.map((child, i) => compileConditionTree(child, [...path, op, i], ctx, depth + 1, false));
  if (children.some((c) => c === undefined)) return undefined;
  return { [op]: children, ...priority };
}
