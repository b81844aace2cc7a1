// The activity log: `record` appends one entry, inside the caller's transaction when given one, so the
// entry exists exactly when the change it describes does. `list` pages a club's entries for its admins,
// filtered by action, car or person, with the people, cars, sheets, records and editions each entry
// names resolved to names and links (the screen turns them into sentences: auditText.ts).
// Entries cannot be changed or deleted (a trigger refuses it), which is what makes the log worth reading.
import type { DataSource, EntityManager } from 'typeorm';
import type {
  AuditEntryWire,
  AuditFilterOption,
  AuditPageWire,
  AuditQuery,
  AuditSubjectsWire,
} from '../contracts/audit';
import { AuditEntry } from '../entities';

export interface AuditRecord {
  clubId: string | null;
  /** The user who acted; null for the system (a job, the seed). */
  actorId: string | null;
  /** `<entity>.<verb>`, e.g. `membership.roles_changed`. */
  action: string;
  entity: { type: string; id: string | null };
  details?: Record<string, unknown>;
}

export interface RecordOptions {
  manager?: EntityManager;
}

const actionPattern = /^[a-z][a-z0-9_]*(\.[a-z][a-z0-9_]*)+$/;

/** A uuid read from text (an entity id, a details field), or NULL when the text is not one. */
const uuidOf = (text: string) =>
  `(CASE WHEN (${text}) ~* '^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$' THEN (${text})::uuid END)`;
const idFor = (entityType: string, ...detailKeys: string[]) =>
  uuidOf(
    `CASE WHEN a.entity_type = '${entityType}' THEN a.entity_id ELSE ${detailKeys.length ? `COALESCE(${detailKeys.map((k) => `a.details->>'${k}'`).join(', ')})` : 'NULL'} END`,
  );

/**
 * What each entry names, resolved by joins: the ids come from the entity and from well-known details
 * fields (`carId`, `sheetId`, `submissionId`, `recordId`, `versionId`, `userId`, `mailId`), so entries
 * written before the names were recorded still read in words. `$1` is the club; entries keep no
 * foreign keys, so every join is LEFT and a thing deleted since falls back to the name in the details.
 */
const resolvedFrom = `
  FROM audit_entries a
  CROSS JOIN LATERAL (SELECT
    ${idFor('submission', 'submissionId')} AS submission_id,
    ${idFor('cage_record', 'recordId')} AS record_id,
    ${idFor('build_sheet', 'sheetId', 'buildSheetId')} AS sheet_id,
    ${idFor('ruleset_version', 'versionId', 'rulesetVersionId')} AS version_id,
    ${idFor('membership', 'userId')} AS person_id,
    ${idFor('invitation')} AS invitation_id,
    ${uuidOf(`a.details->>'carId'`)} AS car_id,
    ${uuidOf(`a.details->>'mailId'`)} AS mail_id
  ) k
  LEFT JOIN submissions s ON s.id = k.submission_id
  LEFT JOIN cage_records r ON r.id = k.record_id
  LEFT JOIN cage_records ra ON k.record_id IS NULL AND a.action = 'submission.approve' AND ra.submission_id = s.id
  LEFT JOIN build_sheets b ON b.id = COALESCE(k.sheet_id, s.build_sheet_id)
  LEFT JOIN cars c ON c.id = COALESCE(k.car_id, s.car_id, r.car_id, ra.car_id, b.car_id)
  LEFT JOIN ruleset_versions v ON v.id = k.version_id
  LEFT JOIN rulebooks rb ON rb.id = v.rulebook_id
  LEFT JOIN invitations i ON i.id = k.invitation_id
  LEFT JOIN users p ON p.id = COALESCE(k.person_id, (SELECT iu.id FROM users iu WHERE iu.email = i.email))
  LEFT JOIN memberships pm ON pm.club_id = $1 AND pm.user_id = p.id
  LEFT JOIN users u ON u.id = a.actor_id
  LEFT JOIN memberships am ON am.club_id = $1 AND am.user_id = u.id
  LEFT JOIN outbox_messages o ON o.id = k.mail_id`;

