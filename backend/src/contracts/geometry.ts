// The cage model's derived values on the wire (report.geometry and POST /api/geometry/derive):
// per member the developed length, bends, bend-plane rotations, CLR/OD and side; per node the
// members meeting and the angles between them; the geometry facts the model gives; and where a
// typed value disagrees with the model. Canonical units (mm, deg). See docs/geometry.md.
import { z } from 'zod';
import { NODE_ROLES } from '../domain/geometry/model.js';
import { DIMENSIONS } from '../domain/units.js';
import { MEMBER_KINDS } from '../domain/vocabulary.js';
import { specificationSchema } from './specification.js';

export const derivedMemberSchema = z.object({
  memberId: z.string(),
  name: z.string(),
  kind: z.enum(MEMBER_KINDS),
  index: z.number().int(),
  odMm: z.number(),
  developedLengthMm: z.number(),
  chordMm: z.number(),
  bends: z.array(z.object({
    nodeId: z.string(), angleDeg: z.number(), clrMm: z.number(), clrOverOd: z.number(), setbackMm: z.number(), arcMm: z.number(),
  })),
  bendRotationsDeg: z.array(z.number().nullable()),
  side: z.enum(['left', 'right', 'centre']),
  driverSide: z.enum(['driver', 'passenger']).nullable(),
});

export const derivedNodeSchema = z.object({
  nodeId: z.string(),
  label: z.string().nullable(),
  role: z.enum(NODE_ROLES),
  members: z.array(z.object({ memberId: z.string(), name: z.string() })),
  angles: z.array(z.object({ memberIds: z.tuple([z.string(), z.string()]), names: z.tuple([z.string(), z.string()]), angleDeg: z.number() })),
});

export const disagreementSchema = z.object({
  fact: z.string(),
  label: z.string(),
  dimension: z.enum(DIMENSIONS),
  modelValue: z.number(),
  sheetValue: z.number(),
  toleranceCanonical: z.number(),
  memberId: z.string().nullable(),
  members: z.array(z.string()),
});

export const cageGeometrySchema = z.object({
  members: z.array(derivedMemberSchema),
  nodes: z.array(derivedNodeSchema),
  facts: z.record(z.string(), z.object({ value: z.number(), members: z.array(z.string()) })),
  disagreements: z.array(disagreementSchema),
});

export type CageGeometryWire = z.infer<typeof cageGeometrySchema>;

/** POST /api/geometry/derive takes a specification (a build sheet's content) with its model. */
export const deriveBodySchema = z.object({ specification: specificationSchema });
