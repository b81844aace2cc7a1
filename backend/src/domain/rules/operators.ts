// Comparison operators: the names documents may use, how they map onto json-rules-engine's, and
// how a ruleset's measurement tolerance and floating-point slack are folded into the compared
// value at compile time (so the engine itself compares plain numbers).
import { Operator } from 'json-rules-engine';
import { epsilonFor } from '../units.js';

/** json-rules-engine's built-in operators that documents may write in `conditions`. */
export const ENGINE_OPERATORS = [
  'equal', 'notEqual', 'lessThan', 'lessThanInclusive', 'greaterThan', 'greaterThanInclusive',
  'in', 'notIn', 'contains', 'doesNotContain',
] as const;
export type EngineOperator = (typeof ENGINE_OPERATORS)[number];

/** Operators shown to people in reports (and used by the `limit` template). */
export type FriendlyOperator = 'atLeast' | 'atMost' | 'above' | 'below' | 'equals' | 'notEquals' | 'oneOf' | 'noneOf' | 'includes' | 'excludes';

export const FRIENDLY_FROM_ENGINE: Readonly<Record<EngineOperator, FriendlyOperator>> = {
  equal: 'equals', notEqual: 'notEquals', lessThan: 'below', lessThanInclusive: 'atMost', greaterThan: 'above',
  greaterThanInclusive: 'atLeast', in: 'oneOf', notIn: 'noneOf', contains: 'includes', doesNotContain: 'excludes',
};

export const ENGINE_FROM_LIMIT: Readonly<Record<'atLeast' | 'atMost' | 'above' | 'below' | 'equals' | 'notEquals', EngineOperator>> = {
  atLeast: 'greaterThanInclusive', atMost: 'lessThanInclusive', above: 'greaterThan', below: 'lessThan', equals: 'equal', notEquals: 'notEqual',
};

export const NUMERIC_OPERATORS: ReadonlySet<string> = new Set(['equal', 'notEqual', 'lessThan', 'lessThanInclusive', 'greaterThan', 'greaterThanInclusive']);
export const EQUALITY_OPERATORS: ReadonlySet<string> = new Set(['equal', 'notEqual']);
export const MEMBERSHIP_OPERATORS: ReadonlySet<string> = new Set(['in', 'notIn']);
export const LIST_OPERATORS: ReadonlySet<string> = new Set(['contains', 'doesNotContain']);

/** Custom engine operators for numeric equality within tolerance: value is [target, slack]. */
export const NEAR = 'cwNear';
export const NOT_NEAR = 'cwNotNear';

const isNumber = (x: unknown): x is number => typeof x === 'number' && Number.isFinite(x);
const near = (a: number, v: unknown): boolean => Array.isArray(v) && isNumber(v[0]) && isNumber(v[1]) && Math.abs(a - v[0]) <= v[1];

/**
 * Dates are "YYYY-MM-DD" text, which orders correctly as text; the engine's own lessThan only
 * takes numbers, so date comparisons get operators of their own.
 */
export const DATE_OPERATORS: Readonly<Partial<Record<EngineOperator, string>>> = {
  lessThan: 'cwDateBefore', lessThanInclusive: 'cwDateOnOrBefore', greaterThan: 'cwDateAfter', greaterThanInclusive: 'cwDateOnOrAfter',
  equal: 'cwDateOn', notEqual: 'cwDateNotOn',
};
export const isDateText = (x: unknown): x is string => typeof x === 'string' && /^\d{4}-\d{2}-\d{2}$/.test(x);

/** The date operators' comparisons, shared by the engine and the plain-code reader (plain.ts). */
export const DATE_COMPARISONS: Readonly<Record<string, (a: string, b: string) => boolean>> = {
  cwDateBefore: (a, b) => a < b, cwDateOnOrBefore: (a, b) => a <= b, cwDateAfter: (a, b) => a > b,
  cwDateOnOrAfter: (a, b) => a >= b, cwDateOn: (a, b) => a === b, cwDateNotOn: (a, b) => a !== b,
};

export function customOperators(): Operator[] {
  return [
    new Operator<number, unknown>(NEAR, (a, v) => near(a, v), isNumber),
    new Operator<number, unknown>(NOT_NEAR, (a, v) => !near(a, v), isNumber),
    ...Object.entries(DATE_COMPARISONS).map(([name, cmp]) => new Operator<string, unknown>(name, (a, v) => cmp(a, String(v)), isDateText)),
  ];
}

/**
 * The engine operator and compared value for a numeric comparison against a canonical `target`.
 * A value within `tolerance` of the limit counts as meeting it; epsilon absorbs conversion noise.
 */
export function numericComparison(op: EngineOperator, target: number, tolerance: number): { operator: string; value: unknown } {
  const eps = epsilonFor(target);
  switch (op) {
    case 'greaterThanInclusive': return { operator: op, value: target - tolerance - eps };
    case 'greaterThan': return { operator: op, value: target - tolerance + eps };
    case 'lessThanInclusive': return { operator: op, value: target + tolerance + eps };
    case 'lessThan': return { operator: op, value: target + tolerance - eps };
    case 'equal': return { operator: NEAR, value: [target, tolerance + eps] };
    case 'notEqual': return { operator: NOT_NEAR, value: [target, tolerance + eps] };
    default: throw new Error(`${op} is not a numeric comparison`);
  }
}
