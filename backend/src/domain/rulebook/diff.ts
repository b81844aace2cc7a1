// What changed between two ruleset documents, in words a club admin or builder reads at a glance:
// "Club Saloon: C4.2.2 band up to 2,200 lb, mild steel: minimum wall for 1.500 in OD 0.095 → 0.120 in".
// Values are compared in canonical units and shown in the reader's unit system. The order is
// fixed: rulebook identity, policy, printed equivalents, classes, then requirements in the new
// document's order with removed ones last, so the same two documents always give the same list.
import type { RequirementArea, Requirement, RulesetClass, RulesetDocument, StrengthMeasure } from '../../contracts/ruleset.js';
import type { Dimension, UnitSystem } from '../units.js';
import { FACTS_BY_NAME } from '../facts.js';
import {
  changedJsonPaths,
  kindsText,
  valueWord,
  pathsText,
  quantity,
  quoted,
  canonical,
  sameNumber,
  sameSize,
  sizeText,
} from './diff-format.js';
import type { Side } from './diff-format.js';
import { describeRequiresChanges } from './diff-requires.js';
import type { ChangeKind } from './diff-requires.js';

export type { ChangeKind } from './diff-requires.js';
export type ChangeArea = 'rulebook' | 'policy' | 'class' | RequirementArea;

export interface RulesetChange {
  area: ChangeArea;
  kind: ChangeKind;
  text: string;
  /** Set for class changes, and for requirement changes that concern exactly one class. */
  classId?: string;
  /** The classes a requirement change concerns when the requirement names them. */
  classIds?: string[];
  requirementId?: string;
  before?: string;
  after?: string;
  /** Changed JSON paths, for raw conditions. */
  paths?: string[];
}

export interface DescribeOptions {
  /** The reader's unit system; default: the newer document's. */
  unitSystem?: UnitSystem;
}

type Extra = Pick<RulesetChange, 'before' | 'after' | 'paths' | 'classId' | 'classIds' | 'requirementId'>;

export function describeRulesetChanges(
  before: RulesetDocument,
  after: RulesetDocument,
  options: DescribeOptions = {},
): RulesetChange[] {
  const display = options.unitSystem ?? after.unitSystem;
  const sa: Side = { system: before.unitSystem, display };
  const sb: Side = { system: after.unitSystem, display };
  const out: RulesetChange[] = [];
  const push = (area: ChangeArea, kind: ChangeKind, text: string, extra: Extra = {}) => {
    const item: RulesetChange = { area, kind, text };
    for (const [k, v] of Object.entries(extra))
      if (v !== undefined) (item as unknown as Record<string, unknown>)[k] = v;
    out.push(item);
  };
  identity(before, after, push);
  policy(before, sa, after, sb, push);
  classes(before.classes, sa, after.classes, sb, push);
  requirements(before, sa, after, sb, push);
  return out;
}

type Push = (area: ChangeArea, kind: ChangeKind, text: string, extra?: Extra) => void;

const MEASURE_TEXT: Readonly<Record<StrengthMeasure, string>> = { section_modulus: 'section modulus', bending_strength: 'bending strength (yield × Z)' };

/**
 * Equivalence by strength in the compare view: whether it is accepted, by which measure, the
 * listed sizes' yield and the least wall. An omitted option reads as "not accepted, by section
 * modulus", so adding it switched off changes nothing a check decides and says nothing.
 */
