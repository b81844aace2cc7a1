// The review state of build sheets for the garage and the overview: each sheet's latest submission
// with its verdict counting waivers, and the newest cage record issued for it with its status now.
// Two queries for any number of sheets.
import type { EntityManager } from 'typeorm';
import type { SheetReviewWire } from '../../contracts/garage';
import type { Finding } from '../../contracts/report';
import { calendarDateIn } from '../../domain/dates';
import { recordStatus } from '../../domain/review/cage-record';
import { overallWithWaivers, type Waiver } from '../../domain/review/waivers';

interface SubmissionRow {
  id: string;
  build_sheet_id: string;
  state: SheetReviewWire['state'];
  waivers: Waiver[];
  findings: Finding[];
  revision_number: number | null;
  created_at: Date;
  decided_at: Date | null;
}

interface RecordRow {
  build_sheet_id: string;
  time_zone: string;
  id: string;
  number: string;
  submission_id: string;
  verification_code: string;
  issued_at: Date;
  expires_at: Date;
  revoked_at: Date | null;
  revoked_reason: string | null;
  superseded_by_id: string | null;
  superseded_at: Date | null;
  waivers: Waiver[];
  findings: Finding[];
  revision_number: number | null;
}

const waived = (findings: Finding[], waivers: Waiver[]) => overallWithWaivers(findings, waivers);

export async function sheetReviews(em: EntityManager, sheetIds: readonly string[], now: Date): Promise<Map<string, SheetReviewWire>> {
  const out = new Map<string, SheetReviewWire>();
  if (sheetIds.length === 0) return out;
  const subs: SubmissionRow[] = await em.query(
    `SELECT DISTINCT ON (s.build_sheet_id) s.id, s.build_sheet_id, s.state, s.waivers, cr.report->'findings' AS findings,
            r.number AS revision_number, s.created_at, s.decided_at
     FROM submissions s JOIN check_runs cr ON cr.id = s.check_run_id LEFT JOIN build_sheet_revisions r ON r.id = cr.build_sheet_revision_id
     WHERE s.build_sheet_id = ANY($1::uuid[]) ORDER BY s.build_sheet_id, s.created_at DESC, s.id DESC`,
    [sheetIds],
  );
  const records: RecordRow[] = await em.query(
    `SELECT DISTINCT ON (s.build_sheet_id) s.build_sheet_id, c.id, c.number, c.submission_id, c.verification_code, c.issued_at, c.expires_at,
            c.revoked_at, c.revoked_reason, c.superseded_by_id, c.superseded_at, s.waivers, cr.report->'findings' AS findings, r.number AS revision_number,
            cl.time_zone
     FROM cage_records c JOIN clubs cl ON cl.id = c.club_id JOIN submissions s ON s.id = c.submission_id JOIN check_runs cr ON cr.id = s.check_run_id
     LEFT JOIN build_sheet_revisions r ON r.id = cr.build_sheet_revision_id
     WHERE s.build_sheet_id = ANY($1::uuid[]) ORDER BY s.build_sheet_id, c.issued_at DESC, c.id DESC`,
    [sheetIds],
  );
  const recordBySheet = new Map(records.map((r) => [r.build_sheet_id, r]));
  for (const s of subs) {
    const overall = waived(s.findings ?? [], s.waivers ?? []);
    const rec = recordBySheet.get(s.build_sheet_id);
    out.set(s.build_sheet_id, {
      submissionId: s.id,
      state: s.state,
      revisionNumber: s.revision_number,
      verdict: overall.verdict,
      waivedCount: overall.waivedCount,
      sentAt: s.created_at.toISOString(),
      decidedAt: s.decided_at ? s.decided_at.toISOString() : null,
      record: rec
        ? {
            id: rec.id,
            number: rec.number,
            status: recordStatus(
              { id: rec.id, number: rec.number, submissionId: rec.submission_id, verificationCode: rec.verification_code, issuedAt: rec.issued_at, expiresAt: rec.expires_at,
                revokedAt: rec.revoked_at, revokedReason: rec.revoked_reason, supersededById: rec.superseded_by_id, supersededAt: rec.superseded_at },
              now,
            ),
            expiresAt: rec.expires_at.toISOString(),
            expiresOn: calendarDateIn(rec.expires_at, rec.time_zone),
            submissionId: rec.submission_id,
            waivedCount: waived(rec.findings ?? [], rec.waivers ?? []).waivedCount,
            revisionNumber: rec.revision_number,
          }
        : null,
    });
  }
  return out;
}
