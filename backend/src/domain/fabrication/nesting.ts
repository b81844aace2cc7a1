// The buying list: the cut list grouped by tube (size and material), each group nested into stock
// sticks first-fit-decreasing with a kerf (the saw's cut width) between pieces, the offcuts left over,
// and the mass of what is bought (tube and plates). First-fit-decreasing is not always optimal, but it
// never uses more than 11/9 of the optimum plus one stick, and a builder can follow it by hand.
import { DENSITY_G_PER_CM3, tubeSectionProperties, type Material } from '../tube';

export interface CutPiece {
  memberId: string;
  /** The name the builder gave the member (what every output says). */
  label: string;
  lengthMm: number;
}

export interface TubeGroupInput {
  odMm: number;
  wallMm: number;
  material: Material | 'unspecified';
  pieces: CutPiece[];
}

export interface NestingOptions {
  stickLengthMm: number;
  kerfMm: number;
}

export interface Stick {
  pieces: CutPiece[];
  /** Stick length less the pieces and the kerfs between them. */
  offcutMm: number;
}

export interface BuyingGroup {
  odMm: number;
  wallMm: number;
  material: Material | 'unspecified';
  sticks: Stick[];
  /** Pieces longer than a stick: they need a longer stick or a joint, which this list will not plan. */
  tooLong: CutPiece[];
  massPerMetreKg: number;
  piecesLengthMm: number;
  boughtLengthMm: number;
  boughtMassKg: number;
}

export interface PlateInput {
  id: string;
  thicknessMm: number;
  areaMm2: number;
}

export interface BuyingList {
  stickLengthMm: number;
  kerfMm: number;
  groups: BuyingGroup[];
  /** Mass of the sticks bought. */
  tubeMassKg: number;
  /** Mass of the pieces that go into the cage (the offcuts excluded). */
  cutTubeMassKg: number;
  plateMassKg: number;
  /** Plates without a thickness or an area, left out of the mass. */
  platesWithoutSize: string[];
  totalMassKg: number;
}

export const NESTING_LIMITS = { minStickMm: 500, maxStickMm: 13_000, maxKerfMm: 10 } as const;
/** 6 m is the common metric stick; 20 ft the common imperial one. */
export const DEFAULT_STICK_MM = { metric: 6000, imperial: 20 * 12 * 25.4 } as const;
export const DEFAULT_KERF_MM = 2;

export interface NestingProblem {
  path: 'stickLengthMm' | 'kerfMm';
  message: string;
}

export function nestingProblems({ stickLengthMm, kerfMm }: NestingOptions): NestingProblem[] {
  const problems: NestingProblem[] = [];
  if (!Number.isFinite(stickLengthMm) || stickLengthMm < NESTING_LIMITS.minStickMm || stickLengthMm > NESTING_LIMITS.maxStickMm)
    problems.push({ path: 'stickLengthMm', message: `A stick must be from ${NESTING_LIMITS.minStickMm} mm to ${NESTING_LIMITS.maxStickMm / 1000} m long.` });
  if (!Number.isFinite(kerfMm) || kerfMm < 0) problems.push({ path: 'kerfMm', message: 'The kerf cannot be negative.' });
  else if (kerfMm > NESTING_LIMITS.maxKerfMm) problems.push({ path: 'kerfMm', message: `A kerf over ${NESTING_LIMITS.maxKerfMm} mm is not a saw cut; check the units.` });
  return problems;
}

/** First-fit-decreasing into sticks; a kerf is spent before every piece but the first of a stick. */
export function nestPieces(pieces: readonly CutPiece[], { stickLengthMm, kerfMm }: NestingOptions): { sticks: Stick[]; tooLong: CutPiece[] } {
  const sorted = [...pieces].sort((a, b) => b.lengthMm - a.lengthMm || a.label.localeCompare(b.label));
  const sticks: Stick[] = [];
  const tooLong: CutPiece[] = [];
  for (const piece of sorted) {
    if (piece.lengthMm > stickLengthMm) {
      tooLong.push(piece);
      continue;
    }
    const stick = sticks.find((s) => s.offcutMm >= piece.lengthMm + kerfMm);
    if (stick) {
      stick.pieces.push(piece);
      stick.offcutMm -= piece.lengthMm + kerfMm;
    } else sticks.push({ pieces: [piece], offcutMm: stickLengthMm - piece.lengthMm });
  }
  return { sticks, tooLong };
}

