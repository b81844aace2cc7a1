// One audited step of a submission's review: the event the workflow returned, with its time. The
// history a steward reads on the review page comes from here.
import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import type { Relation } from 'typeorm';
import { Submission } from './submission.entity';
import { User } from './user.entity';

@Entity({ name: 'submission_events' })
@Index('IDX_submission_events_submission', ['submissionId', 'createdAt'])
export class SubmissionEvent {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'submission_id', type: 'uuid' })
  submissionId!: string;

  @ManyToOne(() => Submission, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'submission_id' })
  submission?: Relation<Submission>;

  @Column({ name: 'from_state', type: 'varchar', length: 20, nullable: true })
  fromState!: string | null;

  @Column({ name: 'to_state', type: 'varchar', length: 20 })
  toState!: string;

  @Column({ type: 'varchar', length: 30 })
  action!: string;

  @Column({ name: 'actor_id', type: 'uuid', nullable: true })
  actorId!: string | null;

  @ManyToOne(() => User, { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'actor_id' })
  actor?: Relation<User> | null;

  @Column({ type: 'text', nullable: true })
  note!: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;
}
