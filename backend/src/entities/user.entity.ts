// A person with an account. E-mail is stored lower-cased and is unique. `passwordHash` is null while
// the account waits for its invitation to be accepted: such a user cannot sign in.
import { Check, Column, CreateDateColumn, Entity, OneToMany, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { Relation } from 'typeorm';
import { Membership } from './membership.entity';

export const unitSystems = ['imperial', 'metric'] as const;
export type UnitSystem = (typeof unitSystems)[number];

@Entity({ name: 'users' })
@Check('CHK_users_email_lower_case', `"email" = lower("email")`)
export class User {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ type: 'varchar', length: 320, unique: true })
  email!: string;

  @Column({ name: 'display_name', type: 'varchar', length: 120 })
  displayName!: string;

  @Column({ name: 'password_hash', type: 'varchar', length: 255, nullable: true })
  passwordHash!: string | null;

  @Column({ name: 'preferred_units', type: 'enum', enum: unitSystems, enumName: 'unit_system', default: 'imperial' })
  preferredUnits!: UnitSystem;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt!: Date;

  @OneToMany(() => Membership, (m) => m.user)
  memberships?: Relation<Membership[]>;
}
