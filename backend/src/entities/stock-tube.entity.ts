// A tube size on a stock list: the club's list (kept by its admins, started from the common sizes)
// or a builder's own. Exactly one of club and owner is set. Canonical mm and MPa; the database
// refuses a wall of half the OD or more, as the service does first with a clear message.
import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { Relation } from 'typeorm';
import { Club } from './club.entity';
import { User } from './user.entity';

export const stockMaterials = ['mild_steel', 'chromoly_4130', 'other'] as const;
export const stockProcesses = ['dom', 'erw', 'seamless', 'cds', 'other'] as const;

@Entity({ name: 'stock_tubes' })
@Check('CHK_stock_tubes_one_list', `("club_id" IS NULL) <> ("owner_id" IS NULL)`)
@Check('CHK_stock_tubes_size', `"od_mm" > 0 AND "wall_mm" > 0 AND "wall_mm" * 2 < "od_mm"`)
@Check('CHK_stock_tubes_material', `"material" IN ('mild_steel', 'chromoly_4130', 'other')`)
@Check('CHK_stock_tubes_process', `"process" IN ('dom', 'erw', 'seamless', 'cds', 'other')`)
@Check('CHK_stock_tubes_yield', `"yield_mpa" IS NULL OR "yield_mpa" > 0`)
@Index('IDX_stock_tubes_club', ['clubId'])
@Index('IDX_stock_tubes_owner', ['ownerId'])
export class StockTube {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'club_id', type: 'uuid', nullable: true })
  clubId!: string | null;

  @ManyToOne(() => Club, { onDelete: 'CASCADE', nullable: true })
  @JoinColumn({ name: 'club_id' })
  club?: Relation<Club> | null;

  @Column({ name: 'owner_id', type: 'uuid', nullable: true })
  ownerId!: string | null;

  @ManyToOne(() => User, { onDelete: 'CASCADE', nullable: true })
  @JoinColumn({ name: 'owner_id' })
  owner?: Relation<User> | null;

  @Column({ type: 'varchar', length: 120 })
  label!: string;

  @Column({ name: 'od_mm', type: 'double precision' })
  odMm!: number;

  @Column({ name: 'wall_mm', type: 'double precision' })
  wallMm!: number;

  @Column({ type: 'varchar', length: 20 })
  material!: (typeof stockMaterials)[number];

  @Column({ type: 'varchar', length: 20 })
  process!: (typeof stockProcesses)[number];

  @Column({ type: 'varchar', length: 60, nullable: true })
  grade!: string | null;

  @Column({ name: 'yield_mpa', type: 'double precision', nullable: true })
  yieldMpa!: number | null;

  /** Where the yield comes from (a standard's minimum, a mill certificate…). */
  @Column({ name: 'yield_source', type: 'varchar', length: 200, nullable: true })
  yieldSource!: string | null;

  /** Came from the common sizes (common practice), not typed by a person. */
  @Column({ type: 'boolean', default: false })
  common!: boolean;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt!: Date;
}

/** When a club's list was started from the common sizes; a list emptied on purpose stays empty. */
@Entity({ name: 'club_stock_seeds' })
export class ClubStockSeed {
  @PrimaryColumn({ name: 'club_id', type: 'uuid' })
  clubId!: string;

  @ManyToOne(() => Club, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'club_id' })
  club?: Relation<Club>;

  @CreateDateColumn({ name: 'seeded_at', type: 'timestamptz' })
  seededAt!: Date;
}
