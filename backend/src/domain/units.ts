// Units of measure for Cagewright. Everything inside the product is canonical (mm, kg, degrees,
// MPa, mm², mm³, mm⁴, kg/m); conversion happens only at the edges: form inputs, reports and the
// one-time conversion of a ruleset document written in its rulebook's own units.
import { readTypedNumber } from './typed-number.js';

export type UnitSystem = 'imperial' | 'metric';

export type Dimension =
  | 'length'
  | 'mass'
  | 'angle'
  | 'area'
  | 'stress'
  | 'ratio'
  | 'count'
  | 'mass_per_length'
  | 'section_modulus'
  | 'second_moment'
  /** A bending moment (yield × section modulus: MPa × mm³ = N·mm). */
  | 'moment';

export const DIMENSIONS: readonly Dimension[] = [
  'length', 'mass', 'angle', 'area', 'stress', 'ratio', 'count', 'mass_per_length', 'section_modulus', 'second_moment', 'moment',
];

/** Exact by definition (international inch and pound, 1959). F-UNIT-1. */
export const MM_PER_IN = 25.4;
export const KG_PER_LB = 0.45359237;
/** 1 lbf/in² in MPa: 4.4482216152605 N / 645.16 mm². */
export const MPA_PER_PSI = (KG_PER_LB * 9.80665) / (MM_PER_IN * MM_PER_IN);
/** 1 lbf in newtons (standard gravity, exact by definition). */
const LBF_N = KG_PER_LB * 9.80665;

interface UnitDef {
  dimension: Dimension;
  /** canonical = value × factor */
  factor: number;
  label: string;
}

/** Every unit a ruleset document or a form may name. Keys are what documents write. */
export const UNITS: Readonly<Record<string, UnitDef>> = {
  mm: { dimension: 'length', factor: 1, label: 'mm' },
  cm: { dimension: 'length', factor: 10, label: 'cm' },
  m: { dimension: 'length', factor: 1000, label: 'm' },
  in: { dimension: 'length', factor: MM_PER_IN, label: 'in' },
  ft: { dimension: 'length', factor: MM_PER_IN * 12, label: 'ft' },
  kg: { dimension: 'mass', factor: 1, label: 'kg' },
  lb: { dimension: 'mass', factor: KG_PER_LB, label: 'lb' },
  deg: { dimension: 'angle', factor: 1, label: '°' },
  mm2: { dimension: 'area', factor: 1, label: 'mm²' },
  cm2: { dimension: 'area', factor: 100, label: 'cm²' },
  in2: { dimension: 'area', factor: MM_PER_IN ** 2, label: 'in²' },
  MPa: { dimension: 'stress', factor: 1, label: 'MPa' },
  'N/mm2': { dimension: 'stress', factor: 1, label: 'N/mm²' },
  psi: { dimension: 'stress', factor: MPA_PER_PSI, label: 'psi' },
  ksi: { dimension: 'stress', factor: MPA_PER_PSI * 1000, label: 'ksi' },
  ratio: { dimension: 'ratio', factor: 1, label: '' },
  count: { dimension: 'count', factor: 1, label: '' },
  'kg/m': { dimension: 'mass_per_length', factor: 1, label: 'kg/m' },
  'lb/ft': { dimension: 'mass_per_length', factor: KG_PER_LB / (MM_PER_IN * 12 / 1000), label: 'lb/ft' },
  mm3: { dimension: 'section_modulus', factor: 1, label: 'mm³' },
  in3: { dimension: 'section_modulus', factor: MM_PER_IN ** 3, label: 'in³' },
  mm4: { dimension: 'second_moment', factor: 1, label: 'mm⁴' },
  in4: { dimension: 'second_moment', factor: MM_PER_IN ** 4, label: 'in⁴' },
  'N*mm': { dimension: 'moment', factor: 1, label: 'N·mm' },
  'N*m': { dimension: 'moment', factor: 1000, label: 'N·m' },
  'lbf*in': { dimension: 'moment', factor: LBF_N * MM_PER_IN, label: 'lbf·in' },
  'lbf*ft': { dimension: 'moment', factor: LBF_N * MM_PER_IN * 12, label: 'lbf·ft' },
};

