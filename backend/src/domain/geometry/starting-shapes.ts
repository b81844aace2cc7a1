// Starting shapes: nobody should type 40 coordinates to begin. From the handful of dimensions a
// tape gives, these generate the nodes and members of a cage in the model frame (docs/geometry.md),
// with tube sizes from a `sizeFor(kind)` callback (the class's lightest listed size, say) and bend
// radii of 3.5 × OD, which clears the 3 × OD most rulebooks ask (common practice, not a rule).
// Pure: the same choices and dimensions always give the same cage.
import type { MemberKind } from '../vocabulary.js';
import { analysePath } from './member-path.js';
import type { CageNode, NodeRole, PathEntry } from './model.js';
import { MODEL_LIMITS, nodeIndex, nodePoint } from './model.js';

/** The builder's choices, each with words of our own (the picker shows `STARTING_SHAPE_WORDS`). */
export interface StartingChoices {
  harnessBar: boolean;
  front: 'none' | 'front_hoop' | 'halo';
  doorBars: 'none' | 'straight' | 'crossed' | 'bowed';
  diagonal: 'none' | 'main_hoop' | 'backstays';
}

export const STARTING_SHAPE_WORDS = {
  base: 'Hoop and stays: a main hoop with a backstay each side',
  harnessBar: 'Harness bar across the main hoop',
  front: { none: 'Nothing in front', front_hoop: 'Front hoop along the screen, joined by roof rails', halo: 'Roof halo with A-pillar bars' },
  doorBars: { none: 'No door bars', straight: 'One straight bar each side', crossed: 'Two crossed bars each side', bowed: 'One bar each side, bowed outwards' },
  diagonal: { none: 'No diagonal', main_hoop: 'Diagonal across the main hoop', backstays: 'Diagonal between the backstays' },
} as const;

/** Canonical mm and degrees; the frame's origin is on the centreline at the main hoop's feet. */
export interface StartingDimensions {
  /** Centreline width between the main hoop's feet. */
  hoopWidthAtFeetMm: number;
  /** Centreline width across the main hoop's top corners. */
  hoopWidthAtTopMm: number;
  /** Floor to the centreline of the main hoop's top. */
  hoopHeightMm: number;
  /** Rearward lean of the main hoop from vertical (the top behind the feet). */
  hoopLeanDeg: number;
  /** How far forward of the main hoop the front hoop's (or A-pillars') feet stand. */
  frontHoopForwardMm?: number;
  /** How far behind the main hoop the backstays land. */
  backstayLandingBehindMm: number;
  /** Height of the backstay landings above the floor (default 300 mm, a typical strut tower). */
  backstayLandingHeightMm?: number;
  /** Height of the door bars (their middle) above the floor. */
  doorBarHeightMm?: number;
  /** Height of the harness bar (default 60 % of the hoop height). */
  harnessBarHeightMm?: number;
}

export type SizeFor = (kind: MemberKind) => { odMm: number; wallMm: number };

export interface GeneratedMember {
  id: string;
  kind: MemberKind;
  label: string;
  odMm: number;
  wallMm: number;
  path: PathEntry[];
}

export interface StartingShape {
  nodes: CageNode[];
  members: GeneratedMember[];
}

export type StartingShapeOutcome = { ok: true; shape: StartingShape } | { ok: false; problems: { path: string; message: string }[] };

/** Bend radius for a generated bend: 3.5 × OD, rounded up to 5 mm. */
export const startingClrMm = (odMm: number): number => Math.ceil((3.5 * odMm) / 5) * 5;
const BOW_OUT_MM = 80;
const DOOR_CROSS_SPREAD_MM = 150;

