// A build sheet: one cage specification of a car, checked against one club's rulebook. Its content
// lives in numbered revisions; the sheet keeps the number of the latest one (the optimistic lock a
// save compares against) and the outcome of its latest saved check.
import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { Relation } from 'typeorm';
import { Car } from './car.entity';
import { CheckRun, type OverallVerdict } from './check-run.entity';
import { Club } from './club.entity';
import { Rulebook } from './rulebook.entity';
import { RulesetVersion } from './ruleset-version.entity';

@Entity({ name: 'build_sheets' })
@Check('CHK_build_sheets_latest_verdict', `"latest_verdict" IS NULL OR "latest_verdict" IN ('pass', 'fail', 'needs_information')`)
@Check('CHK_build_sheets_current_revision', `"current_revision" > 0`)
@Index('IDX_build_sheets_car', ['carId'])
@Index('IDX_build_sheets_club', ['clubId'])
export class BuildSheet {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'car_id', type: 'uuid' })
  carId!: string;

  // RESTRICT: a car with sheets is archived, never deleted.
  @ManyToOne(() => Car, (c) => c.buildSheets, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'car_id' })
  car?: Relation<Car>;

  @Column({ type: 'varchar', length: 120 })
  name!: string;

  @Column({ name: 'club_id', type: 'uuid' })
  clubId!: string;

  @ManyToOne(() => Club, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'club_id' })
  club?: Relation<Club>;

  @Column({ name: 'rulebook_id', type: 'uuid' })
  rulebookId!: string;

  @ManyToOne(() => Rulebook, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'rulebook_id' })
  rulebook?: Relation<Rulebook>;

  @Column({ name: 'ruleset_version_id', type: 'uuid' })
  rulesetVersionId!: string;

  @ManyToOne(() => RulesetVersion, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'ruleset_version_id' })
  rulesetVersion?: Relation<RulesetVersion>;

  @Column({ name: 'class_id', type: 'varchar', length: 60 })
  classId!: string;

  @Column({ name: 'current_revision', type: 'int' })
  currentRevision!: number;

  @Column({ name: 'archived_at', type: 'timestamptz', nullable: true })
  archivedAt!: Date | null;

  @Column({ name: 'latest_check_run_id', type: 'uuid', nullable: true })
  latestCheckRunId!: string | null;

  @ManyToOne(() => CheckRun, { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'latest_check_run_id' })
  latestCheckRun?: Relation<CheckRun> | null;

  @Column({ name: 'latest_verdict', type: 'varchar', length: 20, nullable: true })
  latestVerdict!: OverallVerdict | null;

  @Column({ name: 'latest_checked_revision', type: 'int', nullable: true })
  latestCheckedRevision!: number | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt!: Date;
}
