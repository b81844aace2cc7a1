// Wire contracts for rulebooks, ruleset versions and checks (docs/api.md, "Rulesets and checks").
// The specification itself is the shared schema of contracts/specification.ts, so its field
// errors come back as `specification.members.0.wallMm` and the like.
import { z } from 'zod';
import type { CheckReport } from './report';
import type { RulesetDocument } from './ruleset';
import { specificationSchema, type Specification } from './specification';
import { unitSystemSchema, uuidSchema } from './common';

export const rulesetVersionParamsSchema = z.object({ versionId: uuidSchema });
export const checkRunParamsSchema = z.object({ id: uuidSchema });
/** A code as typed from a PDF: cleaned and read by domain/review/verification-code.ts. */
export const checkRunCodeParamsSchema = z.object({ code: z.string().max(200, 'At most 200 characters') });

export const classIdSchema = z
  .string('Must be text')
  .trim()
  .min(1, 'Required')
  .max(60, 'At most 60 characters')
  .regex(/^[A-Za-z0-9_.-]+$/, 'Letters, digits, "_", "-" and "." only');

export const dryRunBodySchema = z
  .object({
    rulesetVersionId: uuidSchema,
    classId: classIdSchema,
    specification: specificationSchema,
    /** Units for the report's reason texts; the numbers stay canonical. Default: the rulebook's own. */
    unitSystem: unitSystemSchema.optional(),
  })
  .superRefine((body, ctx) => {
    // The specification names its class too; checking it against another would mislead.
    if (body.specification.vehicle.classId !== body.classId) {
      ctx.addIssue({
        code: 'custom',
        path: ['specification', 'vehicle', 'classId'],
        message: `Must be the class being checked ("${body.classId}")`,
      });
    }
  });
export type DryRunBody = z.infer<typeof dryRunBodySchema>;

/** 'published' is the edition in force; 'scheduled' was published ahead of its effective date. */
export const rulesetStatusSchema = z.enum(['draft', 'scheduled', 'published', 'superseded', 'retired']);
export type RulesetStatusWire = z.infer<typeof rulesetStatusSchema>;

export interface RulesetClassWire {
  id: string;
  name: string;
  weightBasis: 'with_driver' | 'without_driver';
}

export interface RulesetVersionSummaryWire {
  id: string;
  rulebookId: string;
  versionNumber: number;
  status: RulesetStatusWire;
  edition: string;
  /** YYYY-MM-DD */
  effectiveDate: string;
  publishedAt: string | null;
  classes: RulesetClassWire[];
  requirementCount: number;
}

export interface RulebookWire {
  id: string;
  clubId: string;
  slug: string;
  title: string;
  publisher: string;
  createdAt: string;
  /** Newest first; drafts only for the club's admins. */
  versions: RulesetVersionSummaryWire[];
}

export interface RulebooksListWire {
  rulebooks: RulebookWire[];
}

export interface RulesetVersionWire extends RulesetVersionSummaryWire {
  rulebook: { id: string; clubId: string; slug: string; title: string; publisher: string };
  document: RulesetDocument;
  lockVersion: number;
  createdAt: string;
  updatedAt: string;
}

export interface DryRunWire {
  report: CheckReport;
}

export interface CheckRunWire {
  id: string;
  rulesetVersionId: string;
  classId: string;
  specification: Specification;
  report: CheckReport;
  overallVerdict: CheckReport['verdict'];
  createdBy: { id: string; displayName: string } | null;
  createdAt: string;
  buildSheetRevisionId: string | null;
  verificationCode: string;
}
