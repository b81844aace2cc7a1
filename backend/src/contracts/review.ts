// The wire of reviews, cage records and verification (docs/api.md, "Review and cage records"): zod
// schemas for what comes in, and the shapes that go out. Shared with the front end.
import { z } from 'zod';
import { NOTE_MAX, REVOKE_REASON_MAX, WAIVER_REASON_MAX } from './review-limits';
import type { CheckReport } from './report';
import type { DiffChangeWire, PhotoWire } from './garage';
import type { Specification } from './specification';
import { uuidSchema } from './common';

export const SUBMISSION_STATES = ['pending', 'in_review', 'approved', 'changes_requested', 'rejected', 'withdrawn'] as const;
export type SubmissionStateWire = (typeof SUBMISSION_STATES)[number];
export const RECORD_STATUSES = ['valid', 'expired', 'superseded', 'revoked'] as const;
export type RecordStatusWire = (typeof RECORD_STATUSES)[number];

const noteText = z.string('Must be text').max(NOTE_MAX, `At most ${NOTE_MAX.toLocaleString('en-GB')} characters`);
const expectedSchema = z.object({
  state: z.enum(SUBMISSION_STATES, 'Must be a submission state'),
  version: z.number('Must be a number').int('Must be a whole number').positive('Must be positive'),
}).strict();

export const submissionParamsSchema = z.object({ submissionId: uuidSchema });
export const recordParamsSchema = z.object({ recordId: uuidSchema });
export const clubParamsSchema = z.object({ clubId: uuidSchema });

export const submitBodySchema = z.object({ checkRunId: uuidSchema, note: noteText.optional() }).strict();
export type SubmitBody = z.infer<typeof submitBodySchema>;

export const resubmitBodySchema = z.object({ checkRunId: uuidSchema, note: noteText.optional(), expected: expectedSchema }).strict();
export type ResubmitBody = z.infer<typeof resubmitBodySchema>;

const findingKeySchema = z.string('Must be a finding key').min(1, 'Must be a finding key').max(200, 'At most 200 characters');

/** The steward's and builder's actions; the workflow checks notes and reasons itself, with its own words. */
export const actionBodySchema = z.discriminatedUnion('type', [
  z.object({ type: z.literal('claim'), expected: expectedSchema }).strict(),
  z.object({ type: z.literal('release'), expected: expectedSchema, note: noteText.optional() }).strict(),
  z.object({ type: z.literal('waive'), expected: expectedSchema, findingKey: findingKeySchema, reason: z.string('Give the reason for the waiver').max(WAIVER_REASON_MAX, `At most ${WAIVER_REASON_MAX.toLocaleString('en-GB')} characters`) }).strict(),
  z.object({ type: z.literal('remove_waiver'), expected: expectedSchema, findingKey: findingKeySchema }).strict(),
  z.object({ type: z.literal('approve'), expected: expectedSchema, note: noteText.optional() }).strict(),
  z.object({ type: z.literal('request_changes'), expected: expectedSchema, note: noteText }).strict(),
  z.object({ type: z.literal('reject'), expected: expectedSchema, reason: noteText }).strict(),
  z.object({ type: z.literal('withdraw'), expected: expectedSchema, note: noteText.optional() }).strict(),
], 'Must be one of claim, release, waive, remove_waiver, approve, request_changes, reject, withdraw');
export type ActionBody = z.infer<typeof actionBodySchema>;

export const annotationBodySchema = z.object({
  findingKey: findingKeySchema,
  text: z.string('Must be text').trim().min(1, 'Write the note').max(2000, 'At most 2,000 characters'),
}).strict();
export type AnnotationBody = z.infer<typeof annotationBodySchema>;

