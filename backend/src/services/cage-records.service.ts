// Cage records: issued inside the approval's transaction (number from a per-club, per-year sequence
// bumped with an upsert, so concurrent approvals never share one; a fresh verification code; expiry
// from the club's validity setting), superseding the car's earlier records; read by the car's owner
// and the club's stewards and admins, revoked by a steward or admin with a reason (the access
// policy's `record.read` and `record.revoke`).
import { randomBytes, randomUUID } from 'node:crypto';
import type { DataSource, EntityManager } from 'typeorm';
import type { CageRecordWire, RecordSettingsBody, RecordSettingsWire } from '../contracts/review';
import {
  formatRecordNumber, issueCageRecord, recordStatus, revokeRecord, supersedeRecord, RECORD_PREFIX_PATTERN,
  type CageRecord as DomainRecord,
} from '../domain/review/cage-record';
import { CODE_RANDOM_BYTES, newVerificationCode } from '../domain/review/verification-code';
import { CageRecord, Car, Club, ClubRecordSettings, User, type ClubRole } from '../entities';
import { calendarDateIn } from '../domain/dates';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import type { AuditService } from './audit.service';
import { allows } from '../domain/access-policy';
import { enforce } from './access';
import { rolesOf } from './review-access';
import { mailRevoked, type ReviewMailDeps } from './review-mail';

export const DEFAULT_VALIDITY_MONTHS = 12;

/** "Tarnwick Vale Motor Club" → "TVMC": the initials, 2–6 characters, else "CW". */
export function defaultPrefix(clubName: string): string {
  const initials = clubName.split(/[^A-Za-z0-9]+/).filter(Boolean).map((w) => w[0]!.toUpperCase()).join('').slice(0, 6);
  return RECORD_PREFIX_PATTERN.test(initials) ? initials : 'CW';
}

const toDomain = (r: CageRecord): DomainRecord => ({
  id: r.id, number: r.number, submissionId: r.submissionId, verificationCode: r.verificationCode, issuedAt: r.issuedAt,
  expiresAt: r.expiresAt, revokedAt: r.revokedAt, revokedReason: r.revokedReason, supersededById: r.supersededById, supersededAt: r.supersededAt,
});

export const verificationUrl = (publicUrl: string, code: string) => `${publicUrl}/verify/${code}`;

export type CageRecordService = ReturnType<typeof createCageRecordService>;