function dimensionProblems(d: StartingDimensions, c: StartingChoices): { path: string; message: string }[] {
  const out: { path: string; message: string }[] = [];
  const need = (field: keyof StartingDimensions, min: number, max: number) => {
    const v = d[field];
    if (v === undefined) return;
    if (!Number.isFinite(v) || v < min || v > max) out.push({ path: field, message: `Must be between ${min} and ${max}` });
  };
  need('hoopWidthAtFeetMm', 300, 2500);
  need('hoopWidthAtTopMm', 300, 2500);
  need('hoopHeightMm', 500, 2500);
  need('hoopLeanDeg', 0, 45);
  need('frontHoopForwardMm', 300, 3000);
  need('backstayLandingBehindMm', 100, 3000);
  need('backstayLandingHeightMm', 0, 2000);
  need('doorBarHeightMm', 100, 2000);
  need('harnessBarHeightMm', 100, 2500);
  if (c.front !== 'none' && d.frontHoopForwardMm === undefined) out.push({ path: 'frontHoopForwardMm', message: 'Needed for a front hoop or a halo' });
  if (c.doorBars !== 'none') {
    if (c.front === 'none') out.push({ path: 'doorBarHeightMm', message: 'Door bars need a front hoop or a halo to run to' });
    if (d.doorBarHeightMm === undefined) out.push({ path: 'doorBarHeightMm', message: 'Needed for door bars' });
    else if (d.doorBarHeightMm >= d.hoopHeightMm * 0.7) out.push({ path: 'doorBarHeightMm', message: 'Door bars must sit well below the hoop top' });
  }
  if (d.harnessBarHeightMm !== undefined && d.harnessBarHeightMm >= d.hoopHeightMm * 0.85)
    out.push({ path: 'harnessBarHeightMm', message: 'The harness bar must sit below the hoop top' });
  if ((d.backstayLandingHeightMm ?? 300) >= d.hoopHeightMm * 0.7) out.push({ path: 'backstayLandingHeightMm', message: 'Backstays must land well below the hoop top' });
  return out;
}

/** A leg from foot to top corner, and points on it at a height. */
function leg(foot: { x: number; y: number }, top: { x: number; y: number; z: number }) {
  return (z: number) => {
    const t = z / top.z;
    return { x: foot.x + (top.x - foot.x) * t, y: foot.y + (top.y - foot.y) * t, z };
  };
}

const round = (v: number) => Math.round(v * 10) / 10;

/**
 * Generates the cage for these choices and dimensions. Every generated path is checked as a tube
 * (tangents, radii); dimensions that cannot make one are refused with the reason.
 */
