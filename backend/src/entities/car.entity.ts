// A builder's car: the vehicle a cage goes into. Owned by one user; never hard-deleted while it has
// build sheets (archive it instead), so the history of checks made on it stays whole.
import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, OneToMany, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { Relation } from 'typeorm';
import { CHASSIS_TYPES } from '../domain/vocabulary';
import { BuildSheet } from './build-sheet.entity';
import { User } from './user.entity';

export type ChassisType = (typeof CHASSIS_TYPES)[number];

@Entity({ name: 'cars' })
@Check('CHK_cars_year', `"year" IS NULL OR "year" BETWEEN 1900 AND 2100`)
@Index('IDX_cars_owner', ['ownerId'])
export class Car {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'owner_id', type: 'uuid' })
  ownerId!: string;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'owner_id' })
  owner?: Relation<User>;

  @Column({ type: 'varchar', length: 120 })
  name!: string;

  @Column({ type: 'varchar', length: 80, nullable: true })
  make!: string | null;

  @Column({ type: 'varchar', length: 80, nullable: true })
  model!: string | null;

  @Column({ type: 'int', nullable: true })
  year!: number | null;

  @Column({ name: 'chassis_type', type: 'enum', enum: CHASSIS_TYPES, enumName: 'chassis_type' })
  chassisType!: ChassisType;

  @Column({ name: 'race_number', type: 'varchar', length: 10, nullable: true })
  raceNumber!: string | null;

  @Column({ name: 'archived_at', type: 'timestamptz', nullable: true })
  archivedAt!: Date | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt!: Date;

  @OneToMany(() => BuildSheet, (s) => s.car)
  buildSheets?: Relation<BuildSheet[]>;
}
