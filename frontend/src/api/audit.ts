// A club's activity log (club admins).
import { http } from './http';
import type { AuditEntryWire, AuditFilterOption, AuditPageWire } from '@contracts/audit';

export type AuditEntry = AuditEntryWire;
export type AuditPage = AuditPageWire;
export type { AuditFilterOption };

export interface AuditFilter {
  page: number;
  pageSize: number;
  action?: string | null;
  carId?: string | null;
  personId?: string | null;
}

export function listAudit(clubId: string, filter: AuditFilter): Promise<AuditPage> {
  const query = new URLSearchParams({ page: String(filter.page), pageSize: String(filter.pageSize) });
  if (filter.action) query.set('action', filter.action);
  if (filter.carId) query.set('carId', filter.carId);
  if (filter.personId) query.set('personId', filter.personId);
  return http.get<AuditPage>(`/clubs/${encodeURIComponent(clubId)}/audit?${query.toString()}`);
}
