// The public check at the track: a cage record by its verification code, showing only the car's
// name and race number, the class, the rulebook edition and the status now. An unknown code and a
// malformed one get the same answer (null → one 404), after the same single indexed look-up, so
// neither the body nor the timing says which codes exist.
import type { DataSource } from 'typeorm';
import type { RecordStatusWire, VerificationWire } from '../contracts/review';
import { recordStatus } from '../domain/review/cage-record';
import { isWellFormedVerificationCode, normaliseVerificationCode } from '../domain/review/verification-code';

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
}

export type VerificationService = ReturnType<typeof createVerificationService>;

export function createVerificationService(ds: DataSource) {
  return {
    async verify(input: string, now = new Date()): Promise<VerificationWire | null> {
      const code = normaliseVerificationCode(input);
      const wellFormed = isWellFormedVerificationCode(code);
      // A malformed code still makes the look-up (it cannot match), so it takes as long as an unknown one.
      const rows: Row[] = await ds.query(
        `SELECT r.id, r.number, r.submission_id, r.verification_code, r.issued_at, r.expires_at, r.revoked_at, r.revoked_reason,
                r.superseded_by_id, r.superseded_at, c.name AS car_name, c.race_number, r.class_name, r.rulebook_title, r.edition
         FROM cage_records r JOIN cars c ON c.id = r.car_id WHERE r.verification_code = $1`,
        [code],
      );
      const row = rows[0];
      if (!wellFormed || !row) return null;
      const status: RecordStatusWire = recordStatus(
        {
          id: row.id, number: row.number, submissionId: row.submission_id, verificationCode: row.verification_code,
          issuedAt: new Date(row.issued_at), expiresAt: new Date(row.expires_at), revokedAt: row.revoked_at ? new Date(row.revoked_at) : null,
          revokedReason: row.revoked_reason, supersededById: row.superseded_by_id, supersededAt: row.superseded_at ? new Date(row.superseded_at) : null,
        },
        now,
      );
      return { carName: row.car_name, raceNumber: row.race_number, className: row.class_name, rulebookTitle: row.rulebook_title, edition: row.edition, status };
    },
  };
}