export function buyingList(groups: readonly TubeGroupInput[], plates: readonly (PlateInput | { id: string; thicknessMm?: number; areaMm2?: number })[], options: NestingOptions): BuyingList {
  const problems = nestingProblems(options);
  if (problems.length) throw new RangeError(problems.map((p) => p.message).join(' '));
  const out: BuyingGroup[] = groups.map((g) => {
    const { sticks, tooLong } = nestPieces(g.pieces, options);
    const material: Material = g.material === 'unspecified' ? 'other' : g.material;
    const massPerMetreKg = tubeSectionProperties({ odMm: g.odMm, wallMm: g.wallMm }, material).massPerMetreKg;
    const boughtLengthMm = sticks.length * options.stickLengthMm + tooLong.reduce((s, p) => s + p.lengthMm, 0);
    const piecesLengthMm = g.pieces.reduce((s, p) => s + p.lengthMm, 0);
    return { odMm: g.odMm, wallMm: g.wallMm, material: g.material, sticks, tooLong, massPerMetreKg, piecesLengthMm, boughtLengthMm, boughtMassKg: (massPerMetreKg * boughtLengthMm) / 1000 };
  });
  const platesWithoutSize: string[] = [];
  let plateMassKg = 0;
  for (const p of plates) {
    if (p.thicknessMm === undefined || p.areaMm2 === undefined) platesWithoutSize.push(p.id);
    // mm³ × g/cm³ → g / 1000 → kg: mm³/1000 = cm³.
    else plateMassKg += (p.thicknessMm * p.areaMm2 * DENSITY_G_PER_CM3.mild_steel) / 1_000_000;
  }
  const tubeMassKg = out.reduce((s, g) => s + g.boughtMassKg, 0);
  const cutTubeMassKg = out.reduce((s, g) => s + (g.massPerMetreKg * g.piecesLengthMm) / 1000, 0);
  return { ...options, groups: out, tubeMassKg, cutTubeMassKg, plateMassKg, platesWithoutSize, totalMassKg: tubeMassKg + plateMassKg };
}

const csvCell = (v: string | number) => {
  const s = String(v);
  // Spreadsheets run cells that start with = + - @ as formulas: a member label must stay text.
  const safe = /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
  return /[",\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
};

/** The buying list as CSV, one row per piece, in canonical units (mm, kg) with the unit in each header. */
export function buyingListCsv(list: BuyingList, sizeText: (g: BuyingGroup) => string): string {
  const rows: (string | number)[][] = [['tube', 'material', 'stick', 'member', 'piece length (mm)', 'offcut of stick (mm)', 'mass per metre (kg/m)']];
  for (const g of list.groups) {
    g.sticks.forEach((s, i) => {
      for (const p of s.pieces) rows.push([sizeText(g), g.material.replace(/_/g, ' '), i + 1, p.label, p.lengthMm.toFixed(1), s.offcutMm.toFixed(1), g.massPerMetreKg.toFixed(3)]);
    });
    for (const p of g.tooLong) rows.push([sizeText(g), g.material.replace(/_/g, ' '), 'longer than a stick', p.label, p.lengthMm.toFixed(1), '', g.massPerMetreKg.toFixed(3)]);
  }
  rows.push([], ['sticks of (mm)', list.stickLengthMm.toFixed(0)], ['kerf (mm)', list.kerfMm.toFixed(1)], ['tube bought (kg)', list.tubeMassKg.toFixed(2)], ['plates (kg)', list.plateMassKg.toFixed(2)], ['total (kg)', list.totalMassKg.toFixed(2)]);
  return rows.map((r) => r.map(csvCell).join(',')).join('\r\n') + '\r\n';
}
