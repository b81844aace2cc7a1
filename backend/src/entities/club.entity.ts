// A club (sanctioning body or region) whose rules and people the product serves.
import { Column, CreateDateColumn, Entity, OneToMany, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { Relation } from 'typeorm';
import { Membership } from './membership.entity';

@Entity({ name: 'clubs' })
export class Club {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ type: 'varchar', length: 80, unique: true })
  slug!: string;

  @Column({ type: 'varchar', length: 200 })
  name!: string;

  /** IANA zone the club's dates are read in: an edition takes effect at midnight there. */
  @Column({ name: 'time_zone', type: 'varchar', length: 64, default: 'UTC' })
  timeZone!: string;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt!: Date;

  @OneToMany(() => Membership, (m) => m.club)
  memberships?: Relation<Membership[]>;
}
