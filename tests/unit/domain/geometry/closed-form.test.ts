// Closed-form geometry: every expected value here is computed by hand (or by the independent
// formula written in the test), not read back from the code under test.
import { describe, expect, test } from 'vitest';
import { analysePath, deriveCageGeometry, memberCentreline, vec3 } from '@backend/domain/geometry/index';
import type { PathGeometry } from '@backend/domain/geometry/index';
import { HOOP, cageSpec } from '../../../fixtures/cage-model';

const analyse = (pts: [number, number, number][], clrs: (number | undefined)[], od = 45): PathGeometry => {
  const r = analysePath(pts.map(([x, y, z]) => vec3(x, y, z)), clrs, od);
  if (!r.ok) throw new Error(JSON.stringify(r.problems));
  return r.geometry;
};

describe('one 90° bend (textbook: arc = CLR·π/2, setback = CLR·tan 45° = CLR)', () => {
  const clr = 150;
  const g = analyse([[0, 0, 0], [0, 0, 1000], [0, 500, 1000]], [undefined, clr, undefined]);
  test('angle, arc and setback', () => {
    expect(g.bends).toHaveLength(1);
    expect(g.bends[0].angleDeg).toBeCloseTo(90, 9);
    expect(g.bends[0].arcMm).toBeCloseTo((clr * Math.PI) / 2, 9); // 235.619… mm, computed
    expect(g.bends[0].setbackMm).toBeCloseTo(clr, 9);
  });
  test('developed length = straights less setbacks plus the arc', () => {
    // (1000 − 150) + (500 − 150) + 150·π/2 = 1435.619… mm, computed.
    expect(g.developedLengthMm).toBeCloseTo(850 + 350 + (clr * Math.PI) / 2, 9);
    expect(g.straightsMm[0]).toBeCloseTo(850, 9);
    expect(g.straightsMm[1]).toBeCloseTo(350, 9);
  });
  test('the sampled centreline is tangent-continuous and lies on the arc', () => {
    const line = memberCentreline([
      { id: 'a', role: 'foot', xMm: 0, yMm: 0, zMm: 0 }, { id: 'b', role: 'bend', xMm: 0, yMm: 0, zMm: 1000 }, { id: 'c', role: 'end', xMm: 0, yMm: 500, zMm: 1000 },
    ], [{ nodeId: 'a' }, { nodeId: 'b', clrMm: clr }, { nodeId: 'c' }], 45);
    expect(line[0]).toEqual({ x: 0, y: 0, z: 0 });
    expect(line[line.length - 1]).toEqual({ x: 0, y: 500, z: 1000 });
    // Arc centre is at (0, 150, 850): every arc sample is CLR from it.
    for (const p of line.slice(1, -1)) expect(Math.hypot(p.y - 150, p.z - 850)).toBeCloseTo(clr, 6);
    expect(line[1]).toEqual(expect.objectContaining({ y: 0 }));
    expect(line[1].z).toBeCloseTo(850, 9);
    // Polyline length is a little under the developed length (chords of the arc), within 0.5 mm.
    let l = 0;
    for (let i = 1; i < line.length; i++) l += Math.hypot(line[i].x - line[i - 1].x, line[i].y - line[i - 1].y, line[i].z - line[i - 1].z);
    expect(l).toBeLessThanOrEqual(g.developedLengthMm + 1e-9);
    expect(g.developedLengthMm - l).toBeLessThan(0.5);
  });
});

