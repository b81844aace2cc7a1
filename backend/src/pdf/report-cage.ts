// The cage views for a report: the checked specification drawn with the run's findings (waived
// findings shown as waived on an approved submission), labelled for paper since a page has no hover.
import type { CheckReport } from '../contracts/report';
import type { Specification } from '../contracts/specification';
import { drawCage } from '../domain/geometry/cage-drawing';
import type { UnitSystem } from '../domain/units';
import type { ReportDocumentInput, ReportReview } from './report-document';

export function cageFor(spec: Specification, report: CheckReport, units: UnitSystem, review?: ReportReview): ReportDocumentInput['cage'] {
  if (!spec.model?.nodes.length) return undefined;
  const waivedKeys = new Set(review?.waivers.map((w) => w.findingKey) ?? []);
  const drawing = drawCage({ spec, findings: report.findings, units, waivedKeys, labels: true });
  return { svgs: drawing.svgs, drawnMembers: drawing.drawn.length, totalMembers: spec.members.length };
}
