// The cage specification a builder submits: the vehicle, every member with its tube, geometry
// measurements, mounting plates, padding and welding. Canonical units only (mm, kg, degrees, MPa);
// clients convert at the edges. Every measurement is optional except what makes a member a member.
import { z } from 'zod';
import {
  CHASSIS_TYPES, COCKPIT_TYPES, DRIVER_SIDES, FUELS, JOINT_KINDS, MATERIALS, MEMBER_KINDS, MEMBER_KIND_LABELS, MEMBER_SIDES,
  PADDING_STANDARDS, PLATE_FIXINGS, PLATE_LOCATIONS, PROCESSES, SIDED_MEMBER_KINDS, WALL_METHODS, WELDING_PROCESSES,
} from '../domain/vocabulary.js';
import { tubeSizeProblems } from '../domain/tube.js';
import { addDays, formatIsoDate, isIsoDate, isoDateOf } from '../domain/dates.js';
import { MODEL_LIMITS, NODE_ROLES } from '../domain/geometry/model.js';
import { analysePath } from '../domain/geometry/member-path.js';

export const SPEC_LIMITS = { members: 60, bendsPerMember: 12, readingsPerMember: 24, jointsPerMember: 12, plates: 40, holes: 60 } as const;

const TUBE_FIELD_MAX_MM = { odMm: 1000, wallMm: 100 } as const;
const positive = (max: number) => z.number().positive('Must be greater than zero').max(max, `Must be at most ${max}`);
const nonNegative = (max: number) => z.number().min(0, 'Must not be negative').max(max, `Must be at most ${max}`);
const signed = (limit: number) => z.number().min(-limit, `Must be at least ${-limit}`).max(limit, `Must be at most ${limit}`);
const text = (max: number) => z.string().trim().max(max, `At most ${max} characters`);
const id = z.string().trim().min(1, 'Required').max(40, 'At most 40 characters').regex(/^[A-Za-z0-9_.-]+$/, 'Letters, digits, "_", "-" and "." only');

export const wallReadingSchema = z.object({
  wallMm: positive(20),
  method: z.enum(WALL_METHODS),
  note: text(200).optional(),
});

export const bendSchema = z.object({
  clrMm: positive(2000),
  minOdMm: positive(300).optional(),
  maxOdMm: positive(300).optional(),
});

export const jointSchema = z.object({
  kind: z.enum(JOINT_KINDS),
  /** Free text for the joint type (e.g. "double lug", "sleeved") since approved types vary by rulebook. */
  jointType: text(80).optional(),
  boltGrade: text(20).optional(),
});

// The cage model (issue 10): nodes on tube centrelines in the cage frame, see docs/geometry.md.
const coordinate = z.number()
  .min(-MODEL_LIMITS.coordinateMm, `More than ${MODEL_LIMITS.coordinateMm / 1000} m from the origin: check the units (the model is in millimetres)`)
  .max(MODEL_LIMITS.coordinateMm, `More than ${MODEL_LIMITS.coordinateMm / 1000} m from the origin: check the units (the model is in millimetres)`);

export const cageNodeSchema = z.object({
  id,
  label: text(80).optional(),
  role: z.enum(NODE_ROLES),
  xMm: coordinate,
  yMm: coordinate,
  zMm: coordinate,
});

export const modelSchema = z.object({
  nodes: z.array(cageNodeSchema).max(MODEL_LIMITS.nodes, `At most ${MODEL_LIMITS.nodes} nodes`),
});

export const pathEntrySchema = z.object({
  nodeId: id,
  /** Centreline radius of a bend at this node; only on interior entries. */
  clrMm: positive(5000).optional(),
});