export const QUEUE_SORTS = ['oldest', 'newest', 'car'] as const;
export const QUEUE_AGES = ['any', 'over_3_days', 'over_7_days', 'over_14_days'] as const;
export const queueQuerySchema = z.object({
  state: z.union([z.enum(SUBMISSION_STATES), z.literal('open'), z.literal('all')], 'Must be a state, open or all').default('open'),
  classId: z.string().min(1).max(60).optional(),
  age: z.enum(QUEUE_AGES, 'Must be any, over_3_days, over_7_days or over_14_days').default('any'),
  assigned: z.enum(['anyone', 'me'], 'Must be anyone or me').default('anyone'),
  sort: z.enum(QUEUE_SORTS, 'Must be oldest, newest or car').default('oldest'),
}).strict();
export type QueueQuery = z.infer<typeof queueQuerySchema>;

export const mySubmissionsQuerySchema = z.object({ checkRunId: uuidSchema.optional() }).strict();

export const revokeBodySchema = z.object({ reason: z.string('Give the reason').max(REVOKE_REASON_MAX, `At most ${REVOKE_REASON_MAX.toLocaleString('en-GB')} characters`) }).strict();

export const recordSettingsBodySchema = z.object({
  recordPrefix: z.string('Must be text').trim().toUpperCase().regex(/^[A-Z][A-Z0-9]{1,5}$/, '2 to 6 letters or digits, starting with a letter').optional(),
  validityMonths: z.number('Must be a number').int('Whole months').min(1, 'At least 1 month').max(120, 'At most 120 months').optional(),
}).strict().refine((b) => b.recordPrefix !== undefined || b.validityMonths !== undefined, { message: 'Change at least one setting' });
export type RecordSettingsBody = z.infer<typeof recordSettingsBodySchema>;

export const reviewMailBodySchema = z.object({ enabled: z.boolean('Must be true or false') }).strict();

// No length rule: every code that names no record must get the same 404, never a 400.
export const verifyParamsSchema = z.object({ code: z.string() });

export interface PersonWire {
  id: string;
  displayName: string;
}

export interface WaiverWire {
  findingKey: string;
  reason: string;
  steward: PersonWire | null;
}

export interface QueueItemWire {
  id: string;
  state: SubmissionStateWire;
  version: number;
  car: { id: string; name: string; raceNumber: string | null };
  builder: PersonWire;
  classId: string;
  className: string;
  /** The check run's own verdict, before any waiver. */
  verdict: CheckReport['verdict'];
  /** The verdict with the steward's waivers counted, and how many findings are waived. */
  reviewVerdict: 'pass' | 'pass_with_waivers' | 'fail' | 'needs_information';
  waivedCount: number;
  assignedSteward: PersonWire | null;
  isResubmission: boolean;
  /** Set when the builder answered a request for changes with a resubmission (then it is not open). */
  resubmittedAsId: string | null;
  createdAt: string;
  updatedAt: string;
}

export interface QueueWire {
  items: QueueItemWire[];
  /** Per state; `changes_requested` leaves out the requests answered by a resubmission. */
  counts: Record<SubmissionStateWire, number>;
  classes: { id: string; name: string }[];
}

export interface SubmissionEventWire {
  from: SubmissionStateWire | null;
  to: SubmissionStateWire;
  action: string;
  actor: PersonWire | null;
  note: string | null;
  createdAt: string;
}

export interface AnnotationWire {
  id: string;
  findingKey: string;
  text: string;
  author: PersonWire | null;
  createdAt: string;
}

export interface CageRecordWire {
  id: string;
  number: string;
  status: RecordStatusWire;
  car: { id: string; name: string; raceNumber: string | null };
  classId: string;
  className: string;
  rulebookTitle: string;
  edition: string;
  steward: PersonWire | null;
  issuedAt: string;
  expiresAt: string;
  /** The date it is valid until, in the club's time zone (YYYY-MM-DD): what every screen shows. */
  expiresOn: string;
  revokedAt: string | null;
  revokedReason: string | null;
  supersededAt: string | null;
  verificationCode: string;
  verificationUrl: string;
  submissionId: string;
  canRevoke: boolean;
}

