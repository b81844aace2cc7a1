// The club's book of cage records, for its stewards and admins: the records page (search by record
// number, car name, make, model or race number; filter by status, valid records expiring within 30
// days flagged; paged), the track inspections recorded on a record (who, when, seal number, wall
// readings against the rulebook's minimum), and the expiry reminder the scheduled job sends each
// builder once, 30 days before their record expires (services/records/expiry-reminder-job.ts).
// Status is computed in SQL with the same precedence as domain/review/cage-record.ts (revoked >
// superseded > expired > valid), so filters and counts agree with every record's own page.
import type { DataSource, EntityManager } from 'typeorm';
import type { InspectionBody, InspectionMemberWire, InspectionsWire, InspectionWire, RecordListItemWire, RecordListQuery, RecordListWire } from '../contracts/cage-records';
import { EXPIRY_NOTICE_DAYS, RECORD_STATUS_WORDS, type RecordShownKey, type RecordStatusKey } from '../contracts/record-words';
import { allows } from '../domain/access-policy';
import { memberNames } from '../domain/geometry/names';
import { recordStatus } from '../domain/review/cage-record';
import { daysLeft, expiresSoon, inspectionProblems, isBelowMinimum, memberMinimumWalls } from '../domain/review/inspection';
import { CageRecord, CageRecordInspection, Car, CheckRun, Club, Submission, User, type StoredInspectionReading } from '../entities';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { enforce } from './access';
import type { AuditService } from './audit.service';
import type { MailService } from './mail';
import { renderMail } from './mail';
import { rolesOf } from './review-access';
import { calendarDateIn, formatIsoDate } from '../domain/dates';

export type RecordBookService = ReturnType<typeof createRecordBookService>;

// $1 is "now". Mirrors recordStatus(): revoked > superseded > expired > valid.
const STATUS_SQL = `CASE WHEN r.revoked_at IS NOT NULL AND r.revoked_at <= $1::timestamptz THEN 'revoked'
  WHEN r.superseded_by_id IS NOT NULL AND (r.superseded_at IS NULL OR r.superseded_at <= $1::timestamptz) THEN 'superseded'
  WHEN r.expires_at <= $1::timestamptz THEN 'expired' ELSE 'valid' END`;
const SOON_SQL = `(${STATUS_SQL}) = 'valid' AND r.expires_at <= $1::timestamptz + make_interval(days => ${EXPIRY_NOTICE_DAYS})`;

const likeEscaped = (q: string) => q.replace(/[\\%_]/g, (c) => `\\${c}`);

interface ListRow {
  id: string;
  number: string;
  status: RecordStatusKey;
  expires_at: Date;
  issued_at: Date;
  class_name: string;
  car_id: string;
  car_name: string;
  make: string | null;
  model: string | null;
  race_number: string | null;
  inspected_at: Date | null;
  seal_number: string | null;
}

const recordNotFound = 'Cage record not found.';

