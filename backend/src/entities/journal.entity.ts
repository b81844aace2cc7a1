// The build journal of a build sheet: one entry per stage reached (our stage names, contracts/
// journal.ts), each with its date and note, and journal photos stored through the same pipeline and
// storage as the sheet's photos but counted apart from them.
import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, Unique, UpdateDateColumn } from 'typeorm';
import type { Relation } from 'typeorm';
import { JOURNAL_STAGES, type JournalStage } from '../contracts/journal';
import { BuildSheet } from './build-sheet.entity';
import { User } from './user.entity';

@Entity({ name: 'journal_entries' })
@Unique('UQ_journal_entries_sheet_stage', ['buildSheetId', 'stage'])
@Check('CHK_journal_entries_stage', `"stage" IN (${JOURNAL_STAGES.map((s) => `'${s}'`).join(', ')})`)
export class JournalEntry {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'build_sheet_id', type: 'uuid' })
  buildSheetId!: string;

  @ManyToOne(() => BuildSheet, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'build_sheet_id' })
  buildSheet?: Relation<BuildSheet>;

  @Column({ type: 'varchar', length: 30 })
  stage!: JournalStage;

  /** The calendar day the stage was reached (YYYY-MM-DD). */
  @Column({ name: 'happened_on', type: 'date' })
  happenedOn!: string;

  @Column({ type: 'text', default: '' })
  note!: string;

  @Column({ name: 'created_by', type: 'uuid', nullable: true })
  createdById!: string | null;

  @ManyToOne(() => User, { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'created_by' })
  createdBy?: Relation<User> | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt!: Date;
}

@Entity({ name: 'journal_photos' })
@Check('CHK_journal_photos_size', `"width_px" > 0 AND "height_px" > 0 AND "byte_size" > 0`)
@Index('IDX_journal_photos_entry', ['entryId'])
@Index('IDX_journal_photos_sheet', ['buildSheetId'])
export class JournalPhoto {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'entry_id', type: 'uuid' })
  entryId!: string;

  @ManyToOne(() => JournalEntry, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'entry_id' })
  entry?: Relation<JournalEntry>;

  /** The entry's sheet, kept here so the per-sheet limit is one count. */
  @Column({ name: 'build_sheet_id', type: 'uuid' })
  buildSheetId!: string;

  @ManyToOne(() => BuildSheet, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'build_sheet_id' })
  buildSheet?: Relation<BuildSheet>;

  @Column({ type: 'varchar', length: 300, default: '' })
  caption!: string;

  @Column({ name: 'storage_key', type: 'varchar', length: 200, unique: true })
  storageKey!: string;

  @Column({ name: 'thumbnail_key', type: 'varchar', length: 200, unique: true })
  thumbnailKey!: string;

  @Column({ name: 'width_px', type: 'int' })
  widthPx!: number;

  @Column({ name: 'height_px', type: 'int' })
  heightPx!: number;

  @Column({ name: 'byte_size', type: 'int' })
  byteSize!: number;

  @Column({ name: 'uploaded_by', type: 'uuid', nullable: true })
  uploadedById!: string | null;

  @ManyToOne(() => User, { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'uploaded_by' })
  uploadedBy?: Relation<User> | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;
}