function strengthEquivalents(a: RulesetDocument, sa: Side, b: RulesetDocument, sb: Side, push: Push): void {
  const x = a.strengthEquivalents ?? { accept: false, measure: 'section_modulus' as const };
  const y = b.strengthEquivalents ?? { accept: false, measure: 'section_modulus' as const };
  const state = (s: typeof x) => (s.accept ? `accepted by ${MEASURE_TEXT[s.measure]}` : 'not accepted');
  if (x.accept !== y.accept)
    push('policy', 'changed', y.accept ? `Equivalents by strength now accepted, by ${MEASURE_TEXT[y.measure]}` : 'Equivalents by strength no longer accepted (advice only)', { before: state(x), after: state(y) });
  else if (x.measure !== y.measure)
    push('policy', 'changed', `Equivalence by strength judged by ${MEASURE_TEXT[x.measure]} → ${MEASURE_TEXT[y.measure]}${y.accept ? '' : ' (advice only)'}`, { before: MEASURE_TEXT[x.measure], after: MEASURE_TEXT[y.measure] });
  const values = [
    ['listedYield', 'stress', 'Yield the listed sizes are taken at, for equivalence by strength'],
    ['minWall', 'length', 'Least wall of an equivalent by strength'],
  ] as const;
  for (const [key, dim, word] of values) {
    const u = x[key];
    const v = y[key];
    if (!u && v) push('policy', 'added', `${word}: ${quantity(v.value, dim, sb, v.unit)} added`, { after: quantity(v.value, dim, sb, v.unit) });
    else if (u && !v) push('policy', 'removed', `${word}: ${quantity(u.value, dim, sa, u.unit)} removed`, { before: quantity(u.value, dim, sa, u.unit) });
    else if (u && v && !sameNumber(canonical(u.value, dim, sa, u.unit), canonical(v.value, dim, sb, v.unit)))
      push('policy', 'changed', `${word}: ${quantity(u.value, dim, sa, u.unit)} → ${quantity(v.value, dim, sb, v.unit)}`, { before: quantity(u.value, dim, sa, u.unit), after: quantity(v.value, dim, sb, v.unit) });
  }
}

function identity(a: RulesetDocument, b: RulesetDocument, push: Push): void {
  const ra = a.rulebook;
  const rb = b.rulebook;
  if (ra.edition !== rb.edition)
    push('rulebook', 'changed', `Rulebook edition ${ra.edition} → ${rb.edition}`, {
      before: ra.edition,
      after: rb.edition,
    });
  if (ra.title !== rb.title)
    push('rulebook', 'changed', `Rulebook title ${quoted(ra.title)} → ${quoted(rb.title)}`, {
      before: ra.title,
      after: rb.title,
    });
  if (ra.publisher !== rb.publisher)
    push('rulebook', 'changed', `Publisher ${quoted(ra.publisher)} → ${quoted(rb.publisher)}`, {
      before: ra.publisher,
      after: rb.publisher,
    });
  if (ra.effectiveDate !== rb.effectiveDate)
    push('rulebook', 'changed', `Effective date ${ra.effectiveDate} → ${rb.effectiveDate}`, {
      before: ra.effectiveDate,
      after: rb.effectiveDate,
    });
  if (!ra.url && rb.url)
    push('rulebook', 'added', `Link to the rulebook added: ${rb.url}`, { after: rb.url });
  else if (ra.url && !rb.url) push('rulebook', 'removed', 'Link to the rulebook removed', { before: ra.url });
  else if (ra.url !== rb.url)
    push('rulebook', 'changed', `Link to the rulebook changed to ${rb.url}`, {
      before: ra.url,
      after: rb.url,
    });
  if (a.unitSystem !== b.unitSystem)
    push('rulebook', 'changed', `Rulebook units ${a.unitSystem} → ${b.unitSystem}`, {
      before: a.unitSystem,
      after: b.unitSystem,
    });
}

const TOLERANCE_DIMENSIONS = [
  'length',
  'angle',
  'mass',
  'area',
  'stress',
  'ratio',
] as const satisfies readonly Dimension[];