export function createCageRecordService(ds: DataSource, deps: ReviewMailDeps & { audit: AuditService }) {
  async function settingsOf(em: EntityManager, clubId: string): Promise<RecordSettingsWire> {
    const row = await em.getRepository(ClubRecordSettings).findOneBy({ clubId });
    if (row) return { recordPrefix: row.recordPrefix, validityMonths: row.validityMonths, saved: true };
    const club = await em.getRepository(Club).findOneByOrFail({ id: clubId });
    return { recordPrefix: defaultPrefix(club.name), validityMonths: DEFAULT_VALIDITY_MONTHS, saved: false };
  }

  async function view(em: EntityManager, r: CageRecord, viewer: { userId: string; roles: readonly ClubRole[] }, now = new Date()): Promise<CageRecordWire> {
    const car = await em.getRepository(Car).findOneByOrFail({ id: r.carId });
    const club = await em.getRepository(Club).findOneByOrFail({ id: r.clubId });
    const steward = r.stewardId ? await em.getRepository(User).findOneBy({ id: r.stewardId }) : null;
    const status = recordStatus(toDomain(r), now);
    return {
      id: r.id, number: r.number, status, car: { id: car.id, name: car.name, raceNumber: car.raceNumber },
      classId: r.classId, className: r.className, rulebookTitle: r.rulebookTitle, edition: r.edition,
      steward: steward ? { id: steward.id, displayName: steward.displayName } : null,
      issuedAt: r.issuedAt.toISOString(), expiresAt: r.expiresAt.toISOString(), expiresOn: calendarDateIn(r.expiresAt, club.timeZone), revokedAt: r.revokedAt?.toISOString() ?? null,
      revokedReason: r.revokedReason, supersededAt: r.supersededAt?.toISOString() ?? null, verificationCode: r.verificationCode,
      verificationUrl: verificationUrl(deps.publicUrl, r.verificationCode), submissionId: r.submissionId,
      canRevoke: !r.revokedAt && allows('record.revoke', { actorId: viewer.userId, ownerId: car.ownerId, roles: viewer.roles }),
    };
  }

  /** The record and the viewer's roles, or 404 for anyone but the car's owner and the club's stewards and admins. */
  async function recordFor(em: EntityManager, recordId: string, userId: string, lock = false) {
    const r = await em.getRepository(CageRecord).findOne({ where: { id: recordId }, ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}) });
    if (!r) throw new NotFoundError('Cage record not found.');
    const roles = await rolesOf(em, userId, r.clubId);
    const car = await em.getRepository(Car).findOneByOrFail({ id: r.carId });
    const facts = { actorId: userId, ownerId: car.ownerId, roles };
    enforce('record.read', facts, { notFound: 'Cage record not found.' });
    return { r, roles, car, facts };
  }

  return {
    settingsOf,
    view,

    /** Issues the record of an approved submission inside the approval's transaction. */
    async issue(tx: EntityManager, input: {
      clubId: string; submissionId: string; carId: string; classId: string; className: string; rulesetVersionId: string;
      rulebookTitle: string; edition: string; stewardId: string; at: Date;
    }): Promise<CageRecord> {
      const settings = await settingsOf(tx, input.clubId);
      const year = input.at.getUTCFullYear();
      const [{ last_sequence: sequence }] = (await tx.query(
        `INSERT INTO cage_record_sequences (club_id, year, last_sequence) VALUES ($1, $2, 1)
         ON CONFLICT (club_id, year) DO UPDATE SET last_sequence = cage_record_sequences.last_sequence + 1
         RETURNING last_sequence`,
        [input.clubId, year],
      )) as [{ last_sequence: number }];
      const id = randomUUID();
      const issued = issueCageRecord({
        id, number: formatRecordNumber(settings.recordPrefix, year, sequence), submissionId: input.submissionId,
        verificationCode: newVerificationCode(randomBytes(CODE_RANDOM_BYTES)), issuedAt: input.at, validityMonths: settings.validityMonths,
      });
      const repo = tx.getRepository(CageRecord);
      // The car's earlier records give way to the new one (a revoked record stays revoked).
      const earlier = await repo.find({ where: { carId: input.carId }, lock: { mode: 'pessimistic_write' } });
      for (const old of earlier) {
        if (old.revokedAt || old.supersededById) continue;
        const next = supersedeRecord(toDomain(old), id, input.at);
        if (next.ok) await repo.update({ id: old.id }, { supersededById: id, supersededAt: input.at });
      }
      return repo.save(repo.create({
        id, clubId: input.clubId, number: issued.number, year, sequence, submissionId: input.submissionId, carId: input.carId,
        classId: input.classId, className: input.className, rulesetVersionId: input.rulesetVersionId, rulebookTitle: input.rulebookTitle,
        edition: input.edition, stewardId: input.stewardId, verificationCode: issued.verificationCode, issuedAt: issued.issuedAt,
        expiresAt: issued.expiresAt, revokedAt: null, revokedReason: null, revokedById: null, supersededById: null, supersededAt: null,
      }));
    },

    async get(recordId: string, userId: string): Promise<CageRecordWire> {
      const { r, roles } = await recordFor(ds.manager, recordId, userId);
      return view(ds.manager, r, { userId, roles });
    },

    async revoke(recordId: string, userId: string, reason: string): Promise<CageRecordWire> {
      return ds.transaction(async (tx) => {
        const { r, roles, car, facts } = await recordFor(tx, recordId, userId, true);
        enforce('record.revoke', facts, { notFound: 'Cage record not found.', forbidden: 'Only a steward or admin of the club can revoke a cage record.' });
        const now = new Date();
        const result = revokeRecord(toDomain(r), reason, now);
        if (!result.ok) {
          if (result.code === 'reason_required') throw new ValidationError([{ path: 'reason', message: result.message }], result.message);
          throw new ConflictError(result.message, { reason: result.code });
        }
        await tx.getRepository(CageRecord).update({ id: r.id }, { revokedAt: now, revokedReason: result.record.revokedReason, revokedById: userId });
        await deps.audit.record(
          { clubId: r.clubId, actorId: userId, action: 'cage_record.revoked', entity: { type: 'cage_record', id: r.id }, details: { number: r.number, reason: result.record.revokedReason, carId: car.id, carName: car.name, submissionId: r.submissionId } },
          { manager: tx },
        );
        const builder = await tx.getRepository(User).findOneByOrFail({ id: car.ownerId });
        const club = await tx.getRepository(Club).findOneByOrFail({ id: r.clubId });
        await mailRevoked(deps, tx, {
          builder, clubId: club.id, clubName: club.name, carName: car.name, recordNumber: r.number, reason: result.record.revokedReason ?? '', recordId: r.id,
        });
        const fresh = await tx.getRepository(CageRecord).findOneByOrFail({ id: r.id });
        return view(tx, fresh, { userId, roles }, now);
      });
    },

    async settings(clubId: string): Promise<RecordSettingsWire> {
      return settingsOf(ds.manager, clubId);
    },

    async updateSettings(clubId: string, userId: string, body: RecordSettingsBody): Promise<RecordSettingsWire> {
      return ds.transaction(async (tx) => {
        const current = await settingsOf(tx, clubId);
        const next = { clubId, recordPrefix: body.recordPrefix ?? current.recordPrefix, validityMonths: body.validityMonths ?? current.validityMonths };
        await tx.getRepository(ClubRecordSettings).upsert(next, ['clubId']);
        await deps.audit.record(
          { clubId, actorId: userId, action: 'club.record_settings_changed', entity: { type: 'club', id: clubId }, details: { before: { recordPrefix: current.recordPrefix, validityMonths: current.validityMonths }, after: { recordPrefix: next.recordPrefix, validityMonths: next.validityMonths } } },
          { manager: tx },
        );
        return { recordPrefix: next.recordPrefix, validityMonths: next.validityMonths, saved: true };
      });
    },
  };
}
