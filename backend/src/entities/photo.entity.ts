// A photo on a build sheet, tied to one member or to an area of the cage. The bytes live in
// PhotoStorage under `storageKey` / `thumbnailKey`; a row exists only once both files are stored.
import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { Relation } from 'typeorm';
import { PHOTO_AREAS, type PhotoArea } from '../contracts/garage';
import { BuildSheet } from './build-sheet.entity';
import { User } from './user.entity';

@Entity({ name: 'photos' })
@Check('CHK_photos_size', `"width_px" > 0 AND "height_px" > 0 AND "byte_size" > 0`)
@Index('IDX_photos_build_sheet', ['buildSheetId'])
export class Photo {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'build_sheet_id', type: 'uuid' })
  buildSheetId!: string;

  @ManyToOne(() => BuildSheet, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'build_sheet_id' })
  buildSheet?: Relation<BuildSheet>;

  @Column({ name: 'member_id', type: 'varchar', length: 40, nullable: true })
  memberId!: string | null;

  @Column({ type: 'enum', enum: PHOTO_AREAS, enumName: 'photo_area' })
  area!: PhotoArea;

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

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt!: Date;
}
