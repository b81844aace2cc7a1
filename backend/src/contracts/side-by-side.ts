// Wire contracts for one build sheet checked against several rulebooks at once (docs/api.md,
// "Several rulebooks side by side"). The matrix itself is the pure domain's (domain/compare/side-by-side.ts).
import { z } from 'zod';
import type { RulebookComparison } from '../domain/compare/side-by-side.js';
import { classIdSchema } from './checks.js';
import { unitSystemSchema, uuidSchema } from './common.js';

/** Columns besides the home one (the sheet's own rulebook, always first). */
export const SIDE_BY_SIDE_MAX_COLUMNS = 7;

export const sideBySideBodySchema = z
  .object({
    columns: z
      .array(z.object({ rulesetVersionId: uuidSchema, classId: classIdSchema }).strict())
      .min(1, 'Pick at least one rulebook besides the sheet’s own')
      .max(SIDE_BY_SIDE_MAX_COLUMNS, `At most ${SIDE_BY_SIDE_MAX_COLUMNS} rulebooks besides the sheet’s own`),
    /** Units for the summary line; default: the builder's preferred units. */
    unitSystem: unitSystemSchema.optional(),
  })
  .strict()
  .superRefine((body, ctx) => {
    const seen = new Set<string>();
    body.columns.forEach((c, i) => {
      if (seen.has(c.rulesetVersionId)) ctx.addIssue({ code: 'custom', path: ['columns', i, 'rulesetVersionId'], message: 'This rulebook is already a column' });
      seen.add(c.rulesetVersionId);
    });
  });
export type SideBySideBody = z.infer<typeof sideBySideBodySchema>;

export interface SideBySideClassWire {
  id: string;
  name: string;
}

/** A rulebook edition in force in one of the builder's clubs, with the class suggested for this sheet. */
export interface SideBySideOptionWire {
  rulesetVersionId: string;
  rulebookTitle: string;
  publisher: string;
  edition: string;
  effectiveDate: string;
  club: { id: string; name: string };
  classes: SideBySideClassWire[];
  /** The class with the sheet's class id, else its name, else the only class; null: the builder picks. */
  suggestedClassId: string | null;
}

export interface SideBySideHomeWire {
  rulesetVersionId: string;
  rulebookTitle: string;
  publisher: string;
  edition: string;
  club: { id: string; name: string };
  classId: string;
  className: string;
}

export interface SideBySideOptionsWire {
  home: SideBySideHomeWire;
  options: SideBySideOptionWire[];
}

export interface SideBySideColumnWire {
  rulesetVersionId: string;
  clubName: string;
}

export interface SideBySideWire {
  /** The matrix; `comparison.columns[i]` and `columns[i]` describe the same rulebook, home first. */
  comparison: RulebookComparison;
  columns: SideBySideColumnWire[];
  /** What would satisfy every rulebook at once, or that nothing in the listed sizes does. */
  line: string;
  revision: number;
}
