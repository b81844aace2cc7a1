// One saved state of a build sheet: the full specification plus the ruleset version and class it
// was meant for. Revisions are numbered 1, 2, … per sheet; the unique (sheet, number) key makes
// sure two saves from the same base can never both become revision N+1.
import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, Unique } from 'typeorm';
import type { Relation } from 'typeorm';
import type { Specification } from '../contracts/specification';
import { BuildSheet } from './build-sheet.entity';
import { RulesetVersion } from './ruleset-version.entity';
import { User } from './user.entity';

@Entity({ name: 'build_sheet_revisions' })
@Unique('UQ_build_sheet_revisions_sheet_number', ['buildSheetId', 'number'])
@Index('IDX_build_sheet_revisions_ruleset_version', ['rulesetVersionId'])
export class BuildSheetRevision {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'build_sheet_id', type: 'uuid' })
  buildSheetId!: string;

  @ManyToOne(() => BuildSheet, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'build_sheet_id' })
  buildSheet?: Relation<BuildSheet>;

  @Column({ type: 'int' })
  number!: number;

  @Column({ type: 'jsonb' })
  specification!: Specification;

  @Column({ name: 'ruleset_version_id', type: 'uuid' })
  rulesetVersionId!: string;

  @ManyToOne(() => RulesetVersion, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'ruleset_version_id' })
  rulesetVersion?: Relation<RulesetVersion>;

  @Column({ name: 'class_id', type: 'varchar', length: 60 })
  classId!: string;

  @Column({ name: 'created_by', type: 'uuid', nullable: true })
  createdById!: string | null;

  @ManyToOne(() => User, { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'created_by' })
  createdBy?: Relation<User> | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;
}