export const memberSchema = z.object({
  id,
  kind: z.enum(MEMBER_KINDS),
  label: text(80).optional(),
  odMm: positive(TUBE_FIELD_MAX_MM.odMm),
  wallMm: positive(TUBE_FIELD_MAX_MM.wallMm),
  wallReadings: z.array(wallReadingSchema).max(SPEC_LIMITS.readingsPerMember).optional(),
  material: z.enum(MATERIALS).optional(),
  grade: text(60).optional(),
  process: z.enum(PROCESSES).optional(),
  yieldMpa: positive(3000).optional(),
  lengthMm: positive(20000).optional(),
  bends: z.array(bendSchema).max(SPEC_LIMITS.bendsPerMember).optional(),
  continuousPiece: z.boolean().optional(),
  joints: z.array(jointSchema).max(SPEC_LIMITS.jointsPerMember).optional(),
  /** Which side of the car the member is on, as typed; with a path the model derives it from y. */
  side: z.enum(MEMBER_SIDES).optional(),
  /** The member's centreline through the model's nodes, in order (issue 10). */
  path: z.array(pathEntrySchema)
    .min(2, 'A path needs at least two nodes')
    .max(MODEL_LIMITS.nodes, `At most ${MODEL_LIMITS.nodes} nodes in a path`)
    .optional(),
}).superRefine((m, ctx) => {
  // Cross-field checks per member, so one bad member does not hide another's problems.
  if (m.side !== undefined && !SIDED_MEMBER_KINDS.includes(m.kind))
    ctx.addIssue({ code: 'custom', path: ['side'], message: `A ${MEMBER_KIND_LABELS[m.kind]} spans the car and has no side; leave the side empty.` });
  // Sizes outside the field bounds already failed above; add only what those bounds cannot see.
  for (const p of tubeSizeProblems(m)) if (m[p.field] > 0 && m[p.field] <= TUBE_FIELD_MAX_MM[p.field]) ctx.addIssue({ code: 'custom', path: [p.field], message: p.message });
  m.wallReadings?.forEach((r, j) => {
    if (r.wallMm >= m.odMm / 2)
      ctx.addIssue({ code: 'custom', path: ['wallReadings', j, 'wallMm'], message: 'A wall reading must be less than half the outside diameter.' });
  });
  m.bends?.forEach((b, j) => {
    if (b.minOdMm !== undefined && b.maxOdMm !== undefined && b.minOdMm > b.maxOdMm)
      ctx.addIssue({ code: 'custom', path: ['bends', j, 'minOdMm'], message: 'The smallest diameter cannot exceed the largest.' });
    if (b.clrMm < m.odMm / 2)
      ctx.addIssue({ code: 'custom', path: ['bends', j, 'clrMm'], message: 'A centreline radius under half the OD is not a bend.' });
  });
});

export const vehicleSchema = z.object({
  classId: id,
  weightWithDriverKg: positive(10000).optional(),
  weightWithoutDriverKg: positive(10000).optional(),
  chassis: z.enum(CHASSIS_TYPES).optional(),
  cockpit: z.enum(COCKPIT_TYPES).optional(),
  fuel: z.enum(FUELS).optional(),
  /** Which side the driver sits on, so "driver side" and "passenger side" resolve. */
  driverSide: z.enum(DRIVER_SIDES).optional(),
  /** Height (z, model frame) of the seated driver's shoulders. */
  driverShoulderHeightMm: positive(MODEL_LIMITS.coordinateMm).optional(),
  /** The helmet in the driving position as a sphere: centre in the model frame and radius. */
  helmet: z.object({ xMm: coordinate, yMm: coordinate, zMm: coordinate, radiusMm: positive(300) }).optional(),
});

/** Geometry measurements, all optional; signs are explained per field. */
export const geometrySchema = z.object({
  /** How far below the top of the main hoop the rear braces attach. */
  rearBraceAttachBelowTopMm: nonNegative(2000).optional(),
  /** Angle each rear brace makes with the vertical (the smaller one if they differ). */
  rearBraceAngleFromVerticalDeg: nonNegative(90).optional(),
  /** Included angle between a rear brace and the main hoop where they meet (the smaller one if they differ). */
  rearBraceIncludedAngleDeg: nonNegative(180).optional(),
  /** Top of main hoop above the top of the helmet (negative: helmet sticks out above). */
  hoopAboveHelmetMm: signed(1000).optional(),
  /** Helmet top below the line joining the main and front hoop tops (negative: above the line). */
  helmetBelowHoopLineMm: signed(1000).optional(),
  /** Horizontal distance from the back of the helmet to the main hoop. */
  hoopBehindHelmetMm: nonNegative(2000).optional(),
  /** Inside width between the main hoop uprights at their feet. */
  mainHoopInsideWidthMm: positive(3000).optional(),
  /** Harness bar below the driver's shoulders (negative: above the shoulders). */
  harnessBarBelowShouldersMm: signed(1000).optional(),
  /** Diagonal's lower end from the mounting foot / node it should meet. */
  diagonalLowerEndFromNodeMm: nonNegative(2000).optional(),
  /** Diagonal's upper end from the node it should meet. */
  diagonalUpperEndFromNodeMm: nonNegative(2000).optional(),
  /** Nearest bare tube to the helmet. */
  nearestTubeToHelmetMm: nonNegative(2000).optional(),
});

