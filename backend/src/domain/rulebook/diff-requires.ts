// The ruleset diff for what one requirement demands: each rule kind (template-kinds.ts) compared
// part by part, values in canonical units so a
// document rewritten in other units reads as unchanged where the rule is unchanged.
import type { LimitCheck, Requires, TubeTable } from '../../contracts/ruleset.js';
import { FACTS_BY_NAME } from '../facts.js';
import { findGrade } from '../grades.js';
import { GRADE_FACTS } from '../rules/limit-forms.js';
import { formatIsoDate } from '../dates.js';
import { TEMPLATE_KINDS, TEMPLATE_NAMES } from '../rules/template-kinds.js';
import type { TemplateName, TemplateOf } from '../rules/template-kinds.js';
import {
  canonical,
  changedJsonPaths,
  kindsText,
  pathsText,
  quantity,
  quantityNumber,
  quoted,
  sameNumber,
  sameSize,
  sizeText,
  valueWord,
} from './diff-format.js';
import type { Side, SizeDoc } from './diff-format.js';

export type ChangeKind = 'added' | 'removed' | 'changed';

/** Receives one change of this requirement; `head` ("Club Saloon: C4.2.2") is prepended by the caller. */
export type Emit = (
  kind: ChangeKind,
  detail: string,
  values?: { before?: string; after?: string; paths?: string[] },
) => void;

/** Words for each rule kind, from the one registry of kinds. */
export const TEMPLATE_WORDS: Readonly<Record<Requires['template'], string>> = Object.fromEntries(
  TEMPLATE_NAMES.map((t) => [t, TEMPLATE_KINDS[t].words]),
) as Record<Requires['template'], string>;

type Differ<K extends TemplateName> = (a: TemplateOf<K>, sa: Side, b: TemplateOf<K>, sb: Side, emit: Emit) => void;

/** How each rule kind is compared. A mapped type: a kind without its words here fails the type-check. */
const DIFFERS: { readonly [K in TemplateName]: Differ<K> } = {
  tube_table: tubeTable,
  required_members: (a, _sa, b, _sb, emit) => requiredMembers(a, b, emit),
  limit: (a, sa, b, sb, emit) => limits(a.checks, sa, b.checks, sb, emit),
  allowed_values: (a, _sa, b, _sb, emit) => allowedValues(a, b, emit),
  member_match: (a, _sa, b, _sb, emit) => memberMatch(a, b, emit),
  conditions: (a, _sa, b, _sb, emit) => {
    const paths = changedJsonPaths(a.conditions, b.conditions);
    if (paths.length > 0) emit('changed', `conditions changed (${pathsText(paths)})`, { paths });
  },
};

export function describeRequiresChanges(a: Requires, sa: Side, b: Requires, sb: Side, emit: Emit): void {
  if (a.template !== b.template) {
    emit('changed', `rule rewritten: ${TEMPLATE_WORDS[a.template]} → ${TEMPLATE_WORDS[b.template]}`, {
      before: TEMPLATE_WORDS[a.template],
      after: TEMPLATE_WORDS[b.template],
    });
    return;
  }
  // Same template on both sides (checked above); the mapped type ties each differ to its kind.
  (DIFFERS[a.template] as Differ<TemplateName>)(a, sa, b, sb, emit);
}

// Tube tables -----------------------------------------------------------------------------------

type Band = TubeTable['bands'][number];
type Row = Band['rows'][number];

function bandName(bands: readonly Band[], i: number, side: Side, unit?: string): string {
  const band = bands[i];
  if (band.label) return `band ${band.label}`;
  if (bands.length === 1) return 'all weights';
  const prev = i > 0 ? bands[i - 1].upTo : undefined;
  if (band.upTo === undefined)
    return prev === undefined ? `band ${i + 1}` : `band over ${quantity(prev, 'mass', side, unit)}`;
  return prev === undefined
    ? `band up to ${quantity(band.upTo, 'mass', side, unit)}`
    : `band over ${quantityNumber(prev, 'mass', side, unit)} up to ${quantity(band.upTo, 'mass', side, unit)}`;
}

const rowKey = (r: Row): string =>
  `${[...(r.materials ?? [])].sort().join('+')}|${[...(r.processes ?? [])].sort().join('+')}|${r.approvedBefore ?? ''}`;