const resolvedColumns = `a.id, a.action, a.entity_type, a.entity_id, a.details, a.created_at,
  u.id AS actor_id, u.email AS actor_email, u.display_name AS actor_name, am.id IS NOT NULL AS actor_member,
  p.id AS person_id, p.email AS person_email,
  -- Someone invited who has not joined yet has a placeholder name (their e-mail's first part): show the address.
  CASE WHEN p.password_hash IS NULL THEN p.email ELSE p.display_name END AS person_name, pm.id IS NOT NULL AS person_member,
  c.id AS car_id, c.name AS car_name, c.owner_id AS car_owner_id,
  b.id AS sheet_id, b.name AS sheet_name, b.club_id AS sheet_club_id,
  COALESCE(r.id, ra.id) AS record_id, COALESCE(r.number, ra.number) AS record_number, COALESCE(r.club_id, ra.club_id) AS record_club_id,
  v.id AS version_id, v.version_number, v.edition, rb.title AS rulebook_title, rb.club_id AS rulebook_club_id,
  s.id AS submission_id, s.club_id AS submission_club_id,
  o.status AS mail_status, o.sent_at AS mail_sent_at, k.mail_id`;

interface ListRow {
  id: string;
  action: string;
  entity_type: string;
  entity_id: string | null;
  details: Record<string, unknown>;
  created_at: Date;
  actor_id: string | null;
  actor_email: string | null;
  actor_name: string | null;
  actor_member: boolean;
  person_id: string | null;
  person_email: string | null;
  person_name: string | null;
  person_member: boolean;
  car_id: string | null;
  car_name: string | null;
  car_owner_id: string | null;
  sheet_id: string | null;
  sheet_name: string | null;
  sheet_club_id: string | null;
  record_id: string | null;
  record_number: string | null;
  record_club_id: string | null;
  version_id: string | null;
  version_number: number | null;
  edition: string | null;
  rulebook_title: string | null;
  rulebook_club_id: string | null;
  submission_id: string | null;
  submission_club_id: string | null;
  mail_status: NonNullable<AuditSubjectsWire['invitationMail']>['status'] | null;
  mail_sent_at: Date | null;
  mail_id: string | null;
}

const text = (value: unknown): string | undefined =>
  typeof value === 'string' && value.trim() !== '' ? value : undefined;
const uuidPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** "Tarnwick Vale cage regulations, version 3 (edition 2027)"; parts missing on either side are left out. */
function editionName(title: string | undefined, versionNumber: unknown, edition: unknown): string {
  const version = typeof versionNumber === 'number' ? `version ${versionNumber}` : undefined;
  const ed = text(edition) ? `edition ${String(edition)}` : undefined;
  const tail = version && ed ? `${version} (${ed})` : (version ?? ed);
  return [title ?? 'the rulebook', tail].filter(Boolean).join(', ');
}

/** The things an entry names, with names and whether `viewerId` (an admin of `clubId`) can open them. */
function subjectsOf(r: ListRow, clubId: string, viewerId: string): AuditSubjectsWire {
  const d = r.details;
  const out: AuditSubjectsWire = {};
  const personId =
    r.person_id ??
    (r.entity_type === 'membership' && r.entity_id && uuidPattern.test(r.entity_id) ? r.entity_id : null);
  const email = r.person_email ?? text(d.email);
  if (personId || email) {
    out.person = {
      id: personId ?? '',
      name: r.person_name ?? text(d.displayName) ?? email ?? 'someone',
      email: email ?? '',
      open: r.person_member,
    };
  }
  const carId = r.car_id ?? text(d.carId);
  const carName = r.car_name ?? text(d.carName);
  if (carId && carName) out.car = { id: carId, name: carName, open: r.car_owner_id === viewerId };
  const sheetId = r.sheet_id ?? text(d.sheetId) ?? (r.entity_type === 'build_sheet' ? r.entity_id : null);
  const sheetName = r.sheet_name ?? text(d.sheetName);
  if (sheetId && sheetName)
    out.sheet = {
      id: sheetId,
      name: sheetName,
      open: r.sheet_club_id === clubId || (r.sheet_id !== null && r.car_owner_id === viewerId),
    };
  const recordNumber =
    r.record_number ??
    text(d.recordNumber) ??
    (r.action.startsWith('cage_record.') ? text(d.number) : undefined);
  const recordId = r.record_id ?? text(d.recordId) ?? (r.entity_type === 'cage_record' ? r.entity_id : null);
  if (recordId && recordNumber)
    out.record = { id: recordId, name: recordNumber, open: r.record_club_id === clubId };
  const versionId = r.version_id ?? (r.entity_type === 'ruleset_version' ? r.entity_id : null);
  if (versionId) {
    out.edition = {
      id: versionId,
      name: editionName(
        r.rulebook_title ?? text(d.rulebookTitle),
        r.version_number ?? d.versionNumber,
        r.edition ?? d.edition,
      ),
      open: r.rulebook_club_id === clubId,
    };
  }
  const submissionId = r.submission_id ?? (r.entity_type === 'submission' ? r.entity_id : null);
  if (submissionId)
    out.submission = { id: submissionId, name: 'submission', open: r.submission_club_id === clubId };
  if (r.action === 'membership.added' && d.invited === true) {
    out.invitationMail = r.mail_status
      ? { status: r.mail_status, sentAt: r.mail_sent_at ? r.mail_sent_at.toISOString() : null }
      : null;
  }
  return out;
}

