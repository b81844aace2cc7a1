// Plausible ranges of a build sheet's fields: the second net under the number reader. A value
// outside its field's range is almost always a units slip (a weight typed in the wrong unit, a wall
// typed as an OD), so it is refused where it is typed and again when a sheet is written. Ranges
// belong to the field, not the dimension: a wall and a brace are both lengths, with nothing else in
// common. Stored revisions are never re-judged by these ranges, so old revisions keep checking.
// The bounds are common practice for club cages (not from a rulebook), kept generous: they catch
// slips of ×10 and ×1000, not unusual cars.
import { formatQuantity, type Dimension, type UnitSystem } from './units.js';

export interface FieldRange {
  dimension: Dimension;
  /** Canonical units (mm, kg, deg, MPa, mm²). */
  min: number;
  max: number;
  /** What the value is, for the message: "a race car's weight". */
  what: string;
}

/** Field paths with `*` for any index, as `joinPath` writes them. */
export const FIELD_RANGES = {
  'vehicle.weightWithDriverKg': { dimension: 'mass', min: 200, max: 5000, what: "a race car's weight" },
  'vehicle.weightWithoutDriverKg': { dimension: 'mass', min: 200, max: 5000, what: "a race car's weight" },
  'members.*.odMm': { dimension: 'length', min: 10, max: 120, what: "a cage tube's outside diameter" },
  'members.*.wallMm': { dimension: 'length', min: 0.5, max: 10, what: "a cage tube's wall" },
  'members.*.wallReadings.*.wallMm': { dimension: 'length', min: 0.3, max: 10, what: 'a measured wall' },
  'members.*.yieldMpa': { dimension: 'stress', min: 150, max: 1500, what: "a tube steel's yield strength" },
  'members.*.lengthMm': { dimension: 'length', min: 50, max: 6000, what: "a cage member's length" },
  'members.*.bends.*.clrMm': { dimension: 'length', min: 15, max: 1500, what: "a bend's centreline radius" },
  'members.*.bends.*.minOdMm': { dimension: 'length', min: 10, max: 120, what: 'a diameter at a bend' },
  'members.*.bends.*.maxOdMm': { dimension: 'length', min: 10, max: 120, what: 'a diameter at a bend' },
  'geometry.rearBraceAttachBelowTopMm': { dimension: 'length', min: 0, max: 1500, what: 'a brace attachment below the hoop top' },
  'geometry.rearBraceAngleFromVerticalDeg': { dimension: 'angle', min: 0, max: 90, what: "a brace's angle from vertical" },
  'geometry.hoopAboveHelmetMm': { dimension: 'length', min: -500, max: 1000, what: 'the hoop top above the helmet' },
  'geometry.helmetBelowHoopLineMm': { dimension: 'length', min: -500, max: 1000, what: 'the helmet below the hoop line' },
  'geometry.hoopBehindHelmetMm': { dimension: 'length', min: 0, max: 1500, what: 'the hoop behind the helmet' },
  'geometry.mainHoopInsideWidthMm': { dimension: 'length', min: 300, max: 2500, what: "a main hoop's inside width" },
  'geometry.harnessBarBelowShouldersMm': { dimension: 'length', min: -500, max: 1000, what: 'the harness bar below the shoulders' },
  'geometry.diagonalLowerEndFromNodeMm': { dimension: 'length', min: 0, max: 1500, what: "a diagonal's end from its node" },
  'geometry.diagonalUpperEndFromNodeMm': { dimension: 'length', min: 0, max: 1500, what: "a diagonal's end from its node" },
  'geometry.nearestTubeToHelmetMm': { dimension: 'length', min: 0, max: 1500, what: 'the nearest tube to the helmet' },
  'plates.*.thicknessMm': { dimension: 'length', min: 0.5, max: 25, what: "a plate's thickness" },
  'plates.*.sidesMm.*': { dimension: 'length', min: 10, max: 1000, what: "a plate's side" },
  'plates.*.areaMm2': { dimension: 'area', min: 100, max: 1_000_000, what: "a plate's area" },
  'plates.*.backingThicknessMm': { dimension: 'length', min: 0.5, max: 25, what: "a backing plate's thickness" },
  'plates.*.boltDiameterMm': { dimension: 'length', min: 3, max: 30, what: "a bolt's diameter" },
  'inspectionHoles.*.diameterMm': { dimension: 'length', min: 1, max: 25, what: "an inspection hole's diameter" },
  'inspectionHoles.*.distanceFromWeldOrBendMm': { dimension: 'length', min: 0, max: 3000, what: "a hole's distance from a weld or bend" },
} as const satisfies Record<string, FieldRange>;

