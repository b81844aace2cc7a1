// The builder's garage: cars, build sheets, revisions and their diffs, and check runs
// (docs/api.md, "Garage"). Wire types come from the server's contract; canonical units throughout.
import { http } from './http';
import type {
  BuildSheetDetailWire, CarWire, CheckRunSummaryWire, SheetEditionsWire, SheetCheckRunWire as CheckRunWire, CreateCarBody, ListQuery, RevisionDiffWire,
  RevisionSummaryWire, RevisionWire, UpdateCarBody,
} from '@contracts/garage';
import type { Specification } from '@contracts/specification';
import type { CheckRunWire as SavedCheckRun } from '@contracts/checks';

export type { SavedCheckRun };

export type {
  BuildSheetDetailWire as BuildSheetDetail, BuildSheetWire as BuildSheet, CarWire as Car, SheetCheckRunWire as CheckRun,
  CutListRowWire as CutListRow, DiffChangeWire as DiffChange, RevisionDiffWire as RevisionDiff,
  RevisionSummaryWire as RevisionSummary, SheetSummaryWire as SheetSummary, SheetVerdict, SheetEditionsWire as SheetEditions,
  SheetReviewWire as SheetReview,
} from '@contracts/garage';

const id = encodeURIComponent;
const carPath = (carId: string) => `/cars/${id(carId)}`;
const sheetPath = (sheetId: string) => `/build-sheets/${id(sheetId)}`;

export async function listCars(show: ListQuery['show'] = 'active'): Promise<CarWire[]> {
  return (await http.get<{ cars: CarWire[] }>(`/cars?show=${show}`)).cars;
}

export async function getCar(carId: string): Promise<CarWire> {
  return (await http.get<{ car: CarWire }>(carPath(carId))).car;
}

export async function createCar(body: CreateCarBody): Promise<CarWire> {
  return (await http.post<{ car: CarWire }>('/cars', body)).car;
}

export async function updateCar(carId: string, body: UpdateCarBody): Promise<CarWire> {
  return (await http.patch<{ car: CarWire }>(carPath(carId), body)).car;
}

export async function archiveCar(carId: string): Promise<CarWire> {
  return (await http.post<{ car: CarWire }>(`${carPath(carId)}/archive`)).car;
}

export async function restoreCar(carId: string): Promise<CarWire> {
  return (await http.post<{ car: CarWire }>(`${carPath(carId)}/unarchive`)).car;
}

export interface NewSheet {
  name: string;
  clubId: string;
  rulesetVersionId: string;
  classId: string;
}

export function createSheet(carId: string, body: NewSheet): Promise<BuildSheetDetailWire> {
  return http.post<BuildSheetDetailWire>(`${carPath(carId)}/build-sheets`, body);
}

export function getSheet(sheetId: string): Promise<BuildSheetDetailWire> {
  return http.get<BuildSheetDetailWire>(sheetPath(sheetId));
}

export async function archiveSheet(sheetId: string): Promise<void> {
  await http.post(`${sheetPath(sheetId)}/archive`);
}

export interface SaveRevision {
  baseRevision: number;
  rulesetVersionId: string;
  classId: string;
  specification: Specification;
}

/** Saves a new revision on top of `baseRevision`; a stale base gives `409 conflict` `{ currentRevision }`. */
export function saveRevision(sheetId: string, body: SaveRevision): Promise<BuildSheetDetailWire> {
  return http.put<BuildSheetDetailWire>(`${sheetPath(sheetId)}/specification`, body);
}

/** The sheet's edition and the newest one of its rulebook, with what the sheet gets under each. */
export async function getSheetEditions(sheetId: string): Promise<SheetEditionsWire> {
  return (await http.get<{ editions: SheetEditionsWire }>(`${sheetPath(sheetId)}/editions`)).editions;
}

/** Saves the latest revision again under a newer edition; a stale base gives `409` `{ currentRevision }`. */
export function moveSheetToEdition(sheetId: string, baseRevision: number, rulesetVersionId: string): Promise<BuildSheetDetailWire> {
  return http.post<BuildSheetDetailWire>(`${sheetPath(sheetId)}/move-edition`, { baseRevision, rulesetVersionId });
}

export async function listRevisions(sheetId: string): Promise<RevisionSummaryWire[]> {
  return (await http.get<{ revisions: RevisionSummaryWire[] }>(`${sheetPath(sheetId)}/revisions`)).revisions;
}

export async function getRevision(sheetId: string, number: number): Promise<RevisionWire> {
  return (await http.get<{ revision: RevisionWire }>(`${sheetPath(sheetId)}/revisions/${number}`)).revision;
}

export function diffRevisions(sheetId: string, from: number, to: number): Promise<RevisionDiffWire> {
  return http.get<RevisionDiffWire>(`${sheetPath(sheetId)}/revisions/${from}/diff/${to}`);
}

/** Runs the check on the sheet's current revision and keeps it as an immutable check run. */
export async function runCheck(sheetId: string): Promise<CheckRunWire> {
  return (await http.post<{ checkRun: CheckRunWire }>(`${sheetPath(sheetId)}/check-runs`)).checkRun;
}

export async function listCheckRuns(sheetId: string): Promise<CheckRunSummaryWire[]> {
  return (await http.get<{ checkRuns: CheckRunSummaryWire[] }>(`${sheetPath(sheetId)}/check-runs`)).checkRuns;
}

/** A kept run as the checks API gives it (the sheet it came from is not part of that answer). */
export async function getCheckRun(checkRunId: string): Promise<SavedCheckRun> {
  return (await http.get<{ checkRun: SavedCheckRun }>(`/check-runs/${id(checkRunId)}`)).checkRun;
}

/** A kept run by the code printed on its PDF; the creator and the club's stewards and admins only. */
export async function getCheckRunByCode(code: string): Promise<SavedCheckRun> {
  return (await http.get<{ checkRun: SavedCheckRun }>(`/check-runs/by-code/${id(code)}`)).checkRun;
}

export const checkRunPdfUrl = (checkRunId: string) => `/api/check-runs/${id(checkRunId)}/report.pdf`;
