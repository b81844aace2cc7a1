// Fabrication sheets (docs/api.md, "Fabrication"): the cope and its template PDF, the builder's
// settings, a sheet's schedule and buying list. Canonical units throughout.
import { http } from './http';
import type { CopePdfBody, FabricationSettings, FabricationSettingsWire, HoopLegsBody } from '@contracts/fabrication';
import type { MeasuredLegTrim, SheetFabrication } from '@domain/fabrication/sheet-fabrication';

export type { FabricationSettings, FabricationSettingsWire };
export type SheetFabricationWire = SheetFabrication & { sheetName: string; revisionNumber: number };

const id = encodeURIComponent;

export function copeTemplatePdf(body: CopePdfBody): Promise<Blob> {
  return http.postForBlob('/fabrication/cope.pdf', body);
}

export async function getFabricationSettings(): Promise<FabricationSettingsWire> {
  return (await http.get<{ settings: FabricationSettingsWire }>('/fabrication/settings')).settings;
}

export async function saveFabricationSettings(settings: FabricationSettings): Promise<FabricationSettingsWire> {
  return (await http.put<{ settings: FabricationSettingsWire }>('/fabrication/settings', settings)).settings;
}

export async function getSheetFabrication(sheetId: string): Promise<SheetFabricationWire> {
  return (await http.get<{ fabrication: SheetFabricationWire }>(`/build-sheets/${id(sheetId)}/fabrication`)).fabrication;
}

/** Keeps a hoop's measured legs with the sheet; refused at `legs.N.padHeightMm` etc. when they cannot stand it. */
export async function saveMeasuredLegs(sheetId: string, memberId: string, body: HoopLegsBody): Promise<MeasuredLegTrim> {
  return (await http.put<{ measuredLegs: MeasuredLegTrim }>(`/build-sheets/${id(sheetId)}/fabrication/legs/${id(memberId)}`, body)).measuredLegs;
}

export function clearMeasuredLegs(sheetId: string, memberId: string): Promise<void> {
  return http.delete(`/build-sheets/${id(sheetId)}/fabrication/legs/${id(memberId)}`);
}

export const buyingListCsvUrl = (sheetId: string, units: string) => `/api/build-sheets/${id(sheetId)}/buying-list.csv?units=${units}`;

/** Opens a downloaded file under a name, the way a link with `download` would. */
export function saveBlob(blob: Blob, fileName: string): void {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
