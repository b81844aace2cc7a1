// Wire contracts for the build journal (docs/api.md, "Build journal"): the stages of a cage's build
// per build sheet, each with a date, a note and photos of its own (their own limit, apart from the
// sheet's photos).
import { z } from 'zod';
import { uuidSchema } from './common';

/** Our stage names, in build order. */
export const JOURNAL_STAGES = ['cut_and_bent', 'fitted', 'tacked', 'fully_welded', 'finished'] as const;
export type JournalStage = (typeof JOURNAL_STAGES)[number];

export const JOURNAL_STAGE_LABELS: Readonly<Record<JournalStage, string>> = {
  cut_and_bent: 'Cut and bent',
  fitted: 'Fitted in the car',
  tacked: 'Tacked',
  fully_welded: 'Fully welded',
  finished: 'Finished',
};

export const JOURNAL_STAGE_HINTS: Readonly<Record<JournalStage, string>> = {
  cut_and_bent: 'Tubes cut to length, bent and coped, ready to offer up.',
  fitted: 'Every tube in place in the car, clamped, with the gaps checked.',
  tacked: 'Held by tack welds only, so it can still be cut and moved.',
  fully_welded: 'Every joint welded all round.',
  finished: 'Cleaned, painted or coated, padding fitted: ready for inspection.',
};

export const JOURNAL_LIMITS = { photosPerSheet: 60, photosPerStage: 12, noteChars: 2000 } as const;

export const journalEntryParamsSchema = z.object({ entryId: uuidSchema });
export const journalPhotoParamsSchema = z.object({ photoId: uuidSchema });

const DAY_MS = 24 * 3600 * 1000;

/** Why a text is not a stage date: YYYY-MM-DD that exists, from 1950 on, not after tomorrow (time zones). */
export function journalDateProblem(s: string, now = Date.now()): string | null {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(s)) return 'A date as YYYY-MM-DD';
  const d = new Date(`${s}T00:00:00Z`);
  if (Number.isNaN(d.getTime()) || d.toISOString().slice(0, 10) !== s) return 'Not a date in the calendar';
  if (s < '1950-01-01') return 'A date from 1950 on';
  if (d.getTime() > now + DAY_MS) return 'A stage cannot be dated in the future';
  return null;
}

/** One message per bad date (the first problem), at the date's own path. */
export const journalDateSchema = z.string('A date as YYYY-MM-DD').superRefine((s, ctx) => {
  const problem = journalDateProblem(s);
  if (problem) ctx.addIssue({ code: 'custom', message: problem });
});

const noteSchema = z.string('Must be text').trim().max(JOURNAL_LIMITS.noteChars, `At most ${JOURNAL_LIMITS.noteChars} characters`);

export const createJournalEntryBodySchema = z
  .object({
    stage: z.enum(JOURNAL_STAGES, `Must be one of ${JOURNAL_STAGES.join(', ')}`),
    happenedOn: journalDateSchema,
    note: noteSchema.default(''),
  })
  .strict();
export type CreateJournalEntryBody = z.infer<typeof createJournalEntryBodySchema>;
export type CreateJournalEntryInput = z.input<typeof createJournalEntryBodySchema>;

export const updateJournalEntryBodySchema = z
  .object({ happenedOn: journalDateSchema.optional(), note: noteSchema.optional() })
  .strict()
  .refine((b) => Object.keys(b).length > 0, 'Change at least one field');
export type UpdateJournalEntryBody = z.infer<typeof updateJournalEntryBodySchema>;

export const updateJournalPhotoBodySchema = z
  .object({ caption: z.string('Must be text').trim().max(300, 'At most 300 characters') })
  .strict();
export type UpdateJournalPhotoBody = z.infer<typeof updateJournalPhotoBodySchema>;

export interface JournalPhotoWire {
  id: string;
  entryId: string;
  caption: string;
  widthPx: number;
  heightPx: number;
  createdAt: string;
  imageUrl: string;
  thumbnailUrl: string;
}

export interface JournalEntryWire {
  id: string;
  buildSheetId: string;
  stage: JournalStage;
  happenedOn: string;
  note: string;
  createdBy: { id: string; displayName: string } | null;
  createdAt: string;
  updatedAt: string;
  photos: JournalPhotoWire[];
}

export interface JournalWire {
  sheetId: string;
  /** Entries in build order (stage order). */
  entries: JournalEntryWire[];
  stages: { stage: JournalStage; label: string; hint: string }[];
  limits: typeof JOURNAL_LIMITS;
  photoCount: number;
  canEdit: boolean;
  caution: string;
}
