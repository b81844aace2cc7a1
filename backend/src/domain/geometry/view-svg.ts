// One SVG string per view of the cage, shared by the build sheet, the review page and the PDF: the
// viewBox is in millimetres so the drawing is to scale, each tube is stroked at its OD, each member is
// marked by its worst finding (tint, centreline pattern and symbol from VERDICT_MARKS), and the
// measured geometry is drawn over it. Presentation attributes only, text in Noto Sans: pdfmake's SVG
// converter ignores classes, and this way the PDF and the screen draw the same thing.
import { formatQuantity, type UnitSystem } from '../units.js';
import { geometryMarkLabelBox, geometryMarkSvg, markBounds, type GeometryMark } from './geometry-marks.js';
import { discBox, placeBesideSymbol, type Box, type PageTube } from './label-layout.js';
import { pageMidpoint, VIEW_TITLES, type Bounds, type Point2, type ProjectedView } from './projection.js';
import { attrs, escapeXml, INK, MUTED, n, pathData, symbol, text } from './svg-parts.js';
import { dashArrayMm, VERDICT_MARKS, type MarkVerdict } from './verdict-marks.js';

export interface SvgMemberInfo {
  /** The name the builder gave the member ("backstay left"). */
  name: string;
  /** "45.0 × 2.50 mm" in the reader's units. */
  sizeText: string;
  verdict: MarkVerdict;
  /** The worst finding's rule when it does not pass. */
  rule: string | null;
}

export interface CageSvgOptions {
  /** Marks and words per member id; a member without an entry is drawn unchecked. */
  members: ReadonlyMap<string, SvgMemberInfo>;
  marks?: readonly GeometryMark[];
  units: UnitSystem;
  /** The member to draw with a halo (a finding asked to show it). */
  highlightId?: string | null;
  /** Names beside the tubes (the PDF has no hover); on screen the hover names them. */
  labels?: boolean;
  /** Replaces the view's own title (role="img" needs one). */
  title?: string;
}

const NEUTRAL: SvgMemberInfo = { name: '', sizeText: '', verdict: 'unchecked', rule: null };

/** The frame around the drawing: its bounds, the marks, the floor and room for the scale bar. */
function frameOf(view: ProjectedView, marks: readonly GeometryMark[]): Bounds {
  let b = view.bounds ?? { minU: -500, maxU: 500, minV: 0, maxV: 1000 };
  for (const m of marks) b = markBounds(m, view.view, b) ?? b;
  // The floor (v = 0) shows in the side and front views, so the hoop's height reads at a glance.
  if (view.view !== 'top') b = { ...b, minV: Math.min(b.minV, 0) };
  const span = Math.max(b.maxU - b.minU, b.maxV - b.minV, 200);
  const pad = span * 0.1;
  return { minU: b.minU - pad, maxU: b.maxU + pad * 2.2, minV: b.minV - pad * 1.6, maxV: b.maxV + pad };
}

/** A round scale-bar length near a fifth of the drawing's width, in the reader's units. */
function scaleBar(widthMm: number, units: UnitSystem): { mm: number; label: string } {
  const unitMm = units === 'imperial' ? 25.4 : 1;
  const target = widthMm / 5 / unitMm;
  const steps = units === 'imperial' ? [6, 12, 18, 24, 36, 48] : [100, 200, 250, 500, 1000];
  const pick = steps.reduce((best, s) => (Math.abs(s - target) < Math.abs(best - target) ? s : best), steps[0]!);
  const mm = pick * unitMm;
  return { mm, label: formatQuantity(mm, 'length', units, { decimals: 0 }).text };
}

// Written out by hand rather than through attrs(): this runs for every tube of every view on each
// keystroke, and only the hover words need escaping (ids are [A-Za-z0-9_.-], the rest are numbers).
function memberSvg(m: ProjectedView['members'][number], info: SvgMemberInfo, highlighted: boolean): string {
  const mark = VERDICT_MARKS[info.verdict];
  const d = pathData(m.points);
  const round = `fill="none" stroke-linecap="round" stroke-linejoin="round" d="${d}"`;
  const hover = [info.name || m.name, info.sizeText, mark.label, info.rule].filter(Boolean).join(' · ');
  const dash = dashArrayMm(mark, m.odMm);
  let out = `<g data-member-id="${escapeXml(m.id)}" data-verdict="${info.verdict}" cursor="pointer"><title>${escapeXml(hover)}</title>`;
  if (highlighted) out += `<path ${round} stroke="#f2b705" stroke-width="${n(m.odMm * 2.6)}" stroke-opacity="0.75"/>`;
  out += `<path ${round} stroke="${INK}" stroke-width="${n(m.odMm * 1.16)}"/><path ${round} stroke="${mark.tint}" stroke-width="${n(m.odMm * 0.96)}"/>`;
  if (info.verdict !== 'unchecked')
    out += `<path fill="none" d="${d}" stroke="${mark.colour}" stroke-width="${n(m.odMm * 0.3)}" stroke-linejoin="round"${dash.length ? ` stroke-dasharray="${dash.join(' ')}"` : ''}/>`;
  return `${out}</g>`;
}

