// An invitation for an e-mail that had no active account when an admin added it to a club. Only the
// SHA-256 of the token is stored: the token itself appears once, in the link the admin passes on.
import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import type { Relation } from 'typeorm';
import { Club } from './club.entity';
import type { ClubRole } from './membership.entity';
import { User } from './user.entity';
import { CLUB_ROLES_SQL } from '../contracts/roles';

@Entity({ name: 'invitations' })
@Check('CHK_invitations_roles', `cardinality("roles") > 0 AND "roles" <@ ${CLUB_ROLES_SQL}::text[]`)
@Index('IDX_invitations_club_email', ['clubId', 'email'])
export class Invitation {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'token_hash', type: 'char', length: 64, unique: true })
  tokenHash!: string;

  @Column({ type: 'varchar', length: 320 })
  email!: string;

  @Column({ name: 'club_id', type: 'uuid' })
  clubId!: string;

  @ManyToOne(() => Club, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'club_id' })
  club?: Relation<Club>;

  @Column({ type: 'text', array: true })
  roles!: ClubRole[];

  @Column({ name: 'invited_by', type: 'uuid', nullable: true })
  invitedById!: string | null;

  @ManyToOne(() => User, { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'invited_by' })
  invitedBy?: Relation<User> | null;

  @Column({ name: 'expires_at', type: 'timestamptz' })
  expiresAt!: Date;

  @Column({ name: 'accepted_at', type: 'timestamptz', nullable: true })
  acceptedAt!: Date | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;
}
