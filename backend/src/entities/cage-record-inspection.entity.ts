// A physical inspection of a caged car at the track, on its cage record: which steward, when, the
// seal or sticker number fixed to the cage, and the wall readings taken (an ultrasonic reading per
// member, named as the approved sheet names them). A record keeps every inspection (its history);
// none is ever changed or removed. Each reading keeps the rulebook's minimum wall of its member as it
// was when taken, so "under the minimum" reads the same later.
import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import type { Relation } from 'typeorm';
import { CageRecord } from './cage-record.entity';
import { User } from './user.entity';

export interface StoredInspectionReading {
  memberId: string;
  memberName: string;
  wallMm: number;
  /** The least wall the record's rulebook asks of this member; null when the check named none. */
  minWallMm: number | null;
}

@Entity({ name: 'cage_record_inspections' })
@Index('IDX_cage_record_inspections_record', ['recordId', 'inspectedAt'])
export class CageRecordInspection {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'record_id', type: 'uuid' })
  recordId!: string;

  @ManyToOne(() => CageRecord, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'record_id' })
  record?: Relation<CageRecord>;

  @Column({ name: 'steward_id', type: 'uuid', nullable: true })
  stewardId!: string | null;

  @ManyToOne(() => User, { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'steward_id' })
  steward?: Relation<User> | null;

  @Column({ name: 'inspected_at', type: 'timestamptz' })
  inspectedAt!: Date;

  @Column({ name: 'seal_number', type: 'varchar', length: 40 })
  sealNumber!: string;

  @Column({ type: 'jsonb', default: () => "'[]'" })
  readings!: StoredInspectionReading[];

  @Column({ type: 'text', nullable: true })
  note!: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;
}