export const plateSchema = z.object({
  id,
  location: z.enum(PLATE_LOCATIONS),
  memberId: id.optional(),
  thicknessMm: positive(50).optional(),
  sidesMm: z.tuple([positive(2000), positive(2000)]).optional(),
  /** Measured area when the plate is not a rectangle. */
  areaMm2: positive(4_000_000).optional(),
  /** Older sheets: one fixing for the plate; read as the plate's fixing to the body when `plateFixing` is absent. */
  fixing: z.enum(PLATE_FIXINGS).optional(),
  /** How the plate is fixed to the body or chassis. */
  plateFixing: z.enum(PLATE_FIXINGS).optional(),
  /** How the hoop or brace foot is fixed to the plate. */
  footFixing: z.enum(PLATE_FIXINGS).optional(),
  backingPlate: z.boolean().optional(),
  backingThicknessMm: positive(50).optional(),
  boltCount: z.number().int('Must be a whole number').min(0).max(50).optional(),
  boltDiameterMm: positive(50).optional(),
  boltGrade: text(20).optional(),
});

export const inspectionHoleSchema = z.object({
  memberId: id,
  diameterMm: positive(50),
  distanceFromWeldOrBendMm: nonNegative(5000).optional(),
});

export const paddingSchema = z.object({
  nearHelmet: z.boolean().optional(),
  standard: z.enum(PADDING_STANDARDS).optional(),
});

export const weldingSchema = z.object({
  process: z.enum(WELDING_PROCESSES).optional(),
});

const isoDate = z.string().refine(isIsoDate, 'A date as YYYY-MM-DD');

/** A day of slack so a builder a timezone ahead of UTC can enter today's date. */
export function latestAcceptedDate(now: Date = new Date()): string {
  return addDays(isoDateOf(now), 1);
}

/** The cage's own history: approval and build dates, and a maker's certificate or homologation. */
export const cageSchema = z.object({
  /** When the cage (or bar) was approved by the sanctioning body: legacy allowances depend on it. */
  approvedOn: isoDate.optional(),
  builtOn: isoDate.optional(),
  certificate: z.object({
    issuer: text(120).optional(),
    number: z.string().trim().min(1, 'Required').max(80, 'At most 80 characters'),
  }).optional(),
}).superRefine((c, ctx) => {
  const latest = latestAcceptedDate();
  if (c.approvedOn !== undefined && isIsoDate(c.approvedOn) && c.approvedOn > latest)
    ctx.addIssue({ code: 'custom', path: ['approvedOn'], message: `An approval date cannot be in the future (${formatIsoDate(c.approvedOn)}).` });
  if (c.builtOn !== undefined && isIsoDate(c.builtOn) && c.builtOn > latest)
    ctx.addIssue({ code: 'custom', path: ['builtOn'], message: `A build date cannot be in the future (${formatIsoDate(c.builtOn)}).` });
});

