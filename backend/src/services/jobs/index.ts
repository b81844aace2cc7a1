// Background jobs (pg-boss) and their progress rows.
export {
  createJobs,
  type Jobs,
  type JobHandler,
  type JobContext,
  type ProgressReporter,
  type SendOptions,
  type JobsOptions,
  type QueueOptions,
  defaultQueueOptions,
  JobSupersededError,
  FinalJobError,
} from './jobs';
export {
  createJobProgressReader,
  createJobProgressStore,
  type JobProgress,
  type JobProgressReader,
  type JobProgressStore,
  type SqlQuery,
  type JobControl,
} from './progress';
