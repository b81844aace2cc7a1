// Wire shapes of the fabrication sheets (docs/api.md, "Fabrication"): the cope and its 1:1 template,
// the builder's fabrication settings (bender dies with their springback, allowances, stick length),
// the standalone bend schedule, the hoop leg trim and the buying list. Canonical units (mm, deg, kg).
// The domain's own checks run inside the schemas, so every refusal is a 400 at its field.
import { z } from 'zod';
import { uuidSchema } from './common.js';
import { copeProblems } from '../domain/fabrication/cope.js';
import { springbackProblems } from '../domain/fabrication/bends.js';
import { legTrimProblems } from '../domain/fabrication/leg-trim.js';
import { nestingProblems } from '../domain/fabrication/nesting.js';
import { planProblems } from '../domain/fabrication/cut-schedule.js';

const finite = (message = 'Must be a number') => z.number({ error: message }).finite(message);
const text = (max: number) => z.string().trim().max(max, `At most ${max} characters`);

export const PAGE_SIZES = ['A4', 'Letter'] as const;
export type PageSize = (typeof PAGE_SIZES)[number];
export const unitsSchema = z.enum(['metric', 'imperial']);

export const copeBodySchema = z
  .object({ branchOdMm: finite(), runOdMm: finite(), angleDeg: finite(), offsetMm: finite().default(0) })
  .superRefine((v, ctx) => {
    for (const p of copeProblems(v)) ctx.addIssue({ code: 'custom', path: [p.field], message: p.message });
  });
export type CopeBody = z.infer<typeof copeBodySchema>;

export const copePdfBodySchema = z
  .object({
    branchOdMm: finite(), runOdMm: finite(), angleDeg: finite(), offsetMm: finite().default(0),
    pageSize: z.enum(PAGE_SIZES, { error: 'Choose A4 or Letter' }),
    memberName: text(80).optional(),
    branchWallMm: z.number().positive('Must be greater than zero').max(20, 'Must be at most 20').optional(),
    units: unitsSchema.default('metric'),
  })
  .superRefine((v, ctx) => {
    for (const p of copeProblems(v)) ctx.addIssue({ code: 'custom', path: [p.field], message: p.message });
    if (v.branchWallMm !== undefined && v.branchWallMm >= v.branchOdMm / 2) ctx.addIssue({ code: 'custom', path: ['branchWallMm'], message: 'A wall of half the outside diameter or more is a solid bar.' });
  });
export type CopePdfBody = z.infer<typeof copePdfBodySchema>;

export const benderDieSchema = z
  .object({
    name: z.string().trim().min(1, 'Required').max(60, 'At most 60 characters'),
    clrMm: z.number().positive('Must be greater than zero').max(1000, 'Must be at most 1000'),
    setDeg: finite(),
    heldDeg: finite(),
  })
  .superRefine((d, ctx) => {
    for (const p of springbackProblems(d)) ctx.addIssue({ code: 'custom', path: [p.field], message: p.message });
  });

export const fabricationSettingsSchema = z
  .object({
    dies: z.array(benderDieSchema).max(20, 'At most 20 dies'),
    trimAllowanceMm: z.number().min(0, 'A trim allowance cannot be negative').max(300, 'A trim allowance over 300 mm is not an allowance; check the units'),
    stickLengthMm: finite(),
    kerfMm: finite(),
  })
  .superRefine((s, ctx) => {
    for (const p of nestingProblems(s)) ctx.addIssue({ code: 'custom', path: [p.path], message: p.message });
    const seen = new Set<string>();
    s.dies.forEach((d, i) => {
      const key = d.name.toLowerCase();
      if (seen.has(key)) ctx.addIssue({ code: 'custom', path: ['dies', i, 'name'], message: `Another die is already named "${d.name}".` });
      seen.add(key);
    });
  });
export type FabricationSettings = z.infer<typeof fabricationSettingsSchema>;
/** The settings as read back: `saved` is false until the builder saves settings of their own. */
export type FabricationSettingsWire = FabricationSettings & { saved: boolean };

export const bendScheduleBodySchema = z
  .object({
    legsMm: z.array(finite()).min(1, 'At least one straight').max(13, 'At most 13 straights'),
    bends: z.array(z.object({ angleDeg: finite(), clrMm: finite() }).nullable()).max(12),
    rotationsDeg: z.array(finite().min(-180, 'Must be at least -180').max(180, 'Must be at most 180').nullable()).max(11),
    endLossMm: z.tuple([finite().min(-500).max(500), finite().min(-500).max(500)]).default([0, 0]),
    trimMm: z.tuple([finite(), finite()]),
  })
  .superRefine((v, ctx) => {
    for (const p of planProblems(v)) ctx.addIssue({ code: 'custom', path: p.path.split('.').map((s) => (/^\d+$/.test(s) ? Number(s) : s)), message: p.message });
  });
export type BendScheduleBody = z.infer<typeof bendScheduleBodySchema>;

const legSchema = z.object({ uncutMm: finite(), padHeightMm: finite(), bendEndMm: finite().optional() });
export const legTrimBodySchema = z
  .object({ legs: z.tuple([legSchema, legSchema]), leanDeg: finite(), topHeightMm: finite().optional(), odMm: z.number().positive('Must be greater than zero').max(300) })
  .superRefine((v, ctx) => {
    for (const p of legTrimProblems(v)) ctx.addIssue({ code: 'custom', path: p.path.split('.').map((s) => (/^\d+$/.test(s) ? Number(s) : s)), message: p.message });
  });
export type LegTrimBody = z.infer<typeof legTrimBodySchema>;

/**
 * A hoop's legs as measured, kept with the sheet (PUT /build-sheets/:sheetId/fabrication/legs/:memberId):
 * the uncut legs (left first), the pad heights above one datum, the lean and optionally the top's
 * height. Checked against the member's OD with the leg trim's own rules by the service.
 */
export const hoopLegsBodySchema = z
  .object({ legs: z.tuple([legSchema, legSchema]), leanDeg: finite(), topHeightMm: finite().optional() })
  .strict();
export type HoopLegsBody = z.infer<typeof hoopLegsBodySchema>;
export const hoopLegsParamsSchema = z.object({
  sheetId: uuidSchema,
  memberId: z.string().trim().min(1, 'Required').max(60, 'At most 60 characters'),
});
