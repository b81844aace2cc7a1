// One line of a club's activity log: who did what to which thing, when. Append-only: a trigger in the
// migration refuses UPDATE and DELETE. No foreign keys on purpose, so an entry outlives what it names.
import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

@Entity({ name: 'audit_entries' })
@Index('IDX_audit_entries_club_created', ['clubId', 'createdAt'])
export class AuditEntry {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'club_id', type: 'uuid', nullable: true })
  clubId!: string | null;

  @Column({ name: 'actor_id', type: 'uuid', nullable: true })
  actorId!: string | null;

  /** `<entity>.<verb>`, e.g. `membership.roles_changed`. */
  @Column({ type: 'varchar', length: 80 })
  action!: string;

  @Column({ name: 'entity_type', type: 'varchar', length: 80 })
  entityType!: string;

  @Column({ name: 'entity_id', type: 'varchar', length: 80, nullable: true })
  entityId!: string | null;

  @Column({ type: 'jsonb', default: () => "'{}'" })
  details!: Record<string, unknown>;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;
}
