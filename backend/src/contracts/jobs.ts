// Wire contract of a background job's progress (docs/api.md, "Background jobs").
import { z } from 'zod';
import { uuidSchema } from './common';
import type { ImpactWire } from './rulebook-admin';

// `retrying`: an attempt failed (its reason in `error`) and another is coming; `failed` is final until an
// admin runs the job again (POST /api/jobs/:id/retry).
export const jobStates = ['queued', 'running', 'retrying', 'completed', 'failed'] as const;
export type JobState = (typeof jobStates)[number];

export const jobParamsSchema = z.object({ id: uuidSchema });

/** What a finished job produced, by kind of job; null until it completes. */
export type JobResultWire =
  | { kind: 'impact'; impact: ImpactWire }
  | { kind: 'recheck'; checked: number; failed: number; changed: number; mailed: number };

export interface JobProgressWire {
  id: string;
  queue: string;
  state: JobState;
  /** Items the job will handle, once it knows; null until then. */
  total: number | null;
  done: number;
  failed: number;
  error: string | null;
  /** How many times a worker started it (a retry or a resumed run counts again). */
  attempts: number;
  createdAt: string;
  updatedAt: string;
  finishedAt: string | null;
  /** The outcome, once the job has completed (the impact summary, a re-check's counts). */
  result: JobResultWire | null;
}