function rowName(r: Row): string {
  const materials = r.materials
    ? r.materials.map((m) => (m === 'other' ? 'other material' : valueWord(m))).join(' or ')
    : 'any material';
  const named = r.processes ? `${materials} (${r.processes.map(valueWord).join(', ')})` : materials;
  return r.approvedBefore ? `${named}, cages approved before ${formatIsoDate(r.approvedBefore)}` : named;
}

const sizesText = (r: Row, side: Side): string => r.alternatives.map((s) => sizeText(s, side)).join(', ');

function tubeTable(a: TubeTable, sa: Side, b: TubeTable, sb: Side, emit: Emit): void {
  const n = Math.max(a.bands.length, b.bands.length);
  for (let i = 0; i < n; i++) {
    const ba = a.bands[i];
    const bb = b.bands[i];
    if (!ba) {
      emit(
        'added',
        `${bandName(b.bands, i, sb, b.weightUnit)} added (${bb.rows.map((r) => `${rowName(r)}: ${sizesText(r, sb)}`).join('; ')})`,
      );
      continue;
    }
    if (!bb) {
      emit('removed', `${bandName(a.bands, i, sa, a.weightUnit)} removed`);
      continue;
    }
    const name = bandName(b.bands, i, sb, b.weightUnit);
    const upA = ba.upTo === undefined ? undefined : canonical(ba.upTo, 'mass', sa, a.weightUnit);
    const upB = bb.upTo === undefined ? undefined : canonical(bb.upTo, 'mass', sb, b.weightUnit);
    if (!sameNumber(upA, upB)) {
      const was = ba.upTo === undefined ? 'no upper weight' : quantity(ba.upTo, 'mass', sa, a.weightUnit);
      const now = bb.upTo === undefined ? 'no upper weight' : quantity(bb.upTo, 'mass', sb, b.weightUnit);
      emit('changed', `band ${i + 1} upper weight ${was} → ${now}`, { before: was, after: now });
    }
    if ((ba.label ?? '') !== (bb.label ?? '')) {
      emit('changed', `band ${i + 1} label ${quoted(ba.label ?? '')} → ${quoted(bb.label ?? '')}`, {
        before: ba.label,
        after: bb.label,
      });
    }
    rows(ba.rows, sa, bb.rows, sb, name, emit);
  }
  allowances(a, sa, b, sb, emit);
}

function rows(ra: readonly Row[], sa: Side, rb: readonly Row[], sb: Side, band: string, emit: Emit): void {
  const used = new Set<number>();
  const pairs: [number, Row][] = [];
  const unpaired: Row[] = [];
  for (const row of rb) {
    const j = ra.findIndex((r, k) => !used.has(k) && rowKey(r) === rowKey(row));
    if (j < 0) unpaired.push(row);
    else {
      used.add(j);
      pairs.push([j, row]);
    }
  }
  // A legacy row whose date moved is the same row with a new date, not one removed and one added.
  const materialsKey = (r: Row) => rowKey({ ...r, approvedBefore: undefined });
  for (const row of unpaired) {
    const j = ra.findIndex((r, k) => !used.has(k) && materialsKey(r) === materialsKey(row) && (r.approvedBefore !== undefined || row.approvedBefore !== undefined));
    if (j < 0) {
      emit('added', `${band}: sizes for ${rowName(row)} added (${sizesText(row, sb)})`);
      continue;
    }
    used.add(j);
    const date = (r: Row) => (r.approvedBefore ? `cages approved before ${formatIsoDate(r.approvedBefore)}` : 'any cage');
    emit('changed', `${band}, ${rowName({ ...row, approvedBefore: undefined })}: sizes now for ${date(row)} (was ${date(ra[j]!)})`, { before: date(ra[j]!), after: date(row) });
    pairs.push([j, row]);
  }
  for (const [j, row] of pairs) alternatives(ra[j]!.alternatives, sa, row.alternatives, sb, `${band}, ${rowName(row)}`, emit);
  ra.forEach((row, k) => {
    if (!used.has(k)) emit('removed', `${band}: sizes for ${rowName(row)} removed (${sizesText(row, sa)})`);
  });
}

type Alt = Row['alternatives'][number];

