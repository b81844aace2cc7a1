// One numbered version of a rulebook: the ruleset document (docs/rulesets.md) plus its life cycle.
// A draft may change; once published its content is frozen by a database trigger (migration
// 1796083300000, moves widened in 1796300100000), which also allows only the status moves listed in
// `allowedStatusMoves`. Checks and cage records cite a version, so what they cite can never change
// underneath them.
import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, Unique, UpdateDateColumn } from 'typeorm';
import type { Relation } from 'typeorm';
import type { RulesetDocument } from '../contracts/ruleset';
import { Rulebook } from './rulebook.entity';
import { User } from './user.entity';

/** 'published' is the version in force; 'scheduled' was published ahead of its effective date. */
export const rulesetStatuses = ['draft', 'scheduled', 'published', 'superseded', 'retired'] as const;
export type RulesetStatus = (typeof rulesetStatuses)[number];

/** The status moves the database allows (besides staying put). Mirrors the trigger's rule. */
export const allowedStatusMoves: Readonly<Record<RulesetStatus, readonly RulesetStatus[]>> = {
  draft: ['published', 'scheduled'],
  scheduled: ['published', 'superseded', 'retired'],
  published: ['superseded', 'retired'],
  superseded: ['retired'],
  retired: [],
};

/** SQLSTATE the immutability triggers raise (ruleset versions and check runs). */
export const immutableRowSqlState = 'CW001';

@Entity({ name: 'ruleset_versions' })
@Unique('UQ_ruleset_versions_rulebook_number', ['rulebookId', 'versionNumber'])
@Check('CHK_ruleset_versions_status', `"status" IN ('draft', 'scheduled', 'published', 'superseded', 'retired')`)
@Check('CHK_ruleset_versions_published_at', `"status" = 'draft' OR "published_at" IS NOT NULL`)
@Check('CHK_ruleset_versions_number', `"version_number" > 0`)
// At most one current version per rulebook; publishing a new one supersedes the old in the same transaction.
@Index('UQ_ruleset_versions_one_published', ['rulebookId'], { unique: true, where: `"status" = 'published'` })
export class RulesetVersion {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'rulebook_id', type: 'uuid' })
  rulebookId!: string;

  @ManyToOne(() => Rulebook, (r) => r.versions, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'rulebook_id' })
  rulebook?: Relation<Rulebook>;

  @Column({ name: 'version_number', type: 'int' })
  versionNumber!: number;

  @Column({ type: 'varchar', length: 20, default: 'draft' })
  status!: RulesetStatus;

  @Column({ type: 'text' })
  edition!: string;

  /** PostgreSQL `date`: node-postgres hands it over as 'YYYY-MM-DD' text, never shifted by a time zone. */
  @Column({ name: 'effective_date', type: 'date' })
  effectiveDate!: string;

  @Column({ type: 'jsonb' })
  document!: RulesetDocument;

  @Column({ name: 'created_by', type: 'uuid', nullable: true })
  createdById!: string | null;

  @ManyToOne(() => User, { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'created_by' })
  createdBy?: Relation<User> | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt!: Date;

  @Column({ name: 'published_at', type: 'timestamptz', nullable: true })
  publishedAt!: Date | null;

  @Column({ name: 'published_by', type: 'uuid', nullable: true })
  publishedById!: string | null;

  @ManyToOne(() => User, { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'published_by' })
  publishedBy?: Relation<User> | null;

  /**
   * Bumped on every change to a draft's content (the trigger does it when the writer does not), so
   * an editor can detect a conflicting save and a cache can key drafts by id + lock version.
   */
  @Column({ name: 'lock_version', type: 'int', default: 1 })
  lockVersion!: number;
}
