// The check report on the wire: one finding per requirement and subject (vehicle, member or
// plate), measured and required values as canonical quantities with their dimension so any client
// formats them in its user's units (domain/units.ts formatQuantity). Deterministic and JSON-safe.
import { z } from 'zod';
import { DIMENSIONS } from '../domain/units.js';
import { MEMBER_KINDS, PLATE_LOCATIONS } from '../domain/vocabulary.js';
import { AREAS, STRENGTH_MEASURES } from './ruleset.js';
import type { ReasonSegment } from '../domain/rules/reason-text.js';
import { cageGeometrySchema } from './geometry.js';

export const VERDICTS = ['pass', 'fail', 'not_applicable', 'needs_information'] as const;
export type FindingVerdict = (typeof VERDICTS)[number];

const dimension = z.enum(DIMENSIONS).nullable();
const scalar = z.union([z.number(), z.string(), z.boolean()]);

export const measuredValueSchema = z.object({
  fact: z.string(),
  label: z.string(),
  path: z.string().optional(),
  value: scalar,
  dimension,
  /** "model" when the value was derived from the cage model; "sheet" marks a typed value beside it. */
  source: z.enum(['model', 'sheet']).optional(),
});

export const requiredValueSchema = z.object({
  fact: z.string(),
  label: z.string(),
  path: z.string().optional(),
  operator: z.enum(['atLeast', 'atMost', 'above', 'below', 'equals', 'notEquals', 'oneOf', 'noneOf', 'includes', 'excludes']),
  /** A number, text, a list, or another fact (`times`: k × that fact, canonical; `timesDimension`: k's dimension, null for a plain factor). */
  value: z.union([scalar, z.array(z.string()), z.object({ fact: z.string(), times: z.number().optional(), timesDimension: dimension.optional() })]),
  dimension,
});

const reasonDimension = z.enum(DIMENSIONS);
/** domain/rules/reason-text.ts: the parts a reason is written from, in the reader's units. */
export const reasonSegmentSchema = z.union([
  z.string(),
  z.object({ q: z.number(), d: reasonDimension }),
  z.object({ cmp: z.object({ value: z.number(), limit: z.number(), d: reasonDimension, op: z.enum(['atLeast', 'atMost', 'above', 'below', 'equals', 'notEquals']), met: z.boolean(), form: z.literal('gap').optional() }) }),
  z.object({ tube: z.object({ odMm: z.number(), wallMm: z.number() }) }),
  z.object({ band: z.object({ aboveKg: z.number().nullable(), upToKg: z.number().nullable() }) }),
  z.object({ bySystem: z.object({ metric: z.string(), imperial: z.string() }) }),
]) satisfies z.ZodType<ReasonSegment>;

export const missingFactSchema = z.object({ fact: z.string(), label: z.string(), dimension });

/**
 * A tube table's judgement of the member's tube against a listed size by strength (docs/rulesets.md,
 * "Equivalence by strength"): canonical inputs, so a reader sees every step in their own units
 * (domain/strength-equivalence.ts). `accepted`: the rulebook accepts equivalents, so it counted;
 * otherwise it is advice only.
 */
export const strengthEquivalenceSchema = z.object({
  measure: z.enum(STRENGTH_MEASURES),
  accepted: z.boolean(),
  listed: z.object({ label: z.string(), odMm: z.number(), wallMm: z.number(), yieldMpa: z.number().optional() }),
  candidate: z.object({ odMm: z.number(), wallMm: z.number(), yieldMpa: z.number().optional() }),
  minWallMm: z.number().optional(),
  equivalent: z.union([z.boolean(), z.literal('unknown')]),
});

