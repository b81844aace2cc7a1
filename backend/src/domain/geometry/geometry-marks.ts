// The measured geometry drawn on a view: the angle between a brace and the vertical, the drop from a
// hoop's top to where a brace attaches, the line a helmet must stay under, and the helmet itself.
// Marks are placed in the model frame (3D) and projected per view, so the same mark lands in the
// right place on every view that shows it. The words come from the derived values, never from the page.
import { projectPoint, widen, type Bounds, type Point2, type Point3, type ViewName } from './projection.js';
import { textBox, type Anchor, type Box } from './label-layout.js';
import { arcPath, attrs, INK, n, text } from './svg-parts.js';

export type GeometryMark =
  | { kind: 'angle'; views: readonly ViewName[]; vertex: Point3; from: Point3; to: Point3; label: string }
  | { kind: 'drop'; views: readonly ViewName[]; top: Point3; bottom: Point3; label: string }
  | { kind: 'line'; views: readonly ViewName[]; a: Point3; b: Point3; label: string }
  | { kind: 'sphere'; views: readonly ViewName[]; centre: Point3; radiusMm: number; label: string };

const MARK_COLOUR = '#3d3a8c';

const page = (p: Point3, view: ViewName): Point2 => {
  const q = projectPoint(p, view);
  return { u: q.u, v: q.v };
};

/** The page area a mark covers, so the view's frame leaves room for it. */
export function markBounds(mark: GeometryMark, view: ViewName, bounds: Bounds | null): Bounds | null {
  if (!mark.views.includes(view)) return bounds;
  const points: Point3[] =
    mark.kind === 'angle' ? [mark.vertex] : mark.kind === 'drop' ? [mark.top, mark.bottom] : mark.kind === 'line' ? [mark.a, mark.b] : [mark.centre];
  let out = bounds;
  for (const p of points) {
    const q = page(p, view);
    out = widen(out, q.u, q.v, mark.kind === 'sphere' ? mark.radiusMm : 0);
  }
  return out;
}

/** Where a mark's words go on a view (null when the view does not show it, or the angle is too small to draw). */
export function geometryMarkLabel(mark: GeometryMark, view: ViewName, fontMm: number): { at: Point2; words: string; anchor: Anchor; sizeMm: number } | null {
  if (!mark.views.includes(view)) return null;
  const sizeMm = fontMm * 0.85;
  const words = mark.label;
  switch (mark.kind) {
    case 'angle': {
      const g = angleGeometry(mark, view, fontMm);
      if (!g) return null;
      return { at: { u: g.c.u + Math.cos(g.at) * (g.r + fontMm * 0.6), v: g.c.v + Math.sin(g.at) * (g.r + fontMm * 0.6) - fontMm * 0.3 }, words, anchor: Math.cos(g.at) < 0 ? 'end' : 'start', sizeMm };
    }
    case 'drop': {
      const top = page(mark.top, view);
      const bottom = page(mark.bottom, view);
      const x = Math.max(top.u, bottom.u) + fontMm * 2.2;
      return { at: { u: x + fontMm * 0.6, v: (top.v + bottom.v) / 2 - fontMm * 0.3 }, words, anchor: 'start', sizeMm };
    }
    case 'line': {
      const a = page(mark.a, view);
      const b = page(mark.b, view);
      return { at: { u: (a.u + b.u) / 2, v: (a.v + b.v) / 2 + fontMm * 0.5 }, words, anchor: 'middle', sizeMm };
    }
    case 'sphere': {
      const c = page(mark.centre, view);
      return { at: { u: c.u, v: c.v - fontMm * 0.3 }, words, anchor: 'middle', sizeMm };
    }
  }
}

/** The page area a mark's words cover on a view, for the member names to keep clear of. */
export function geometryMarkLabelBox(mark: GeometryMark, view: ViewName, fontMm: number): Box | null {
  const l = geometryMarkLabel(mark, view, fontMm);
  return l ? textBox(l.at, l.words, l.sizeMm, l.anchor) : null;
}

