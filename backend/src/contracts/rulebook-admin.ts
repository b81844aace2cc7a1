// Wire contracts of rulebook administration (docs/api.md, "Rulebook administration"): drafts,
// autosave with lock versions, compare, impact, publish, retire, import and export.
import { z } from 'zod';
import type { DocumentProblem } from './ruleset';
import { uuidSchema } from './common';

export const rulebookParamsSchema = z.object({ rulebookId: uuidSchema });
export const draftParamsSchema = z.object({ versionId: uuidSchema });
export const compareParamsSchema = z.object({ versionId: uuidSchema, otherId: uuidSchema });

const lockVersionSchema = z.number('Must be a number').int('Must be a whole number').min(1, 'Must be at least 1');
const dateSchema = z.string('Must be a date').regex(/^\d{4}-\d{2}-\d{2}$/, 'Must be a date written YYYY-MM-DD');

/** An autosave: the whole document (drafts may be incomplete) and the lock version it was based on. */
export const saveDraftBodySchema = z.object({
  lockVersion: lockVersionSchema,
  // Shape is checked by validateRulesetDocument and reported as problems; a draft may be unfinished.
  document: z.record(z.string(), z.unknown(), 'Must be a JSON object'),
});
export type SaveDraftBody = z.infer<typeof saveDraftBodySchema>;

/**
 * An import: the file's text as it was read, so bad JSON can be named precisely. The contract unpacks
 * it, so the boundary's text check also sees what the text carries (`text.requirements.0.section`).
 */
const fileTextSchema = z
  .string('Must be the file text')
  .min(1, 'The file is empty')
  .max(90_000, 'The file is larger than 90 kB')
  .transform((text, ctx): unknown => {
    try {
      return JSON.parse(text) as unknown;
    } catch (err) {
      ctx.addIssue({ code: 'custom', message: `The file is not valid JSON: ${(err as Error).message}` });
      return z.NEVER;
    }
  });

export const importDraftBodySchema = z.object({
  lockVersion: lockVersionSchema,
  text: fileTextSchema,
});
export type ImportDraftBody = z.infer<typeof importDraftBodySchema>;

const nameText = (what: string) =>
  z.string(`Must be the ${what}`).trim().min(1, `Give the ${what}`).max(200, 'At most 200 characters');

/**
 * A new rulebook: blank (a first class and an empty tube table to fill in, in the units chosen), or
 * from a ruleset file, which must be a valid document (its rulebook block names the book).
 */
export const createRulebookBodySchema = z.discriminatedUnion(
  'start',
  [
    z.object({
      start: z.literal('blank'),
      title: nameText('title'),
      publisher: nameText('publisher'),
      edition: nameText('edition name'),
      unitSystem: z.enum(['imperial', 'metric'], 'Must be imperial or metric'),
    }),
    z.object({ start: z.literal('file'), text: fileTextSchema }),
  ],
  { error: 'Must be "blank" or "file"' },
);
export type CreateRulebookBody = z.infer<typeof createRulebookBodySchema>;

export const publishBodySchema = z.object({ lockVersion: lockVersionSchema, effectiveDate: dateSchema });
export type PublishBody = z.infer<typeof publishBodySchema>;

export type Verdict = 'pass' | 'fail' | 'needs_information';

export interface SavedDraftWire {
  lockVersion: number;
  updatedAt: string;
  /** What still stops publishing (empty: publishable). */
  problems: DocumentProblem[];
}

export interface DraftConflictDetails {
  currentLockVersion: number;
  currentDocument: unknown;
  currentUpdatedAt: string;
}

export interface ImpactSheetWire {
  buildSheetId: string;
  sheetName: string;
  carName: string;
  builder: { id: string; displayName: string };
  classId: string;
  before: Verdict | null;
  after: Verdict;
}

export interface ImpactWire {
  versionId: string;
  /** The draft's lock version the impact was worked out for: a later save makes it out of date. */
  lockVersion: number;
  /** Classes the changes touch; sheets of other classes are not re-checked. */
  classIds: string[];
  checked: number;
  /** Sheets that could not be evaluated (counted, not listed). */
  failed: number;
  counts: { passToFail: number; failToPass: number; unchanged: number; needsInformationChanged: number; otherChanged: number };
  /** Sheets whose verdict changes (unchanged ones are only counted). */
  changed: ImpactSheetWire[];
}

export interface PublishedWire {
  versionId: string;
  jobId: string | null;
  classIds: string[];
  /** In force at once ('published'), or 'scheduled' until its effective date in the club's time zone. */
  status: 'published' | 'scheduled';
  effectiveDate: string;
}
