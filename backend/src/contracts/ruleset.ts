// The Cagewright ruleset document: a club's cage rules as data. Values are written in the
// rulebook's own units (`unitSystem`, or a per-value `unit`) and converted to canonical units once,
// when the document is compiled. Requirements use typed templates a non-programmer editor can show
// as tables, checklists and labelled numbers; `conditions` is the escape hatch for anything else.
// This file is the structural schema; `validateRulesetDocument` (domain/rules/validate.ts) adds the
// semantic checks (facts, operators, units, duplicate ids) and reports every problem with its path.
import { z } from 'zod';
import { MATERIALS, MEMBER_KINDS, PLATE_LOCATIONS, PROCESSES, WALL_METHODS } from '../domain/vocabulary.js';

export const RULESET_FORMAT_VERSION = 1;
export const RULESET_LIMITS = {
  classes: 50, requirements: 500, conditionDepth: 8, conditionLeaves: 200, bands: 20, rowsPerBand: 10,
  alternativesPerRow: 12, checks: 20, values: 50, equivalents: 50, textShort: 200, textLong: 4000,
} as const;

const L = RULESET_LIMITS;
const shortText = z.string().trim().min(1, 'Required').max(L.textShort, `At most ${L.textShort} characters`);
const longText = z.string().trim().max(L.textLong, `At most ${L.textLong} characters`);
const idText = z.string().trim().min(1, 'Required').max(60, 'At most 60 characters').regex(/^[A-Za-z0-9_.-]+$/, 'Letters, digits, "_", "-" and "." only');
const finite = z.number().refine(Number.isFinite, 'Must be a finite number');
const positive = finite.refine((x) => x > 0, 'Must be greater than zero');
const nonNegative = finite.refine((x) => x >= 0, 'Must not be negative');
/** Unit names are checked semantically (known unit, right dimension) so the message can say which. */
const unitName = z.string().min(1).max(10);

export const rulebookSchema = z.object({
  publisher: shortText,
  title: shortText,
  edition: shortText,
  effectiveDate: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'A date as YYYY-MM-DD'),
  url: z.string().url('A full URL').max(500).optional(),
});

export const classSchema = z.object({
  id: idText,
  name: shortText,
  weightBasis: z.enum(['with_driver', 'without_driver']),
  description: longText.optional(),
  /**
   * The class's listed weight (e.g. the GCR vehicle weight), in the document's mass unit or `unit`:
   * when given, tube-table bands and `vehicle.weightKg` use it instead of the measured weight.
   */
  listedWeight: z.object({ value: positive, unit: unitName.optional() }).optional(),
});

export const tubeSizeSchema = z.object({
  od: positive,
  wall: positive,
  /** Length unit of od and wall; default: the document's unit system. */
  unit: unitName.optional(),
});

export const printedEquivalentSchema = z.object({
  /** The size the rule sets. */
  size: tubeSizeSchema,
  /** The size the rulebook prints beside it as its equivalent (nominal, not exact: F-UNIT-2). */
  printedAs: tubeSizeSchema,
  note: longText.optional(),
});

export const STRENGTH_MEASURES = ['section_modulus', 'bending_strength'] as const;
export type StrengthMeasure = (typeof STRENGTH_MEASURES)[number];

/**
 * Equivalence by strength (docs/rulesets.md, "Tolerance and equivalence policy"): whether a tube that
 * is not a listed size passes a tube table when it is at least as strong as a listed size of its row,
 * and by which measure. Distinct from `acceptPrintedEquivalents`, which is about the rulebook's own
 * printed unit conversions. Omitted: not accepted, and a check only says so as advice.
 */
export const strengthEquivalentsSchema = z.object({
  /** true: an equivalent tube passes; false: the check says it would be equivalent, as advice only. */
  accept: z.boolean(),
  /** section_modulus: Z ≥ the listed size's Z; bending_strength: yield × Z ≥ listedYield × listed Z. */
  measure: z.enum(STRENGTH_MEASURES),
  /** The yield the listed sizes are taken at (e.g. the rulebook's minimum); needed by bending_strength. */
  listedYield: z.object({ value: positive, unit: unitName.optional() }).strict().optional(),
  /** The thinnest wall an equivalent may have, in the document's length unit or `unit`. */
  minWall: z.object({ value: positive, unit: unitName.optional() }).strict().optional(),
}).strict();
export type StrengthEquivalents = z.infer<typeof strengthEquivalentsSchema>;

export const tubeAlternativeSchema = tubeSizeSchema.extend({ label: shortText.optional() });

