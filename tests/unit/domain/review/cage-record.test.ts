// Cage records: numbers, expiry by calendar months, status precedence and boundary instants.
import { describe, expect, test } from 'vitest';
import {
  addMonthsUtc,
  formatRecordNumber,
  issueCageRecord,
  parseRecordNumber,
  recordStatus,
  revokeRecord,
  supersedeRecord,
} from '@backend/domain/review/cage-record';
import type { CageRecord } from '@backend/domain/review/cage-record';

const at = (iso: string) => new Date(iso);
const ISSUED = '2026-12-01T14:30:00.000Z';
const record = (over: Partial<CageRecord> = {}): CageRecord => ({
  ...issueCageRecord({
    id: 'r1',
    number: 'TV-2026-0042',
    submissionId: 's1',
    verificationCode: 'X',
    issuedAt: at(ISSUED),
    validityMonths: 12,
  }),
  ...over,
});

describe('record numbers', () => {
  test.each<[string, number, number, string]>([
    ['TV', 2027, 42, 'TV-2027-0042'],
    ['tv', 2027, 1, 'TV-2027-0001'],
    [' TVMC ', 2027, 9999, 'TVMC-2027-9999'],
    ['TV', 2027, 12345, 'TV-2027-12345'],
    ['H2', 2030, 7, 'H2-2030-0007'],
  ])('formatRecordNumber(%j, %d, %d) = %s', (prefix, year, seq, text) => {
    expect(formatRecordNumber(prefix, year, seq)).toBe(text);
    expect(parseRecordNumber(text)).toEqual({ prefix: prefix.trim().toUpperCase(), year, sequence: seq });
  });

  test.each<[string, number, number]>([
    ['T', 2027, 1],
    ['2V', 2027, 1],
    ['TV-1', 2027, 1],
    ['TOOLONGX', 2027, 1],
    ['TV', 1999, 1],
    ['TV', 2027, 0],
    ['TV', 2027, 1.5],
    ['TV', 2027.5, 1],
  ])('formatRecordNumber(%j, %d, %d) throws', (prefix, year, seq) => {
    expect(() => formatRecordNumber(prefix, year, seq)).toThrow(RangeError);
  });

  test.each(['TV-2027-042', 'TV2027-0042', 'TV-27-0042', 'TV-2027-0000', '', 'TV-2027-00x2'])(
    'parseRecordNumber(%j) = null',
    (text) => {
      expect(parseRecordNumber(text)).toBeNull();
    },
  );

  test('parsing is lenient about case and surrounding space', () => {
    expect(parseRecordNumber(' tv-2027-0042 ')).toEqual({ prefix: 'TV', year: 2027, sequence: 42 });
  });
});

describe('addMonthsUtc', () => {
  test.each([
    ['2026-12-01T14:30:00.000Z', 12, '2027-12-01T14:30:00.000Z'],
    ['2027-01-31T00:00:00.000Z', 1, '2027-02-28T00:00:00.000Z'],
    ['2028-01-31T00:00:00.000Z', 1, '2028-02-29T00:00:00.000Z'],
    ['2028-02-29T09:00:00.000Z', 12, '2029-02-28T09:00:00.000Z'],
    ['2027-08-31T23:59:59.999Z', 6, '2028-02-29T23:59:59.999Z'],
    ['2027-03-15T12:00:00.000Z', 24, '2029-03-15T12:00:00.000Z'],
  ])('%s + %d months = %s', (from, months, to) => {
    expect(addMonthsUtc(at(from), months).toISOString()).toBe(to);
  });
});

describe('issueCageRecord', () => {
  test('expiry from the validity period, nothing revoked or superseded', () => {
    expect(record()).toMatchObject({
      expiresAt: at('2027-12-01T14:30:00.000Z'),
      revokedAt: null,
      supersededById: null,
    });
  });

  test.each([0, -1, 1.5, 121])('validity of %d months is refused', (months) => {
    expect(() =>
      issueCageRecord({
        id: 'r',
        number: 'TV-2026-0001',
        submissionId: 's',
        verificationCode: 'X',
        issuedAt: at(ISSUED),
        validityMonths: months,
      }),
    ).toThrow(RangeError);
  });
});

describe('recordStatus', () => {
  const revoked = {
    revokedAt: at('2027-06-01T00:00:00.000Z'),
    revokedReason: 'Main hoop cracked at the foot.',
  };
  const superseded = { supersededById: 'r2', supersededAt: at('2027-03-01T00:00:00.000Z') };
  test.each<[string, Partial<CageRecord>, string, string]>([
    ['at the moment of issue', {}, ISSUED, 'valid'],
    ['1 ms before expiry', {}, '2027-12-01T14:29:59.999Z', 'valid'],
    ['at the expiry instant', {}, '2027-12-01T14:30:00.000Z', 'expired'],
    ['after expiry', {}, '2028-01-01T00:00:00.000Z', 'expired'],
    ['1 ms before revocation', revoked, '2027-05-31T23:59:59.999Z', 'valid'],
    ['at revocation', revoked, '2027-06-01T00:00:00.000Z', 'revoked'],
    ['revoked and expired: revoked wins', revoked, '2028-06-01T00:00:00.000Z', 'revoked'],
    ['before it was superseded', superseded, '2027-02-28T23:59:59.999Z', 'valid'],
    ['superseded', superseded, '2027-03-01T00:00:00.000Z', 'superseded'],
    ['superseded and expired: superseded wins', superseded, '2028-06-01T00:00:00.000Z', 'superseded'],
    [
      'superseded and revoked: revoked wins',
      { ...superseded, ...revoked },
      '2027-07-01T00:00:00.000Z',
      'revoked',
    ],
    ['superseded without a time counts at once', { supersededById: 'r2' }, ISSUED, 'superseded'],
  ])('%s', (_n, over, now, status) => {
    expect(recordStatus(record(over), at(now))).toBe(status);
  });
});

describe('revoke and supersede', () => {
  const when = at('2027-05-01T08:00:00.000Z');
  test('revoke with a reason', () => {
    const r = revokeRecord(record(), '  Main hoop cracked at the foot.  ', when);
    expect(r.ok && r.record).toMatchObject({
      revokedAt: when,
      revokedReason: 'Main hoop cracked at the foot.',
    });
  });

  test.each<[string, CageRecord, string]>([
    ['without a reason', record(), 'reason_required'],
    ['twice', record({ revokedAt: when, revokedReason: 'Cracked foot plate.' }), 'already_revoked'],
  ])('revoke refused %s', (_n, rec, code) => {
    expect(
      revokeRecord(rec, _n === 'without a reason' ? '  ' : 'A second reason given.', when),
    ).toMatchObject({ ok: false, code });
  });

  test('supersede by a newer record', () => {
    const r = supersedeRecord(record(), 'r2', when);
    expect(r.ok && r.record).toMatchObject({ supersededById: 'r2', supersededAt: when });
  });

  test.each<[string, CageRecord, string, string]>([
    ['by itself', record(), 'r1', 'same_record'],
    [
      'when revoked',
      record({ revokedAt: when, revokedReason: 'Cracked foot plate.' }),
      'r2',
      'already_revoked',
    ],
    ['twice', record({ supersededById: 'r2', supersededAt: when }), 'r3', 'already_superseded'],
  ])('supersede refused %s', (_n, rec, id, code) => {
    expect(supersedeRecord(rec, id, when)).toMatchObject({ ok: false, code });
  });
});