function alternatives(
  aa: readonly Alt[],
  sa: Side,
  ab: readonly Alt[],
  sb: Side,
  where: string,
  emit: Emit,
): void {
  const keptA = new Set<number>();
  const added: Alt[] = [];
  for (const alt of ab) {
    const j = aa.findIndex((x, k) => !keptA.has(k) && sameSize(x, sa, alt, sb));
    if (j < 0) {
      added.push(alt);
      continue;
    }
    keptA.add(j);
    if ((aa[j].label ?? '') !== (alt.label ?? '')) {
      emit(
        'changed',
        `${where}: label of ${sizeText(alt, sb)} ${quoted(aa[j].label ?? '')} → ${quoted(alt.label ?? '')}`,
        { before: aa[j].label, after: alt.label },
      );
    }
  }
  const removed = aa.filter((_x, k) => !keptA.has(k));
  // A size whose OD stayed and whose wall moved reads as one change: "wall for 1.500 in OD 0.095 → 0.120 in".
  for (const alt of added) {
    const r = removed.findIndex((x) => sameOd(x, sa, alt, sb));
    if (r >= 0) {
      const [old] = removed.splice(r, 1);
      const before = quantityNumber(old.wall, 'length', sa, old.unit);
      const after = quantity(alt.wall, 'length', sb, alt.unit);
      emit(
        'changed',
        `${where}: minimum wall for ${quantity(alt.od, 'length', sb, alt.unit)} OD ${before} → ${after}`,
        { before: sizeText(old, sa), after: sizeText(alt, sb) },
      );
    } else {
      emit('added', `${where}: alternative ${sizeText(alt, sb)} added`, { after: sizeText(alt, sb) });
    }
  }
  for (const old of removed)
    emit('removed', `${where}: alternative ${sizeText(old, sa)} removed`, { before: sizeText(old, sa) });
}

function sameOd(a: SizeDoc, sa: Side, b: SizeDoc, sb: Side): boolean {
  return sameNumber(canonical(a.od, 'length', sa, a.unit), canonical(b.od, 'length', sb, b.unit));
}

const THIN_WALL_WORDS = { smallest_listed: 'smallest listed OD', largest_listed: 'largest listed OD' } as const;
const METHOD_WORDS = { ultrasonic: 'ultrasonic gauge', inspection_hole: 'inspection hole', callipers: 'callipers' } as const;

function measuredWallText(m: NonNullable<TubeTable['measuredWall']>, s: Side): string {
  const tol = m.tolerance;
  const less = tol === undefined ? 'the table wall' : 'percent' in tol ? `the table wall less ${tol.percent} %` : `the table wall less ${quantity(tol.value, 'length', s, tol.unit)}`;
  return `thinnest ${METHOD_WORDS[m.method]} reading at least ${less}`;
}

function measuredWall(a: TubeTable, sa: Side, b: TubeTable, sb: Side, emit: Emit): void {
  const ma = a.measuredWall;
  const mb = b.measuredWall;
  if (!ma && !mb) return;
  if (!ma && mb) return emit('added', `measured wall now required: ${measuredWallText(mb, sb)}`, { after: measuredWallText(mb, sb) });
  if (ma && !mb) return emit('removed', `measured wall no longer required (was ${measuredWallText(ma, sa)})`, { before: measuredWallText(ma, sa) });
  const ta = ma!.tolerance;
  const tb = mb!.tolerance;
  const sameTol =
    ta === undefined || tb === undefined
      ? (ta === undefined || ('value' in ta && ta.value === 0)) && (tb === undefined || ('value' in tb && tb.value === 0))
      : 'percent' in ta || 'percent' in tb
        ? 'percent' in ta && 'percent' in tb && ta.percent === tb.percent
        : sameNumber(canonical(ta.value, 'length', sa, ta.unit), canonical(tb.value, 'length', sb, tb.unit));
  if (ma!.method !== mb!.method || !sameTol)
    emit('changed', `measured wall: ${measuredWallText(ma!, sa)} → ${measuredWallText(mb!, sb)}`, { before: measuredWallText(ma!, sa), after: measuredWallText(mb!, sb) });
}