describe('a hoop: developed length against an independent computation', () => {
  test('rectangular hoop with two 90° corners, junctions on the legs', () => {
    const spec = cageSpec();
    const hoop = deriveCageGeometry(spec).members.find((m) => m.memberId === 'mh')!;
    // Independently: two legs of height H and a top of width 2W, each corner removes 2·CLR of
    // straight and adds a quarter circle: 2H + 2W − 4·CLR + 2·(π/2)·CLR.
    const { halfWidthMm: w, heightMm: h, clrMm: r } = HOOP;
    const expected = 2 * h + 2 * w - 4 * r + Math.PI * r; // 3271.24 mm, computed
    expect(hoop.developedLengthMm).toBeCloseTo(expected, 6);
    expect(hoop.bends.map((b) => b.angleDeg)).toEqual([expect.closeTo(90, 9), expect.closeTo(90, 9)]);
    expect(hoop.bends[0].clrOverOd).toBeCloseTo(150 / 45, 9);
    // Both corners turn the same way in one plane: no rotation between them.
    expect(hoop.bendRotationsDeg).toEqual([expect.closeTo(0, 9)]);
    expect(hoop.side).toBe('centre');
  });
  test('an arched hoop with three bends: length from the tangent-point formula written out here', () => {
    // Feet at y = ±500, shoulders at (±450, 1000), apex at (0, 1150); radius 200 at each interior node.
    const pts: [number, number, number][] = [[0, 500, 0], [0, 450, 1000], [0, 0, 1150], [0, -450, 1000], [0, -500, 0]];
    const clr = 200;
    const g = analyse(pts, [undefined, clr, clr, clr, undefined]);
    const seg = (a: number[], b: number[]) => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
    const dir = (a: number[], b: number[]) => { const l = seg(a, b); return [(b[0] - a[0]) / l, (b[1] - a[1]) / l, (b[2] - a[2]) / l]; };
    let total = 0;
    for (let i = 0; i + 1 < pts.length; i++) total += seg(pts[i], pts[i + 1]);
    for (let i = 1; i + 1 < pts.length; i++) {
      const u = dir(pts[i - 1], pts[i]);
      const v = dir(pts[i], pts[i + 1]);
      const theta = Math.acos(u[0] * v[0] + u[1] * v[1] + u[2] * v[2]);
      total += -2 * clr * Math.tan(theta / 2) + clr * theta;
    }
    expect(g.developedLengthMm).toBeCloseTo(total, 6);
  });
});

describe('a straight brace (values computed: √(900² + 50² + 850²) and acos(850/1238.95))', () => {
  const spec = {
    model: { nodes: [{ id: 'a', role: 'junction' as const, xMm: 0, yMm: 500, zMm: 1150 }, { id: 'b', role: 'foot' as const, xMm: -900, yMm: 450, zMm: 300 }] },
    members: [{ id: 'rb', kind: 'rear_brace' as const, label: 'backstay left', odMm: 38, path: [{ nodeId: 'a' }, { nodeId: 'b' }] }],
  };
  const geo = deriveCageGeometry(spec);
  test('1,238.95 mm long, at 46.7° from vertical, on the left', () => {
    expect(geo.members[0].developedLengthMm).toBeCloseTo(1238.95, 2);
    expect(geo.facts['geometry.rearBraceAngleFromVerticalDeg']?.value).toBeCloseTo(46.7, 1);
    expect(geo.facts['geometry.rearBraceAngleFromVerticalDeg']?.members).toEqual(['backstay left']);
    expect(geo.members[0].side).toBe('left');
    expect(geo.members[0].bends).toEqual([]);
  });
});

describe('bend-plane rotation (sign convention: right-hand rule about the direction of travel)', () => {
  test('a second bend a quarter turn clockwise (seen looking back) is −90°; its mirror image +90°', () => {
    // Up the z axis, bend towards +y, run along +y, then bend towards +x. First plane normal
    // d_in × d_out = z × y = −x; second y × x = −z. A right-handed +90° turn about +y takes −x to
    // +z, so −z is a −90° turn (computed by hand).
    const g = analyse([[0, 0, 0], [0, 0, 1000], [0, 800, 1000], [600, 800, 1000]], [undefined, 100, 100, undefined]);
    expect(g.rotationsDeg[0]).toBeCloseTo(-90, 9);
    const m = analyse([[0, 0, 0], [0, 0, 1000], [0, -800, 1000], [600, -800, 1000]], [undefined, 100, 100, undefined]);
    expect(m.rotationsDeg[0]).toBeCloseTo(90, 9);
  });
  test('an S in one plane is 180°', () => {
    const g = analyse([[0, 0, 0], [0, 0, 1000], [0, 800, 1000], [0, 800, 2000]], [undefined, 100, 100, undefined]);
    expect(Math.abs(g.rotationsDeg[0] ?? 0)).toBeCloseTo(180, 9);
  });
});

describe('node stars: members meeting at a node and the angles between them', () => {
  test('backstay junction: main hoop, backstay and diagonal meet; angles between tube directions', () => {
    const geo = deriveCageGeometry(cageSpec());
    const jl = geo.nodes.find((n) => n.nodeId === 'jl')!;
    expect(jl.members.map((m) => m.name)).toEqual(['main hoop', 'backstay left', 'hoop diagonal']);
    const hoopBrace = jl.angles.find((a) => a.names.join() === 'main hoop,backstay left')!;
    // Brace (0,600,1000)→(−900,550,300): down-ray of the hoop is −z; angle = acos(700/√(900²+50²+700²)) = 52.16°, computed.
    expect(hoopBrace.angleDeg).toBeCloseTo((Math.acos(700 / Math.hypot(900, 50, 700)) * 180) / Math.PI, 9);
  });
});