function policy(a: RulesetDocument, sa: Side, b: RulesetDocument, sb: Side, push: Push): void {
  for (const dim of TOLERANCE_DIMENSIONS) {
    const x = a.measurementTolerance?.[dim];
    const y = b.measurementTolerance?.[dim];
    const word = `Measurement tolerance for ${dim}`;
    if (x === undefined && y !== undefined)
      push('policy', 'added', `${word} ${quantity(y, dim, sb)} added`, { after: quantity(y, dim, sb) });
    else if (x !== undefined && y === undefined)
      push('policy', 'removed', `${word} ${quantity(x, dim, sa)} removed`, { before: quantity(x, dim, sa) });
    else if (
      x !== undefined &&
      y !== undefined &&
      !sameNumber(canonical(x, dim, sa), canonical(y, dim, sb))
    ) {
      push('policy', 'changed', `${word} ${quantity(x, dim, sa)} → ${quantity(y, dim, sb)}`, {
        before: quantity(x, dim, sa),
        after: quantity(y, dim, sb),
      });
    }
  }
  if (a.acceptPrintedEquivalents !== b.acceptPrintedEquivalents) {
    push(
      'policy',
      'changed',
      b.acceptPrintedEquivalents
        ? 'Printed equivalent sizes now accepted'
        : 'Printed equivalent sizes no longer accepted',
      {
        before: a.acceptPrintedEquivalents ? 'accepted' : 'not accepted',
        after: b.acceptPrintedEquivalents ? 'accepted' : 'not accepted',
      },
    );
  }
  strengthEquivalents(a, sa, b, sb, push);
  const ea = a.printedEquivalents ?? [];
  const eb = b.printedEquivalents ?? [];
  const used = new Set<number>();
  for (const e of eb) {
    const j = ea.findIndex((x, k) => !used.has(k) && sameSize(x.size, sa, e.size, sb));
    const of = `Printed equivalent for ${sizeText(e.size, sb)}`;
    if (j < 0) {
      push('policy', 'added', `${of} added: ${sizeText(e.printedAs, sb)}`, {
        after: sizeText(e.printedAs, sb),
      });
      continue;
    }
    used.add(j);
    const old = ea[j];
    if (!sameSize(old.printedAs, sa, e.printedAs, sb)) {
      push('policy', 'changed', `${of}: ${sizeText(old.printedAs, sa)} → ${sizeText(e.printedAs, sb)}`, {
        before: sizeText(old.printedAs, sa),
        after: sizeText(e.printedAs, sb),
      });
    }
    if ((old.note ?? '') !== (e.note ?? ''))
      push('policy', 'changed', `Note on the ${of.charAt(0).toLowerCase()}${of.slice(1)} changed`, {
        before: old.note,
        after: e.note,
      });
  }
  ea.forEach((e, k) => {
    if (!used.has(k))
      push(
        'policy',
        'removed',
        `Printed equivalent for ${sizeText(e.size, sa)} removed (was ${sizeText(e.printedAs, sa)})`,
        { before: sizeText(e.printedAs, sa) },
      );
  });
}

const BASIS_WORDS = { with_driver: 'with driver', without_driver: 'without driver' } as const;

function classes(ca: readonly RulesetClass[], sa: Side, cb: readonly RulesetClass[], sb: Side, push: Push): void {
  const pairs = pairUp(ca, cb, [(x, y) => x.id === y.id, (x, y) => x.name === y.name]);
  for (const [x, y] of pairs) {
    if (!x && y) push('class', 'added', `Class ${quoted(y.name)} added`, { classId: y.id, after: y.name });
    else if (x && !y)
      push('class', 'removed', `Class ${quoted(x.name)} removed`, { classId: x.id, before: x.name });
    else if (x && y) {
      if (x.id !== y.id)
        push('class', 'changed', `Class ${quoted(y.name)} id ${x.id} → ${y.id}`, {
          classId: y.id,
          before: x.id,
          after: y.id,
        });
      if (x.name !== y.name)
        push('class', 'changed', `Class ${quoted(x.name)} renamed ${quoted(y.name)}`, {
          classId: y.id,
          before: x.name,
          after: y.name,
        });
      if (x.weightBasis !== y.weightBasis) {
        push(
          'class',
          'changed',
          `Class ${quoted(y.name)} now weighed ${BASIS_WORDS[y.weightBasis]} (was ${BASIS_WORDS[x.weightBasis]})`,
          {
            classId: y.id,
            before: BASIS_WORDS[x.weightBasis],
            after: BASIS_WORDS[y.weightBasis],
          },
        );
      }
      const listed = (c: RulesetClass, side: Side) => (c.listedWeight ? quantity(c.listedWeight.value, 'mass', side, c.listedWeight.unit) : undefined);
      const la = listed(x, sa);
      const lb = listed(y, sb);
      const laKg = x.listedWeight ? canonical(x.listedWeight.value, 'mass', sa, x.listedWeight.unit) : undefined;
      const lbKg = y.listedWeight ? canonical(y.listedWeight.value, 'mass', sb, y.listedWeight.unit) : undefined;
      if (!sameNumber(laKg, lbKg))
        push(
          'class', 'changed',
          lb === undefined
            ? `Class ${quoted(y.name)} tube sizes now follow the measured weight (was the listed weight ${la})`
            : `Class ${quoted(y.name)} tube sizes now follow the listed weight ${lb}${la === undefined ? ' (was the measured weight)' : ` (was ${la})`}`,
          { classId: y.id, before: la ?? 'measured weight', after: lb ?? 'measured weight' },
        );
      if ((x.description ?? '') !== (y.description ?? ''))
        push('class', 'changed', `Description of class ${quoted(y.name)} changed`, {
          classId: y.id,
          before: x.description,
          after: y.description,
        });
    }
  }
}

