// A steward's note on one finding of a submission (findingKey of domain/review/waivers.ts). Notes are
// added, never edited, so what a steward wrote at the time stays as written.
import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import type { Relation } from 'typeorm';
import { Submission } from './submission.entity';
import { User } from './user.entity';

@Entity({ name: 'finding_annotations' })
@Index('IDX_finding_annotations_submission', ['submissionId'])
export class FindingAnnotation {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'submission_id', type: 'uuid' })
  submissionId!: string;

  @ManyToOne(() => Submission, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'submission_id' })
  submission?: Relation<Submission>;

  @Column({ name: 'finding_key', type: 'varchar', length: 200 })
  findingKey!: string;

  @Column({ name: 'author_id', type: 'uuid', nullable: true })
  authorId!: string | null;

  @ManyToOne(() => User, { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'author_id' })
  author?: Relation<User> | null;

  @Column({ type: 'text' })
  text!: string;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;
}
