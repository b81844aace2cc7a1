// Numbers as people type them, read the way they mean them or refused with the reason. One reader
// for the browser and the server, because a weight typed "2,800" and read as 2.8 puts a heavy car in
// the lightest tube band: a false pass.
//
// Two conventions exist: a decimal point with "," or " " grouping thousands (2,800.5 · 2 800.5), and
// a decimal comma with "." or " " grouping (2.800,5 · 2 800,5). A string that only one convention can
// read is read that way. A string both read alike ("2 800", "1.5") is that value. A string they read
// differently ("2,800" is 2800 or 2.8) needs a presumption: inch-pound mode presumes the point
// convention (its builders write 2,800 lb and 1.500 in), metric mode presumes neither and refuses.
// Grouping must be consistent: one separator, a first group of 1–3 digits, then groups of exactly 3.
// Fractions ("5/8", "1 5/8", "1-5/8") are the trade's way of writing inch sizes.

import type { UnitSystem } from './units.js';

export type TypedNumberRefusal = 'empty' | 'not_a_number' | 'inconsistent_grouping' | 'ambiguous' | 'comma_in_inch_pound' | 'bad_fraction';

export type TypedNumber = { ok: true; value: number } | { ok: false; reason: TypedNumberRefusal; message: string };

type Convention = 'point' | 'comma';

type Reading = { ok: true; value: number } | { ok: false; grouping: boolean };

const SPACES = /[\s\u00A0\u2007\u2009\u202F]+/g;

/** What a person typed → the number they meant, or a refusal saying why. */
export function readTypedNumber(text: string, system: UnitSystem): TypedNumber {
  const shown = text.trim();
  const t = shown.replace(SPACES, ' ').replace(/\u2212/g, '-');
  if (t === '') return refuse('empty', 'Enter a value.');
  const signMatch = /^([+-])\s?/.exec(t);
  const sign = signMatch?.[1] === '-' ? -1 : 1;
  const body = signMatch ? t.slice(signMatch[0].length) : t;
  if (body.includes('/')) return withSign(readFraction(body, shown), sign);
  // Two marks in a row or a trailing mark is a typing slip, not a grouping question.
  if (!/^[0-9.,]/.test(body) || !/^[0-9., ]+$/.test(body) || /[., ]{2}|[., ]$/.test(body)) return refuse('not_a_number', `"${shown}" is not a number.`);

  const point = readIn(body, 'point');
  const comma = readIn(body, 'comma');
  if (point.ok && comma.ok) {
    if (point.value === comma.value) return withSign({ ok: true, value: point.value }, sign);
    if (system === 'imperial') return withSign({ ok: true, value: point.value }, sign);
    return refuse(
      'ambiguous',
      `"${shown}" could mean ${plain(point.value)} or ${plain(comma.value)}. Type ${unambiguous(point.value)} or ${unambiguous(comma.value)} to say which.`,
    );
  }
  if (point.ok) return withSign({ ok: true, value: point.value }, sign);
  if (comma.ok) {
    // A lone decimal comma ("2,8") in inch-pound mode is most likely a slip in "2,800" or "2.8".
    // Only a form that shows the comma convention by its grouping ("2.800,5") is read that way.
    if (system === 'imperial' && !body.includes('.'))
      return refuse(
        'comma_in_inch_pound',
        `"${shown}": in inch-pound units a comma groups thousands (2,800), so this is not clear. Type a decimal with a point (${unambiguous(comma.value)}).`,
      );
    return withSign({ ok: true, value: comma.value }, sign);
  }
  if (point.grouping || comma.grouping)
    return refuse(
      'inconsistent_grouping',
      `"${shown}" is not grouped consistently: use one separator, with three digits in each group after the first (2,800 or 12 500), and one decimal mark.`,
    );
  return refuse('not_a_number', `"${shown}" is not a number.`);
}

/** Reads `s` in one convention; `grouping` says a failure came from a grouping separator. */
function readIn(s: string, convention: Convention): Reading {
  const decimalMark = convention === 'point' ? '.' : ',';
  const groupMarks = convention === 'point' ? [',', ' '] : ['.', ' '];
  const parts = s.split(decimalMark);
  if (parts.length > 2) return { ok: false, grouping: true };
  const [intPart, fracPart] = parts as [string, string | undefined];
  if (fracPart !== undefined && !/^\d+$/.test(fracPart)) return { ok: false, grouping: /[.,]/.test(fracPart) || fracPart.includes(' ') };
  let digits: string;
  const used = groupMarks.filter((m) => intPart.includes(m));
  if (used.length === 0) {
    if (!/^\d*$/.test(intPart)) return { ok: false, grouping: false };
    if (intPart === '' && fracPart === undefined) return { ok: false, grouping: false };
    digits = intPart === '' ? '0' : intPart;
  } else {
    if (used.length > 1) return { ok: false, grouping: true };
    const groups = intPart.split(used[0]!);
    const [first, ...rest] = groups as [string, ...string[]];
    const consistent = /^[1-9]\d{0,2}$/.test(first) && rest.every((g) => /^\d{3}$/.test(g));
    if (!consistent) return { ok: false, grouping: true };
    digits = groups.join('');
  }
  return { ok: true, value: Number(fracPart === undefined ? digits : `${digits}.${fracPart}`) };
}

function readFraction(body: string, shown: string): TypedNumber {
  const simple = /^(\d+)\/(\d+)$/.exec(body);
  const mixed = /^(\d+)(?: |-| ?- ?)(\d+)\/(\d+)$/.exec(body);
  const [whole, num, den] = mixed ? [Number(mixed[1]), Number(mixed[2]), Number(mixed[3])] : simple ? [0, Number(simple[1]), Number(simple[2])] : [NaN, NaN, NaN];
  if (!Number.isFinite(whole)) return refuse('bad_fraction', `"${shown}" is not a fraction: write 5/8, 1 5/8 or 1-5/8.`);
  if (den === 0) return refuse('bad_fraction', `"${shown}" divides by zero.`);
  if (mixed && num >= den) return refuse('bad_fraction', `"${shown}": the fraction after the whole number must be less than one.`);
  return { ok: true, value: whole + num / den };
}

function withSign(r: TypedNumber, sign: number): TypedNumber {
  return r.ok ? { ok: true, value: sign * r.value } : r;
}

function refuse(reason: TypedNumberRefusal, message: string): TypedNumber {
  return { ok: false, reason, message };
}

/** The value written plainly: digits and a decimal point, no grouping. */
function plain(value: number): string {
  return String(value);
}

/** A spelling no convention reads two ways: three decimals could be a group, so add a fourth. */
function unambiguous(value: number): string {
  const s = plain(value);
  const dot = s.indexOf('.');
  return dot >= 0 && s.length - dot - 1 === 3 ? `${s}0` : s;
}
