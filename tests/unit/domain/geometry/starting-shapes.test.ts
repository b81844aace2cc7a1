// Starting shapes: generated cages are valid sheets, measure what their dimensions say, and the
// picker's every combination makes a cage. Expected values computed by hand beside each check.
import { describe, expect, test } from 'vitest';
import { deriveCageGeometry, mirrorMember, startingShape } from '@backend/domain/geometry/index';
import type { StartingChoices, StartingDimensions } from '@backend/domain/geometry/index';
import { parseSpecification } from '@backend/contracts/specification';
import type { MemberKind } from '@backend/domain/vocabulary';
import { startingSizes } from '@backend/domain/tube-choice';
import { IN, LB, compileFile } from '../helpers';

const dims: StartingDimensions = {
  hoopWidthAtFeetMm: 1250, hoopWidthAtTopMm: 1050, hoopHeightMm: 1150, hoopLeanDeg: 8,
  frontHoopForwardMm: 1300, backstayLandingBehindMm: 900, doorBarHeightMm: 450,
};
const sizeFor = (kind: MemberKind) => (kind === 'main_hoop' || kind === 'front_hoop' || kind === 'halo_hoop' ? { odMm: 45, wallMm: 2.5 } : { odMm: 40, wallMm: 2 });
const full: StartingChoices = { harnessBar: true, front: 'front_hoop', doorBars: 'straight', diagonal: 'main_hoop' };

const generate = (choices: StartingChoices, d = dims) => {
  const r = startingShape(choices, d, sizeFor);
  if (!r.ok) throw new Error(JSON.stringify(r.problems));
  return r.shape;
};
const asSpec = (shape: ReturnType<typeof generate>) => ({ vehicle: { classId: 'x', driverSide: 'right' as const }, model: { nodes: shape.nodes }, members: shape.members });

