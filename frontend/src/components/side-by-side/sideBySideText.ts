// Words for the side-by-side matrix: limits and tube demands in the reader's units. Direct module
// imports keep the rules engine out of this page's bundle (the matrix comes computed from the server).
import { formatQuantity, type UnitSystem } from '@domain/units';
import type { ComparedLimit, ComparisonCell } from '@domain/compare/side-by-side';
import { sizeText } from '@/components/tubes/tubeText';

export { sizeText };

export function lengthText(mm: number, units: UnitSystem): string {
  return formatQuantity(mm, 'length', units, { decimals: units === 'imperial' ? 3 : 1 }).text;
}

export function limitValueText(limit: Pick<ComparedLimit, 'dimension' | 'direction'>, value: number, units: UnitSystem): string {
  const shown = limit.dimension ? formatQuantity(value, limit.dimension, units).text : String(value);
  return `${limit.direction === 'atLeast' ? 'at least' : 'at most'} ${shown}`;
}

/** "§ C4.2.2", with the other sections of the cell after it. */
export function sectionsText(cell: ComparisonCell): string {
  return cell.sections.map((s) => `§ ${s}`).join(', ');
}