export function createRecordBookService(ds: DataSource, deps: { audit: AuditService; mail: MailService; publicUrl: string; now?: () => Date }) {
  const clock = deps.now ?? (() => new Date());

  /** The members of the approved sheet, named as the sheet names them, with the rulebook's least wall. */
  async function membersOf(em: EntityManager, r: CageRecord): Promise<InspectionMemberWire[]> {
    const sub = await em.getRepository(Submission).findOneByOrFail({ id: r.submissionId });
    const run = await em.getRepository(CheckRun).findOneByOrFail({ id: sub.checkRunId });
    const members = run.specification.members ?? [];
    const names = memberNames(members);
    const minimums = memberMinimumWalls(run.report);
    return members.map((m, i) => ({ id: m.id, name: names[i]!, wallMm: m.wallMm, minWallMm: minimums.get(m.id) ?? null }));
  }

  async function loadRecord(em: EntityManager, recordId: string, userId: string, lock = false) {
    const r = await em.getRepository(CageRecord).findOne({ where: { id: recordId }, ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}) });
    if (!r) throw new NotFoundError(recordNotFound);
    const roles = await rolesOf(em, userId, r.clubId);
    const car = await em.getRepository(Car).findOneByOrFail({ id: r.carId });
    return { r, car, facts: { actorId: userId, ownerId: car.ownerId, roles } };
  }

  async function inspectionViews(em: EntityManager, recordId: string): Promise<InspectionWire[]> {
    const rows = await em.getRepository(CageRecordInspection).find({ where: { recordId }, order: { inspectedAt: 'DESC', createdAt: 'DESC' } });
    const stewardIds = [...new Set(rows.map((x) => x.stewardId).filter((x): x is string => !!x))];
    const people = stewardIds.length ? await em.getRepository(User).find({ where: stewardIds.map((id) => ({ id })) }) : [];
    const byId = new Map(people.map((p) => [p.id, p]));
    return rows.map((x) => {
      const p = x.stewardId ? byId.get(x.stewardId) : undefined;
      return {
        id: x.id, steward: p ? { id: p.id, displayName: p.displayName } : null, inspectedAt: x.inspectedAt.toISOString(), sealNumber: x.sealNumber,
        readings: x.readings.map((rd) => ({ ...rd, belowMinimum: isBelowMinimum(rd.wallMm, rd.minWallMm) })), note: x.note, createdAt: x.createdAt.toISOString(),
      };
    });
  }

  return {
    async list(clubId: string, query: RecordListQuery): Promise<RecordListWire> {
      const now = clock();
      // $1 (now) is typed even when no condition below uses it.
      const where: string[] = ['$1::timestamptz IS NOT NULL', 'r.club_id = $2'];
      const values: unknown[] = [now, clubId];
      const q = query.q?.trim();
      if (q) {
        values.push(`%${likeEscaped(q)}%`, q.replace(/^(no\.?|#)\s*/i, ''));
        const like = `$${values.length - 1}`;
        const race = `$${values.length}`;
        where.push(`(r.number ILIKE ${like} OR c.name ILIKE ${like} OR c.make ILIKE ${like} OR c.model ILIKE ${like}
          OR concat_ws(' ', c.make, c.model) ILIKE ${like} OR lower(c.race_number) = lower(${race}))`);
      }
      if (query.status === 'expiring_soon') where.push(SOON_SQL);
      else if (query.status !== 'all') {
        values.push(query.status);
        where.push(`(${STATUS_SQL}) = $${values.length}`);
      }
      const from = `FROM cage_records r JOIN cars c ON c.id = r.car_id WHERE ${where.join(' AND ')}`;
      const [{ total }] = (await ds.query(`SELECT count(*)::int AS total ${from}`, values)) as [{ total: number }];
      const offset = (query.page - 1) * query.pageSize;
      const rows: ListRow[] = await ds.query(
        `SELECT r.id, r.number, ${STATUS_SQL} AS status, r.expires_at, r.issued_at, r.class_name, c.id AS car_id, c.name AS car_name, c.make, c.model,
                c.race_number, li.inspected_at, li.seal_number
         ${from.replace('WHERE', `LEFT JOIN LATERAL (SELECT i.inspected_at, i.seal_number FROM cage_record_inspections i WHERE i.record_id = r.id
                ORDER BY i.inspected_at DESC, i.created_at DESC LIMIT 1) li ON true WHERE`)}
         ORDER BY r.issued_at DESC, r.number DESC LIMIT ${query.pageSize} OFFSET ${offset}`,
        values,
      );
      const countRows: { valid: number; expiring_soon: number; expired: number; superseded: number; revoked: number }[] = await ds.query(
        `SELECT count(*) FILTER (WHERE s.status = 'valid')::int AS valid, count(*) FILTER (WHERE s.soon)::int AS expiring_soon,
                count(*) FILTER (WHERE s.status = 'expired')::int AS expired, count(*) FILTER (WHERE s.status = 'superseded')::int AS superseded,
                count(*) FILTER (WHERE s.status = 'revoked')::int AS revoked
         FROM (SELECT ${STATUS_SQL} AS status, ${SOON_SQL} AS soon FROM cage_records r WHERE r.club_id = $2) s`,
        [now, clubId],
      );
      const [{ time_zone: timeZone }] = (await ds.query(`SELECT time_zone FROM clubs WHERE id = $1`, [clubId])) as [{ time_zone: string }];
      const items: RecordListItemWire[] = rows.map((row) => {
        const expiresAt = new Date(row.expires_at);
        return {
          id: row.id, number: row.number, status: row.status, expiringSoon: expiresSoon(row.status, expiresAt, now), daysLeft: daysLeft(expiresAt, now),
          car: { id: row.car_id, name: row.car_name, make: row.make, model: row.model, raceNumber: row.race_number }, className: row.class_name,
          issuedAt: new Date(row.issued_at).toISOString(), expiresAt: expiresAt.toISOString(), expiresOn: calendarDateIn(expiresAt, timeZone),
          lastInspection: row.inspected_at ? { inspectedAt: new Date(row.inspected_at).toISOString(), sealNumber: row.seal_number ?? '' } : null,
        };
      });
      const c = countRows[0]!;
      const counts: Record<RecordShownKey, number> = { valid: c.valid, expiring_soon: c.expiring_soon, expired: c.expired, superseded: c.superseded, revoked: c.revoked };
      return { items, total, page: query.page, pageSize: query.pageSize, counts };
    },

    async inspections(recordId: string, userId: string): Promise<InspectionsWire> {
      const { r, facts } = await loadRecord(ds.manager, recordId, userId);
      enforce('record.read', facts, { notFound: recordNotFound });
      const status = recordStatus({ ...r }, clock());
      return {
        inspections: await inspectionViews(ds.manager, r.id),
        members: await membersOf(ds.manager, r),
        canRecord: status === 'valid' && allows('record.inspect', facts),
      };
    },

    async recordInspection(recordId: string, userId: string, body: InspectionBody): Promise<InspectionsWire> {
      return ds.transaction(async (tx) => {
        const { r, car, facts } = await loadRecord(tx, recordId, userId, true);
        enforce('record.inspect', facts, { notFound: recordNotFound, forbidden: 'Only a steward or admin of the club records a track inspection, and never of their own car.' });
        const now = clock();
        const status = recordStatus({ ...r }, now);
        if (status !== 'valid')
          throw new ConflictError(`Record ${r.number} is ${RECORD_STATUS_WORDS[status].label.toLowerCase()}: an inspection goes on a valid record.`, { reason: `record_${status}` });
        const members = await membersOf(tx, r);
        const inspectedAt = body.inspectedAt ? new Date(body.inspectedAt) : now;
        const problems = inspectionProblems({ inspectedAt, readings: body.readings }, { memberIds: new Set(members.map((m) => m.id)), issuedAt: r.issuedAt, now });
        if (problems.length) throw new ValidationError(problems, problems.length === 1 ? problems[0]!.message : `${problems.length} problems in the inspection; nothing was saved.`);
        const byId = new Map(members.map((m) => [m.id, m]));
        const readings: StoredInspectionReading[] = body.readings.map((rd) => {
          const m = byId.get(rd.memberId)!;
          return { memberId: m.id, memberName: m.name, wallMm: rd.wallMm, minWallMm: m.minWallMm };
        });
        const repo = tx.getRepository(CageRecordInspection);
        const saved = await repo.save(repo.create({ recordId: r.id, stewardId: userId, inspectedAt, sealNumber: body.sealNumber, readings, note: body.note || null }));
        const below = readings.filter((rd) => isBelowMinimum(rd.wallMm, rd.minWallMm)).length;
        await deps.audit.record(
          {
            clubId: r.clubId, actorId: userId, action: 'cage_record.inspected', entity: { type: 'cage_record', id: r.id },
            details: { number: r.number, carId: car.id, carName: car.name, inspectionId: saved.id, sealNumber: body.sealNumber, readings: readings.length, belowMinimum: below, inspectedAt: inspectedAt.toISOString() },
          },
          { manager: tx },
        );
        return { inspections: await inspectionViews(tx, r.id), members, canRecord: true };
      });
    },

    /**
     * Mails the builder of every valid record that expires within EXPIRY_NOTICE_DAYS of `now` and was
     * not reminded yet, and marks it, in one transaction per round. The rows are claimed FOR UPDATE
     * SKIP LOCKED and the mark is set in the same statement, so two servers running at once never
     * take the same record; the outbox's idempotency key per record is the second net (a retried job).
     * Returns the numbers of the records reminded.
     */
    async remindExpiring(now: Date = clock(), limit = 500): Promise<string[]> {
      return ds.transaction(async (tx) => {
        const due: { id: string; number: string; club_id: string; expires_at: Date; car_id: string }[] = await tx.query(
          `WITH due AS (
             UPDATE cage_records SET expiry_reminded_at = $1::timestamptz
             WHERE id IN (
               SELECT r.id FROM cage_records r
               WHERE r.expiry_reminded_at IS NULL AND r.revoked_at IS NULL AND r.superseded_by_id IS NULL
                 AND r.expires_at > $1::timestamptz AND r.expires_at <= $1::timestamptz + make_interval(days => ${EXPIRY_NOTICE_DAYS})
               ORDER BY r.expires_at LIMIT $2 FOR UPDATE SKIP LOCKED)
             RETURNING id, number, club_id, expires_at, car_id)
           SELECT * FROM due ORDER BY expires_at`,
          [now, limit],
        );
        for (const row of due) {
          const car = await tx.getRepository(Car).findOneByOrFail({ id: row.car_id });
          const builder = await tx.getRepository(User).findOneByOrFail({ id: car.ownerId });
          const club = await tx.getRepository(Club).findOneByOrFail({ id: row.club_id });
          const expiresOn = formatIsoDate(calendarDateIn(new Date(row.expires_at), club.timeZone));
          const left = daysLeft(new Date(row.expires_at), now);
          await deps.mail.enqueue(
            {
              to: builder.email,
              kind: 'cage_record.expiring',
              related: { clubId: club.id, recordId: row.id },
              ...renderMail({
                subject: `Cage record ${row.number} expires on ${expiresOn}`,
                greeting: `Hello ${builder.displayName},`,
                paragraphs: [
                  `Cage record ${row.number} for ${car.name} in ${club.name} expires on ${expiresOn}, in ${left} day${left === 1 ? '' : 's'}.`,
                  'After that date a check at the track reads "Expired". Submit a fresh check of the car for review in good time to get a new record.',
                ],
                action: { label: 'Open the record', url: `${deps.publicUrl}/cage-records/${row.id}` },
                reason: `The record is for your car in ${club.name}. This reminder is sent once per record.`,
              }),
            },
            { manager: tx, idempotencyKey: `cage_record.expiring:${row.id}` },
          );
          await deps.audit.record(
            { clubId: club.id, actorId: null, action: 'cage_record.expiry_reminded', entity: { type: 'cage_record', id: row.id }, details: { number: row.number, carId: car.id, carName: car.name, expiresAt: new Date(row.expires_at).toISOString(), expiresOn: calendarDateIn(new Date(row.expires_at), club.timeZone) } },
            { manager: tx },
          );
        }
        return due.map((d) => d.number);
      });
    },
  };
}
