// Small SVG string pieces for the cage views: numbers, escaping, paths, the verdict symbols and the
// measured-geometry marks. Presentation attributes only (no classes, no style sheets), because
// pdfmake's SVG converter ignores CSS and the PDF draws the very same string as the screen.
import type { Point2 } from './projection.js';
import { VERDICT_MARKS, type MarkVerdict } from './verdict-marks.js';

export const INK = '#1d2327';
export const MUTED = '#5b6670';
export const FONT_FAMILY = 'Noto Sans, NotoSans, sans-serif';

/** A coordinate for the page: v flipped (SVG's y runs down), 0.1 mm is finer than any print. */
export const n = (value: number): string => String(Math.round(value * 10) / 10);

const SPECIAL = /[&<>"']/;

export function escapeXml(text: string): string {
  // Most values (numbers, path data, colours) have nothing to escape; testing first is much cheaper.
  if (!SPECIAL.test(text)) return text;
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&apos;');
}

export function pathData(points: readonly Point2[]): string {
  let d = '';
  for (let i = 0; i < points.length; i += 1) d += `${i === 0 ? 'M' : ' L'}${n(points[i]!.u)} ${n(-points[i]!.v)}`;
  return d;
}

type Attrs = Record<string, string | number | undefined>;

export function attrs(a: Attrs): string {
  let out = '';
  for (const k in a) {
    const v = a[k];
    if (v !== undefined) out += ` ${k}="${typeof v === 'number' ? n(v) : escapeXml(v)}"`;
  }
  return out;
}

export function text(at: Point2, content: string, sizeMm: number, extra: Attrs = {}): string {
  return `<text${attrs({ x: at.u, y: -at.v, 'font-family': FONT_FAMILY, 'font-size': sizeMm, fill: INK, ...extra })}>${escapeXml(content)}</text>`;
}

/**
 * A verdict's symbol in a white disc: a cross for a fail, a question mark for a missing measurement,
 * a "W" for a waived finding, a tick for a pass. Its shape alone tells the verdict, without colour.
 */
export function symbol(verdict: MarkVerdict, at: Point2, radiusMm: number): string {
  const mark = VERDICT_MARKS[verdict];
  if (mark.symbol === 'none') return '';
  const { u, v } = { u: at.u, v: -at.v };
  const r = radiusMm;
  const disc = `<circle${attrs({ cx: u, cy: v, r, fill: '#ffffff', stroke: mark.colour, 'stroke-width': r * 0.22 })}/>`;
  const line = { fill: 'none', stroke: mark.colour, 'stroke-width': r * 0.26, 'stroke-linecap': 'round', 'stroke-linejoin': 'round' };
  const k = r * 0.45;
  switch (mark.symbol) {
    case 'cross':
      return `${disc}<path${attrs({ d: `M${n(u - k)} ${n(v - k)} L${n(u + k)} ${n(v + k)} M${n(u + k)} ${n(v - k)} L${n(u - k)} ${n(v + k)}`, ...line })}/>`;
    case 'tick':
      return `${disc}<path${attrs({ d: `M${n(u - k)} ${n(v)} L${n(u - k * 0.2)} ${n(v + k * 0.8)} L${n(u + k)} ${n(v - k * 0.7)}`, ...line })}/>`;
    case 'question':
      return disc + text({ u, v: -(v + r * 0.42) }, '?', r * 1.25, { 'text-anchor': 'middle', 'font-weight': 'bold', fill: mark.colour });
    case 'waived':
      return disc + text({ u, v: -(v + r * 0.4) }, 'W', r * 1.05, { 'text-anchor': 'middle', 'font-weight': 'bold', fill: mark.colour });
  }
}

/** A circular arc on the page from direction `fromRad` to `toRad` (angles measured with v up). */
export function arcPath(centre: Point2, radius: number, fromRad: number, toRad: number): string {
  let sweep = toRad - fromRad;
  while (sweep > Math.PI) sweep -= 2 * Math.PI;
  while (sweep < -Math.PI) sweep += 2 * Math.PI;
  const a = { u: centre.u + radius * Math.cos(fromRad), v: centre.v + radius * Math.sin(fromRad) };
  const b = { u: centre.u + radius * Math.cos(fromRad + sweep), v: centre.v + radius * Math.sin(fromRad + sweep) };
  // v is flipped on the page, so a counter-clockwise sweep (v up) is clockwise in SVG terms.
  return `M${n(a.u)} ${n(-a.v)} A${n(radius)} ${n(radius)} 0 0 ${sweep > 0 ? 0 : 1} ${n(b.u)} ${n(-b.v)}`;
}
