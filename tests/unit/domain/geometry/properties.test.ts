// Properties of the derived geometry over many generated cages (fast-check): translating the model
// along x changes nothing; mirroring it in y swaps left and right and the driver's side, flips the
// bend rotations and changes nothing else; splitting a straight at a new node changes no length.
import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { deriveCageGeometry, mirrorSpecification, startingShape } from '@backend/domain/geometry/index';
import type { CageGeometry, StartingChoices } from '@backend/domain/geometry/index';
import type { MemberKind } from '@backend/domain/vocabulary';

const sizeFor = (kind: MemberKind) => (kind === 'main_hoop' || kind === 'front_hoop' || kind === 'halo_hoop' ? { odMm: 45, wallMm: 2.5 } : { odMm: 38, wallMm: 2 });

const choicesArb: fc.Arbitrary<StartingChoices> = fc.record({
  harnessBar: fc.boolean(),
  front: fc.constantFrom('none', 'front_hoop', 'halo'),
  doorBars: fc.constantFrom('none', 'straight', 'crossed', 'bowed'),
  diagonal: fc.constantFrom('none', 'main_hoop', 'backstays'),
}).map((c) => (c.front === 'none' ? { ...c, doorBars: 'none' as const } : c));

const cageArb = fc.record({
  choices: choicesArb,
  feet: fc.integer({ min: 900, max: 1500 }),
  top: fc.integer({ min: 800, max: 1400 }),
  height: fc.integer({ min: 950, max: 1300 }),
  lean: fc.double({ min: 0, max: 20, noNaN: true }),
  front: fc.integer({ min: 900, max: 1600 }),
  landing: fc.integer({ min: 400, max: 1300 }),
  door: fc.integer({ min: 350, max: 600 }),
  helmet: fc.record({ x: fc.integer({ min: 100, max: 500 }), y: fc.integer({ min: -400, max: 400 }), z: fc.integer({ min: 700, max: 950 }) }),
  driverSide: fc.constantFrom('left' as const, 'right' as const),
  // A bar bent in two planes (so bend rotations are not all 0° or 180°), on one side of the car.
  kink: fc.record({ y: fc.integer({ min: 150, max: 400 }), e: fc.integer({ min: -300, max: 300 }), run: fc.integer({ min: 300, max: 500 }) }),
}).map((a) => {
  const r = startingShape(a.choices, {
    hoopWidthAtFeetMm: a.feet, hoopWidthAtTopMm: a.top, hoopHeightMm: a.height, hoopLeanDeg: a.lean,
    frontHoopForwardMm: a.front, backstayLandingBehindMm: a.landing, doorBarHeightMm: a.door,
  }, sizeFor);
  if (!r.ok) return null;
  return {
    vehicle: { driverSide: a.driverSide, driverShoulderHeightMm: a.helmet.z - 100, helmet: { xMm: a.helmet.x, yMm: a.helmet.y, zMm: a.helmet.z, radiusMm: 140 } },
    model: {
      nodes: [
        ...r.shape.nodes,
        { id: 'k1', role: 'end' as const, xMm: 500, yMm: a.kink.y, zMm: 200 }, { id: 'k2', role: 'bend' as const, xMm: 500, yMm: a.kink.y, zMm: 600 },
        { id: 'k3', role: 'bend' as const, xMm: 500, yMm: a.kink.y + a.kink.run, zMm: 600 }, { id: 'k4', role: 'end' as const, xMm: 900, yMm: a.kink.y + a.kink.run, zMm: 600 + a.kink.e },
      ],
    },
    members: [
      ...r.shape.members,
      { id: 'kink', kind: 'other' as const, label: 'kinked bar', odMm: 30, wallMm: 2, path: [{ nodeId: 'k1' }, { nodeId: 'k2', clrMm: 90 }, { nodeId: 'k3', clrMm: 90 }, { nodeId: 'k4' }] },
    ],
  };
}).filter((s): s is NonNullable<typeof s> => s !== null);

/** Every number of a derived result, with its place, for comparison within rounding. */
function numbers(g: CageGeometry): Map<string, number | null | string> {
  const out = new Map<string, number | null | string>();
  const walk = (v: unknown, at: string) => {
    if (typeof v === 'number' || v === null || typeof v === 'string') out.set(at, v as number | null | string);
    else if (Array.isArray(v)) v.forEach((x, i) => walk(x, `${at}.${i}`));
    else if (typeof v === 'object' && v !== null) for (const [k, x] of Object.entries(v)) walk(x, `${at}.${k}`);
  };
  walk(g, '');
  return out;
}