export const tubeRowSchema = z.object({
  /** Materials this row applies to; omitted = any material. */
  materials: z.array(z.enum(MATERIALS)).min(1).max(MATERIALS.length).optional(),
  /** Tube processes this row accepts; omitted = any process. */
  processes: z.array(z.enum(PROCESSES)).min(1).max(PROCESSES.length).optional(),
  /** The row counts only for cages approved before this date (YYYY-MM-DD), e.g. a legacy size. */
  approvedBefore: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'A date as YYYY-MM-DD').optional(),
  alternatives: z.array(tubeAlternativeSchema).min(1, 'List at least one size').max(L.alternativesPerRow),
});

export const weightBandSchema = z.object({
  label: shortText.optional(),
  /** Inclusive upper limit in the document's mass unit (or weightUnit); omitted on the last band. */
  upTo: positive.optional(),
  rows: z.array(tubeRowSchema).min(1).max(L.rowsPerBand),
});

export const THIN_WALL_READINGS = ['smallest_listed', 'largest_listed'] as const;

/** A wall tolerance for measured walls: an absolute length, or a percent of the table's wall. */
export const wallToleranceSchema = z.union([
  z.object({ value: nonNegative, unit: unitName.optional() }).strict(),
  z.object({ percent: nonNegative }).strict(),
]);

export const measuredWallSchema = z
  .object({
    /** Only readings taken this way count (the thinnest of them). */
    method: z.enum(WALL_METHODS),
    /** Omitted: 0 (the reading must reach the table's wall). */
    tolerance: wallToleranceSchema.optional(),
  })
  .strict();

export const tubeTableSchema = z.object({
  template: z.literal('tube_table'),
  /** Opt-in: a member also needs a measured wall, by `method`, of at least the table's wall less `tolerance`. */
  measuredWall: measuredWallSchema.optional(),
  weightUnit: unitName.optional(),
  bands: z.array(weightBandSchema).min(1).max(L.bands),
  allowances: z
    .object({
      /** "If the OD is at least `odMargin` above the band minimum, the wall may be `minWall`." */
      thinWallWhenOdExceedsMinimum: z
        .object({
          odMargin: nonNegative,
          minWall: positive,
          unit: unitName.optional(),
          /**
           * Which OD is "the minimum diameter required for the weight": the smallest OD the row lists
           * (default, the behaviour of every document written before the option) or the largest.
           */
          minimumDiameter: z.enum(THIN_WALL_READINGS).optional(),
        })
        .optional(),
      /** Subtracted from every wall in the table (e.g. −0.010 in: write 0.010). */
      wallAllowance: z.object({ value: nonNegative, unit: unitName.optional() }).optional(),
    })
    .optional(),
});

export const MEMBER_COUNT_SIDES = ['each', 'left', 'right', 'driver', 'passenger'] as const;
export type MemberCountSide = (typeof MEMBER_COUNT_SIDES)[number];

export const requiredMembersSchema = z.object({
  template: z.literal('required_members'),
  members: z
    .array(
      z.object({
        kinds: z.array(z.enum(MEMBER_KINDS)).min(1).max(MEMBER_KINDS.length),
        min: z.number().int().min(0).max(50),
        max: z.number().int().min(0).max(50).optional(),
        label: shortText.optional(),
        /**
         * Count per side instead of in total: "each" (left and right each need min..max), or one
         * side: left, right, driver, passenger. Omitted: counted in total, whatever the sides.
         */
        side: z.enum(MEMBER_COUNT_SIDES).optional(),
      }),
    )
    .min(1)
    .max(L.checks),
});

export const LIMIT_OPERATORS = ['atLeast', 'atMost', 'above', 'below', 'equals', 'notEquals'] as const;
export type LimitOperator = (typeof LIMIT_OPERATORS)[number];

/**
 * "k × another fact": `times` is k, a plain number when both facts have the same dimension, or a
 * quantity with `unit` when the dimensions differ (area ≥ 10 in × OD: k is a length).
 */
export const proportionalValueSchema = z
  .object({ times: positive, of: z.string().min(1).max(80), unit: unitName.optional() })
  .strict();

export const limitCheckSchema = z.object({
  fact: z.string().min(1).max(80),
  /** For facts with `path` (vehicle.memberCounts): the member kind. */
  path: z.string().max(40).optional(),
  params: z.record(z.string(), z.unknown()).optional(),
  operator: z.enum(LIMIT_OPERATORS),
  /** A number in document units, true/false, a date "YYYY-MM-DD" (date facts), a grade name (grade facts), or k × another fact. */
  value: z.union([finite, z.boolean(), z.string().trim().min(1).max(60), proportionalValueSchema]),
  unit: unitName.optional(),
  label: shortText.optional(),
});