/** An angle mark's vertex, arc radius and the direction its words go, or null when too small to draw. */
function angleGeometry(mark: Extract<GeometryMark, { kind: 'angle' }>, view: ViewName, fontMm: number) {
  const c = page(mark.vertex, view);
  const f = page(mark.from, view);
  const t = page(mark.to, view);
  const a1 = Math.atan2(f.v - c.v, f.u - c.u);
  const a2 = Math.atan2(t.v - c.v, t.u - c.u);
  const reach = Math.min(Math.hypot(f.u - c.u, f.v - c.v), Math.hypot(t.u - c.u, t.v - c.v));
  if (reach < 1) return null;
  const r = Math.min(reach * 0.45, fontMm * 6);
  // The words go just outside the wedge, beyond the brace (away from the vertical, which usually
  // runs down the hoop's leg), so they cross neither tube.
  let away = a2 - a1;
  if (away > Math.PI) away -= 2 * Math.PI;
  if (away < -Math.PI) away += 2 * Math.PI;
  return { c, f, t, a1, a2, r, at: a2 + Math.sign(away || 1) * 0.3 };
}

/** One mark as SVG, or '' when the view does not show it. `fontMm` sets the scale of words and ticks. */
export function geometryMarkSvg(mark: GeometryMark, view: ViewName, fontMm: number): string {
  if (!mark.views.includes(view)) return '';
  const thin = { fill: 'none', stroke: MARK_COLOUR, 'stroke-width': fontMm * 0.09 };
  const words = () => {
    const l = geometryMarkLabel(mark, view, fontMm);
    return l ? text(l.at, l.words, l.sizeMm, { fill: MARK_COLOUR, 'text-anchor': l.anchor }) : '';
  };
  switch (mark.kind) {
    case 'angle': {
      const g = angleGeometry(mark, view, fontMm);
      if (!g) return '';
      const { c, f, t, r } = g;
      const ray = (p: Point2) => `M${n(c.u)} ${n(-c.v)} L${n(c.u + (p.u - c.u) * (r * 1.25) / Math.hypot(p.u - c.u, p.v - c.v))} ${n(-(c.v + (p.v - c.v) * (r * 1.25) / Math.hypot(p.u - c.u, p.v - c.v)))}`;
      return (
        `<path${attrs({ d: `${ray(f)} ${ray(t)}`, ...thin, 'stroke-dasharray': `${n(fontMm * 0.4)} ${n(fontMm * 0.25)}` })}/>` +
        `<path${attrs({ d: arcPath(c, r, g.a1, g.a2), ...thin, 'stroke-width': fontMm * 0.14 })}/>` +
        words()
      );
    }
    case 'drop': {
      const top = page(mark.top, view);
      const bottom = page(mark.bottom, view);
      const off = fontMm * 2.2;
      const x = Math.max(top.u, bottom.u) + off;
      const tick = fontMm * 0.5;
      const d = `M${n(top.u)} ${n(-top.v)} L${n(x + tick)} ${n(-top.v)} M${n(bottom.u)} ${n(-bottom.v)} L${n(x + tick)} ${n(-bottom.v)} M${n(x)} ${n(-top.v)} L${n(x)} ${n(-bottom.v)}`;
      const arrows = [top.v, bottom.v]
        .map((v, i) => {
          const dir = i === 0 ? 1 : -1; // arrow heads point at the two extension lines
          return `M${n(x - tick * 0.5)} ${n(-v + dir * tick)} L${n(x)} ${n(-v)} L${n(x + tick * 0.5)} ${n(-v + dir * tick)}`;
        })
        .join(' ');
      return `<path${attrs({ d: `${d} ${arrows}`, ...thin })}/>` + words();
    }
    case 'line': {
      const a = page(mark.a, view);
      const b = page(mark.b, view);
      return (
        `<path${attrs({ d: `M${n(a.u)} ${n(-a.v)} L${n(b.u)} ${n(-b.v)}`, ...thin, 'stroke-width': fontMm * 0.12, 'stroke-dasharray': `${n(fontMm)} ${n(fontMm * 0.4)}` })}/>` +
        words()
      );
    }
    case 'sphere': {
      const c = page(mark.centre, view);
      return (
        `<circle${attrs({ cx: c.u, cy: -c.v, r: mark.radiusMm, fill: '#ffffff', 'fill-opacity': 0.6, stroke: INK, 'stroke-width': fontMm * 0.1, 'stroke-dasharray': `${n(fontMm * 0.5)} ${n(fontMm * 0.3)}` })}/>` +
        words()
      );
    }
  }
}
