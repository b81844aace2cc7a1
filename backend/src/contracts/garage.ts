// Wire contracts of the builder's garage (docs/api.md, "Garage"): cars, build sheets with their
// revisions and diffs, photos, check runs and tube data. Canonical units only; clients format them.
import { z } from 'zod';
import type { Dimension } from '../domain/units.js';
import type { MemberKind } from '../domain/vocabulary.js';
import { CHASSIS_TYPES } from '../domain/vocabulary.js';
import { uuidSchema } from './common.js';
import type { CheckRunWire } from './checks.js';
import type { memberTubeDataSchema } from './report.js';
import { specificationSchema } from './specification.js';

export const PHOTO_AREAS = ['tubes', 'members', 'geometry', 'mounting', 'padding', 'welding', 'general'] as const;
export type PhotoArea = (typeof PHOTO_AREAS)[number];

export const PHOTO_LIMITS = { filesPerRequest: 10, bytesPerFile: 15 * 1024 * 1024, photosPerSheet: 60, captionChars: 300 } as const;

const optionalText = (max: number) =>
  z
    .string('Must be text')
    .trim()
    .max(max, `At most ${max} characters`)
    .transform((v) => (v === '' ? null : v))
    .nullable()
    .optional();
const requiredName = z.string('Must be text').trim().min(1, 'Must not be empty').max(120, 'At most 120 characters');
const classIdSchema = z.string('Must be text').trim().min(1, 'Required').max(60, 'At most 60 characters');

// ---------------------------------------------------------------- cars

export const carParamsSchema = z.object({ carId: uuidSchema });

const carFields = {
  name: requiredName,
  make: optionalText(80),
  model: optionalText(80),
  year: z.number('Must be a year').int('Must be a whole year').min(1900, 'Must be 1900 or later').max(2100, 'Must be 2100 or earlier').nullable().optional(),
  chassisType: z.enum(CHASSIS_TYPES, 'Must be unibody or tube_frame'),
  raceNumber: optionalText(10),
};

export const createCarBodySchema = z.object(carFields).strict();
export type CreateCarBody = z.infer<typeof createCarBodySchema>;

export const updateCarBodySchema = z
  .object({ ...carFields, name: requiredName.optional(), chassisType: carFields.chassisType.optional() })
  .strict()
  .refine((b) => Object.keys(b).length > 0, 'Change at least one field');
export type UpdateCarBody = z.infer<typeof updateCarBodySchema>;

export const listQuerySchema = z.object({
  /** `active` (default) hides archived things, `archived` shows only those, `all` both. */
  show: z.enum(['active', 'archived', 'all'], 'Must be active, archived or all').default('active'),
});
export type ListQuery = z.infer<typeof listQuerySchema>;

export type SheetVerdict = 'pass' | 'fail' | 'needs_information';

/**
 * Where a sheet stands with the club's stewards: its latest submission (sent, being reviewed, changes
 * asked, approved, rejected, withdrawn) and the newest cage record issued for it, with its status now.
 */
export interface SheetReviewWire {
  submissionId: string;
  state: 'pending' | 'in_review' | 'approved' | 'changes_requested' | 'rejected' | 'withdrawn';
  /** The revision that was submitted. */
  revisionNumber: number | null;
  /** The verdict with the steward's waivers counted, and how many findings were waived. */
  verdict: 'pass' | 'pass_with_waivers' | 'fail' | 'needs_information';
  waivedCount: number;
  sentAt: string;
  decidedAt: string | null;
  record: {
    id: string;
    number: string;
    status: 'valid' | 'expired' | 'superseded' | 'revoked';
    expiresAt: string;
    /** The date it is valid until, in the club's time zone (YYYY-MM-DD). */
    expiresOn: string;
    submissionId: string;
    waivedCount: number;
    /** The revision the approved check ran on. */
    revisionNumber: number | null;
  } | null;
}

export interface SheetSummaryWire {
  id: string;
  name: string;
  club: { id: string; name: string };
  classId: string;
  currentRevision: number;
  archivedAt: string | null;
  latestCheckRunId: string | null;
  latestVerdict: SheetVerdict | null;
  /** The revision the latest check ran on; when below currentRevision the verdict is out of date. */
  latestCheckedRevision: number | null;
  updatedAt: string;
  /** Null until the sheet is first submitted for review. */
  review: SheetReviewWire | null;
}

export interface CarWire {
  id: string;
  name: string;
  make: string | null;
  model: string | null;
  year: number | null;
  chassisType: (typeof CHASSIS_TYPES)[number];
  raceNumber: string | null;
  archivedAt: string | null;
  createdAt: string;
  updatedAt: string;
  buildSheets: SheetSummaryWire[];
}