function allowances(a: TubeTable, sa: Side, b: TubeTable, sb: Side, emit: Emit): void {
  const ta = a.allowances?.thinWallWhenOdExceedsMinimum;
  const tb = b.allowances?.thinWallWhenOdExceedsMinimum;
  const thinText = (t: NonNullable<typeof ta>, s: Side) =>
    `an OD ${quantity(t.odMargin, 'length', s, t.unit)} over the band minimum may use ${quantity(t.minWall, 'length', s, t.unit)} wall`;
  if (!ta && tb) emit('added', `thin-wall allowance added: ${thinText(tb, sb)}`, { after: thinText(tb, sb) });
  else if (ta && !tb)
    emit('removed', `thin-wall allowance removed (${thinText(ta, sa)})`, { before: thinText(ta, sa) });
  else if (ta && tb) {
    const field = (word: string, x: number, y: number) => {
      if (sameNumber(canonical(x, 'length', sa, ta.unit), canonical(y, 'length', sb, tb.unit))) return;
      const before = quantity(x, 'length', sa, ta.unit);
      const after = quantity(y, 'length', sb, tb.unit);
      emit('changed', `thin-wall allowance ${word} ${quantityNumber(x, 'length', sa, ta.unit)} → ${after}`, {
        before,
        after,
      });
    };
    field('OD margin', ta.odMargin, tb.odMargin);
    field('wall', ta.minWall, tb.minWall);
    const ra = ta.minimumDiameter ?? 'smallest_listed';
    const rb = tb.minimumDiameter ?? 'smallest_listed';
    if (ra !== rb)
      emit('changed', `thin-wall allowance now counts from the ${THIN_WALL_WORDS[rb]} (was the ${THIN_WALL_WORDS[ra]})`, {
        before: THIN_WALL_WORDS[ra],
        after: THIN_WALL_WORDS[rb],
      });
  }
  measuredWall(a, sa, b, sb, emit);
  const wa = a.allowances?.wallAllowance;
  const wb = b.allowances?.wallAllowance;
  const wallText = (w: NonNullable<typeof wa>, s: Side) => quantity(w.value, 'length', s, w.unit);
  if (!wa && wb) emit('added', `wall allowance of ${wallText(wb, sb)} added`, { after: wallText(wb, sb) });
  else if (wa && !wb)
    emit('removed', `wall allowance of ${wallText(wa, sa)} removed`, { before: wallText(wa, sa) });
  else if (
    wa &&
    wb &&
    !sameNumber(canonical(wa.value, 'length', sa, wa.unit), canonical(wb.value, 'length', sb, wb.unit))
  ) {
    emit(
      'changed',
      `wall allowance ${quantityNumber(wa.value, 'length', sa, wa.unit)} → ${wallText(wb, sb)}`,
      { before: wallText(wa, sa), after: wallText(wb, sb) },
    );
  }
}

// Required members ------------------------------------------------------------------------------

type MemberEntry = Extract<Requires, { template: 'required_members' }>['members'][number];
const entryKey = (e: MemberEntry) => [...new Set(e.kinds)].sort().join('+');
const SIDE_COUNT_WORDS: Readonly<Record<NonNullable<MemberEntry['side']>, string>> = {
  each: 'on each side', left: 'on the left', right: 'on the right', driver: "on the driver's side", passenger: "on the passenger's side",
};
const countText = (e: MemberEntry) =>
  `${e.max === undefined
    ? `at least ${e.min}`
    : e.min === e.max
      ? `exactly ${e.min}`
      : e.min === 0
        ? `at most ${e.max}`
        : `${e.min} to ${e.max}`}${e.side ? ` ${SIDE_COUNT_WORDS[e.side]}` : ''}`;

function requiredMembers(
  a: Extract<Requires, { template: 'required_members' }>,
  b: typeof a,
  emit: Emit,
): void {
  const used = new Set<number>();
  for (const e of b.members) {
    const j = a.members.findIndex((x, k) => !used.has(k) && entryKey(x) === entryKey(e));
    const kinds = kindsText(e.kinds);
    if (j < 0) {
      if (e.min > 0) emit('added', `${kinds} now required (${countText(e)})`, { after: countText(e) });
      else emit('added', `${kinds} limited to ${countText(e)}`, { after: countText(e) });
      continue;
    }
    used.add(j);
    const old = a.members[j];
    if (old.min === 0 && e.min > 0)
      emit('changed', `${kinds} now required (${countText(e)})`, {
        before: countText(old),
        after: countText(e),
      });
    else if (old.min > 0 && e.min === 0)
      emit('changed', `${kinds} no longer required (${countText(e)})`, {
        before: countText(old),
        after: countText(e),
      });
    else if (old.min !== e.min || old.max !== e.max || old.side !== e.side)
      emit('changed', `${kinds}: ${countText(old)} → ${countText(e)}`, {
        before: countText(old),
        after: countText(e),
      });
    if ((old.label ?? '') !== (e.label ?? ''))
      emit('changed', `${kinds}: label ${quoted(old.label ?? '')} → ${quoted(e.label ?? '')}`, {
        before: old.label,
        after: e.label,
      });
  }
  a.members.forEach((e, k) => {
    if (used.has(k)) return;
    const kinds = kindsText(e.kinds);
    emit(
      'removed',
      e.min > 0
        ? `${kinds} no longer required (was ${countText(e)})`
        : `limit on ${kinds} removed (was ${countText(e)})`,
      { before: countText(e) },
    );
  });
}