interface MarkGroup {
  at: Point2;
  ids: string[];
  names: string[];
  verdict: MarkVerdict;
  odMm: number;
}

/** Members' marks gathered where they would overlap on the page, worst member first in each group. */
function markGroups(view: ProjectedView, members: ReadonlyMap<string, SvgMemberInfo>, fontMm: number): MarkGroup[] {
  const ordered = [...view.members].sort((a, b) => VERDICT_MARKS[(members.get(a.id) ?? NEUTRAL).verdict].rank - VERDICT_MARKS[(members.get(b.id) ?? NEUTRAL).verdict].rank);
  const groups: MarkGroup[] = [];
  for (const m of ordered) {
    const info = members.get(m.id) ?? NEUTRAL;
    const at = pageMidpoint(m.points);
    const near = groups.find((g) => Math.hypot(g.at.u - at.u, g.at.v - at.v) < fontMm * 1.6);
    if (near) {
      near.ids.push(m.id);
      near.names.push(info.name || m.name);
    } else groups.push({ at, ids: [m.id], names: [info.name || m.name], verdict: info.verdict, odMm: m.odMm });
  }
  return groups;
}

/**
 * One view as parts: the `<svg>` element's attributes and title, then keyed pieces of its content in
 * drawing order (the frame, one per member, the geometry marks, the symbols, the scale bar). The
 * screen renders each piece on its own, so moving a node re-parses only the pieces that changed; the
 * PDF takes the whole string (`cageViewSvg`), which is the parts joined.
 */
export interface CageViewParts {
  attrs: Record<string, string>;
  title: string;
  parts: { key: string; svg: string }[];
}