export const specificationSchema = z
  .object({
    vehicle: vehicleSchema,
    members: z.array(memberSchema).max(SPEC_LIMITS.members, `At most ${SPEC_LIMITS.members} members`),
    geometry: geometrySchema.optional(),
    plates: z.array(plateSchema).max(SPEC_LIMITS.plates, `At most ${SPEC_LIMITS.plates} plates`).optional(),
    inspectionHoles: z.array(inspectionHoleSchema).max(SPEC_LIMITS.holes).optional(),
    padding: paddingSchema.optional(),
    welding: weldingSchema.optional(),
    cage: cageSchema.optional(),
    model: modelSchema.optional(),
  })
  .superRefine((spec, ctx) => {
    const seen = new Map<string, number>();
    spec.members.forEach((m, i) => {
      const prior = seen.get(m.id);
      if (prior !== undefined) ctx.addIssue({ code: 'custom', path: ['members', i, 'id'], message: `Member id "${m.id}" is already used by member ${prior + 1}.` });
      else seen.set(m.id, i);
    });
    const ids = new Set(spec.members.map((m) => m.id));
    spec.plates?.forEach((p, i) => {
      if (p.memberId !== undefined && !ids.has(p.memberId))
        ctx.addIssue({ code: 'custom', path: ['plates', i, 'memberId'], message: `No member has the id "${p.memberId}".` });
    });
    spec.inspectionHoles?.forEach((h, i) => {
      if (!ids.has(h.memberId)) ctx.addIssue({ code: 'custom', path: ['inspectionHoles', i, 'memberId'], message: `No member has the id "${h.memberId}".` });
    });
    modelProblems(spec, ctx);
  });

/** The model's cross-checks: unique node ids, paths through known nodes, and each path a real tube. */
function modelProblems(spec: { members: z.infer<typeof memberSchema>[]; model?: z.infer<typeof modelSchema> }, ctx: z.RefinementCtx): void {
  const nodes = new Map<string, { x: number; y: number; z: number }>();
  spec.model?.nodes.forEach((n, i) => {
    if (nodes.has(n.id)) ctx.addIssue({ code: 'custom', path: ['model', 'nodes', i, 'id'], message: `Node id "${n.id}" is already used by another node.` });
    else nodes.set(n.id, { x: n.xMm, y: n.yMm, z: n.zMm });
  });
  // A node already refused for its coordinates would only add knock-on problems to its paths.
  const refused = (p: { x: number; y: number; z: number }) => [p.x, p.y, p.z].some((c) => !(Math.abs(c) <= MODEL_LIMITS.coordinateMm));
  spec.members.forEach((m, i) => {
    if (!m.path) return;
    if (!spec.model) {
      ctx.addIssue({ code: 'custom', path: ['members', i, 'path'], message: 'A path needs the model’s nodes; add the nodes first.' });
      return;
    }
    let known = true;
    m.path.forEach((e, j) => {
      if (nodes.has(e.nodeId)) return;
      known = false;
      ctx.addIssue({ code: 'custom', path: ['members', i, 'path', j, 'nodeId'], message: `No node has the id "${e.nodeId}".` });
    });
    if (!known) return;
    const points = m.path.map((e) => nodes.get(e.nodeId)!);
    if (points.some(refused)) return;
    const r = analysePath(points, m.path.map((e) => e.clrMm), m.odMm);
    if (!r.ok) for (const p of r.problems) ctx.addIssue({ code: 'custom', path: ['members', i, 'path', p.index, p.field], message: p.message });
  });
}

export type Specification = z.infer<typeof specificationSchema>;
export type SpecMember = z.infer<typeof memberSchema>;
export type SpecPlate = z.infer<typeof plateSchema>;
export type SpecCage = z.infer<typeof cageSchema>;
export type SpecModel = z.infer<typeof modelSchema>;
export type SpecCageNode = z.infer<typeof cageNodeSchema>;
export type SpecPathEntry = z.infer<typeof pathEntrySchema>;

export interface FieldProblem {
  path: string;
  message: string;
}

export type ParseOutcome<T> = { ok: true; value: T } | { ok: false; problems: FieldProblem[] };

/** Joins a zod issue path the way the API reports it: `members.2.wallMm`; the root is "". */
export function joinPath(path: readonly PropertyKey[]): string {
  return path.map((p) => String(p)).join('.');
}

export function issuesToProblems(issues: readonly { path: readonly PropertyKey[]; message: string }[]): FieldProblem[] {
  return issues.map((i) => ({ path: joinPath(i.path), message: i.message }));
}

/** Parses untrusted JSON into a specification, or every invalid field with its path. */
export function parseSpecification(json: unknown): ParseOutcome<Specification> {
  const result = specificationSchema.safeParse(json);
  if (result.success) return { ok: true, value: result.data };
  return { ok: false, problems: issuesToProblems(result.error.issues) };
}
