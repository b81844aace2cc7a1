// The public check at the track: a code printed on a cage record or on a check run's PDF. A cage
// record shows only its number, the club, the car's name, make, model and race number, the class,
// the rulebook edition, the expiry and the status now, and the latest track inspection's date and
// seal number; a check run says it is a pre-check of its date (not a cage record), against which rulebook and
// class, and its overall result, the same words as its PDF. Never people or photos. An unknown code
// and a malformed one get the same answer (null → one 404), after the same two indexed look-ups, so
// neither the body nor the timing says which codes exist. Check runs saved before the one code form
// keep their older 24-character codes, and those still verify.
import type { DataSource } from 'typeorm';
import type { RulesetDocument } from '../contracts/ruleset';
import type { CheckRunVerificationWire, RecordStatusWire, VerificationWire } from '../contracts/review';
import { calendarDateIn } from '../domain/dates';
import { recordStatus } from '../domain/review/cage-record';
import { codeForLookup } from '../domain/review/verification-code';

interface RunRow {
  created_at: Date;
  overall_verdict: CheckRunVerificationWire['verdict'];
  class_id: string;
  classes: RulesetDocument['classes'] | null;
  rulebook_title: string;
  edition: string;
  car_name: string | null;
  race_number: string | null;
  time_zone: string;
}

export type CodeLookup = { kind: 'cage_record'; record: VerificationWire } | { kind: 'check_run'; checkRun: CheckRunVerificationWire };

interface Row {
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
  car_name: string;
  race_number: string | null;
  class_name: string;
  rulebook_title: string;
  edition: string;
  club_name: string;
  time_zone: string;
  make: string | null;
  model: string | null;
  inspected_at: Date | null;
  seal_number: string | null;
}

export type VerificationService = ReturnType<typeof createVerificationService>;

export function createVerificationService(ds: DataSource) {
  return {
    async verify(input: string, now = new Date()): Promise<CodeLookup | null> {
      const lookup = codeForLookup(input);
      // Both look-ups run whatever the form, so a malformed code (which cannot match) takes as long as an unknown one.
      const recordCode = lookup.form === 'current' ? lookup.code : '';
      const runCode = lookup.form === 'malformed' ? '' : lookup.code;
      const rows: Row[] = await ds.query(
        `SELECT r.id, r.number, r.submission_id, r.verification_code, r.issued_at, r.expires_at, r.revoked_at, r.revoked_reason,
                r.superseded_by_id, r.superseded_at, c.name AS car_name, c.race_number, c.make, c.model, r.class_name, r.rulebook_title, r.edition,
                cl.name AS club_name, cl.time_zone, li.inspected_at, li.seal_number
         FROM cage_records r JOIN cars c ON c.id = r.car_id JOIN clubs cl ON cl.id = r.club_id
         LEFT JOIN LATERAL (SELECT i.inspected_at, i.seal_number FROM cage_record_inspections i WHERE i.record_id = r.id
                            ORDER BY i.inspected_at DESC, i.created_at DESC LIMIT 1) li ON true
         WHERE r.verification_code = $1`,
        [recordCode],
      );
      const runs: RunRow[] = await ds.query(
        `SELECT cr.created_at, cr.overall_verdict, cr.class_id, v.document->'classes' AS classes, rb.title AS rulebook_title, v.edition,
                car.name AS car_name, car.race_number, cl.time_zone
         FROM check_runs cr
         JOIN ruleset_versions v ON v.id = cr.ruleset_version_id
         JOIN rulebooks rb ON rb.id = v.rulebook_id
         JOIN clubs cl ON cl.id = rb.club_id
         LEFT JOIN build_sheet_revisions rev ON rev.id = cr.build_sheet_revision_id
         LEFT JOIN build_sheets s ON s.id = rev.build_sheet_id
         LEFT JOIN cars car ON car.id = s.car_id
         WHERE cr.verification_code = $1`,
        [runCode],
      );
      const row = rows[0];
      const run = runs[0];
      if (lookup.form === 'malformed') return null;
      if (row && lookup.form === 'current') {
        const status: RecordStatusWire = recordStatus(
          {
            id: row.id, number: row.number, submissionId: row.submission_id, verificationCode: row.verification_code,
            issuedAt: new Date(row.issued_at), expiresAt: new Date(row.expires_at), revokedAt: row.revoked_at ? new Date(row.revoked_at) : null,
            revokedReason: row.revoked_reason, supersededById: row.superseded_by_id, supersededAt: row.superseded_at ? new Date(row.superseded_at) : null,
          },
          now,
        );
        const expiresAt = new Date(row.expires_at).toISOString();
        return {
          kind: 'cage_record',
          record: {
            recordNumber: row.number, clubName: row.club_name, carName: row.car_name, make: row.make, model: row.model, raceNumber: row.race_number,
            className: row.class_name, rulebookTitle: row.rulebook_title, edition: row.edition, status, expiresAt, expiresOn: calendarDateIn(new Date(row.expires_at), row.time_zone),
            lastInspection: row.inspected_at ? { inspectedOn: calendarDateIn(new Date(row.inspected_at), row.time_zone), sealNumber: row.seal_number ?? '' } : null,
          },
        };
      }
      if (!run) return null;
      return {
        kind: 'check_run',
        checkRun: {
          // The club's calendar date, as the run's PDF prints it.
          checkedOn: calendarDateIn(new Date(run.created_at), run.time_zone),
          timeZone: run.time_zone,
          verdict: run.overall_verdict,
          className: run.classes?.find((c) => c.id === run.class_id)?.name ?? run.class_id,
          rulebookTitle: run.rulebook_title,
          edition: run.edition,
          carName: run.car_name,
          raceNumber: run.race_number,
        },
      };
    },
  };
}