export type AuditService = ReturnType<typeof createAuditService>;

export function createAuditService(ds: DataSource) {
  return {
    async record(entry: AuditRecord, options: RecordOptions = {}): Promise<void> {
      if (!actionPattern.test(entry.action))
        throw new Error(`audit.record: action "${entry.action}" must look like area.verb`);
      const repo = (options.manager ?? ds.manager).getRepository(AuditEntry);
      await repo.save(
        repo.create({
          clubId: entry.clubId,
          actorId: entry.actorId,
          action: entry.action,
          entityType: entry.entity.type,
          entityId: entry.entity.id,
          details: entry.details ?? {},
        }),
      );
    },

    /** One page of the club's log, newest first, each entry with the things it names resolved. */
    async list(clubId: string, viewerId: string, query: AuditQuery): Promise<AuditPageWire> {
      const where = ['a.club_id = $1'];
      const params: unknown[] = [clubId];
      if (query.action) where.push(`a.action = $${params.push(query.action)}`);
      if (query.carId) where.push(`c.id = $${params.push(query.carId)}`);
      if (query.personId) {
        const n = params.push(query.personId);
        where.push(`(a.actor_id = $${n} OR p.id = $${n} OR s.builder_id = $${n})`);
      }
      const filter = where.join(' AND ');
      const offset = (query.page - 1) * query.pageSize;
      const rows: ListRow[] = await ds.query(
        `SELECT ${resolvedColumns} ${resolvedFrom} WHERE ${filter}
         ORDER BY a.created_at DESC, a.id DESC
         LIMIT $${params.length + 1} OFFSET $${params.length + 2}`,
        [...params, query.pageSize, offset],
      );
      const [{ total }] = (await ds.query(
        `SELECT count(*)::int AS total ${resolvedFrom} WHERE ${filter}`,
        params,
      )) as [{ total: number }];
      const actions: { action: string }[] = await ds.query(
        `SELECT DISTINCT action FROM audit_entries WHERE club_id = $1 ORDER BY action`,
        [clubId],
      );
      const cars: AuditFilterOption[] = await ds.query(
        `SELECT DISTINCT c.id, c.name, o.display_name AS hint, lower(c.name) AS sort
         FROM build_sheets b JOIN cars c ON c.id = b.car_id JOIN users o ON o.id = c.owner_id
         WHERE b.club_id = $1 ORDER BY sort, hint, c.id`,
        [clubId],
      );
      const people: AuditFilterOption[] = await ds.query(
        `SELECT u.id, CASE WHEN u.password_hash IS NULL THEN u.email ELSE u.display_name END AS name, u.email AS hint FROM users u
         WHERE u.id IN (SELECT user_id FROM memberships WHERE club_id = $1)
            OR u.id IN (SELECT actor_id FROM audit_entries WHERE club_id = $1 AND actor_id IS NOT NULL)
            OR u.id::text IN (SELECT entity_id FROM audit_entries WHERE club_id = $1 AND entity_type = 'membership')
         ORDER BY lower(u.display_name), u.email`,
        [clubId],
      );
      const entries: AuditEntryWire[] = rows.map((r) => ({
        id: r.id,
        action: r.action,
        entityType: r.entity_type,
        entityId: r.entity_id,
        actor:
          r.actor_id && r.actor_email
            ? {
                id: r.actor_id,
                email: r.actor_email,
                displayName: r.actor_name ?? r.actor_email,
                open: r.actor_member,
              }
            : null,
        details: r.details,
        subjects: subjectsOf(r, clubId, viewerId),
        createdAt: r.created_at.toISOString(),
      }));
      return {
        entries,
        page: query.page,
        pageSize: query.pageSize,
        total,
        actions: actions.map((a) => a.action),
        cars: cars.map(({ id, name, hint }) => ({ id, name, hint })),
        people,
      };
    },
  };
}