// ---------------------------------------------------------------- build sheets

export const sheetParamsSchema = z.object({ sheetId: uuidSchema });

export const createSheetBodySchema = z
  .object({
    name: requiredName,
    clubId: uuidSchema,
    rulesetVersionId: uuidSchema,
    classId: classIdSchema,
    /** The first revision; an empty specification (no members yet) when left out. */
    specification: z.unknown().optional(),
  })
  .strict();
export type CreateSheetBody = z.infer<typeof createSheetBodySchema>;

export const updateSheetBodySchema = z.object({ name: requiredName }).strict();

export const saveRevisionBodySchema = z
  .object({
    baseRevision: z.number('Must be a revision number').int().min(1),
    rulesetVersionId: uuidSchema,
    classId: classIdSchema,
    // Parsed with the specification schema separately so its paths read `specification.members.0.wallMm`.
    specification: z.unknown(),
  })
  .strict();
export type SaveRevisionBody = z.infer<typeof saveRevisionBodySchema>;

export { specificationSchema };

export const revisionParamsSchema = z.object({ sheetId: uuidSchema, number: z.coerce.number('Must be a revision number').int('Must be a revision number').min(1, 'Must be a revision number') });
/** Restore an earlier revision as the next one; `baseRevision` is the latest the caller has seen. */
export const restoreRevisionBodySchema = z.object({ baseRevision: z.number('Must be a revision number').int('Must be a revision number').min(1, 'Must be a revision number') }).strict();

export const diffParamsSchema = z.object({
  sheetId: uuidSchema,
  from: z.coerce.number('Must be a revision number').int('Must be a revision number').min(1, 'Must be a revision number'),
  to: z.coerce.number('Must be a revision number').int('Must be a revision number').min(1, 'Must be a revision number'),
});

export interface RevisionSummaryWire {
  number: number;
  rulesetVersionId: string;
  classId: string;
  memberCount: number;
  createdAt: string;
  createdBy: { id: string; displayName: string } | null;
}

export interface RevisionWire extends RevisionSummaryWire {
  specification: unknown;
}

export interface CutListRowWire {
  odMm: number;
  wallMm: number;
  material: string;
  /** Members of this size, in specification order. */
  memberIds: string[];
  /** The same members by the builder's names (what a person reads). */
  memberNames: string[];
  /** Summed lengths of the members that have one. */
  totalLengthMm: number;
  massKg: number;
  massPerMetreKg: number;
  /** Members of this size without a length (not in the totals). */
  membersWithoutLength: string[];
  namesWithoutLength: string[];
}

export interface TubeDataWire {
  members: MemberTubeDataWire[];
  cutList: CutListRowWire[];
  estimatedTubeMassKg: number;
  massComplete: boolean;
  membersWithoutLength: string[];
  /** The same members by the builder's names. */
  namesWithoutLength: string[];
}

export type SheetAccess = 'owner' | 'reviewer';

export interface BuildSheetWire {
  id: string;
  name: string;
  car: { id: string; name: string; make: string | null; model: string | null; year: number | null; raceNumber: string | null; chassisType: string };
  owner: { id: string; displayName: string };
  club: { id: string; name: string };
  rulebook: { id: string; title: string; edition: string; publisher: string };
  rulesetVersionId: string;
  classId: string;
  currentRevision: number;
  archivedAt: string | null;
  latestCheckRunId: string | null;
  latestVerdict: SheetVerdict | null;
  latestCheckedRevision: number | null;
  createdAt: string;
  updatedAt: string;
}

/** `GET /api/build-sheets/:sheetId` and the answer to a save. */
export interface BuildSheetDetailWire {
  buildSheet: BuildSheetWire;
  revision: RevisionWire;
  tubeData: TubeDataWire;
  /** What the caller may do: the owner edits; a club steward or admin reads. */
  access: SheetAccess;
}

// ---------------------------------------------------------------- editions of a sheet's rulebook

/** Moves a sheet to a newer edition as a new revision; `baseRevision` is the revision on screen. */
export const moveEditionBodySchema = z
  .object({
    baseRevision: z.number('Must be a revision number').int().min(1),
    rulesetVersionId: uuidSchema,
  })
  .strict();
export type MoveEditionBody = z.infer<typeof moveEditionBodySchema>;

export interface SheetEditionRefWire {
  versionId: string;
  versionNumber: number;
  edition: string;
  status: 'draft' | 'scheduled' | 'published' | 'superseded' | 'retired';
  /** YYYY-MM-DD, the club's calendar date. */
  effectiveDate: string;
}

/** A finding the newer edition gives that the sheet's own edition does not. */
export interface EditionFindingWire {
  requirementId: string;
  title: string;
  section: string;
  /** "main hoop mh", "plate p1", "whole car" */
  subject: string;
  verdict: 'fail' | 'needs_information';
}

