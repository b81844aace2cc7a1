// The server's dry-run check: the same evaluation the browser runs, used when the browser cannot.
import { http } from './http';
import type { CheckReport } from '@contracts/report';
import type { Specification } from '@contracts/specification';
import type { UnitSystem } from '@domain/index';

export async function dryRunCheck(
  rulesetVersionId: string,
  classId: string,
  specification: Specification,
  unitSystem: UnitSystem,
  signal?: AbortSignal,
): Promise<CheckReport> {
  const body = { rulesetVersionId, classId, specification, unitSystem };
  return (await http.post<{ report: CheckReport }>('/checks', body, { signal })).report;
}