export function startingShape(choices: StartingChoices, d: StartingDimensions, sizeFor: SizeFor): StartingShapeOutcome {
  const problems = dimensionProblems(d, choices);
  if (problems.length > 0) return { ok: false, problems };

  const nodes: CageNode[] = [];
  const members: GeneratedMember[] = [];
  const add = (id: string, label: string, role: NodeRole, p: { x: number; y: number; z: number }): string => {
    nodes.push({ id, label, role, xMm: round(p.x), yMm: round(p.y), zMm: round(p.z) });
    return id;
  };
  const member = (id: string, kind: MemberKind, label: string, path: PathEntry[]) => {
    const size = sizeFor(kind);
    members.push({ id, kind, label, odMm: size.odMm, wallMm: size.wallMm, path });
  };
  const sides = [
    { s: 1, key: 'l', word: 'left' },
    { s: -1, key: 'r', word: 'right' },
  ] as const;

  // Main hoop: feet on the floor at x = 0, the top leaning back by the lean angle.
  const h = d.hoopHeightMm;
  const topX = -h * Math.tan((d.hoopLeanDeg * Math.PI) / 180);
  const mainOd = sizeFor('main_hoop').odMm;
  const mainClr = startingClrMm(mainOd);
  const mainLeg = (s: number) => leg({ x: 0, y: (s * d.hoopWidthAtFeetMm) / 2 }, { x: topX, y: (s * d.hoopWidthAtTopMm) / 2, z: h });
  // Backstays meet the top of the hoop just inside each top bend, on the straight past its tangent
  // point (the bend's setback from the corner, half the brace's OD and 10 mm more): common practice, and
  // at the hoop's top, where rulebooks ask them to be. On a leg below the bend they would sit a bend's
  // setback (about 3.5 ODs) under the top, lower than a "within 150 mm of the top" rule allows.
  const legLength = Math.hypot(topX, (d.hoopWidthAtFeetMm - d.hoopWidthAtTopMm) / 2, h);
  const cornerTurn = Math.PI - Math.acos(Math.max(-1, Math.min(1, ((d.hoopWidthAtTopMm - d.hoopWidthAtFeetMm) / 2) / legLength)));
  const setback = mainClr * Math.tan(cornerTurn / 2);
  const stayInset = setback + sizeFor('rear_brace').odMm / 2 + 10;
  const stayPoint = (s: number) => ({ x: topX, y: s * (d.hoopWidthAtTopMm / 2 - stayInset), z: h });
  // Each backstay needs its inset from the corner, and 25 mm to the middle of the top at least.
  const narrowestTop = Math.ceil(2 * (stayInset + 25));
  if (d.hoopWidthAtTopMm < narrowestTop)
    return { ok: false, problems: [{ path: 'hoopWidthAtTopMm', message: `The top must be at least ${narrowestTop} mm wide between the corners: two bends of CLR ${mainClr} mm and a backstay inside each` }] };

  const legJunctions: Record<'l' | 'r', { z: number; id: string }[]> = { l: [], r: [] };
  const junctionAt = (side: (typeof sides)[number], z: number, label: string): string => {
    const list = legJunctions[side.key];
    const near = list.find((j) => Math.abs(j.z - z) < 1);
    if (near) return near.id;
    const id = add(`mh-${label.replace(/ /g, '-')}-${side.key}`, `main hoop at ${label} ${side.word}`, 'junction', mainLeg(side.s)(z));
    list.push({ z, id });
    return id;
  };

  const feet: Record<string, string> = {};
  const tops: Record<string, string> = {};
  const stays: Record<string, string> = {};
  for (const side of sides) {
    feet[side.key] = add(`mh-foot-${side.key}`, `hoop foot ${side.word}`, 'foot', mainLeg(side.s)(0));
    tops[side.key] = add(`mh-top-${side.key}`, `hoop top ${side.word}`, 'bend', mainLeg(side.s)(h));
    stays[side.key] = add(`mh-backstay-${side.key}`, `main hoop at backstay ${side.word}`, 'junction', stayPoint(side.s));
  }

  // Backstays: straight back from the junction to the landing.
  const landZ = d.backstayLandingHeightMm ?? 300;
  const landings: Record<string, string> = {};
  for (const side of sides) {
    const j = stayPoint(side.s);
    landings[side.key] = add(`bs-foot-${side.key}`, `backstay foot ${side.word}`, 'foot', { x: j.x - d.backstayLandingBehindMm, y: j.y, z: landZ });
    member(`backstay-${side.key}`, 'rear_brace', `backstay ${side.word}`, [{ nodeId: stays[side.key] }, { nodeId: landings[side.key] }]);
  }

  if (choices.harnessBar) {
    const z = d.harnessBarHeightMm ?? Math.round(h * 0.6);
    const [l, r] = sides.map((side) => junctionAt(side, z, 'harness bar'));
    member('harness-bar', 'harness_bar', 'harness bar', [{ nodeId: l }, { nodeId: r }]);
  }

  // In front: the front hoop (raked along the screen, a little lower than the main hoop) or a halo.
  const frontFeet: Record<string, string> = {};
  const frontTops: Record<string, string> = {};
  let frontLeg: ((s: number) => (z: number) => { x: number; y: number; z: number }) | null = null;
  const frontJunctions: Record<'l' | 'r', { z: number; id: string }[]> = { l: [], r: [] };
  if (choices.front !== 'none') {
    const fx = d.frontHoopForwardMm!;
    const fh = h - 80;
    const fTopX = fx - fh * 0.55;
    frontLeg = (s: number) => leg({ x: fx, y: (s * d.hoopWidthAtFeetMm) / 2 }, { x: fTopX, y: (s * d.hoopWidthAtTopMm) / 2, z: fh });
    const word = choices.front === 'halo' ? 'A-pillar' : 'front hoop';
    for (const side of sides) {
      frontFeet[side.key] = add(`fh-foot-${side.key}`, `${word} foot ${side.word}`, 'foot', frontLeg(side.s)(0));
      frontTops[side.key] = add(`fh-top-${side.key}`, `${word} top ${side.word}`, 'bend', frontLeg(side.s)(fh));
    }
  }
  const frontJunctionAt = (side: (typeof sides)[number], z: number, label: string): string => {
    const list = frontJunctions[side.key];
    const near = list.find((j) => Math.abs(j.z - z) < 1);
    if (near) return near.id;
    const id = add(`fh-${label.replace(/ /g, '-')}-${side.key}`, `${choices.front === 'halo' ? 'A-pillar' : 'front hoop'} at ${label} ${side.word}`, 'junction', frontLeg!(side.s)(z));
    list.push({ z, id });
    return id;
  };

  if (choices.doorBars !== 'none') {
    const dz = d.doorBarHeightMm!;
    for (const side of sides) {
      if (choices.doorBars === 'crossed') {
        const a = junctionAt(side, dz - DOOR_CROSS_SPREAD_MM, 'door bar low');
        const b = frontJunctionAt(side, dz + DOOR_CROSS_SPREAD_MM, 'door bar high');
        const c = junctionAt(side, dz + DOOR_CROSS_SPREAD_MM, 'door bar high');
        const e = frontJunctionAt(side, dz - DOOR_CROSS_SPREAD_MM, 'door bar low');
        member(`door-bar-rising-${side.key}`, 'door_bar', `door bar rising ${side.word}`, [{ nodeId: a }, { nodeId: b }]);
        member(`door-bar-falling-${side.key}`, 'door_bar', `door bar falling ${side.word}`, [{ nodeId: c }, { nodeId: e }]);
        continue;
      }
      const a = junctionAt(side, dz, 'door bar');
      const b = frontJunctionAt(side, dz, 'door bar');
      if (choices.doorBars === 'straight') {
        member(`door-bar-${side.key}`, 'door_bar', `door bar ${side.word}`, [{ nodeId: a }, { nodeId: b }]);
        continue;
      }
      // Bowed outwards: a bend in the middle, pushed out from the car by BOW_OUT_MM.
      const pa = nodePoint(nodes.find((n) => n.id === a)!);
      const pb = nodePoint(nodes.find((n) => n.id === b)!);
      const mid = add(`door-bow-${side.key}`, `door bar bow ${side.word}`, 'bend', { x: (pa.x + pb.x) / 2, y: (pa.y + pb.y) / 2 + side.s * BOW_OUT_MM, z: dz });
      member(`door-bar-${side.key}`, 'door_bar', `door bar ${side.word}`, [{ nodeId: a }, { nodeId: mid, clrMm: startingClrMm(sizeFor('door_bar').odMm) }, { nodeId: b }]);
    }
  }

  if (choices.diagonal === 'main_hoop') {
    // From the right foot up to the left backstay junction: both ends on their nodes.
    member('diagonal', 'diagonal', 'main hoop diagonal', [{ nodeId: feet.r }, { nodeId: stays.l }]);
  } else if (choices.diagonal === 'backstays') {
    member('diagonal', 'diagonal', 'backstay diagonal', [{ nodeId: landings.r }, { nodeId: stays.l }]);
  }

  // Hoop paths: foot, the junctions on the leg in height order, the top corners (the main hoop's
  // backstay junctions between them, on its top), and down again.
  const legPath = (list: { z: number; id: string }[]) => [...list].sort((a, b) => a.z - b.z).map((j) => ({ nodeId: j.id }));
  const mainPath: PathEntry[] = [
    { nodeId: feet.l }, ...legPath(legJunctions.l),
    { nodeId: tops.l, clrMm: mainClr }, { nodeId: stays.l }, { nodeId: stays.r }, { nodeId: tops.r, clrMm: mainClr },
    ...legPath(legJunctions.r).reverse(), { nodeId: feet.r },
  ];
  members.unshift({ id: 'main-hoop', kind: 'main_hoop', label: 'main hoop', ...sizeFor('main_hoop'), path: mainPath });

  if (choices.front === 'front_hoop') {
    const od = sizeFor('front_hoop').odMm;
    const clr = startingClrMm(od);
    members.push({
      id: 'front-hoop', kind: 'front_hoop', label: 'front hoop', ...sizeFor('front_hoop'),
      path: [{ nodeId: frontFeet.l }, ...legPath(frontJunctions.l), { nodeId: frontTops.l, clrMm: clr }, { nodeId: frontTops.r, clrMm: clr }, ...legPath(frontJunctions.r).reverse(), { nodeId: frontFeet.r }],
    });
    for (const side of sides) member(`roof-rail-${side.key}`, 'roof_bar', `roof rail ${side.word}`, [{ nodeId: tops[side.key] }, { nodeId: frontTops[side.key] }]);
  } else if (choices.front === 'halo') {
    const od = sizeFor('halo_hoop').odMm;
    const clr = startingClrMm(od);
    members.push({
      id: 'halo', kind: 'halo_hoop', label: 'roof halo', ...sizeFor('halo_hoop'),
      path: [{ nodeId: tops.l }, { nodeId: frontTops.l, clrMm: clr }, { nodeId: frontTops.r, clrMm: clr }, { nodeId: tops.r }],
    });
    for (const side of sides)
      member(`a-pillar-${side.key}`, 'a_pillar', `A-pillar bar ${side.word}`, [{ nodeId: frontTops[side.key] }, ...legPath(frontJunctions[side.key]).reverse(), { nodeId: frontFeet[side.key] }]);
  }

  // Every path must be a tube; a dimension set that cannot make one says why.
  const index = nodeIndex(nodes);
  for (const m of members) {
    const r = analysePath(m.path.map((e) => nodePoint(index.get(e.nodeId)!)), m.path.map((e) => e.clrMm), m.odMm);
    if (!r.ok) return { ok: false, problems: [{ path: '', message: `These dimensions do not make a ${m.label} that can be bent: ${r.problems[0].message}` }] };
  }
  for (const n of nodes)
    if ([n.xMm, n.yMm, n.zMm].some((v) => Math.abs(v) > MODEL_LIMITS.coordinateMm))
      return { ok: false, problems: [{ path: '', message: 'These dimensions put a node more than 5 m from the origin: check the units.' }] };
  return { ok: true, shape: { nodes, members } };
}
