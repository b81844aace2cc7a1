// A hoop's legs as measured for its leg trim, per build sheet and member: the uncut legs on the bench,
// the pad (stop-block) heights in the car, the lean it should stand at and, optionally, the top's
// height. Bench facts, kept apart from the sheet's revisions: measuring the car changes no design.
import { Column, CreateDateColumn, Entity, JoinColumn, ManyToOne, PrimaryGeneratedColumn, Unique, UpdateDateColumn } from 'typeorm';
import type { Relation } from 'typeorm';
import { BuildSheet } from './build-sheet.entity';
import { User } from './user.entity';

export interface MeasuredLeg {
  uncutMm: number;
  padHeightMm: number;
  bendEndMm?: number;
}

@Entity({ name: 'hoop_leg_measurements' })
@Unique('UQ_hoop_leg_measurements_sheet_member', ['buildSheetId', 'memberId'])
export class HoopLegMeasurement {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'build_sheet_id', type: 'uuid' })
  buildSheetId!: string;

  @ManyToOne(() => BuildSheet, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'build_sheet_id' })
  buildSheet?: Relation<BuildSheet>;

  /** The member's id in the sheet's specification. */
  @Column({ name: 'member_id', type: 'varchar', length: 60 })
  memberId!: string;

  /** Left leg first, canonical mm (validated by contracts/fabrication.ts and the leg-trim domain). */
  @Column({ type: 'jsonb' })
  legs!: [MeasuredLeg, MeasuredLeg];

  @Column({ name: 'lean_deg', type: 'double precision' })
  leanDeg!: number;

  @Column({ name: 'top_height_mm', type: 'double precision', nullable: true })
  topHeightMm!: number | null;

  @Column({ name: 'updated_by', type: 'uuid', nullable: true })
  updatedById!: string | null;

  @ManyToOne(() => User, { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'updated_by' })
  updatedBy?: Relation<User> | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt!: Date;
}
