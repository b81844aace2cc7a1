// Cage records (issued on approval, checked at the track by their verification code), the club's
// record settings (number prefix, validity in months) and the per-club, per-year sequence numbers
// are allocated from. Status is never stored: domain/review/cage-record.ts computes it at a moment.
import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, PrimaryGeneratedColumn, Unique } from 'typeorm';
import type { Relation } from 'typeorm';
import { Car } from './car.entity';
import { Club } from './club.entity';
import { RulesetVersion } from './ruleset-version.entity';
import { Submission } from './submission.entity';
import { User } from './user.entity';

@Entity({ name: 'cage_records' })
@Unique('UQ_cage_records_number', ['number'])
@Unique('UQ_cage_records_code', ['verificationCode'])
@Unique('UQ_cage_records_submission', ['submissionId'])
@Unique('UQ_cage_records_club_year_sequence', ['clubId', 'year', 'sequence'])
@Index('IDX_cage_records_car', ['carId'])
export class CageRecord {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'club_id', type: 'uuid' })
  clubId!: string;

  @ManyToOne(() => Club, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'club_id' })
  club?: Relation<Club>;

  @Column({ type: 'varchar', length: 40 })
  number!: string;

  @Column({ type: 'int' })
  year!: number;

  @Column({ type: 'int' })
  sequence!: number;

  @Column({ name: 'submission_id', type: 'uuid' })
  submissionId!: string;

  @ManyToOne(() => Submission, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'submission_id' })
  submission?: Relation<Submission>;

  @Column({ name: 'car_id', type: 'uuid' })
  carId!: string;

  @ManyToOne(() => Car, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'car_id' })
  car?: Relation<Car>;

  @Column({ name: 'class_id', type: 'varchar', length: 60 })
  classId!: string;

  @Column({ name: 'class_name', type: 'text' })
  className!: string;

  @Column({ name: 'ruleset_version_id', type: 'uuid' })
  rulesetVersionId!: string;

  @ManyToOne(() => RulesetVersion, { onDelete: 'NO ACTION' })
  @JoinColumn({ name: 'ruleset_version_id' })
  rulesetVersion?: Relation<RulesetVersion>;

  @Column({ name: 'rulebook_title', type: 'text' })
  rulebookTitle!: string;

  @Column({ type: 'text' })
  edition!: string;

  @Column({ name: 'steward_id', type: 'uuid', nullable: true })
  stewardId!: string | null;

  @ManyToOne(() => User, { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'steward_id' })
  steward?: Relation<User> | null;

  @Column({ name: 'verification_code', type: 'varchar', length: 40 })
  verificationCode!: string;

  @Column({ name: 'issued_at', type: 'timestamptz' })
  issuedAt!: Date;

  @Column({ name: 'expires_at', type: 'timestamptz' })
  expiresAt!: Date;

  @Column({ name: 'revoked_at', type: 'timestamptz', nullable: true })
  revokedAt!: Date | null;

  @Column({ name: 'revoked_reason', type: 'text', nullable: true })
  revokedReason!: string | null;

  @Column({ name: 'revoked_by', type: 'uuid', nullable: true })
  revokedById!: string | null;

  @Column({ name: 'superseded_by_id', type: 'uuid', nullable: true })
  supersededById!: string | null;

  @Column({ name: 'superseded_at', type: 'timestamptz', nullable: true })
  supersededAt!: Date | null;

  /** When the builder was mailed that the record expires within 30 days (once: the reminder job sets it). */
  @Column({ name: 'expiry_reminded_at', type: 'timestamptz', nullable: true })
  expiryRemindedAt!: Date | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;
}

/** A club's record settings; a club without a row uses the defaults (its initials, 12 months). */
@Entity({ name: 'club_record_settings' })
@Check('CHK_club_record_settings_validity', `"validity_months" BETWEEN 1 AND 120`)
export class ClubRecordSettings {
  @PrimaryColumn({ name: 'club_id', type: 'uuid' })
  clubId!: string;

  @ManyToOne(() => Club, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'club_id' })
  club?: Relation<Club>;

  @Column({ name: 'record_prefix', type: 'varchar', length: 6 })
  recordPrefix!: string;

  @Column({ name: 'validity_months', type: 'int', default: 12 })
  validityMonths!: number;
}

/** The last sequence number used per club and year; bumped with an upsert, so two approvals never share one. */
@Entity({ name: 'cage_record_sequences' })
export class CageRecordSequence {
  @PrimaryColumn({ name: 'club_id', type: 'uuid' })
  clubId!: string;

  @ManyToOne(() => Club, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'club_id' })
  club?: Relation<Club>;

  @PrimaryColumn({ type: 'int' })
  year!: number;

  @Column({ name: 'last_sequence', type: 'int' })
  lastSequence!: number;
}

/** Stewards who asked to be e-mailed when a new submission reaches their club's queue. */
@Entity({ name: 'steward_mail_opt_ins' })
export class StewardMailOptIn {
  @PrimaryColumn({ name: 'user_id', type: 'uuid' })
  userId!: string;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'user_id' })
  user?: Relation<User>;

  @PrimaryColumn({ name: 'club_id', type: 'uuid' })
  clubId!: string;

  @ManyToOne(() => Club, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'club_id' })
  club?: Relation<Club>;
}
