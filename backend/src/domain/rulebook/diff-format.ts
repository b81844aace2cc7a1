// Wording helpers for the ruleset diff: document values to display text in a chosen unit system,
// vocabulary words, and a structural comparison of raw JSON (conditions) that names changed paths.
import type { Dimension, UnitSystem } from '../units.js';
import { documentValueToCanonical, epsilonFor, formatQuantity } from '../units.js';
import { MEMBER_KIND_LABELS } from '../vocabulary.js';
import type { MemberKind } from '../vocabulary.js';

/** How values of one document are shown: the document's own system and the reader's. */
export interface Side {
  system: UnitSystem;
  display: UnitSystem;
}

/** "2200 lb" → "2,200 lb": rulebooks print weights with a thousands separator. */
export function groupThousands(text: string): string {
  return text.replace(
    /^(-?)(\d{4,})/,
    (_m, sign: string, digits: string) => sign + digits.replace(/\B(?=(\d{3})+(?!\d))/g, ','),
  );
}

/** A document value in canonical units, or undefined when its unit is unknown (a broken draft). */
export function canonical(
  value: number,
  dimension: Dimension,
  side: Side,
  unit?: string,
): number | undefined {
  try {
    return documentValueToCanonical(value, dimension, side.system, unit);
  } catch {
    return undefined;
  }
}

export function quantity(value: number, dimension: Dimension, side: Side, unit?: string): string {
  const c = canonical(value, dimension, side, unit);
  if (c === undefined) return `${value} ${unit ?? ''}`.trim();
  return groupThousands(formatQuantity(c, dimension, side.display).text);
}

/** The number part only ("0.095"), for "0.095 → 0.120 in". */
export function quantityNumber(value: number, dimension: Dimension, side: Side, unit?: string): string {
  const c = canonical(value, dimension, side, unit);
  if (c === undefined) return String(value);
  const f = formatQuantity(c, dimension, side.display);
  return groupThousands(f.value.toFixed(f.decimals));
}

export function sameNumber(a: number | undefined, b: number | undefined): boolean {
  if (a === undefined || b === undefined) return a === b;
  return Math.abs(a - b) <= epsilonFor(b);
}

export interface SizeDoc {
  od: number;
  wall: number;
  unit?: string;
}

export function canonicalSize(s: SizeDoc, side: Side): { odMm: number; wallMm: number } | undefined {
  const odMm = canonical(s.od, 'length', side, s.unit);
  const wallMm = canonical(s.wall, 'length', side, s.unit);
  return odMm === undefined || wallMm === undefined ? undefined : { odMm, wallMm };
}

export function sameSize(a: SizeDoc, sa: Side, b: SizeDoc, sb: Side): boolean {
  const ca = canonicalSize(a, sa);
  const cb = canonicalSize(b, sb);
  if (!ca || !cb) return a.od === b.od && a.wall === b.wall && a.unit === b.unit;
  return sameNumber(ca.odMm, cb.odMm) && sameNumber(ca.wallMm, cb.wallMm);
}

/** "1.500 × 0.095 in" / "45.0 × 2.50 mm": the trade's way of writing a tube size. */
export function sizeText(s: SizeDoc, side: Side): string {
  const c = canonicalSize(s, side);
  if (!c) return `${s.od} × ${s.wall} ${s.unit ?? ''}`.trim();
  const od = formatQuantity(c.odMm, 'length', side.display);
  const wall = formatQuantity(c.wallMm, 'length', side.display);
  return `${od.value.toFixed(od.decimals)} × ${wall.value.toFixed(wall.decimals)} ${od.unitLabel}`;
}

const VALUE_WORDS: Readonly<Record<string, string>> = {
  mild_steel: 'mild steel',
  chromoly_4130: '4130 chromoly',
  dom: 'DOM',
  erw: 'ERW',
  cds: 'CDS',
  tig: 'TIG',
  mig: 'MIG',
  sfi_45_1: 'SFI 45.1',
  fia_8857_2001: 'FIA 8857-2001',
  non_homologated: 'non-homologated',
  tube_frame: 'tube frame',
};

/** A vocabulary value as a reader would write it ("chromoly_4130" → "4130 chromoly"). */
export function valueWord(value: string): string {
  return VALUE_WORDS[value] ?? value.replace(/_/g, ' ');
}

/** Values joined for reading; member kinds by their trade names ("rear brace (backstay)"). */
export function kindsText(kinds: readonly string[], joiner = ' or '): string {
  return kinds
    .map((k) =>
      Object.prototype.hasOwnProperty.call(MEMBER_KIND_LABELS, k)
        ? MEMBER_KIND_LABELS[k as MemberKind]
        : valueWord(k),
    )
    .join(joiner);
}

export const quoted = (text: string): string => `'${text}'`;

/**
 * Paths (dot-joined, array indices as numbers) where two JSON values differ, in document order.
 * A changed leaf is named itself; an added or removed key or array element by its own path.
 */
export function changedJsonPaths(a: unknown, b: unknown, prefix = ''): string[] {
  if (Object.is(a, b)) return [];
  const here = prefix === '' ? '(whole)' : prefix;
  const join = (k: string | number) => (prefix === '' ? String(k) : `${prefix}.${k}`);
  if (Array.isArray(a) && Array.isArray(b)) {
    const out: string[] = [];
    for (let i = 0; i < Math.max(a.length, b.length); i++) {
      if (i >= a.length || i >= b.length) out.push(join(i));
      else out.push(...changedJsonPaths(a[i], b[i], join(i)));
    }
    return out;
  }
  const isObj = (x: unknown): x is Record<string, unknown> =>
    typeof x === 'object' && x !== null && !Array.isArray(x);
  if (isObj(a) && isObj(b)) {
    const keys = [...Object.keys(a), ...Object.keys(b).filter((k) => !(k in a))];
    return keys.flatMap((k) => (k in a && k in b ? changedJsonPaths(a[k], b[k], join(k)) : [join(k)]));
  }
  return [here];
}

/** "all.1.value, all.3 and 4 more" */
export function pathsText(paths: readonly string[], shown = 5): string {
  const head = paths.slice(0, shown).join(', ');
  return paths.length > shown ? `${head} and ${paths.length - shown} more` : head;
}
