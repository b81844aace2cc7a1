// Tube sizes an explanation quotes ("1.500 × 0.095 in", "38 × 2.5 / 40 × 2.0 mm", "1-5/8 in OD × 0.118
// in"), so the rulebook editor can warn when a tube table was changed and its explanation still quotes a
// size the table no longer lists. Only sizes the table listed before count as stale: an explanation may
// rightly quote other sizes (a printed imperial equivalent, the sizes of another rule). Pure: the
// browser imports it.
import type { TubeTable } from '../../contracts/ruleset.js';
import { MM_PER_IN } from '../units.js';

export interface SizeMm {
  odMm: number;
  wallMm: number;
}

export interface QuotedSize extends SizeMm {
  /** The words as the explanation has them, e.g. "1.500 × 0.095 in". */
  text: string;
}

type LengthUnit = 'in' | 'mm';

const NUMBER = String.raw`(\d+[- ]\d+\/\d+|\d+\/\d+|\d*\.\d+|\d+)`;
const UNIT = String.raw`(?:\s*(inches|inch|in\b|mm\b|"|″|”))?`;
const SIZE = new RegExp(String.raw`${NUMBER}${UNIT}(?:\s*OD)?\s*[×xX]\s*${NUMBER}${UNIT}`, 'g');
/** How far ahead a unit-less size looks for the unit of the size after it ("38 × 2.5 / 40 × 2.0 mm"). */
const SHARED_UNIT_REACH = 12;

function numberOf(text: string): number {
  const mixed = /^(\d+)[- ](\d+)\/(\d+)$/.exec(text);
  if (mixed) return Number(mixed[1]) + Number(mixed[2]) / Number(mixed[3]);
  const fraction = /^(\d+)\/(\d+)$/.exec(text);
  if (fraction) return Number(fraction[1]) / Number(fraction[2]);
  return Number(text);
}

function unitOf(word: string | undefined): LengthUnit | undefined {
  if (!word) return undefined;
  return word === 'mm' ? 'mm' : 'in';
}

const toMm = (value: number, unit: LengthUnit) => (unit === 'in' ? value * MM_PER_IN : value);

/** Every OD × wall the text quotes, in millimetres; a size without a unit takes the next size's or `defaultUnit`. */
export function quotedSizes(text: string, defaultUnit: LengthUnit): QuotedSize[] {
  const found = [...text.matchAll(SIZE)].map((m) => ({
    text: m[0].trim(),
    start: m.index,
    end: m.index + m[0].length,
    od: numberOf(m[1]!),
    wall: numberOf(m[3]!),
    unit: unitOf(m[4]) ?? unitOf(m[2]),
  }));
  return found.flatMap((f, i) => {
    const next = found[i + 1];
    const shared = next && next.start - f.end <= SHARED_UNIT_REACH ? next.unit : undefined;
    const unit = f.unit ?? shared ?? defaultUnit;
    if (!Number.isFinite(f.od) || !Number.isFinite(f.wall) || f.od <= 0 || f.wall <= 0) return [];
    return [{ text: f.unit || !shared ? f.text : `${f.text} ${unit}`, odMm: toMm(f.od, unit), wallMm: toMm(f.wall, unit) }];
  });
}

/** Every size the table lists, in any band or row, in millimetres (`lengthUnit`: the document's). */
export function tableSizes(table: Pick<TubeTable, 'bands'>, lengthUnit: string): SizeMm[] {
  return table.bands.flatMap((band) =>
    band.rows.flatMap((row) =>
      row.alternatives
        .filter((a) => Number.isFinite(a.od) && Number.isFinite(a.wall))
        .map((a) => {
          const unit: LengthUnit = (a.unit ?? lengthUnit) === 'mm' ? 'mm' : 'in';
          return { odMm: toMm(a.od, unit), wallMm: toMm(a.wall, unit) };
        }),
    ),
  );
}

/** Same size, to the third decimal of an inch (0.0254 mm) either way. */
const sameSize = (a: SizeMm, b: SizeMm) => Math.abs(a.odMm - b.odMm) < 0.02 && Math.abs(a.wallMm - b.wallMm) < 0.02;

/**
 * The sizes `explanation` quotes that the table listed (`before`) but lists no more (`now`): what an
 * editor should tell the admin to update. Each size once, in the order the text has them.
 */
export function staleQuotedSizes(explanation: string, before: readonly SizeMm[], now: readonly SizeMm[], defaultUnit: LengthUnit): QuotedSize[] {
  const out: QuotedSize[] = [];
  for (const q of quotedSizes(explanation, defaultUnit)) {
    if (!before.some((b) => sameSize(b, q)) || now.some((n) => sameSize(n, q))) continue;
    if (!out.some((o) => sameSize(o, q))) out.push(q);
  }
  return out;
}