export interface HistoryItemWire {
  id: string;
  state: SubmissionStateWire;
  /** Findings the steward waived (an approval reads "Approved with N waivers"). */
  waivedCount: number;
  resubmittedAsId: string | null;
  createdAt: string;
  decidedAt: string | null;
  decisionNote: string | null;
  revisionNumber: number | null;
  recordNumber: string | null;
}

export interface ChangesSinceWire {
  previousSubmissionId: string;
  previousDecisionNote: string | null;
  fromRevision: number | null;
  toRevision: number | null;
  changes: DiffChangeWire[];
  /** Sentences from the rulebook diff when the ruleset version changed; empty otherwise. */
  rulesetChanges: string[];
  rulesetChanged: boolean;
}

export interface SubmissionPermissionsWire {
  claim: boolean;
  release: boolean;
  decide: boolean;
  withdraw: boolean;
  resubmit: boolean;
  annotate: boolean;
}

export interface SubmissionDetailWire {
  id: string;
  state: SubmissionStateWire;
  version: number;
  club: { id: string; name: string };
  car: { id: string; name: string; raceNumber: string | null; make: string | null; model: string | null; year: number | null };
  buildSheet: { id: string; name: string };
  builder: PersonWire;
  assignedSteward: PersonWire | null;
  builderNote: string | null;
  decisionNote: string | null;
  decidedAt: string | null;
  createdAt: string;
  updatedAt: string;
  previousSubmissionId: string | null;
  resubmittedAsId: string | null;
  checkRun: { id: string; verificationCode: string; createdAt: string; revisionNumber: number | null; report: CheckReport; specification: Specification };
  waivers: WaiverWire[];
  /** The verdict with waivers counted (domain/review/waivers.ts). */
  overall: { verdict: 'pass' | 'pass_with_waivers' | 'fail' | 'needs_information'; blocking: string[]; waivedCount: number };
  photos: PhotoWire[];
  events: SubmissionEventWire[];
  annotations: AnnotationWire[];
  history: HistoryItemWire[];
  changesSince: ChangesSinceWire | null;
  record: CageRecordWire | null;
  can: SubmissionPermissionsWire;
}

export interface MySubmissionWire {
  id: string;
  state: SubmissionStateWire;
  version: number;
  /** Findings the steward waived (an approval reads "Approved with N waivers"). */
  waivedCount: number;
  checkRunId: string;
  createdAt: string;
  decisionNote: string | null;
  resubmittedAsId: string | null;
}

export interface RecordSettingsWire {
  recordPrefix: string;
  validityMonths: number;
  /** False when the club has not saved settings and the defaults apply. */
  saved: boolean;
}

/**
 * What anyone may see for a check run's code: a pre-check of that date (the club's calendar date, in
 * `timeZone`: the club whose rulebook it was checked against), not a cage record.
 * No people, no photos; the car only when the run came from a build sheet.
 */
export interface CheckRunVerificationWire {
  checkedOn: string;
  /** The club's IANA time zone, which `checkedOn` is a date in. */
  timeZone: string;
  verdict: 'pass' | 'fail' | 'needs_information';
  className: string;
  rulebookTitle: string;
  edition: string;
  carName: string | null;
  raceNumber: string | null;
}

/** What anyone at the track may see: no people, no photos. */
export interface VerificationWire {
  recordNumber: string;
  clubName: string;
  carName: string;
  make: string | null;
  model: string | null;
  raceNumber: string | null;
  className: string;
  rulebookTitle: string;
  edition: string;
  status: RecordStatusWire;
  /** The record's expiry instant (ISO 8601) and its date in the club's time zone (YYYY-MM-DD). */
  expiresAt: string;
  expiresOn: string;
  /** The latest track inspection: its date in the club's time zone and seal number only (never who inspected). */
  lastInspection: { inspectedOn: string; sealNumber: string } | null;
}
