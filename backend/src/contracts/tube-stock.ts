// Wire contracts for tube stock lists and the tube chooser (docs/api.md, "Tube stock and the tube
// chooser"). Canonical units on the wire: mm, MPa, kg/m, kg.
import { z } from 'zod';
import { MATERIALS, MEMBER_KINDS, PROCESSES } from '../domain/vocabulary';
import { tubeSizeProblems, MAX_PLAUSIBLE_OD_MM } from '../domain/tube';
import { uuidSchema } from './common';

export const stockTubeParamsSchema = z.object({ clubId: uuidSchema, tubeId: uuidSchema });
export const ownStockTubeParamsSchema = z.object({ tubeId: uuidSchema });

const optionalText = (max: number) =>
  z.string('Must be text').trim().max(max, `At most ${max} characters`).optional().transform((s) => (s === '' ? undefined : s));

const stockTubeFields = {
  label: optionalText(120),
  odMm: z.number('Must be a number').positive('Must be greater than zero').max(MAX_PLAUSIBLE_OD_MM, `At most ${MAX_PLAUSIBLE_OD_MM} mm`),
  wallMm: z.number('Must be a number').positive('Must be greater than zero').max(50, 'At most 50 mm'),
  material: z.enum(MATERIALS, `Must be one of ${MATERIALS.join(', ')}`),
  process: z.enum(PROCESSES, `Must be one of ${PROCESSES.join(', ')}`),
  grade: optionalText(60),
  yieldMpa: z.number('Must be a number').positive('Must be greater than zero').max(3000, 'At most 3000 MPa').optional(),
  yieldSource: optionalText(200),
};

/** A new stock size. A wall of half the OD or more is refused at `wallMm` (the tube would be solid). */
export const stockTubeBodySchema = z.object(stockTubeFields).strict().superRefine((t, ctx) => {
  for (const p of tubeSizeProblems(t)) if (p.field === 'wallMm' && t.wallMm > 0) ctx.addIssue({ code: 'custom', path: ['wallMm'], message: p.message });
});
export type StockTubeBody = z.infer<typeof stockTubeBodySchema>;
/** What a client sends (before trimming). */
export type StockTubeInput = z.input<typeof stockTubeBodySchema>;

/** A change to a stock size: any of the fields; the result must still be a possible tube. */
export const stockTubePatchSchema = z.object({
  ...stockTubeFields,
  odMm: stockTubeFields.odMm.optional(),
  wallMm: stockTubeFields.wallMm.optional(),
  material: stockTubeFields.material.optional(),
  process: stockTubeFields.process.optional(),
  // null clears an optional field.
  grade: stockTubeFields.grade.nullable(),
  yieldMpa: stockTubeFields.yieldMpa.nullable(),
  yieldSource: stockTubeFields.yieldSource.nullable(),
}).strict().refine((p) => Object.keys(p).length > 0, 'Change at least one field');
export type StockTubePatch = z.infer<typeof stockTubePatchSchema>;
export type StockTubePatchInput = z.input<typeof stockTubePatchSchema>;

export interface StockTubeWire {
  id: string;
  list: 'club' | 'mine';
  label: string;
  odMm: number;
  wallMm: number;
  material: (typeof MATERIALS)[number];
  process: (typeof PROCESSES)[number];
  grade: string | null;
  yieldMpa: number | null;
  yieldSource: string | null;
  /** From the common sizes (common practice), not typed by a person. */
  common: boolean;
  massPerMetreKg: number;
  updatedAt: string;
}

export interface StockListWire {
  tubes: StockTubeWire[];
  /** The caller may change this list. */
  canEdit: boolean;
}

export const tubeChoiceQuerySchema = z.object({
  /** Consider stock of every material, not only the member's own. */
  anyMaterial: z.enum(['true', 'false'], 'Must be true or false').optional().transform((v) => v === 'true'),
});

export interface RequirementRefWire {
  requirementId: string;
  title: string;
  section: string;
}

/** Another member changed with the choice so the sheet stays legal (a rule compares them). */
export interface CompanionWire {
  memberId: string;
  memberName: string;
  /** The rule it would fail with its own tube beside the new one. */
  because: RequirementRefWire;
  candidate: CandidateWire;
}

