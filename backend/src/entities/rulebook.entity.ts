// A club's rulebook (its cage rules as one named publication). Its text lives in numbered
// ruleset versions; the rulebook itself only names it. The slug is unique within the club.
import { Column, CreateDateColumn, Entity, JoinColumn, ManyToOne, OneToMany, PrimaryGeneratedColumn, Unique } from 'typeorm';
import type { Relation } from 'typeorm';
import { Club } from './club.entity';
import { RulesetVersion } from './ruleset-version.entity';

@Entity({ name: 'rulebooks' })
@Unique('UQ_rulebooks_club_slug', ['clubId', 'slug'])
export class Rulebook {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'club_id', type: 'uuid' })
  clubId!: string;

  @ManyToOne(() => Club, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'club_id' })
  club?: Relation<Club>;

  @Column({ type: 'varchar', length: 80 })
  slug!: string;

  @Column({ type: 'varchar', length: 200 })
  title!: string;

  @Column({ type: 'varchar', length: 200 })
  publisher!: string;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;

  @OneToMany(() => RulesetVersion, (v) => v.rulebook)
  versions?: Relation<RulesetVersion[]>;
}