/**
 * Pairs the items of two lists by the first test that matches (id, then a fallback), in the new
 * list's order; unpaired old items come last in their own order.
 */
function pairUp<T>(
  a: readonly T[],
  b: readonly T[],
  tests: ((x: T, y: T) => boolean)[],
): [T | undefined, T | undefined][] {
  const match = new Map<number, number>();
  const usedA = new Set<number>();
  for (const test of tests) {
    b.forEach((y, i) => {
      if (match.has(i)) return;
      const j = a.findIndex((x, k) => !usedA.has(k) && test(x, y));
      if (j >= 0) {
        match.set(i, j);
        usedA.add(j);
      }
    });
  }
  const pairs: [T | undefined, T | undefined][] = b.map((y, i) => [
    match.has(i) ? a[match.get(i) as number] : undefined,
    y,
  ]);
  a.forEach((x, k) => {
    if (!usedA.has(k)) pairs.push([x, undefined]);
  });
  return pairs;
}

function scopeText(r: Requirement): string {
  switch (r.scope.kind) {
    case 'vehicle':
      return 'the vehicle';
    case 'member':
      return `each ${kindsText(r.scope.memberKinds)}`;
    case 'plate':
      return `each plate at the ${r.scope.locations.map(valueWord).join(' or ')}`;
  }
}

function classesText(ids: readonly string[] | undefined, names: ReadonlyMap<string, string>): string {
  return ids ? ids.map((id) => names.get(id) ?? id).join(', ') : 'every class';
}

function requirements(a: RulesetDocument, sa: Side, b: RulesetDocument, sb: Side, push: Push): void {
  const names = new Map<string, string>([...a.classes, ...b.classes].map((c) => [c.id, c.name]));
  for (const c of b.classes) names.set(c.id, c.name);
  const pairs = pairUp(a.requirements, b.requirements, [
    (x, y) => x.id === y.id,
    (x, y) => x.section === y.section,
    (x, y) => x.title === y.title,
  ]);
  for (const [x, y] of pairs) {
    const r = (y ?? x) as Requirement;
    const ids = r.appliesTo?.classes;
    const who: Extra = {
      requirementId: r.id,
      ...(ids ? { classIds: [...ids] } : {}),
      ...(ids?.length === 1 ? { classId: ids[0] } : {}),
    };
    const named = `${r.section} ${quoted(r.title)}`;
    const forClasses = ids ? ` (${classesText(ids, names)})` : '';
    if (!x) {
      push(r.area, 'added', `Requirement ${named} added${forClasses}`, who);
      continue;
    }
    if (!y) {
      push(r.area, 'removed', `Requirement ${named} removed${forClasses}`, who);
      continue;
    }
    const head = `${ids ? `${classesText(ids, names)}: ` : ''}${y.section}`;
    const at = (kind: ChangeKind, text: string, extra: Extra = {}) =>
      push(y.area, kind, text, { ...who, ...extra });
    if (x.id !== y.id) at('changed', `${y.section} id ${x.id} → ${y.id}`, { before: x.id, after: y.id });
    if (x.section !== y.section)
      at('changed', `Requirement ${quoted(y.title)} renumbered ${x.section} → ${y.section}`, {
        before: x.section,
        after: y.section,
      });
    if (x.title !== y.title)
      at('changed', `${y.section} title ${quoted(x.title)} → ${quoted(y.title)}`, {
        before: x.title,
        after: y.title,
      });
    if (x.severity !== y.severity)
      at('changed', `${y.section} is now ${y.severity} (was ${x.severity})`, {
        before: x.severity,
        after: y.severity,
      });
    if (x.area !== y.area)
      at('changed', `${y.section} moved from ${x.area} to ${y.area}`, { before: x.area, after: y.area });
    if (scopeText(x) !== scopeText(y))
      at('changed', `${y.section} now checks ${scopeText(y)} (was ${scopeText(x)})`, {
        before: scopeText(x),
        after: scopeText(y),
      });
    const ca = classesText(x.appliesTo?.classes, names);
    const cb = classesText(y.appliesTo?.classes, names);
    if (ca !== cb) at('changed', `${y.section} now applies to ${cb} (was ${ca})`, { before: ca, after: cb });
    whenChanges(x, y, at);
    if (sa.system !== sb.system) unitsOfRawConditions(x, y, sb.system, at);
    describeRequiresChanges(x.requires, sa, y.requires, sb, (kind, detail, values = {}) =>
      at(kind, `${head} ${detail}`, values),
    );
    if ((x.acceptsMakerCertificate ?? false) !== (y.acceptsMakerCertificate ?? false))
      at(
        'changed',
        y.acceptsMakerCertificate
          ? `${y.section} now accepts a cage certified by its maker in its place`
          : `${y.section} no longer accepts a maker's certificate in its place`,
        { before: x.acceptsMakerCertificate ? 'certificate accepted' : 'certificate not accepted', after: y.acceptsMakerCertificate ? 'certificate accepted' : 'certificate not accepted' },
      );
    if (x.explanation !== y.explanation)
      at('changed', `Explanation of ${y.section} changed`, { before: x.explanation, after: y.explanation });
  }
}

