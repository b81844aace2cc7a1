// The wire of the club's records page and of track inspections (docs/api.md, "Review and cage
// records"): zod schemas for what comes in and the shapes that go out. Shared with the front end.
import { z } from 'zod';
import type { RecordShownKey, RecordStatusKey } from './record-words';
import type { PersonWire } from './review';

export const RECORD_FILTERS = ['all', 'valid', 'expiring_soon', 'expired', 'superseded', 'revoked'] as const;
export type RecordFilterWire = (typeof RECORD_FILTERS)[number];

export const recordListQuerySchema = z.object({
  /** Part of a record number, a car's name, make or model, or a race number. */
  q: z.string('Must be text').trim().max(80, 'At most 80 characters').optional(),
  status: z.enum(RECORD_FILTERS, 'Must be all, valid, expiring_soon, expired, superseded or revoked').default('all'),
  page: z.coerce.number('Must be a number').int('Must be a whole number').min(1, 'At least 1').default(1),
  pageSize: z.coerce.number('Must be a number').int('Must be a whole number').min(1, 'At least 1').max(100, 'At most 100').default(20),
}).strict();
export type RecordListQuery = z.infer<typeof recordListQuerySchema>;

export interface RecordListItemWire {
  id: string;
  number: string;
  status: RecordStatusKey;
  /** Valid and expiring within EXPIRY_NOTICE_DAYS. */
  expiringSoon: boolean;
  /** Whole days until expiry (negative once expired). */
  daysLeft: number;
  car: { id: string; name: string; make: string | null; model: string | null; raceNumber: string | null };
  className: string;
  issuedAt: string;
  expiresAt: string;
  /** The date it is valid until, in the club's time zone (YYYY-MM-DD): what every screen shows. */
  expiresOn: string;
  /** The latest track inspection, if any. */
  lastInspection: { inspectedAt: string; sealNumber: string } | null;
}

export interface RecordListWire {
  items: RecordListItemWire[];
  total: number;
  page: number;
  pageSize: number;
  /** Per filter, over the whole club (not the search): the filter buttons' numbers. */
  counts: Record<RecordShownKey, number>;
}

/** The least and most a sonic wall reading may be (mm): common practice, catching unit slips (×10, ×25.4). */
export const INSPECTION_LIMITS = { readings: 60, sealMax: 40, noteMax: 2000 } as const;

const readingSchema = z.object({
  memberId: z.string('Must be a member id').min(1, 'Must be a member id').max(60, 'At most 60 characters'),
  /** Canonical millimetres; the form reads what was typed with the shared typed-number reader. */
  wallMm: z.number('Must be a number').finite('Must be a number'),
}).strict();

export const inspectionBodySchema = z.object({
  /** When the inspection was made; absent: now. */
  inspectedAt: z.iso.datetime({ offset: true, error: 'A date and time (ISO 8601)' }).optional(),
  sealNumber: z.string('Must be text').trim().min(1, 'Give the seal or sticker number').max(INSPECTION_LIMITS.sealMax, `At most ${INSPECTION_LIMITS.sealMax} characters`),
  readings: z.array(readingSchema, 'Must be a list of readings').max(INSPECTION_LIMITS.readings, `At most ${INSPECTION_LIMITS.readings} readings`).default([]),
  note: z.string('Must be text').trim().max(INSPECTION_LIMITS.noteMax, `At most ${INSPECTION_LIMITS.noteMax.toLocaleString('en')} characters`).optional(),
}).strict();
export type InspectionBody = z.infer<typeof inspectionBodySchema>;

export interface InspectionReadingWire {
  memberId: string;
  memberName: string;
  wallMm: number;
  /** The least wall the record's rulebook asks of the member, when the check named one. */
  minWallMm: number | null;
  belowMinimum: boolean;
}

export interface InspectionWire {
  id: string;
  steward: PersonWire | null;
  inspectedAt: string;
  sealNumber: string;
  readings: InspectionReadingWire[];
  note: string | null;
  createdAt: string;
}

/** A member of the approved sheet a reading can name, with the rulebook's least wall for it. */
export interface InspectionMemberWire {
  id: string;
  name: string;
  /** As specified on the approved sheet. */
  wallMm: number;
  minWallMm: number | null;
}

export interface InspectionsWire {
  inspections: InspectionWire[];
  members: InspectionMemberWire[];
  canRecord: boolean;
}