/** A member the choice would leave failing, with no stock size to put it right. */
export interface LeftFailingWire {
  memberId: string;
  memberName: string;
  requirement: RequirementRefWire;
}

export interface CandidateWire {
  /** The stock row; null for the sheet's current tube. */
  stockId: string | null;
  list: 'club' | 'mine' | 'sheet';
  label: string;
  odMm: number;
  wallMm: number;
  /** null: not stated on the sheet. */
  material: (typeof MATERIALS)[number] | null;
  process: (typeof PROCESSES)[number] | null;
  grade: string | null;
  yieldMpa: number | null;
  massPerMetreKg: number;
  status: 'legal' | 'fails' | 'undecided';
  /** Tube-table sizes it matched, e.g. "1.625 × 0.080 in". */
  matched: string[];
  /** The requirement that turned it away. */
  failing: { requirementId: string; title: string; section: string } | null;
  /** What would decide it (undecided). */
  missing: { fact: string; label: string; requirementIds: string[] }[];
  /** Wall readings on the sheet are taken to read this tube's catalogue wall. */
  assumesCatalogueWall: boolean;
  /** Members to change with it so the sheet stays legal (empty for most). */
  together: CompanionWire[];
  /** Members it would leave failing: such a size is never the lightest, and cannot be put on the sheet. */
  leavesFailing: LeftFailingWire[];
}

export interface MemberTubeChoiceWire {
  memberId: string;
  memberKind: (typeof MEMBER_KINDS)[number];
  label: string | null;
  /** The builder's name for the member (label, else the kind's words): what the page shows. */
  name: string;
  lengthMm: number | null;
  current: CandidateWire;
  lightest: CandidateWire | null;
  /** The next legal sizes after the lightest (at most 5). */
  alternatives: CandidateWire[];
  /** Lighter sizes that could be legal once something is known (at most 5). */
  undecided: CandidateWire[];
  legalCount: number;
  savingPerMetreKg: number | null;
  savingKg: number | null;
  /** With the companions of the lightest changed too, when every length involved is known. */
  savingTogetherKg: number | null;
}

export interface TubeChoiceWire {
  sheetId: string;
  revision: number;
  rulesetVersionId: string;
  classId: string;
  className: string;
  rulebook: { publisher: string; title: string; edition: string };
  stock: { club: number; mine: number };
  anyMaterial: boolean;
  members: MemberTubeChoiceWire[];
  /** Requirements the choice was judged against (tube-dependent ones for the sheet's class). */
  requirementsJudged: number;
  /** The caller may put a chosen size on the sheet (its builder, on a sheet that is not archived). */
  canApply: boolean;
  caution: string;
}

/** Put a stock size on a member (with the companions the choice needs) as the sheet's next revision. */
export const tubeChoiceApplySchema = z.object({
  /** The revision the chooser was read from; a sheet saved since is refused (409). */
  baseRevision: z.number('Must be a revision number').int('Must be a revision number').min(1, 'Must be a revision number'),
  memberId: z.string('Must be text').trim().min(1, 'Required').max(60, 'At most 60 characters'),
  stockId: uuidSchema,
  /** As the chooser was read: stock of any material may stand in for the companions. */
  anyMaterial: z.boolean('Must be true or false').default(false),
}).strict();
export type TubeChoiceApplyBody = z.infer<typeof tubeChoiceApplySchema>;
export type TubeChoiceApplyInput = z.input<typeof tubeChoiceApplySchema>;

export interface TubeChangeWire {
  memberId: string;
  memberName: string;
  from: { odMm: number; wallMm: number; material: (typeof MATERIALS)[number] | null; process: (typeof PROCESSES)[number] | null };
  to: { odMm: number; wallMm: number; material: (typeof MATERIALS)[number]; process: (typeof PROCESSES)[number]; label: string };
}

export interface TubeChoiceAppliedWire {
  /** The revision saved with the new tubes, and the one it was made from (to undo to). */
  revision: number;
  previousRevision: number;
  changes: TubeChangeWire[];
}

export const FABRICATION_CAUTION =
  'Cagewright gives a pre-check only; the sanctioning body’s inspector decides. Welding and fabrication belong to qualified people working under local rules. These numbers are an aid, not a substitute for measuring the car.';
