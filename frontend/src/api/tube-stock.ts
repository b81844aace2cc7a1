// Tube stock lists and the tube chooser (docs/api.md, "Tube stock and the tube chooser"). Wire types
// come from the server's contract; canonical units throughout (mm, MPa, kg/m).
import { http } from './http';
import type {
  StockListWire, StockTubeInput as StockTubeBody, StockTubePatchInput as StockTubePatch, StockTubeWire, TubeChoiceAppliedWire, TubeChoiceApplyInput, TubeChoiceWire,
} from '@contracts/tube-stock';
import type { BuildSheetDetailWire } from '@contracts/garage';

export type {
  CandidateWire as TubeCandidate, MemberTubeChoiceWire as MemberTubeChoice, StockListWire as StockList, StockTubeInput as StockTubeBody,
  StockTubePatchInput as StockTubePatch, StockTubeWire as StockTube, TubeChoiceWire as TubeChoice, TubeChoiceAppliedWire as TubeChoiceApplied,
  TubeChangeWire as TubeChange,
} from '@contracts/tube-stock';

const id = encodeURIComponent;
const clubStock = (clubId: string) => `/clubs/${id(clubId)}/tube-stock`;

export function listClubStock(clubId: string): Promise<StockListWire> {
  return http.get<StockListWire>(clubStock(clubId));
}

export async function addClubStock(clubId: string, body: StockTubeBody): Promise<StockTubeWire> {
  return (await http.post<{ tube: StockTubeWire }>(clubStock(clubId), body)).tube;
}

export async function updateClubStock(clubId: string, tubeId: string, patch: StockTubePatch): Promise<StockTubeWire> {
  return (await http.patch<{ tube: StockTubeWire }>(`${clubStock(clubId)}/${id(tubeId)}`, patch)).tube;
}

export function deleteClubStock(clubId: string, tubeId: string): Promise<void> {
  return http.delete(`${clubStock(clubId)}/${id(tubeId)}`);
}

export function addCommonSizes(clubId: string): Promise<{ added: number; list: StockListWire }> {
  return http.post<{ added: number; list: StockListWire }>(`${clubStock(clubId)}/common`);
}

export function listMyStock(): Promise<StockListWire> {
  return http.get<StockListWire>('/tube-stock/mine');
}

export async function addMyStock(body: StockTubeBody): Promise<StockTubeWire> {
  return (await http.post<{ tube: StockTubeWire }>('/tube-stock/mine', body)).tube;
}

export async function updateMyStock(tubeId: string, patch: StockTubePatch): Promise<StockTubeWire> {
  return (await http.patch<{ tube: StockTubeWire }>(`/tube-stock/mine/${id(tubeId)}`, patch)).tube;
}

export function deleteMyStock(tubeId: string): Promise<void> {
  return http.delete(`/tube-stock/mine/${id(tubeId)}`);
}

export function getTubeChoice(sheetId: string, anyMaterial: boolean): Promise<TubeChoiceWire> {
  return http.get<TubeChoiceWire>(`/build-sheets/${id(sheetId)}/tube-choice${anyMaterial ? '?anyMaterial=true' : ''}`);
}

/** Puts a stock size (and the companions it needs) on the sheet as its next revision. */
export function applyTubeChoice(sheetId: string, body: TubeChoiceApplyInput): Promise<TubeChoiceAppliedWire> {
  return http.post<TubeChoiceAppliedWire>(`/build-sheets/${id(sheetId)}/tube-choice/apply`, body);
}

/** Undo: saves revision `number` again as the next revision, on top of `baseRevision`. */
export function restoreRevision(sheetId: string, number: number, baseRevision: number): Promise<BuildSheetDetailWire> {
  return http.post<BuildSheetDetailWire>(`/build-sheets/${id(sheetId)}/revisions/${number}/restore`, { baseRevision });
}
