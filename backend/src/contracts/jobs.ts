// Wire contract of a background job's progress (docs/api.md, "Background jobs").
import { z } from 'zod';
import { uuidSchema } from './common';

export const jobStates = ['queued', 'running', 'completed', 'failed'] as const;
export type JobState = (typeof jobStates)[number];

export const jobParamsSchema = z.object({ id: uuidSchema });

export interface JobProgressWire {
  id: string;
  queue: string;
  state: JobState;
  /** Items the job will handle, once it knows; null until then. */
  total: number | null;
  done: number;
  failed: number;
  error: string | null;
  createdAt: string;
  updatedAt: string;
  finishedAt: string | null;
}