// Limits ----------------------------------------------------------------------------------------

const OPERATOR_WORDS: Readonly<Record<LimitCheck['operator'], string>> = {
  atLeast: 'at least',
  atMost: 'at most',
  above: 'more than',
  below: 'less than',
  equals: 'must be',
  notEquals: 'must not be',
};

const checkKey = (c: LimitCheck) => `${c.fact}|${c.path ?? ''}|${JSON.stringify(c.params ?? {})}`;

function checkSubject(c: LimitCheck): string {
  if (c.label) return c.label;
  const fact = FACTS_BY_NAME.get(c.fact);
  if (!fact) return c.fact;
  return c.path ? `${fact.label}: ${valueWord(c.path)}` : fact.label;
}

const DATE_OPERATOR_WORDS: Readonly<Record<LimitCheck['operator'], string>> = {
  atLeast: 'on or after', atMost: 'on or before', above: 'after', below: 'before', equals: 'on', notEquals: 'not on',
};

function checkValue(c: LimitCheck, side: Side): { value: string; canonical?: number; key: string } {
  const v = c.value;
  if (typeof v === 'boolean') return { value: v ? 'yes' : 'no', key: String(v) };
  if (typeof v === 'string') {
    if (FACTS_BY_NAME.get(c.fact)?.type === 'date') return { value: formatIsoDate(v), key: `date|${v}` };
    // A grade: the same grade however it is written.
    const family = GRADE_FACTS[c.fact]?.family;
    const grade = family ? findGrade(family, v) : undefined;
    if (grade) return { value: grade.name, key: `grade|${grade.id}` };
    return { value: valueWord(v), key: `text|${v}` };
  }
  if (typeof v === 'object') {
    const k = v.unit === undefined ? v.times : canonical(v.times, 'length', side, v.unit);
    const kText = v.unit === undefined ? String(v.times) : quantity(v.times, 'length', side, v.unit);
    const of = FACTS_BY_NAME.get(v.of)?.label ?? v.of;
    return { value: `${kText} × ${of}`, key: `times|${v.of}|${k}` };
  }
  const dimension = FACTS_BY_NAME.get(c.fact)?.dimension;
  if (!dimension) return { value: String(v), canonical: v, key: String(v) };
  const value = canonical(v, dimension, side, c.unit);
  return { value: quantity(v, dimension, side, c.unit), canonical: value, key: String(value) };
}

/** Two proportional limits with the same other fact: k compared as numbers (a unit change alone is no change). */
function sameProportional(a: LimitCheck, sa: Side, b: LimitCheck, sb: Side): boolean | undefined {
  const x = a.value;
  const y = b.value;
  if (typeof x !== 'object' || typeof y !== 'object' || x.of !== y.of || (x.unit === undefined) !== (y.unit === undefined)) return undefined;
  const kx = x.unit === undefined ? x.times : canonical(x.times, 'length', sa, x.unit);
  const ky = y.unit === undefined ? y.times : canonical(y.times, 'length', sb, y.unit);
  return sameNumber(kx, ky);
}

const checkText = (c: LimitCheck, side: Side) =>
  `${(FACTS_BY_NAME.get(c.fact)?.type === 'date' ? DATE_OPERATOR_WORDS : OPERATOR_WORDS)[c.operator]} ${checkValue(c, side).value}`;