function whenChanges(
  x: Requirement,
  y: Requirement,
  at: (kind: ChangeKind, text: string, extra?: Extra) => void,
): void {
  const wa = x.appliesTo?.when;
  const wb = y.appliesTo?.when;
  if (wa === undefined && wb !== undefined)
    at('added', `${y.section} now applies only when its conditions hold`);
  else if (wa !== undefined && wb === undefined)
    at('removed', `${y.section} no longer has conditions on when it applies`);
  else {
    const paths = changedJsonPaths(wa, wb);
    if (paths.length > 0)
      at('changed', `${y.section} conditions on when it applies changed (${pathsText(paths)})`, { paths });
  }
}

/** Whether a json-rules-engine tree compares a measured quantity with a number written without a unit. */
function readsDocumentUnits(node: unknown): boolean {
  if (typeof node !== 'object' || node === null) return false;
  const n = node as Record<string, unknown>;
  for (const key of ['all', 'any'])
    if (Array.isArray(n[key]) && (n[key] as unknown[]).some(readsDocumentUnits)) return true;
  if (n.not !== undefined) return readsDocumentUnits(n.not);
  const dimension = typeof n.fact === 'string' ? FACTS_BY_NAME.get(n.fact)?.dimension : undefined;
  return (
    typeof n.value === 'number' &&
    n.unit === undefined &&
    dimension !== undefined &&
    dimension !== 'count' &&
    dimension !== 'ratio'
  );
}

/**
 * Raw conditions keep their numbers as written, in the document's units, so a change of unit
 * system changes what they mean even when the JSON is identical. Say so rather than stay silent.
 */
function unitsOfRawConditions(
  x: Requirement,
  y: Requirement,
  system: UnitSystem,
  at: (kind: ChangeKind, text: string, extra?: Extra) => void,
): void {
  const parts: [unknown, unknown, string][] = [
    [x.appliesTo?.when, y.appliesTo?.when, 'conditions on when it applies'],
  ];
  if (x.requires.template === 'conditions' && y.requires.template === 'conditions')
    parts.push([x.requires.conditions, y.requires.conditions, 'conditions']);
  for (const [a, b, word] of parts) {
    if (readsDocumentUnits(b) && changedJsonPaths(a, b).length === 0) {
      at('changed', `${y.section} ${word} now read in ${system} units (numbers unchanged)`, {
        after: system,
      });
    }
  }
}