describe('startingShape', () => {
  test.each([
    ['hoop and stays', { harnessBar: false, front: 'none', doorBars: 'none', diagonal: 'none' }, 3],
    ['+ harness bar', { harnessBar: true, front: 'none', doorBars: 'none', diagonal: 'none' }, 4],
    ['+ front hoop and straight door bars, main hoop diagonal', full, 10],
    ['+ halo, crossed door bars, backstay diagonal', { harnessBar: true, front: 'halo', doorBars: 'crossed', diagonal: 'backstays' }, 12],
    ['+ halo, bowed door bars', { harnessBar: false, front: 'halo', doorBars: 'bowed', diagonal: 'none' }, 8],
  ] as [string, StartingChoices, number][])('%s: a valid sheet of %i members', (_n, choices, count) => {
    const shape = generate(choices);
    expect(shape.members).toHaveLength(count);
    const parsed = parseSpecification(asSpec(shape));
    expect(parsed.ok ? [] : parsed.problems).toEqual([]);
  });

  test('the main hoop measures the dimensions typed', () => {
    const geo = deriveCageGeometry(asSpec(generate(full)));
    // Feet 1250 apart on the centreline, less one OD of 45 → 1205 inside.
    expect(geo.facts['geometry.mainHoopInsideWidthMm']?.value).toBeCloseTo(1205, 6);
    const hoop = geo.members.find((m) => m.kind === 'main_hoop')!;
    expect(hoop.bends).toHaveLength(2);
    expect(hoop.bends[0].clrMm).toBe(160); // 3.5 × 45 = 157.5, rounded up to 5 mm
    expect(hoop.side).toBe('centre');
    // Backstays run straight back 900 mm and drop from the junction to 300 mm: angle from vertical
    // atan(900 / (z_junction − 300)); the junction sits on the top of the hoop, at 1150 mm, so
    // atan(900 / 850) = 46.6°, and 0 mm below the hoop top.
    const stay = geo.members.find((m) => m.name === 'backstay left')!;
    expect(stay.side).toBe('left');
    expect(stay.driverSide).toBe('passenger');
    const a = geo.facts['geometry.rearBraceAngleFromVerticalDeg']!.value;
    expect(a).toBeCloseTo((Math.atan(900 / 850) * 180) / Math.PI, 6);
    // Inside the top bend: the near-90° bend sets back about its CLR (160 mm) from the corner, then half the
    // brace's 40 mm OD and 10 mm: about 190 mm in from the corner at y = 525, so y ≈ 335.
    const junction = generate(full).nodes.find((n) => n.id === 'mh-backstay-l')!;
    expect(junction.zMm).toBe(1150);
    expect(junction.yMm).toBeGreaterThan(525 - 190 - 1);
    expect(junction.yMm).toBeLessThan(525 - 160);
    expect(geo.facts['geometry.diagonalUpperEndFromNodeMm']?.value).toBe(0);
    expect(geo.facts['geometry.diagonalLowerEndFromNodeMm']?.value).toBe(0);
  });

  test.each([
    ['hoop and stays', { harnessBar: false, front: 'none', doorBars: 'none', diagonal: 'none' }],
    ['the full cage', full],
    ['halo, crossed door bars, backstay diagonal', { harnessBar: true, front: 'halo', doorBars: 'crossed', diagonal: 'backstays' }],
  ] as [string, StartingChoices][])('%s: the backstays meet the hoop at its top, by its top bends', (_n, choices) => {
    const shape = generate(choices);
    const geo = deriveCageGeometry(asSpec(shape));
    // F-NHRA-G1 (NHRA GR 4.10): rear braces meet the hoop ≤ 5 in from its top; F-SCCA-G1 (SCCA GCR,
    // older): not more than 6 in below the top. The stricter 5 in = 127 mm; a starting shape's brace
    // centreline meets the hoop's centreline at its top, half the hoop's 45 mm OD below the tube's top.
    expect(geo.facts['geometry.rearBraceAttachBelowTopMm']?.value).toBeCloseTo(45 / 2, 6);
    expect(geo.facts['geometry.rearBraceAttachBelowTopMm']!.value).toBeLessThanOrEqual(5 * IN);
    // F-MSUK-G1 (Motorsport UK): near the top outer bends; here within 200 mm of each corner node.
    for (const side of ['l', 'r']) {
      const junction = shape.nodes.find((n) => n.id === `mh-backstay-${side}`)!;
      const corner = shape.nodes.find((n) => n.id === `mh-top-${side}`)!;
      expect(Math.hypot(junction.xMm - corner.xMm, junction.yMm - corner.yMm, junction.zMm - corner.zMm)).toBeLessThan(200);
    }
  });

  test('door bars meet both hoops at the door bar height; bowed bars bend outwards', () => {
    const shape = generate({ ...full, doorBars: 'bowed' });
    const bow = shape.nodes.find((n) => n.id === 'door-bow-l')!;
    expect(bow.zMm).toBe(450);
    const ends = shape.members.find((m) => m.id === 'door-bar-l')!.path.map((e) => shape.nodes.find((n) => n.id === e.nodeId)!);
    expect(ends.map((n) => n.zMm)).toEqual([450, 450, 450]);
    expect(bow.yMm).toBeGreaterThan(Math.max(ends[0].yMm, ends[2].yMm));
  });

  test('dimensions are refused at their field with a reason', () => {
    const r = startingShape({ ...full }, { ...dims, hoopHeightMm: 40000, frontHoopForwardMm: undefined }, sizeFor);
    expect(r).toEqual({ ok: false, problems: [
      { path: 'hoopHeightMm', message: 'Must be between 500 and 2500' },
      { path: 'frontHoopForwardMm', message: 'Needed for a front hoop or a halo' },
    ] });
    const doors = startingShape({ ...full, front: 'none' }, dims, sizeFor);
    expect(doors).toEqual({ ok: false, problems: [{ path: 'doorBarHeightMm', message: 'Door bars need a front hoop or a halo to run to' }] });
  });

  test('a top too narrow for its bends and backstays is refused, not generated', () => {
    // Vertical legs 300 apart: each 90° bend of CLR 160 sets back 160 mm, a 40 mm backstay inside it
    // 20 + 10 mm more, and 25 mm to the middle: 2 × (160 + 30 + 25) = 430 mm of top (computed).
    const r = startingShape({ ...full, front: 'none', doorBars: 'none' }, { ...dims, hoopWidthAtFeetMm: 300, hoopWidthAtTopMm: 300, hoopLeanDeg: 0 }, sizeFor);
    expect(r).toEqual({ ok: false, problems: [{ path: 'hoopWidthAtTopMm', message: 'The top must be at least 430 mm wide between the corners: two bends of CLR 160 mm and a backstay inside each' }] });
    expect(startingShape({ ...full, front: 'none', doorBars: 'none' }, { ...dims, hoopWidthAtFeetMm: 430, hoopWidthAtTopMm: 430, hoopLeanDeg: 0 }, sizeFor).ok).toBe(true);
  });
});

