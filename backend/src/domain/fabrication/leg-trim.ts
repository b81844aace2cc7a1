// Hoop leg trim: a hoop bent from one tube, with legs left long, is cut so that both legs land on
// their floor pads (which may be at different heights) and the hoop stands at its intended lean with
// its top level across the car.
//
// Measures (docs/geometry.md, "Hoop leg trim"): with the hoop flat on the bench, each leg's height is
// taken square to the top's centreline, from that centreline down the hoop's plane to the leg's end
// (centreline). Pad heights are above one level datum in the car. The lean is the hoop plane's angle
// from vertical, positive leaning back. A leg cut at in-plane height h drops h·cos(lean) in the car,
// so with the top at height T it lands on a pad at P when h = (T − P) / cos(lean). The cut is level in
// the car, so the leg's end is bevelled at the lean, fore and aft.

export interface HoopLeg {
  /** In-plane height of the uncut leg's end below the top's centreline. */
  uncutMm: number;
  /** Height of the pad's surface above the datum. */
  padHeightMm: number;
  /** In-plane height, below the top's centreline, where the leg's lowest bend ends; no cut above it. */
  bendEndMm?: number;
}

export interface LegTrimInput {
  legs: [HoopLeg, HoopLeg];
  leanDeg: number;
  /** Height of the top's centreline above the datum; the tallest the legs allow when not given. */
  topHeightMm?: number;
  odMm: number;
}

export interface LegCut {
  /** In-plane height below the top's centreline at which to cut (mark it on the bench). */
  cutHeightMm: number;
  /** What comes off the leg's end, measured along the hoop's plane. */
  trimMm: number;
  padHeightMm: number;
}

export interface LegTrim {
  legs: [LegCut, LegCut];
  leanDeg: number;
  topHeightMm: number;
  /** The hoop's top surface above the datum (centreline plus half the OD). */
  topSurfaceHeightMm: number;
  /** Fore-and-aft bevel of each leg's end so it sits flat on a level pad. */
  footBevelDeg: number;
}

export interface LegTrimProblem {
  path: string;
  message: string;
}

export const LEG_TRIM_LIMITS = { maxLeanDeg: 60, maxHeightMm: 3000, maxPadMm: 1000 } as const;
const LEG_NAMES = ['left', 'right'] as const;
const rad = (deg: number) => (deg * Math.PI) / 180;
const mm = (v: number) => `${Math.round(v * 10) / 10} mm`;

/** `len` writes a length in the reader's units (the messages say how far short a leg is); mm by default. */
export function legTrimProblems(input: LegTrimInput, len: (mm: number) => string = mm): LegTrimProblem[] {
  const problems: LegTrimProblem[] = [];
  if (!Number.isFinite(input.leanDeg) || Math.abs(input.leanDeg) > LEG_TRIM_LIMITS.maxLeanDeg)
    problems.push({ path: 'leanDeg', message: `The lean must be within ±${LEG_TRIM_LIMITS.maxLeanDeg}° of vertical.` });
  if (!(input.odMm > 0)) problems.push({ path: 'odMm', message: 'The outside diameter must be positive.' });
  input.legs.forEach((leg, i) => {
    if (!Number.isFinite(leg.uncutMm) || leg.uncutMm <= 0 || leg.uncutMm > LEG_TRIM_LIMITS.maxHeightMm)
      problems.push({ path: `legs.${i}.uncutMm`, message: `The uncut leg must be more than 0 and at most ${LEG_TRIM_LIMITS.maxHeightMm} mm.` });
    if (!Number.isFinite(leg.padHeightMm) || Math.abs(leg.padHeightMm) > LEG_TRIM_LIMITS.maxPadMm)
      problems.push({ path: `legs.${i}.padHeightMm`, message: `A pad height must be within ±${LEG_TRIM_LIMITS.maxPadMm} mm of the datum.` });
    if (leg.bendEndMm !== undefined && (!Number.isFinite(leg.bendEndMm) || leg.bendEndMm < 0 || leg.bendEndMm >= leg.uncutMm))
      problems.push({ path: `legs.${i}.bendEndMm`, message: 'The bend must end above the leg’s uncut end.' });
  });
  if (problems.length) return problems;
  const cos = Math.cos(rad(input.leanDeg));
  const reach = input.legs.map((l) => l.padHeightMm + l.uncutMm * cos);
  const top = input.topHeightMm ?? Math.min(...reach);
  if (input.topHeightMm !== undefined && (!Number.isFinite(top) || Math.abs(top) > LEG_TRIM_LIMITS.maxHeightMm))
    return [{ path: 'topHeightMm', message: `The top's height must be within ${LEG_TRIM_LIMITS.maxHeightMm} mm of the datum.` }];
  input.legs.forEach((leg, i) => {
    const h = (top - leg.padHeightMm) / cos;
    const name = LEG_NAMES[i];
    if (h > leg.uncutMm + 1e-9)
      problems.push({ path: `legs.${i}.padHeightMm`, message: `The ${name} leg cannot reach this pad: it is ${len(h - leg.uncutMm)} short.` });
    else if (h <= (leg.bendEndMm ?? 0))
      problems.push({
        path: `legs.${i}.padHeightMm`,
        message: leg.bendEndMm === undefined
          ? `The ${name} pad is above where the hoop's top can be; the other leg is too short to stand the hoop over it.`
          : `The ${name} pad is too high: the cut would go into the leg's bend, ${len(leg.bendEndMm - h)} above where the bend ends.`,
      });
  });
  return problems;
}

export class LegTrimInputError extends Error {
  constructor(readonly problems: LegTrimProblem[]) {
    super(problems.map((p) => p.message).join(' '));
    this.name = 'LegTrimInputError';
  }
}

