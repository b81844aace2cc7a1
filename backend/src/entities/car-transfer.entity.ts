// A car changing hands (issue 13 §3): the seller offers it to a buyer of the same club, who accepts or
// declines from their garage, or the seller withdraws the offer; a club admin may also move a car of their
// club outright (`transferred`). The car's sheets, check runs, records and photos follow its owner, so
// the only thing that moves is `cars.owner_id`; this row is the request and its outcome.
import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import type { Relation } from 'typeorm';
import { Car } from './car.entity';
import { User } from './user.entity';

export const carTransferStates = ['offered', 'accepted', 'declined', 'withdrawn', 'cancelled', 'transferred'] as const;
export type CarTransferState = (typeof carTransferStates)[number];

@Entity({ name: 'car_transfers' })
@Check('CHK_car_transfers_state', `"state" IN ('offered', 'accepted', 'declined', 'withdrawn', 'cancelled', 'transferred')`)
@Check('CHK_car_transfers_people', `"from_user_id" <> "to_user_id"`)
// One open offer per car at a time.
@Index('UQ_car_transfers_open_offer', ['carId'], { unique: true, where: `"state" = 'offered'` })
@Index('IDX_car_transfers_to', ['toUserId', 'state'])
@Index('IDX_car_transfers_from', ['fromUserId', 'state'])
export class CarTransfer {
  @PrimaryGeneratedColumn('uuid', { primaryKeyConstraintName: 'PK_car_transfers' })
  id!: string;

  @Column({ name: 'car_id', type: 'uuid' })
  carId!: string;

  @ManyToOne(() => Car, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'car_id', foreignKeyConstraintName: 'FK_car_transfers_car' })
  car?: Relation<Car>;

  /** The owner when the transfer was asked for. */
  @Column({ name: 'from_user_id', type: 'uuid' })
  fromUserId!: string;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'from_user_id', foreignKeyConstraintName: 'FK_car_transfers_from' })
  fromUser?: Relation<User>;

  @Column({ name: 'to_user_id', type: 'uuid' })
  toUserId!: string;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'to_user_id', foreignKeyConstraintName: 'FK_car_transfers_to' })
  toUser?: Relation<User>;

  @Column({ type: 'varchar', length: 20 })
  state!: CarTransferState;

  /** The club admin who moved the car outright; null for an offer between the two people. */
  @Column({ name: 'by_admin_id', type: 'uuid', nullable: true })
  byAdminId!: string | null;

  @ManyToOne(() => User, { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'by_admin_id', foreignKeyConstraintName: 'FK_car_transfers_admin' })
  byAdmin?: Relation<User> | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;

  @Column({ name: 'decided_at', type: 'timestamptz', nullable: true })
  decidedAt!: Date | null;
}