export const findingSchema = z.object({
  requirementId: z.string(),
  title: z.string(),
  citation: z.object({ publisher: z.string(), rulebookTitle: z.string(), edition: z.string(), section: z.string() }),
  verdict: z.enum(VERDICTS),
  severity: z.enum(['mandatory', 'advisory']),
  area: z.enum(AREAS),
  /** `name` is the builder's own name for the member (their label, else the kind's words). */
  member: z.object({ id: z.string(), kind: z.enum(MEMBER_KINDS), index: z.number().int(), name: z.string().optional() }).nullable(),
  plate: z.object({ id: z.string(), location: z.enum(PLATE_LOCATIONS), index: z.number().int() }).nullable(),
  measured: z.array(measuredValueSchema),
  required: z.array(requiredValueSchema),
  missing: z.array(missingFactSchema),
  /** Why the verdict: which alternative matched, which was nearest, what is missing; in the units of the run. */
  reason: z.string(),
  /**
   * The same reason as parts with canonical values, written in the reader's units when read
   * (`findingReason`). Absent on runs stored before parts existed: those keep `reason`.
   */
  reasonParts: z.array(reasonSegmentSchema).optional(),
  explanation: z.string(),
  /** Set when the rulebook accepts the sheet's maker's certificate in place of this rule (not checked). */
  acceptedOnCertificate: z.object({ number: z.string(), issuer: z.string().optional() }).optional(),
  /** A tube table's equivalence by strength: how the tube passed, or advice where the rulebook does not accept it. */
  strengthEquivalence: strengthEquivalenceSchema.optional(),
});

export const memberTubeDataSchema = z.object({
  memberId: z.string(),
  kind: z.enum(MEMBER_KINDS),
  index: z.number().int(),
  odMm: z.number(),
  wallMm: z.number(),
  areaMm2: z.number(),
  secondMomentMm4: z.number(),
  sectionModulusMm3: z.number(),
  radiusOfGyrationMm: z.number(),
  torsionalConstantMm4: z.number(),
  massPerMetreKg: z.number(),
  lengthMm: z.number().nullable(),
  massKg: z.number().nullable(),
  densityAssumed: z.boolean(),
  /** The builder's name for the member; absent on runs stored before names were carried. */
  name: z.string().optional(),
});

export const checkReportSchema = z.object({
  reportFormat: z.literal(1),
  rulebook: z.object({ publisher: z.string(), title: z.string(), edition: z.string(), effectiveDate: z.string(), url: z.string().optional() }),
  classId: z.string(),
  className: z.string(),
  verdict: z.enum(['pass', 'fail', 'needs_information']),
  summary: z.object({
    pass: z.number().int(), fail: z.number().int(), notApplicable: z.number().int(), needsInformation: z.number().int(),
    advisoryFail: z.number().int(),
  }),
  findings: z.array(findingSchema),
  /**
   * What to measure next: missing facts of mandatory findings, with the members they concern (ids, and
   * the builder's names in the same order; runs stored before names were carried have no names).
   */
  measureNext: z.array(missingFactSchema.extend({ memberIds: z.array(z.string()), memberNames: z.array(z.string()).optional(), requirementIds: z.array(z.string()) })),
  tubes: z.object({
    members: z.array(memberTubeDataSchema),
    /** Sum of the members with a length; complete only when every member has one. */
    estimatedTubeMassKg: z.number(),
    massComplete: z.boolean(),
    membersWithoutLength: z.array(z.string()),
  }),
  policy: z.object({
    acceptPrintedEquivalents: z.boolean(),
    /** Equivalence by strength: accepted, or advice only; by which measure. Absent on runs stored before it existed. */
    strengthEquivalents: z.object({ accept: z.boolean(), measure: z.enum(STRENGTH_MEASURES) }).optional(),
    /** Canonical units per dimension. */
    measurementTolerance: z.record(z.string(), z.number()),
  }),
  /** Derived values of the cage model, when the specification has one (docs/geometry.md). */
  geometry: cageGeometrySchema.optional(),
  disclaimer: z.string(),
});

export type MeasuredValue = z.infer<typeof measuredValueSchema>;
export type RequiredValue = z.infer<typeof requiredValueSchema>;
export type MissingFact = z.infer<typeof missingFactSchema>;
export type Finding = z.infer<typeof findingSchema>;
export type FindingStrengthEquivalence = z.infer<typeof strengthEquivalenceSchema>;
export type CheckReport = z.infer<typeof checkReportSchema>;

export const PRE_CHECK_DISCLAIMER =
  'This is a pre-check, not an approval. The sanctioning body’s inspector decides whether the cage complies. ' +
  'Welding and fabrication belong to qualified people working under local rules.';
