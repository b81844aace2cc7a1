// Projection onto the side, top and front views, against closed forms worked out by hand in the
// model frame (x forward, y to the car's left, z up). The brace example is the issue's own: from
// (0, 500, 1150) to (-900, 450, 300) mm its true length is 1,238.95 mm (computed: sqrt(900² + 50² + 850²)).
import { describe, expect, it } from 'vitest';
import {
  pageLengthMm, pageMidpoint, projectPoint, projectView, segmentsOf, VIEW_AXES, VIEW_NAMES, type DrawnMember,
} from '@backend/domain/geometry/projection';

const cross = (a: { x: number; y: number; z: number }, b: { x: number; y: number; z: number }) => ({
  x: a.y * b.z - a.z * b.y + 0, y: a.z * b.x - a.x * b.z + 0, z: a.x * b.y - a.y * b.x + 0,
});

describe('projectPoint', () => {
  it.each([
    // view, point, page u, page v, depth (toward the viewer)
    ['side', { x: 300, y: 200, z: 1000 }, -300, 1000, 200],
    ['top', { x: 300, y: 200, z: 1000 }, -300, -200, 1000],
    ['front', { x: 300, y: 200, z: 1000 }, 200, 1000, 300],
  ] as const)('%s view of %o is (%d, %d), depth %d', (view, p, u, v, depth) => {
    expect(projectPoint(p, view)).toEqual({ u, v, depthMm: depth });
  });

  it.each(VIEW_NAMES)('the %s view is a true view: page right × page up points at the viewer', (view) => {
    const axes = VIEW_AXES[view];
    expect(cross(axes.u, axes.v)).toEqual(axes.toward);
  });
});

describe('projectView', () => {
  const brace: DrawnMember = { id: 'rb-l', name: 'backstay left', odMm: 38, centreline: [{ x: 0, y: 500, z: 1150 }, { x: -900, y: 450, z: 300 }] };
  const far: DrawnMember = { id: 'rb-r', name: 'backstay right', odMm: 38, centreline: [{ x: 0, y: -500, z: 1150 }, { x: -900, y: -450, z: 300 }] };

  it('keeps the true length of a line parallel to the page and foreshortens the rest', () => {
    const trueLength = Math.hypot(900, 50, 850);
    expect(trueLength).toBeCloseTo(1238.95, 2);
    const side = projectView([brace], 'side').members[0]!;
    expect(pageLengthMm(side.points)).toBeCloseTo(Math.hypot(900, 850), 6); // y drops out
    const front = projectView([brace], 'front').members[0]!;
    expect(pageLengthMm(front.points)).toBeCloseTo(Math.hypot(50, 850), 6); // x drops out
    const top = projectView([brace], 'top').members[0]!;
    expect(pageLengthMm(top.points)).toBeCloseTo(Math.hypot(900, 50), 6); // z drops out
  });

  it('orders members far to near so the nearer tube is drawn last', () => {
    expect(projectView([brace, far], 'side').members.map((m) => m.id)).toEqual(['rb-r', 'rb-l']);
    expect(projectView([far, brace], 'side').members.map((m) => m.id)).toEqual(['rb-r', 'rb-l']);
  });

  it('widens the bounds by half the OD of each tube', () => {
    expect(projectView([brace], 'side').bounds).toEqual({ minU: -19, maxU: 919, minV: 281, maxV: 1169 });
  });

  it('leaves out members without a centreline and has no bounds when nothing is drawn', () => {
    const view = projectView([{ ...brace, centreline: [] }], 'top');
    expect(view.members).toEqual([]);
    expect(view.bounds).toBeNull();
  });
});

describe('page helpers', () => {
  it('cuts a polyline into segments and finds its halfway point along the length', () => {
    const points = [{ u: 0, v: 0 }, { u: 300, v: 0 }, { u: 300, v: 100 }];
    expect(segmentsOf(points)).toHaveLength(2);
    expect(pageLengthMm(points)).toBe(400);
    expect(pageMidpoint(points)).toEqual({ u: 200, v: 0 });
  });
});
