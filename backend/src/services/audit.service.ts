// The activity log: `record` appends one entry, inside the caller's transaction when given one, so the
// entry exists exactly when the change it describes does. `list` pages a club's entries for its admins.
// Entries cannot be changed or deleted (a trigger refuses it), which is what makes the log worth reading.
import type { DataSource, EntityManager } from 'typeorm';
import type { AuditEntryWire, AuditPageWire, AuditQuery } from '../contracts/audit';
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

    async list(clubId: string, query: AuditQuery): Promise<AuditPageWire> {
      const filter = query.action ? 'AND a.action = $2' : '';
      const params: unknown[] = query.action ? [clubId, query.action] : [clubId];
      const offset = (query.page - 1) * query.pageSize;
      const rows: ListRow[] = await ds.query(
        `SELECT a.id, a.action, a.entity_type, a.entity_id, a.details, a.created_at,
                a.actor_id, u.email AS actor_email, u.display_name AS actor_name
         FROM audit_entries a LEFT JOIN users u ON u.id = a.actor_id
         WHERE a.club_id = $1 ${filter}
         ORDER BY a.created_at DESC, a.id DESC
         LIMIT $${params.length + 1} OFFSET $${params.length + 2}`,
        [...params, query.pageSize, offset],
      );
      const [{ total }] = (await ds.query(
        `SELECT count(*)::int AS total FROM audit_entries a WHERE a.club_id = $1 ${filter}`,
        params,
      )) as [{ total: number }];
      const actions: { action: string }[] = await ds.query(
        `SELECT DISTINCT action FROM audit_entries WHERE club_id = $1 ORDER BY action`,
        [clubId],
      );
      const entries: AuditEntryWire[] = rows.map((r) => ({
        id: r.id,
        action: r.action,
        entityType: r.entity_type,
        entityId: r.entity_id,
        actor:
          r.actor_id && r.actor_email
            ? { id: r.actor_id, email: r.actor_email, displayName: r.actor_name ?? r.actor_email }
            : null,
        details: r.details,
        createdAt: r.created_at.toISOString(),
      }));
      return {
        entries,
        page: query.page,
        pageSize: query.pageSize,
        total,
        actions: actions.map((a) => a.action),
      };
    },
  };
}
