// A user's place in one club: the roles they hold there. One row per user and club.
import { Check, Column, CreateDateColumn, Entity, JoinColumn, ManyToOne, PrimaryGeneratedColumn, Unique, UpdateDateColumn } from 'typeorm';
import type { Relation } from 'typeorm';
import { Club } from './club.entity';
import { User } from './user.entity';

import { CLUB_ROLES, CLUB_ROLES_SQL, type ClubRole } from '../contracts/roles';

export const clubRoles = CLUB_ROLES;
export type { ClubRole };

@Entity({ name: 'memberships' })
@Check('CHK_memberships_roles', `cardinality("roles") > 0 AND "roles" <@ ${CLUB_ROLES_SQL}::text[]`)
@Unique('UQ_memberships_user_club', ['userId', 'clubId'])
export class Membership {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'user_id', type: 'uuid' })
  userId!: string;

  @Column({ name: 'club_id', type: 'uuid' })
  clubId!: string;

  @ManyToOne(() => User, (u) => u.memberships, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'user_id' })
  user?: Relation<User>;

  @ManyToOne(() => Club, (c) => c.memberships, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'club_id' })
  club?: Relation<Club>;

  @Column({ type: 'text', array: true })
  roles!: ClubRole[];

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt!: Date;
}
