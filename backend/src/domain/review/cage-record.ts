// Cage records: issued when a steward approves a submission, valid for the club's period, and
// checkable by anyone at the track. Numbers are our own format, PREFIX-YEAR-SEQUENCE
// (e.g. TV-2027-0042). Status is computed at a moment, so "was it valid on race day" has an answer.
import { REVOKE_REASON_MIN } from '../../contracts/review-limits.js';

export type RecordStatus = 'valid' | 'expired' | 'superseded' | 'revoked';

export interface CageRecord {
  id: string;
  number: string;
  submissionId: string;
  verificationCode: string;
  issuedAt: Date;
  expiresAt: Date;
  revokedAt: Date | null;
  revokedReason: string | null;
  supersededById: string | null;
  supersededAt: Date | null;
}

export const RECORD_PREFIX_PATTERN = /^[A-Z][A-Z0-9]{1,5}$/;
const NUMBER_PATTERN = /^([A-Z][A-Z0-9]{1,5})-(\d{4})-(\d{4,})$/;
export const VALIDITY_MONTHS_MAX = 120;
export { REVOKE_REASON_MIN };

/** "tv", 2027, 42 → "TV-2027-0042". Throws on a prefix, year or sequence the format cannot hold. */
export function formatRecordNumber(prefix: string, year: number, sequence: number): string {
  const p = prefix.trim().toUpperCase();
  if (!RECORD_PREFIX_PATTERN.test(p))
    throw new RangeError(`Record prefix "${prefix}" must be 2–6 letters or digits, starting with a letter.`);
  if (!Number.isInteger(year) || year < 2000 || year > 9999)
    throw new RangeError(`Record year ${year} is out of range.`);
  if (!Number.isInteger(sequence) || sequence < 1)
    throw new RangeError(`Record sequence ${sequence} must be a whole number from 1.`);
  return `${p}-${year}-${String(sequence).padStart(4, '0')}`;
}

export function parseRecordNumber(text: string): { prefix: string; year: number; sequence: number } | null {
  const m = NUMBER_PATTERN.exec(text.trim().toUpperCase());
  if (!m) return null;
  const sequence = Number(m[3]);
  return sequence >= 1 && Number.isSafeInteger(sequence)
    ? { prefix: m[1], year: Number(m[2]), sequence }
    : null;
}

/**
 * `months` calendar months after `from`, in UTC, keeping the time of day; a day the target month
 * lacks becomes its last day (31 January + 1 month = 28 or 29 February).
 */
export function addMonthsUtc(from: Date, months: number): Date {
  const y = from.getUTCFullYear();
  const m = from.getUTCMonth() + months;
  const lastDay = new Date(Date.UTC(y, m + 1, 0)).getUTCDate();
  const day = Math.min(from.getUTCDate(), lastDay);
  return new Date(
    Date.UTC(
      y,
      m,
      day,
      from.getUTCHours(),
      from.getUTCMinutes(),
      from.getUTCSeconds(),
      from.getUTCMilliseconds(),
    ),
  );
}

export interface IssueInput {
  id: string;
  number: string;
  submissionId: string;
  verificationCode: string;
  issuedAt: Date;
  /** The club's validity period. */
  validityMonths: number;
}

export function issueCageRecord(input: IssueInput): CageRecord {
  if (
    !Number.isInteger(input.validityMonths) ||
    input.validityMonths < 1 ||
    input.validityMonths > VALIDITY_MONTHS_MAX
  ) {
    throw new RangeError(
      `A validity period is 1 to ${VALIDITY_MONTHS_MAX} whole months; got ${input.validityMonths}.`,
    );
  }
  return {
    id: input.id,
    number: input.number,
    submissionId: input.submissionId,
    verificationCode: input.verificationCode,
    issuedAt: input.issuedAt,
    expiresAt: addMonthsUtc(input.issuedAt, input.validityMonths),
    revokedAt: null,
    revokedReason: null,
    supersededById: null,
    supersededAt: null,
  };
}

/**
 * Status at `now`, by precedence revoked > superseded > expired > valid. A record is expired from
 * the instant `expiresAt` on; revocation and supersession count from their own instants.
 */
export function recordStatus(record: CageRecord, now: Date): RecordStatus {
  const t = now.getTime();
  if (record.revokedAt && record.revokedAt.getTime() <= t) return 'revoked';
  if (record.supersededById && (!record.supersededAt || record.supersededAt.getTime() <= t))
    return 'superseded';
  if (t >= record.expiresAt.getTime()) return 'expired';
  return 'valid';
}

export type RecordRefusal = {
  ok: false;
  code: 'reason_required' | 'already_revoked' | 'already_superseded' | 'same_record';
  message: string;
};

export function revokeRecord(
  record: CageRecord,
  reason: string,
  at: Date,
): { ok: true; record: CageRecord } | RecordRefusal {
  if (record.revokedAt)
    return { ok: false, code: 'already_revoked', message: `Record ${record.number} is already revoked.` };
  const r = reason.trim();
  if (r.length < REVOKE_REASON_MIN)
    return {
      ok: false,
      code: 'reason_required',
      message: `Give the reason for revoking record ${record.number} (at least ${REVOKE_REASON_MIN} characters).`,
    };
  return { ok: true, record: { ...record, revokedAt: at, revokedReason: r } };
}

/** A newer record (a re-inspection) replaces this one. A revoked record stays revoked. */
export function supersedeRecord(
  record: CageRecord,
  newRecordId: string,
  at: Date,
): { ok: true; record: CageRecord } | RecordRefusal {
  if (newRecordId === record.id)
    return { ok: false, code: 'same_record', message: 'A record cannot supersede itself.' };
  if (record.revokedAt)
    return {
      ok: false,
      code: 'already_revoked',
      message: `Record ${record.number} is revoked; it cannot be superseded.`,
    };
  if (record.supersededById)
    return {
      ok: false,
      code: 'already_superseded',
      message: `Record ${record.number} is already superseded.`,
    };
  return { ok: true, record: { ...record, supersededById: newRecordId, supersededAt: at } };
}
