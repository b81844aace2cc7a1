// One build sheet against several rulebooks at once (docs/api.md, "Several rulebooks side by side").
import { http } from './http';
import type { SideBySideBody, SideBySideOptionsWire, SideBySideWire } from '@contracts/side-by-side';

export type { SideBySideOptionsWire as SideBySideOptions, SideBySideOptionWire as SideBySideOption, SideBySideWire as SideBySide } from '@contracts/side-by-side';
export type { ComparisonRow, ComparisonCell, ComparedLimit, ComparedTubes } from '@domain/compare/side-by-side';

const id = encodeURIComponent;

/** The sheet's own rulebook and every other edition in force in the builder's clubs. */
export function getSideBySideOptions(sheetId: string): Promise<SideBySideOptionsWire> {
  return http.get<SideBySideOptionsWire>(`/build-sheets/${id(sheetId)}/side-by-side`);
}

/** The matrix of the sheet's latest saved revision under its own rulebook and the ones picked. */
export function compareSideBySide(sheetId: string, body: SideBySideBody): Promise<SideBySideWire> {
  return http.post<SideBySideWire>(`/build-sheets/${id(sheetId)}/side-by-side`, body);
}