export function computeLegTrim(input: LegTrimInput): LegTrim {
  const problems = legTrimProblems(input);
  if (problems.length) throw new LegTrimInputError(problems);
  const cos = Math.cos(rad(input.leanDeg));
  const top = input.topHeightMm ?? Math.min(...input.legs.map((l) => l.padHeightMm + l.uncutMm * cos));
  const cut = (leg: HoopLeg): LegCut => {
    const h = (top - leg.padHeightMm) / cos;
    return { cutHeightMm: h, trimMm: leg.uncutMm - h, padHeightMm: leg.padHeightMm };
  };
  return {
    legs: [cut(input.legs[0]), cut(input.legs[1])],
    leanDeg: input.leanDeg,
    topHeightMm: top,
    topSurfaceHeightMm: top + input.odMm / 2,
    footBevelDeg: Math.abs(input.leanDeg),
  };
}

const fmt = (v: number) => (Math.round(v * 10) / 10).toString();

/**
 * A small side view (x forward, z up) of the trimmed hoop: the datum, both pads, both legs (left
 * solid, right dashed, so they read apart where they overlap), the lean and the cut heights. One SVG
 * string with presentation attributes only, so the PDF's converter draws it as the screen does.
 */
export function legTrimSideViewSvg(trim: LegTrim, odMm: number, units: (mm: number) => string = (v) => `${fmt(v)} mm`): string {
  const sin = Math.sin(rad(trim.leanDeg));
  const top = trim.topHeightMm;
  const feet = trim.legs.map((l) => ({ x: l.cutHeightMm * sin, z: l.padHeightMm }));
  const xs = [0, ...feet.map((f) => f.x)];
  const zs = [top + odMm, ...feet.map((f) => f.z), 0];
  const pad = Math.max(120, (Math.max(...zs) - Math.min(...zs)) * 0.12);
  const minZ = Math.min(...zs) - pad;
  const maxZ = Math.max(...zs) + pad;
  const h = maxZ - minZ;
  const font = h / 22;
  // Wide enough for every label (about 0.6 em a character in Noto Sans), so none is cut at the edge.
  const textW = (text: string) => text.length * font * 0.6;
  const padLabel = (i: number) => `${i === 0 ? 'left' : 'right'} pad ${units(trim.legs[i]!.padHeightMm)}`;
  const labelX = (i: number) => feet[i]!.x + (i === 0 ? -pad * 2.4 : pad * 0.7);
  const minX = Math.min(Math.min(...xs) - pad * 2.6, labelX(0) - font / 2);
  const maxX = Math.max(Math.max(...xs) + pad * 2.6, labelX(1) + textW(padLabel(1)) + font / 2, labelX(0) + textW(padLabel(0)) + font / 2, pad * 0.4 + textW(`top ${units(top)}`) + font / 2);
  const w = maxX - minX;
  // SVG's y grows downwards: flip z.
  const Y = (z: number) => fmt(maxZ - z + minZ);
  const X = (x: number) => fmt(x);
  const stroke = Math.max(odMm, h / 200);
  const parts: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="${fmt(minX)} ${fmt(minZ)} ${fmt(w)} ${fmt(h)}" width="${fmt(Math.min(360, (360 * w) / h))}" height="${fmt(Math.min(360, (360 * h) / w))}" role="img">`,
    `<title>Hoop leg trim, side view: lean ${fmt(trim.leanDeg)}°, top ${units(top)} above the datum</title>`,
    `<line x1="${X(minX)}" y1="${Y(0)}" x2="${X(maxX)}" y2="${Y(0)}" stroke="#5b6670" stroke-width="${fmt(stroke / 3)}" stroke-dasharray="${fmt(font / 2)} ${fmt(font / 3)}"/>`,
    `<text x="${X(minX + font / 2)}" y="${Y(0 + font / 3)}" font-family="NotoSans, Noto Sans, sans-serif" font-size="${fmt(font * 0.8)}" fill="#5b6670">datum</text>`,
  ];
  trim.legs.forEach((leg, i) => {
    const foot = feet[i]!;
    const dash = i === 1 ? ` stroke-dasharray="${fmt(stroke * 2.5)} ${fmt(stroke * 1.5)}"` : '';
    const colour = i === 0 ? '#1d2327' : '#2a5d8f';
    parts.push(
      `<line x1="${X(foot.x - pad * 0.6)}" y1="${Y(foot.z)}" x2="${X(foot.x + pad * 0.6)}" y2="${Y(foot.z)}" stroke="${colour}" stroke-width="${fmt(stroke * 1.4)}"${dash}/>`,
      `<line x1="${X(0)}" y1="${Y(top)}" x2="${X(foot.x)}" y2="${Y(foot.z)}" stroke="${colour}" stroke-width="${fmt(stroke)}"${dash}/>`,
      `<text x="${X(labelX(i))}" y="${Y(foot.z - font * (i === 0 ? 1.2 : -0.4))}" font-family="NotoSans, Noto Sans, sans-serif" font-size="${fmt(font)}" fill="${colour}">${padLabel(i)}</text>`,
    );
  });
  parts.push(
    `<circle cx="${X(0)}" cy="${Y(top)}" r="${fmt(odMm / 2)}" fill="#1d2327"/>`,
    `<text x="${X(pad * 0.4)}" y="${Y(top + font * 0.3)}" font-family="NotoSans, Noto Sans, sans-serif" font-size="${fmt(font)}" fill="#1d2327">top ${units(top)}</text>`,
    `<text x="${X(minX + font / 2)}" y="${Y(top - font * 2)}" font-family="NotoSans, Noto Sans, sans-serif" font-size="${fmt(font)}" fill="#1d2327">lean ${fmt(trim.leanDeg)}°</text>`,
    '</svg>',
  );
  return parts.join('');
}