describe('mirrorMember', () => {
  test('a left backstay mirrored is a right one on mirrored nodes, reusing a node already there', () => {
    const shape = generate({ harnessBar: false, front: 'none', doorBars: 'none', diagonal: 'none' });
    const left = shape.members.find((m) => m.id === 'backstay-l')!;
    const others = shape.members.filter((m) => m.id !== 'backstay-r');
    const nodes = shape.nodes.filter((n) => n.id !== 'bs-foot-r');
    const r = mirrorMember(nodes, others, left);
    if (!r.ok) throw new Error(r.message);
    expect(r.member).toEqual({ ...left, id: 'backstay-r', label: 'backstay right', path: [{ nodeId: 'mh-backstay-r' }, { nodeId: 'bs-foot-r' }] });
    const foot = r.nodes.find((n) => n.id === 'bs-foot-r')!;
    const orig = shape.nodes.find((n) => n.id === 'bs-foot-l')!;
    expect(foot).toEqual({ ...orig, id: 'bs-foot-r', label: 'backstay foot right', yMm: -orig.yMm });
    expect(r.nodes).toHaveLength(nodes.length + 1);
  });
  test('mirroring a member whose twin is already there is refused, naming the twin', () => {
    const shape = generate({ harnessBar: false, front: 'none', doorBars: 'none', diagonal: 'none' });
    const left = shape.members.find((m) => m.id === 'backstay-l')!;
    expect(mirrorMember(shape.nodes, shape.members, left)).toEqual({ ok: false, message: 'backstay right is already on the other side, on the mirrored nodes.' });
  });
  test('a hoop is its own mirror image', () => {
    const shape = generate(full);
    const r = mirrorMember(shape.nodes, shape.members, shape.members[0]);
    expect(r).toEqual({ ok: false, message: 'This member is its own mirror image (it crosses the car symmetrically).' });
  });
});

describe('startingSizes: the class’s lightest listed size, on the class’s weight basis', () => {
  // The demo club's § C4.2.2 (rulesets/tarnwick-vale-mc-cage-regulations-2027.json, invented) weighs
  // Club Saloons with the driver: 2,201–3,000 lb lists 1.500 × 0.120 and 1.750 × 0.095 in.
  const demo = compileFile('rulesets/tarnwick-vale-mc-cage-regulations-2027.json');
  test('2,600 lb with the driver picks the heavier band even though the car alone is 1,800 lb', () => {
    const sizes = startingSizes(demo, 'club-saloon', { weightWithDriverKg: 2600 * LB, weightWithoutDriverKg: 1800 * LB });
    // Computed: A = π/4 (D² − d²): 1.750 × 0.095 gives 0.5184 in², 1.500 × 0.120 gives 0.5202 in², so the first is lighter.
    expect(sizes.sizeFor('main_hoop')).toEqual({ odMm: 1.75 * IN, wallMm: 0.095 * IN }); // F-UNIT-1: 1 in = 25.4 mm
    expect(sizes.fallbacks.size).toBe(0);
  });
  test('without the weight the class bands on, a common size stands in and the builder is told why', () => {
    const sizes = startingSizes(demo, 'club-saloon', { weightWithoutDriverKg: 800 });
    expect(sizes.sizeFor('main_hoop')).toEqual({ odMm: 45, wallMm: 2.5 }); // common practice, not a rule
    expect(sizes.fallbacks.get('main_hoop')).toBe('the car’s weight is not typed yet');
  });
  test('a kind the rulebook lists no size for', () => {
    const sizes = startingSizes(demo, 'open-sprint', { weightWithoutDriverKg: 600 });
    expect(sizes.sizeFor('harness_bar')).toEqual({ odMm: 38, wallMm: 2 });
    expect(sizes.fallbacks.get('harness_bar')).toBe('the rulebook lists no size for it');
  });
});
