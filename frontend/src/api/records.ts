// The club's records page and a record's track inspections (stewards and admins; the car's owner reads
// the inspections of their own car).
import { http } from './http';
import type { InspectionBody, InspectionsWire, RecordFilterWire, RecordListWire } from '@contracts/cage-records';

export type { InspectionMemberWire as InspectionMember, InspectionWire as Inspection, RecordListItemWire as RecordListItem } from '@contracts/cage-records';
export type RecordFilter = RecordFilterWire;
export type RecordList = RecordListWire;
export type Inspections = InspectionsWire;

const id = (value: string) => encodeURIComponent(value);

export function listClubRecords(clubId: string, filter: { q?: string; status: RecordFilter; page: number; pageSize: number }): Promise<RecordList> {
  const query = new URLSearchParams({ status: filter.status, page: String(filter.page), pageSize: String(filter.pageSize) });
  if (filter.q?.trim()) query.set('q', filter.q.trim());
  return http.get<RecordList>(`/clubs/${id(clubId)}/cage-records?${query.toString()}`);
}

export function getInspections(recordId: string): Promise<Inspections> {
  return http.get<Inspections>(`/cage-records/${id(recordId)}/inspections`);
}

export function recordInspection(recordId: string, body: InspectionBody): Promise<Inspections> {
  return http.post<Inspections>(`/cage-records/${id(recordId)}/inspections`, body);
}
