// Numbers typed at the bench, in the builder's own units: what an input shows for a canonical value
// (mm, kg, degrees inside), how typed text becomes a canonical value again, and the composable an input
// uses so that re-formatting never fights the person typing.
import { ref, watch, type Ref } from 'vue';
import { DEFAULT_UNIT, UNITS, formatQuantity, parseQuantity, roundTo } from '@domain/units';
import type { Dimension, UnitSystem } from '@domain/units';
import { inRange, rangeMessage, type FieldRange } from '@domain/field-ranges';

/** Extra decimals an input may show so a stored value survives being shown (45 mm = 1.7717 in). */
const MAX_INPUT_DECIMALS: Record<string, number> = { in: 4, mm: 3, kg: 1, lb: 0, deg: 1, ratio: 3, count: 0, cm2: 2 };

export function inputUnit(dimension: Dimension, system: UnitSystem): string {
  return DEFAULT_UNIT[system][dimension];
}

export function inputUnitLabel(dimension: Dimension, system: UnitSystem): string {
  return UNITS[inputUnit(dimension, system)]?.label ?? '';
}

/**
 * The text an input shows for a canonical value: the trade's usual decimals (three for inches), with
 * more only when the usual ones would hide a difference (a metric size shown in inches).
 */
export function formatForInput(valueCanonical: number | undefined, dimension: Dimension, system: UnitSystem): string {
  if (valueCanonical === undefined || !Number.isFinite(valueCanonical)) return '';
  const unit = inputUnit(dimension, system);
  const usual = formatQuantity(valueCanonical, dimension, system, { unit });
  const raw = valueCanonical / UNITS[unit].factor;
  const max = MAX_INPUT_DECIMALS[unit] ?? 3;
  let decimals = usual.decimals;
  while (decimals < max && Math.abs(roundTo(raw, decimals) - raw) > 1e-9 * Math.max(1, Math.abs(raw))) decimals += 1;
  return roundTo(raw, decimals).toFixed(decimals);
}

export interface InputRules {
  /** Canonical limits; the message names them in the builder's units. */
  min?: number;
  max?: number;
  /** Zero or below is refused (most lengths and weights). */
  positive?: boolean;
  integer?: boolean;
  /** Said after "Over <max>" when a value is implausibly large, e.g. "not a cage tube; check the units". */
  maxHint?: string;
  /** The field's plausible range (domain/field-ranges.ts): outside it is a units slip. */
  range?: FieldRange;
  /**
   * The field cannot be empty (a node's coordinate): emptying it is refused with this message and the
   * value it held stays, rather than becoming zero or nothing without a word.
   */
  required?: string;
}

export type InputParse = { ok: true; value: number | undefined } | { ok: false; message: string };

/** Typed text → canonical value (undefined when empty), or the message to show at the input. */
export function parseInput(text: string, dimension: Dimension, system: UnitSystem, rules: InputRules = {}): InputParse {
  if (text.trim() === '') return rules.required ? { ok: false, message: rules.required } : { ok: true, value: undefined };
  const parsed = parseQuantity(text, dimension, inputUnit(dimension, system), system);
  if (!parsed.ok) return parsed;
  const value = parsed.valueCanonical;
  const shown = (v: number) => formatQuantity(v, dimension, system).text;
  if (rules.positive !== false && rules.min === undefined && value <= 0) return { ok: false, message: 'Must be more than zero.' };
  if (rules.min !== undefined && value < rules.min - 1e-9)
    return { ok: false, message: rules.min === 0 ? 'Must not be negative.' : `Must be at least ${shown(rules.min)}.` };
  if (rules.max !== undefined && value > rules.max + 1e-9)
    return { ok: false, message: rules.maxHint ? `Over ${shown(rules.max)}: ${rules.maxHint}.` : `Must be at most ${shown(rules.max)}.` };
  if (rules.integer && !Number.isInteger(value)) return { ok: false, message: 'Must be a whole number.' };
  if (rules.range && !inRange(value, rules.range)) return { ok: false, message: rangeMessage(rules.range, system) };
  return { ok: true, value };
}

/**
 * One input's state: the text as typed, its parse error, and the canonical value it stands for. The
 * text follows the model only when the model changes from outside (load, copy, unit switch), never
 * while it reflects what was just typed.
 */
export function useUnitInput(
  model: Ref<number | undefined>,
  dimension: Ref<Dimension>,
  system: Ref<UnitSystem>,
  rules: Ref<InputRules>,
  emit: (value: number | undefined) => void,
) {
  const text = ref(formatForInput(model.value, dimension.value, system.value));
  const parseError = ref<string | null>(null);
  let lastEmitted: number | undefined | null = null;

  /** Takes the text as typed; returns how it read, so a caller may keep the text with its value. */
  function onText(next: string): InputParse {
    text.value = next;
    const parsed = parseInput(next, dimension.value, system.value, rules.value);
    if (!parsed.ok) {
      parseError.value = parsed.message;
      return parsed;
    }
    parseError.value = null;
    lastEmitted = parsed.value;
    if (parsed.value !== model.value) emit(parsed.value);
    return parsed;
  }

  /** Tidy the text to the usual decimals once the builder leaves the input. */
  function onBlur(): void {
    if (parseError.value === null) text.value = formatForInput(model.value, dimension.value, system.value);
  }

  watch(model, (value) => {
    if (lastEmitted !== null && value === lastEmitted) return;
    lastEmitted = null;
    parseError.value = null;
    text.value = formatForInput(value, dimension.value, system.value);
  });
  watch(system, () => {
    if (parseError.value === null) text.value = formatForInput(model.value, dimension.value, system.value);
  });

  return { text, parseError, onText, onBlur };
}