export const limitSchema = z.object({
  template: z.literal('limit'),
  checks: z.array(limitCheckSchema).min(1, 'Add at least one limit.').max(L.checks),
});

export const allowedValuesSchema = z.object({
  template: z.literal('allowed_values'),
  fact: z.string().min(1).max(80),
  mode: z.enum(['allowed', 'forbidden']).default('allowed'),
  values: z.array(z.string().min(1).max(60)).min(1).max(L.values),
});

export const conditionsSchema = z.object({
  template: z.literal('conditions'),
  /** json-rules-engine conditions over the fact catalogue; checked by validateRulesetDocument. */
  conditions: z.unknown(),
});

export const MATCH_MEASURES = ['od', 'wall'] as const;
export const MATCH_OPERATORS = ['equals', 'atLeast', 'atMost'] as const;

/** Member against member: this member's OD / wall compared with every member of the kinds in `of`. */
export const memberMatchSchema = z.object({
  template: z.literal('member_match'),
  of: z.array(z.enum(MEMBER_KINDS)).min(1).max(MEMBER_KINDS.length),
  checks: z
    .array(z.object({ measure: z.enum(MATCH_MEASURES), operator: z.enum(MATCH_OPERATORS) }))
    .min(1)
    .max(MATCH_MEASURES.length),
});

export const requiresSchema = z.discriminatedUnion('template', [tubeTableSchema, requiredMembersSchema, limitSchema, allowedValuesSchema, conditionsSchema, memberMatchSchema]);

export const AREAS = ['tubes', 'members', 'geometry', 'mounting', 'padding', 'welding', 'material'] as const;

export const scopeSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('vehicle') }),
  z.object({ kind: z.literal('member'), memberKinds: z.array(z.enum(MEMBER_KINDS)).min(1).max(MEMBER_KINDS.length) }),
  z.object({ kind: z.literal('plate'), locations: z.array(z.enum(PLATE_LOCATIONS)).min(1).max(PLATE_LOCATIONS.length) }),
]);

export const requirementSchema = z.object({
  id: idText,
  title: shortText,
  section: shortText,
  severity: z.enum(['mandatory', 'advisory']),
  area: z.enum(AREAS),
  scope: scopeSchema,
  appliesTo: z
    .object({
      /** Class ids; omitted = every class. */
      classes: z.array(idText).min(1).max(L.classes).optional(),
      /** json-rules-engine condition: the requirement applies only when it holds. */
      when: z.unknown().optional(),
    })
    .optional(),
  requires: requiresSchema,
  explanation: longText,
  /**
   * The rulebook accepts a cage certified by its maker (certificate or homologation number on the
   * sheet) in place of this rule: such a cage is not checked against it, and the finding says why.
   */
  acceptsMakerCertificate: z.boolean().optional(),
});

export const measurementToleranceSchema = z
  .object({
    length: nonNegative.optional(),
    angle: nonNegative.optional(),
    mass: nonNegative.optional(),
    area: nonNegative.optional(),
    stress: nonNegative.optional(),
    ratio: nonNegative.optional(),
  })
  .strict();

export const rulesetDocumentSchema = z.object({
  formatVersion: z.literal(RULESET_FORMAT_VERSION),
  rulebook: rulebookSchema,
  unitSystem: z.enum(['imperial', 'metric']),
  measurementTolerance: measurementToleranceSchema.default({}),
  acceptPrintedEquivalents: z.boolean().default(false),
  printedEquivalents: z.array(printedEquivalentSchema).max(L.equivalents).default([]),
  strengthEquivalents: strengthEquivalentsSchema.optional(),
  classes: z.array(classSchema).min(1, 'Define at least one class').max(L.classes),
  requirements: z.array(requirementSchema).min(1, 'Define at least one requirement').max(L.requirements, `At most ${L.requirements} requirements`),
});

export type RulesetDocument = z.infer<typeof rulesetDocumentSchema>;
export type RulesetClass = z.infer<typeof classSchema>;
export type Requirement = z.infer<typeof requirementSchema>;
export type RequirementScope = z.infer<typeof scopeSchema>;
export type Requires = z.infer<typeof requiresSchema>;
export type TubeTable = z.infer<typeof tubeTableSchema>;
export type LimitCheck = z.infer<typeof limitCheckSchema>;
export type ProportionalValue = z.infer<typeof proportionalValueSchema>;
export type MemberMatch = z.infer<typeof memberMatchSchema>;
export type TubeSizeInDocument = z.infer<typeof tubeSizeSchema>;
export type RequirementArea = (typeof AREAS)[number];

export interface DocumentProblem {
  path: string;
  message: string;
}