function expectSame(a: Map<string, number | null | string>, b: Map<string, number | null | string>, skip: (key: string) => boolean = () => false) {
  expect([...b.keys()].sort()).toEqual([...a.keys()].sort());
  for (const [k, v] of a) {
    if (skip(k)) continue;
    const w = b.get(k);
    if (typeof v === 'number' && typeof w === 'number') expect(Math.abs(v - w), k).toBeLessThan(1e-6 * Math.max(1, Math.abs(v)));
    else expect(w, k).toEqual(v);
  }
}

describe('geometry properties', () => {
  test('moving the whole model along x changes no derived value', () => {
    fc.assert(fc.property(cageArb, fc.double({ min: -400, max: 400, noNaN: true }), (spec, dx) => {
      const moved = {
        ...spec,
        vehicle: { ...spec.vehicle, helmet: { ...spec.vehicle.helmet, xMm: spec.vehicle.helmet.xMm + dx } },
        model: { nodes: spec.model.nodes.map((n) => ({ ...n, xMm: n.xMm + dx })) },
      };
      expectSame(numbers(deriveCageGeometry(spec)), numbers(deriveCageGeometry(moved)));
    }), { numRuns: 60 });
  });

  test('mirroring in y swaps left and right and the driver’s side, flips bend rotations, changes nothing else', () => {
    const sideSwap: Record<string, string> = { left: 'right', right: 'left', centre: 'centre' };
    fc.assert(fc.property(cageArb, (spec) => {
      const a = deriveCageGeometry(spec);
      const mirrored = mirrorSpecification(spec);
      expect(mirrored.vehicle.driverSide).toBe(spec.vehicle.driverSide === 'left' ? 'right' : 'left');
      const b = deriveCageGeometry(mirrored);
      a.members.forEach((m, i) => {
        expect(b.members[i].side).toBe(sideSwap[m.side]);
        // Both the member and the driver changed sides: driver-side members stay driver-side.
        expect(b.members[i].driverSide).toBe(m.driverSide);
        m.bendRotationsDeg.forEach((r, k) => {
          const s = b.members[i].bendRotationsDeg[k];
          if (r === null) expect(s).toBeNull();
          // ±180° are the same rotation; elsewhere the sign flips.
          else if (Math.abs(Math.abs(r) - 180) < 1e-6) expect(Math.abs(s!)).toBeCloseTo(180, 6);
          else expect(s!).toBeCloseTo(-r, 6);
        });
      });
      const kinked = a.members.find((m) => m.memberId === 'kink')!.bendRotationsDeg[0]!;
      expect(Math.abs(kinked)).toBeGreaterThan(45); // the property is not only about planar members
      expectSame(numbers(a), numbers(b), (k) => /\.side$|\.bendRotationsDeg\./.test(k));
    }), { numRuns: 60 });
  });

  test('splitting a straight segment at a new node changes no length', () => {
    fc.assert(fc.property(cageArb, fc.nat(), fc.double({ min: 0.1, max: 0.9, noNaN: true }), (spec, pick, at) => {
      const before = deriveCageGeometry(spec);
      const m = spec.members[pick % spec.members.length];
      const byId = new Map(spec.model.nodes.map((n) => [n.id, n]));
      const bendAt = new Map(before.members.find((x) => x.memberId === m.id)!.bends.map((b) => [b.nodeId, b.setbackMm]));
      const k = pick % (m.path.length - 1);
      const p = byId.get(m.path[k].nodeId)!;
      const q = byId.get(m.path[k + 1].nodeId)!;
      const len = Math.hypot(q.xMm - p.xMm, q.yMm - p.yMm, q.zMm - p.zMm);
      const t0 = bendAt.get(p.id) ?? 0;
      const t1 = bendAt.get(q.id) ?? 0;
      fc.pre(len - t0 - t1 > 2);
      // A point on the straight part, between the tangent points.
      const s = (t0 + at * (len - t0 - t1)) / len;
      const node = { id: 'split', role: 'junction' as const, xMm: p.xMm + (q.xMm - p.xMm) * s, yMm: p.yMm + (q.yMm - p.yMm) * s, zMm: p.zMm + (q.zMm - p.zMm) * s };
      const split = {
        ...spec,
        model: { nodes: [...spec.model.nodes, node] },
        members: spec.members.map((x) => (x.id === m.id ? { ...x, path: [...x.path.slice(0, k + 1), { nodeId: 'split' }, ...x.path.slice(k + 1)] } : x)),
      };
      const after = deriveCageGeometry(split);
      expect(after.members.map((x) => x.developedLengthMm)).toEqual(before.members.map((x) => expect.closeTo(x.developedLengthMm, 6)));
    }), { numRuns: 80 });
  });
});