export function cageViewParts(view: ProjectedView, options: CageSvgOptions): CageViewParts {
  const marks = options.marks ?? [];
  const f = frameOf(view, marks);
  const width = f.maxU - f.minU;
  const height = f.maxV - f.minV;
  const fontMm = Math.max(width, height) * 0.02;
  const title = options.title ?? VIEW_TITLES[view.view];
  const parts: { key: string; svg: string }[] = [];
  let frame = `<rect${attrs({ x: f.minU, y: -f.maxV, width, height, fill: '#ffffff' })}/>`;
  if (view.view !== 'top') {
    frame += `<path${attrs({ d: `M${n(f.minU)} 0 L${n(f.maxU)} 0`, stroke: MUTED, 'stroke-width': fontMm * 0.08 })}/>`;
    frame += text({ u: f.minU + fontMm * 0.4, v: fontMm * 0.35 }, 'floor', fontMm * 0.7, { fill: MUTED });
  }
  if (view.view !== 'side') {
    // The car's centreline (y = 0): vertical in the front view, horizontal in the top view.
    const d = view.view === 'front' ? `M0 ${n(-f.maxV)} L0 ${n(-f.minV)}` : `M${n(f.minU)} 0 L${n(f.maxU)} 0`;
    frame += `<path${attrs({ d, stroke: MUTED, 'stroke-width': fontMm * 0.06, 'stroke-dasharray': `${n(fontMm * 1.2)} ${n(fontMm * 0.3)} ${n(fontMm * 0.2)} ${n(fontMm * 0.3)}` })}/>`;
  }
  if (view.members.length === 0) {
    frame += text({ u: (f.minU + f.maxU) / 2, v: (f.minV + f.maxV) / 2 }, 'No members with a path to draw yet', fontMm, { 'text-anchor': 'middle', fill: MUTED });
  }
  parts.push({ key: 'frame', svg: frame });
  for (const m of view.members) parts.push({ key: `member:${m.id}`, svg: memberSvg(m, options.members.get(m.id) ?? NEUTRAL, options.highlightId === m.id) });
  parts.push({ key: 'marks', svg: marks.map((mark) => geometryMarkSvg(mark, view.view, fontMm)).join('') });
  // Symbols and names last, so no tube hides them. Members whose marks would land on one another (the
  // left and right backstays in the side view) share one symbol, the worst, and one label naming them all.
  // Each name goes where it covers no other name, no symbol and no words of the measured geometry
  // (label-layout.ts), beside its symbol.
  let symbols = '';
  const groups = markGroups(view, options.members, fontMm).map((g) => ({ ...g, r: Math.max(g.odMm * 0.9, fontMm * 0.65) }));
  const taken: Box[] = options.labels
    ? [
        ...marks.map((mark) => geometryMarkLabelBox(mark, view.view, fontMm)).filter((b): b is Box => b !== null),
        ...groups.map((g) => discBox(g.at, g.r)),
      ]
    : [];
  const tubes: PageTube[] = options.labels ? view.members.map((m) => ({ points: m.points, halfWidthMm: m.odMm * 0.58 })) : [];
  // The car's centreline too, where the view draws it: a name across it is hard to read.
  if (options.labels && view.view === 'top') tubes.push({ points: [{ u: f.minU, v: 0 }, { u: f.maxU, v: 0 }], halfWidthMm: fontMm * 0.1 });
  if (options.labels && view.view === 'front') tubes.push({ points: [{ u: 0, v: f.minV }, { u: 0, v: f.maxV }], halfWidthMm: fontMm * 0.1 });
  for (const group of groups) {
    symbols += `<g${attrs({ 'data-member-id': group.ids[0], cursor: 'pointer' })}>${symbol(group.verdict, group.at, group.r)}</g>`;
    if (options.labels) {
      const words = group.names.join(' / ');
      const placed = placeBesideSymbol(group.at, group.r, words, fontMm * 0.8, taken, tubes);
      taken.push(placed.box);
      symbols += text(placed.at, words, fontMm * 0.8, { fill: INK, ...(placed.anchor === 'start' ? {} : { 'text-anchor': placed.anchor }) });
    }
  }
  parts.push({ key: 'symbols', svg: symbols });
  const bar = scaleBar(width, options.units);
  const y = f.minV + fontMm * 1.2;
  const x0 = f.maxU - bar.mm - fontMm;
  parts.push({
    key: 'scale',
    svg:
      `<path${attrs({ d: `M${n(x0)} ${n(-y)} L${n(x0 + bar.mm)} ${n(-y)} M${n(x0)} ${n(-y - fontMm * 0.3)} L${n(x0)} ${n(-y + fontMm * 0.3)} M${n(x0 + bar.mm)} ${n(-y - fontMm * 0.3)} L${n(x0 + bar.mm)} ${n(-y + fontMm * 0.3)}`, stroke: INK, 'stroke-width': fontMm * 0.1, fill: 'none' })}/>` +
      text({ u: x0 + bar.mm / 2, v: y + fontMm * 0.45 }, bar.label, fontMm * 0.75, { 'text-anchor': 'middle' }),
  });
  return {
    attrs: { viewBox: `${n(f.minU)} ${n(-f.maxV)} ${n(width)} ${n(height)}`, role: 'img', 'aria-label': title, 'font-family': 'Noto Sans, NotoSans, sans-serif' },
    title,
    parts,
  };
}

/** The SVG document of one view: its parts joined (what the PDF embeds). */
export function cageViewSvg(view: ProjectedView, options: CageSvgOptions): string {
  return viewPartsSvg(cageViewParts(view, options));
}

export function viewPartsSvg(v: CageViewParts): string {
  return `<svg xmlns="http://www.w3.org/2000/svg"${attrs(v.attrs)}><title>${escapeXml(v.title)}</title>${v.parts.map((p) => p.svg).join('')}</svg>`;
}

/** A short length of tube with a verdict's mark and symbol, for the legend (screen and PDF alike). */
export function legendSwatchSvg(verdict: MarkVerdict, title: string = VERDICT_MARKS[verdict].label): string {
  const od = 10;
  const member = { id: `legend-${verdict}`, name: title, odMm: od, points: [{ u: 6, v: -8 }, { u: 54, v: -8 }], depthMm: 0 };
  const body = memberSvg(member, { name: title, sizeText: '', verdict, rule: null }, false).replace(/ cursor="pointer"/g, '');
  return `<svg xmlns="http://www.w3.org/2000/svg"${attrs({ viewBox: '0 0 80 16', width: 40, height: 8, role: 'img', 'aria-label': title })}>${body}${symbol(verdict, { u: 70, v: -8 }, 7)}</svg>`;
}
