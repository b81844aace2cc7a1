// A builder's saved check run sent to the club's stewards for review. The state machine lives in
// domain/review/workflow.ts; this row is what it reads and writes. `version` goes up with every
// action, so a decision made on a stale page is refused (409) instead of overwriting another's.
import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { Relation } from 'typeorm';
import type { Waiver } from '../domain/review/waivers';
import type { SubmissionState } from '../domain/review/workflow';
import { BuildSheet } from './build-sheet.entity';
import { Car } from './car.entity';
import { CheckRun } from './check-run.entity';
import { Club } from './club.entity';
import { User } from './user.entity';

@Entity({ name: 'submissions' })
@Check('CHK_submissions_state', `"state" IN ('pending', 'in_review', 'approved', 'changes_requested', 'rejected', 'withdrawn')`)
@Check('CHK_submissions_version', `"version" > 0`)
@Index('IDX_submissions_club_state', ['clubId', 'state'])
@Index('IDX_submissions_car', ['carId'])
@Index('IDX_submissions_builder', ['builderId'])
export class Submission {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'club_id', type: 'uuid' })
  clubId!: string;

  @ManyToOne(() => Club, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'club_id' })
  club?: Relation<Club>;

  @Column({ name: 'car_id', type: 'uuid' })
  carId!: string;

  @ManyToOne(() => Car, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'car_id' })
  car?: Relation<Car>;

  @Column({ name: 'build_sheet_id', type: 'uuid' })
  buildSheetId!: string;

  @ManyToOne(() => BuildSheet, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'build_sheet_id' })
  buildSheet?: Relation<BuildSheet>;

  // No cascade: the check run is the evidence and never goes away.
  @Column({ name: 'check_run_id', type: 'uuid' })
  checkRunId!: string;

  @ManyToOne(() => CheckRun, { onDelete: 'NO ACTION' })
  @JoinColumn({ name: 'check_run_id' })
  checkRun?: Relation<CheckRun>;

  @Column({ name: 'builder_id', type: 'uuid' })
  builderId!: string;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'builder_id' })
  builder?: Relation<User>;

  @Column({ type: 'varchar', length: 20 })
  state!: SubmissionState;

  @Column({ type: 'int', default: 1 })
  version!: number;

  /** Copied from the check run so the queue can filter by class without reading reports. */
  @Column({ name: 'class_id', type: 'varchar', length: 60 })
  classId!: string;

  @Column({ name: 'builder_note', type: 'text', nullable: true })
  builderNote!: string | null;

  @Column({ name: 'assigned_steward_id', type: 'uuid', nullable: true })
  assignedStewardId!: string | null;

  @ManyToOne(() => User, { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'assigned_steward_id' })
  assignedSteward?: Relation<User> | null;

  @Column({ name: 'previous_submission_id', type: 'uuid', nullable: true })
  previousSubmissionId!: string | null;

  @ManyToOne(() => Submission, { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'previous_submission_id' })
  previousSubmission?: Relation<Submission> | null;

  @Column({ name: 'resubmitted_as_id', type: 'uuid', nullable: true })
  resubmittedAsId!: string | null;

  @ManyToOne(() => Submission, { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'resubmitted_as_id' })
  resubmittedAs?: Relation<Submission> | null;

  @Column({ type: 'jsonb', default: () => "'[]'" })
  waivers!: Waiver[];

  /** The sheet's photos when it was submitted, in their order: the evidence the steward sees. */
  @Column({ name: 'photo_ids', type: 'jsonb', default: () => "'[]'" })
  photoIds!: string[];

  @Column({ name: 'decision_note', type: 'text', nullable: true })
  decisionNote!: string | null;

  @Column({ name: 'decided_at', type: 'timestamptz', nullable: true })
  decidedAt!: Date | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt!: Date;
}