/** `GET /api/build-sheets/:sheetId/editions`: the sheet's edition and the newest one of its rulebook. */
export interface SheetEditionsWire {
  pinned: SheetEditionRefWire;
  /** The edition in force now, when it is neither the pinned one nor the newest. */
  inForce: SheetEditionRefWire | null;
  /** The newest published or scheduled edition, when it is newer than the pinned one. */
  newer:
    | (SheetEditionRefWire & {
        /** The sheet's latest revision under its own edition and under the newer one (null: no such class there). */
        verdictNow: SheetVerdict;
        verdictUnder: SheetVerdict | null;
        classExists: boolean;
        className: string;
        /** What changed for the sheet's class, in the reader's units. */
        changes: string[];
        /** Findings that fail or lack a measurement only under the newer edition. */
        newFindings: EditionFindingWire[];
      })
    | null;
  rulebookTitle: string;
}

// ---------------------------------------------------------------- revision diff

export type DiffSection = 'vehicle' | 'members' | 'model' | 'geometry' | 'plates' | 'inspectionHoles' | 'padding' | 'welding';
export type DiffValue = number | string | boolean | null;

export interface DiffChangeWire {
  kind: 'added' | 'removed' | 'changed';
  section: DiffSection;
  /** The member or plate id, or the hole's position ("1"); null for vehicle-wide sections. */
  subjectId: string | null;
  /** "main hoop mh", "plate p1", "vehicle" */
  subjectLabel: string;
  /** Dotted field path inside the subject (`wallMm`, `bends.0.clrMm`); null for a whole subject. */
  field: string | null;
  fieldLabel: string | null;
  before: DiffValue;
  after: DiffValue;
  /** Canonical dimension of before/after so clients format them; null for text and flags. */
  dimension: Dimension | null;
  /** The change in words, in the caller's preferred units. */
  text: string;
}

export interface RevisionDiffWire {
  from: number;
  to: number;
  changes: DiffChangeWire[];
}

// ---------------------------------------------------------------- photos

export const photoParamsSchema = z.object({ photoId: uuidSchema });

const memberIdSchema = z.string().trim().max(40, 'At most 40 characters').regex(/^[A-Za-z0-9_.-]*$/, 'Letters, digits, "_", "-" and "." only');

/** One file's form fields (multipart sends text; empty means "none"). */
export const photoMetaSchema = z.object({
  caption: z.string().trim().max(PHOTO_LIMITS.captionChars, `At most ${PHOTO_LIMITS.captionChars} characters`).default(''),
  memberId: memberIdSchema.transform((v) => (v === '' ? null : v)).default(null),
  area: z.union([z.enum(PHOTO_AREAS, `Must be one of ${PHOTO_AREAS.join(', ')}`), z.literal('').transform(() => null)]).nullable().default(null),
});

export const updatePhotoBodySchema = z
  .object({
    caption: z.string('Must be text').trim().max(PHOTO_LIMITS.captionChars, `At most ${PHOTO_LIMITS.captionChars} characters`).optional(),
    memberId: memberIdSchema.min(1, 'Must not be empty').nullable().optional(),
    area: z.enum(PHOTO_AREAS, `Must be one of ${PHOTO_AREAS.join(', ')}`).optional(),
  })
  .strict()
  .refine((b) => Object.keys(b).length > 0, 'Change at least one field');
export type UpdatePhotoBody = z.infer<typeof updatePhotoBodySchema>;

export interface PhotoWire {
  id: string;
  buildSheetId: string;
  memberId: string | null;
  area: PhotoArea;
  caption: string;
  widthPx: number;
  heightPx: number;
  byteSize: number;
  createdAt: string;
  imageUrl: string;
  thumbnailUrl: string;
}

// ---------------------------------------------------------------- check runs

export const checkRunParamsSchema = z.object({ checkRunId: uuidSchema });

export const reportQuerySchema = z.object({
  /** Units of the PDF; default: the builder's preferred units. */
  units: z.enum(['imperial', 'metric'], 'Must be imperial or metric').optional(),
});

export interface CheckRunSummaryWire {
  id: string;
  buildSheetId: string;
  revisionNumber: number | null;
  rulesetVersionId: string;
  classId: string;
  verdict: SheetVerdict;
  verificationCode: string | null;
  createdAt: string;
}

/** A saved check run of a sheet (the checks contract's run, plus where it came from). */
export type SheetCheckRunWire = CheckRunWire & { buildSheetId: string; revisionNumber: number };

export type MemberTubeDataWire = z.infer<typeof memberTubeDataSchema>;
export type { MemberKind };