export type RangedField = keyof typeof FIELD_RANGES;

const PATTERNS: readonly [RangedField, RegExp][] = (Object.keys(FIELD_RANGES) as RangedField[]).map((k) => [
  k,
  new RegExp(`^${k.replace(/\./g, '\\.').replace(/\*/g, '\\d+')}$`),
]);

/** The range of the field at a concrete path ("members.3.odMm"), if the field has one. */
export function rangeForPath(path: string): FieldRange | undefined {
  for (const [key, re] of PATTERNS) if (re.test(path)) return FIELD_RANGES[key];
  return undefined;
}

/** Groups thousands so a range reads the way a rulebook prints it: 5,000 kg. */
function grouped(valueCanonical: number, range: FieldRange, system: UnitSystem): string {
  const f = formatQuantity(valueCanonical, range.dimension, system);
  const [whole, frac] = f.value.toFixed(f.decimals).split('.') as [string, string | undefined];
  const sign = whole.startsWith('-') ? '−' : '';
  const digits = whole.replace('-', '').replace(/\B(?=(\d{3})+(?!\d))/g, ',');
  // A range is a round figure: trailing zeros say nothing ("0.5 to 10 mm", not "0.50 to 10.0 mm").
  const fraction = frac?.replace(/0+$/, '');
  const number = `${sign}${digits}${fraction ? `.${fraction}` : ''}`;
  return f.unitLabel === '°' ? `${number}°` : f.unitLabel ? `${number} ${f.unitLabel}` : number;
}

function span(range: FieldRange, system: UnitSystem): string {
  const lo = grouped(range.min, range, system);
  const hi = grouped(range.max, range, system);
  return `${lo.replace(/ \S+$|°$/, '')} to ${hi}`;
}

/** "A race car's weight is 441 to 11,023 lb: check the units." in the builder's units. */
export function rangeMessage(range: FieldRange, system: UnitSystem): string {
  return `${capital(range.what)} is ${span(range, system)}: check the units.`;
}

/** The server's message names both systems, since it does not know which the builder typed in. */
export function rangeMessageBothSystems(range: FieldRange): string {
  const metric = span(range, 'metric');
  const imperial = span(range, 'imperial');
  return metric === imperial ? rangeMessage(range, 'metric') : `${capital(range.what)} is ${metric} (${imperial}): check the units.`;
}

/** Whether a canonical value is inside its range (allowing the noise of a unit conversion). */
export function inRange(value: number, range: FieldRange): boolean {
  const slack = 1e-9 * Math.max(1, Math.abs(range.max));
  return value >= range.min - slack && value <= range.max + slack;
}

export interface RangeProblem {
  path: string;
  message: string;
}

/** Every number in `doc` (a specification) outside its field's range, with its path. */
export function implausibleValues(doc: unknown): RangeProblem[] {
  const problems: RangeProblem[] = [];
  const visit = (value: unknown, path: string): void => {
    if (typeof value === 'number') {
      const range = rangeForPath(path);
      if (range && !inRange(value, range)) problems.push({ path, message: rangeMessageBothSystems(range) });
    } else if (Array.isArray(value)) value.forEach((v, i) => visit(v, path ? `${path}.${i}` : String(i)));
    else if (value && typeof value === 'object') for (const [k, v] of Object.entries(value)) visit(v, path ? `${path}.${k}` : k);
  };
  visit(doc, '');
  return problems;
}

const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);