export type UnitName = keyof typeof UNITS;

/** The unit a document or a display uses for a dimension when none is named. */
export const DEFAULT_UNIT: Readonly<Record<UnitSystem, Record<Dimension, string>>> = {
  imperial: {
    length: 'in', mass: 'lb', angle: 'deg', area: 'in2', stress: 'psi', ratio: 'ratio', count: 'count',
    mass_per_length: 'lb/ft', section_modulus: 'in3', second_moment: 'in4', moment: 'lbf*in',
  },
  metric: {
    length: 'mm', mass: 'kg', angle: 'deg', area: 'mm2', stress: 'MPa', ratio: 'ratio', count: 'count',
    mass_per_length: 'kg/m', section_modulus: 'mm3', second_moment: 'mm4', moment: 'N*m',
  },
};

export function isUnitName(name: string): boolean {
  return Object.prototype.hasOwnProperty.call(UNITS, name);
}

export function unitDimension(unit: string): Dimension | undefined {
  return isUnitName(unit) ? UNITS[unit].dimension : undefined;
}

/** Converts a value in `unit` to the canonical unit of its dimension. Throws on an unknown unit. */
export function toCanonical(value: number, unit: string): number {
  const def = UNITS[unit];
  if (!def || !isUnitName(unit)) throw new Error(`Unknown unit "${unit}"`);
  return value * def.factor;
}

/** Converts a canonical value to `unit`. Throws on an unknown unit. */
export function fromCanonical(valueCanonical: number, unit: string): number {
  const def = UNITS[unit];
  if (!def || !isUnitName(unit)) throw new Error(`Unknown unit "${unit}"`);
  return valueCanonical / def.factor;
}

export const inToMm = (inches: number): number => inches * MM_PER_IN;
export const mmToIn = (mm: number): number => mm / MM_PER_IN;
export const lbToKg = (lb: number): number => lb * KG_PER_LB;
export const kgToLb = (kg: number): number => kg / KG_PER_LB;

/** The canonical-unit conversion of a document value of `dimension` written in `system`'s default unit. */
export function documentValueToCanonical(value: number, dimension: Dimension, system: UnitSystem, unit?: string): number {
  return toCanonical(value, unit ?? DEFAULT_UNIT[system][dimension]);
}

export interface FormattedQuantity {
  /** Value in the display unit, rounded to `decimals`. */
  value: number;
  unit: string;
  /** Unit label for display (may be empty for ratios and counts). */
  unitLabel: string;
  decimals: number;
  /** "1.500 in", "45.0 mm", "0.92", "3" */
  text: string;
}

export interface FormatOptions {
  /** Force a display unit of the right dimension (e.g. "cm2" for a plate). */
  unit?: string;
  decimals?: number;
}

/**
 * Picks the display unit and decimals for a canonical quantity. Tube sizes in inches carry three
 * decimals (1.500 × 0.095 in is how the trade writes them); areas of plates show in cm² in metric.
 */
export function formatQuantity(
  valueCanonical: number,
  dimension: Dimension,
  system: UnitSystem,
  options: FormatOptions = {},
): FormattedQuantity {
  let unit = options.unit ?? DEFAULT_UNIT[system][dimension];
  if (!options.unit && system === 'metric' && dimension === 'area' && Math.abs(valueCanonical) >= 1000) unit = 'cm2';
  const def = UNITS[unit];
  if (!def || def.dimension !== dimension) throw new Error(`Unit "${unit}" is not a unit of ${dimension}`);
  const raw = valueCanonical / def.factor;
  const decimals = options.decimals ?? defaultDecimals(unit, raw);
  const value = roundTo(raw, decimals);
  const label = def.label;
  const number = value.toFixed(decimals);
  const text = label === '' ? number : label === '°' ? `${number}°` : `${number} ${label}`;
  return { value, unit, unitLabel: label, decimals, text };
}

