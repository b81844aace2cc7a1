// How tube sizes and candidates read on screen, in the person's units: "44.45 × 2.41 mm" or
// "1.750 × 0.095 in", mass per length in kg/m or lb/ft, and the material and process in words.
import { formatQuantity } from '@domain/units';
import type { UnitSystem } from '@domain/units';
import { MATERIAL_LABELS, PROCESS_LABELS } from '@domain/vocabulary';

/** Millimetres to at most two decimals without trailing zeros (45, 44.45, 2.41), inches to three. */
export function sizeText(odMm: number, wallMm: number, units: UnitSystem): string {
  if (units === 'imperial') {
    const od = formatQuantity(odMm, 'length', units, { decimals: 3 });
    const wall = formatQuantity(wallMm, 'length', units, { decimals: 3 });
    return `${od.value.toFixed(3)} × ${wall.value.toFixed(3)} ${od.unitLabel}`;
  }
  const mm = (x: number) => String(Math.round(x * 100) / 100);
  return `${mm(odMm)} × ${mm(wallMm)} mm`;
}

export function massPerLengthText(kgPerM: number, units: UnitSystem): string {
  return formatQuantity(kgPerM, 'mass_per_length', units, { decimals: 3 }).text;
}

export function massText(kg: number, units: UnitSystem): string {
  return formatQuantity(kg, 'mass', units, { decimals: 2 }).text;
}

/** "DOM mild steel, 1020 DOM" */
export function stuffText(t: { material: string | null; process: string | null; grade?: string | null }): string {
  const process = t.process ? (PROCESS_LABELS[t.process as keyof typeof PROCESS_LABELS] ?? t.process) : 'process not stated,';
  const material = t.material ? (MATERIAL_LABELS[t.material as keyof typeof MATERIAL_LABELS] ?? t.material) : 'material not stated';
  return `${process} ${material}${t.grade ? `, ${t.grade}` : ''}`;
}

export function yieldText(yieldMpa: number | null, units: UnitSystem): string {
  if (yieldMpa === null) return 'not known';
  return units === 'imperial' ? formatQuantity(yieldMpa, 'stress', units, { unit: 'ksi', decimals: 0 }).text : `${Math.round(yieldMpa)} MPa`;
}
