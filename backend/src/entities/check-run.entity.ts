// A saved check: the specification exactly as checked, the report the engine gave, and the ruleset
// version it was checked against. Immutable: a trigger refuses every UPDATE and DELETE (migration
// 1796083300000). The verification code lets a steward or inspector look the run up later.
import { Check, Column, CreateDateColumn, Entity, ForeignKey, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import type { Relation } from 'typeorm';
import type { CheckReport } from '../contracts/report';
import type { Specification } from '../contracts/specification';
import { RulesetVersion } from './ruleset-version.entity';
import { User } from './user.entity';

export const overallVerdicts = ['pass', 'fail', 'needs_information'] as const;
export type OverallVerdict = (typeof overallVerdicts)[number];

@Entity({ name: 'check_runs' })
@Check('CHK_check_runs_verdict', `"overall_verdict" IN ('pass', 'fail', 'needs_information')`)
@Index('IDX_check_runs_created_by', ['createdById'])
@Index('IDX_check_runs_ruleset_version', ['rulesetVersionId'])
@Index('IDX_check_runs_build_sheet_revision', ['buildSheetRevisionId'])
export class CheckRun {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'ruleset_version_id', type: 'uuid' })
  rulesetVersionId!: string;

  // No cascade: a version that a saved check cites must not disappear.
  @ManyToOne(() => RulesetVersion, { onDelete: 'NO ACTION' })
  @JoinColumn({ name: 'ruleset_version_id' })
  rulesetVersion?: Relation<RulesetVersion>;

  @Column({ name: 'class_id', type: 'text' })
  classId!: string;

  @Column({ type: 'jsonb' })
  specification!: Specification;

  @Column({ type: 'jsonb' })
  report!: CheckReport;

  @Column({ name: 'overall_verdict', type: 'varchar', length: 20 })
  overallVerdict!: OverallVerdict;

  @Column({ name: 'created_by', type: 'uuid' })
  createdById!: string;

  @ManyToOne(() => User, { onDelete: 'NO ACTION' })
  @JoinColumn({ name: 'created_by' })
  createdBy?: Relation<User>;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;

  // The build sheet revision the run was made from (migration 1796083400000 adds the constraint).
  // Named by string: importing the revision entity here would make an import cycle.
  @Column({ name: 'build_sheet_revision_id', type: 'uuid', nullable: true })
  @ForeignKey('BuildSheetRevision', { onDelete: 'NO ACTION' })
  buildSheetRevisionId!: string | null;

  @Column({ name: 'verification_code', type: 'text', unique: true })
  verificationCode!: string;
}