function defaultDecimals(unit: string, raw: number): number {
  const abs = Math.abs(raw);
  switch (unit) {
    case 'in': return 3;
    case 'mm': return abs >= 100 ? 0 : abs >= 10 ? 1 : 2;
    case 'ft': case 'm': return 2;
    case 'kg': case 'lb': return abs >= 100 ? 0 : 1;
    case 'deg': return 1;
    case 'in2': return 2;
    case 'cm2': return 1;
    case 'mm2': return abs >= 100 ? 0 : 1;
    case 'psi': return 0;
    case 'ksi': case 'MPa': case 'N/mm2': return 0;
    case 'ratio': return 2;
    case 'count': return 0;
    case 'kg/m': case 'lb/ft': return 3;
    case 'in3': case 'in4': return 4;
    case 'mm3': case 'mm4': return 0;
    case 'N*m': return abs >= 100 ? 0 : 1;
    case 'N*mm': case 'lbf*in': return 0;
    case 'lbf*ft': return abs >= 100 ? 0 : 1;
    default: return 2;
  }
}

export function roundTo(value: number, decimals: number): number {
  // Scale, then drop binary noise below 12 significant digits before rounding, so a value that is
  // exactly on a half in decimal (1.75 in = 44.45 mm, stored as 44.449999…) rounds the way a person expects.
  const f = 10 ** decimals;
  const scaled = Number((value * f).toPrecision(12));
  return (Math.sign(scaled) * Math.round(Math.abs(scaled))) / f;
}

export type ParseResult = { ok: true; valueCanonical: number } | { ok: false; message: string };

/**
 * Parses what a person types into a form field: a number as `readTypedNumber` reads it ("2,800",
 * "2 800", "2.800,5", "1.5", "1 1/2", "1-5/8"), optionally followed by a unit ("45 mm", "1.75in",
 * "0.095\""). Without a unit, `defaultUnit` applies. The form's unit system sets the presumption for
 * a number both conventions read ("2,800" is 2800 in inch-pound mode and refused in metric mode),
 * whatever unit is typed after it: the convention is the writer's, not the unit's.
 */
export function parseQuantity(text: string, dimension: Dimension, defaultUnit: string, system: UnitSystem): ParseResult {
  const trimmed = text.trim().replace(/″|"/g, ' in').replace(/°/g, ' deg');
  if (trimmed === '') return { ok: false, message: 'Enter a value.' };
  const match = /^([+\-\u2212]?\s?[0-9.,][0-9.,\s/-]*?)\s*([a-zA-Z][a-zA-Z0-9/²]*)?$/.exec(trimmed);
  if (!match) return { ok: false, message: `"${text.trim()}" is not a number.` };
  const numberPart = match[1]!.trim();
  const unitPart = (match[2] ?? defaultUnit).replace('²', '2');
  const unit = isUnitName(unitPart) ? unitPart : undefined;
  if (!unit) return { ok: false, message: `Unknown unit "${unitPart}".` };
  if (UNITS[unit].dimension !== dimension) return { ok: false, message: `"${unitPart}" is not a unit of ${dimension.replace(/_/g, ' ')}.` };
  const read = readTypedNumber(numberPart, system);
  if (!read.ok) return { ok: false, message: read.message };
  return { ok: true, valueCanonical: toCanonical(read.value, unit) };
}

/** Relative + absolute floating-point slack: conversions like 1.5 in → 38.1 mm must not flip a verdict. */
export function epsilonFor(value: number): number {
  return 1e-9 * Math.max(1, Math.abs(value));
}

/** a ≥ b allowing floating-point noise and a stated tolerance (canonical units). */
export function atLeast(a: number, b: number, tolerance = 0): boolean {
  return a >= b - tolerance - epsilonFor(b);
}

/** a ≤ b allowing floating-point noise and a stated tolerance (canonical units). */
export function atMost(a: number, b: number, tolerance = 0): boolean {
  return a <= b + tolerance + epsilonFor(b);
}

/** |a − b| within tolerance plus floating-point noise. */
export function nearlyEqual(a: number, b: number, tolerance = 0): boolean {
  return Math.abs(a - b) <= tolerance + epsilonFor(b);
}