function limits(ca: readonly LimitCheck[], sa: Side, cb: readonly LimitCheck[], sb: Side, emit: Emit): void {
  const used = new Set<number>();
  const pairs: [LimitCheck | undefined, LimitCheck][] = cb.map((c) => {
    // Same fact and operator first (two checks on one fact make a range), then same fact.
    let j = ca.findIndex((x, k) => !used.has(k) && checkKey(x) === checkKey(c) && x.operator === c.operator);
    if (j < 0) j = ca.findIndex((x, k) => !used.has(k) && checkKey(x) === checkKey(c));
    if (j >= 0) used.add(j);
    return [j >= 0 ? ca[j] : undefined, c];
  });
  for (const [old, c] of pairs) {
    const subject = checkSubject(c);
    if (!old) {
      emit('added', `new limit: ${subject} ${checkText(c, sb)}`, { after: checkText(c, sb) });
      continue;
    }
    const va = checkValue(old, sa);
    const vb = checkValue(c, sb);
    const sameValue =
      va.canonical !== undefined && vb.canonical !== undefined
        ? sameNumber(va.canonical, vb.canonical)
        : sameProportional(old, sa, c, sb) ?? va.key === vb.key;
    if (old.operator !== c.operator || !sameValue) {
      emit(
        'changed',
        `${subject} ${checkText(old, sa)} → ${old.operator === c.operator ? vb.value : checkText(c, sb)}`,
        { before: checkText(old, sa), after: checkText(c, sb) },
      );
    }
    if ((old.label ?? '') !== (c.label ?? '')) {
      emit('changed', `limit label ${quoted(old.label ?? '')} → ${quoted(c.label ?? '')}`, {
        before: old.label,
        after: c.label,
      });
    }
  }
  ca.forEach((c, k) => {
    if (!used.has(k))
      emit('removed', `limit removed: ${checkSubject(c)} ${checkText(c, sa)}`, { before: checkText(c, sa) });
  });
}

// Allowed values --------------------------------------------------------------------------------

function allowedValues(a: Extract<Requires, { template: 'allowed_values' }>, b: typeof a, emit: Emit): void {
  const label = (fact: string) => FACTS_BY_NAME.get(fact)?.label ?? fact;
  const list = (x: typeof a) =>
    `${x.mode === 'forbidden' ? 'forbidden' : 'allowed'}: ${x.values.map(valueWord).join(', ')}`;
  if (a.fact !== b.fact) {
    emit('changed', `now checks ${label(b.fact)} (was ${label(a.fact)}); ${list(b)}`, {
      before: `${label(a.fact)} ${list(a)}`,
      after: `${label(b.fact)} ${list(b)}`,
    });
    return;
  }
  const subject = label(b.fact);
  if (a.mode !== b.mode) {
    emit('changed', `${subject}: the list now names ${b.mode} values (was ${a.mode}); ${list(b)}`, {
      before: list(a),
      after: list(b),
    });
    return;
  }
  const word = b.mode === 'forbidden' ? 'forbidden' : 'allowed';
  for (const v of b.values)
    if (!a.values.includes(v))
      emit('added', `${subject}: ${valueWord(v)} now ${word}`, { after: valueWord(v) });
  for (const v of a.values)
    if (!b.values.includes(v))
      emit('removed', `${subject}: ${valueWord(v)} no longer ${word}`, { before: valueWord(v) });
}

// Member against member ------------------------------------------------------------------------

const MATCH_WORDS = { equals: 'equal to', atLeast: 'at least', atMost: 'at most' } as const;
const MEASURE_WORDS = { od: 'OD', wall: 'wall' } as const;

export function memberMatchText(m: Extract<Requires, { template: 'member_match' }>): string {
  return m.checks.map((c) => `${MEASURE_WORDS[c.measure]} ${MATCH_WORDS[c.operator]} the ${kindsText(m.of)}'s`).join(', ');
}

function memberMatch(a: Extract<Requires, { template: 'member_match' }>, b: typeof a, emit: Emit): void {
  const kindsA = [...new Set(a.of)].sort().join('+');
  const kindsB = [...new Set(b.of)].sort().join('+');
  if (kindsA !== kindsB) {
    emit('changed', `now compared with the ${kindsText(b.of)} (was the ${kindsText(a.of)})`, { before: kindsText(a.of), after: kindsText(b.of) });
  }
  for (const measure of ['od', 'wall'] as const) {
    const x = a.checks.find((c) => c.measure === measure);
    const y = b.checks.find((c) => c.measure === measure);
    const word = MEASURE_WORDS[measure];
    if (!x && y) emit('added', `${word} must now be ${MATCH_WORDS[y.operator]} the ${kindsText(b.of)}'s`, { after: MATCH_WORDS[y.operator] });
    else if (x && !y) emit('removed', `${word} no longer compared with the ${kindsText(a.of)}'s (was ${MATCH_WORDS[x.operator]})`, { before: MATCH_WORDS[x.operator] });
    else if (x && y && x.operator !== y.operator)
      emit('changed', `${word} ${MATCH_WORDS[x.operator]} → ${MATCH_WORDS[y.operator]} the ${kindsText(b.of)}'s`, { before: MATCH_WORDS[x.operator], after: MATCH_WORDS[y.operator] });
  }
}
