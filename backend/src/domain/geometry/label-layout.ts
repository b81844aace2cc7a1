// Where the names beside the tubes go on a printed view, so that they neither cover one another nor
// the measured geometry's words nor the verdict symbols, and cross as few tubes as they can. Text boxes are estimated from the character
// count (Noto Sans averages a little over half an em per character: an estimate, generous on purpose);
// each name tries a few places around its symbol and takes the first that is clear, else the one that
// covers least. Page coordinates: u to the right, v up, in mm; a text's baseline is at its `at`.
import type { Point2 } from './projection.js';

export type Anchor = 'start' | 'middle' | 'end';

export interface Box {
  minU: number;
  maxU: number;
  minV: number;
  maxV: number;
}

/** Average advance of a character, in ems (estimate; Noto Sans is about 0.55 for lower-case text). */
const EM_PER_CHARACTER = 0.58;

/** The page area a line of text covers: from its descenders to the top of its capitals. */
export function textBox(at: Point2, words: string, sizeMm: number, anchor: Anchor): Box {
  const width = [...words].length * sizeMm * EM_PER_CHARACTER;
  const minU = anchor === 'start' ? at.u : anchor === 'end' ? at.u - width : at.u - width / 2;
  return { minU, maxU: minU + width, minV: at.v - sizeMm * 0.25, maxV: at.v + sizeMm * 0.78 };
}

/** The square around a disc. */
export function discBox(at: Point2, radiusMm: number): Box {
  return { minU: at.u - radiusMm, maxU: at.u + radiusMm, minV: at.v - radiusMm, maxV: at.v + radiusMm };
}

export function overlapArea(a: Box, b: Box): number {
  const du = Math.min(a.maxU, b.maxU) - Math.max(a.minU, b.minU);
  const dv = Math.min(a.maxV, b.maxV) - Math.max(a.minV, b.minV);
  return du > 0 && dv > 0 ? du * dv : 0;
}

export interface PlacedLabel {
  at: Point2;
  anchor: Anchor;
  box: Box;
}

/** A tube on the page: its centreline and half its drawn width. */
export interface PageTube {
  points: readonly Point2[];
  halfWidthMm: number;
}

/** How many points along the tubes' centrelines (one every `stepMm`) fall inside the box, widened by each tube's half width. */
export function tubeHits(box: Box, tubes: readonly PageTube[], stepMm: number): number {
  let hits = 0;
  for (const tube of tubes) {
    const w = tube.halfWidthMm;
    if (tube.points.every((p) => p.u < box.minU - w) || tube.points.every((p) => p.u > box.maxU + w)) continue;
    if (tube.points.every((p) => p.v < box.minV - w) || tube.points.every((p) => p.v > box.maxV + w)) continue;
    for (let i = 1; i < tube.points.length; i++) {
      const a = tube.points[i - 1]!;
      const b = tube.points[i]!;
      const steps = Math.max(1, Math.ceil(Math.hypot(b.u - a.u, b.v - a.v) / stepMm));
      for (let k = 0; k <= steps; k++) {
        const u = a.u + ((b.u - a.u) * k) / steps;
        const v = a.v + ((b.v - a.v) * k) / steps;
        if (u >= box.minU - w && u <= box.maxU + w && v >= box.minV - w && v <= box.maxV + w) hits++;
      }
    }
  }
  return hits;
}

/**
 * The place for a member's name beside its symbol (a disc of `radiusMm` at `at`): right of it, left
 * of it, then above and below on either side, then a line further out. The first place clear of
 * `taken` (other words, symbols) and of the tubes wins; else the one that covers the least of `taken`,
 * then crosses the fewest tubes. The caller adds the chosen box to `taken`.
 */
export function placeBesideSymbol(at: Point2, radiusMm: number, words: string, sizeMm: number, taken: readonly Box[], tubes: readonly PageTube[] = []): PlacedLabel {
  const r = radiusMm;
  const mid = at.v - sizeMm * 0.27; // the baseline that centres a line on the symbol
  const above = at.v + r + sizeMm * 0.3;
  const below = at.v - r - sizeMm * 0.85;
  const candidates: { at: Point2; anchor: Anchor }[] = [
    { at: { u: at.u + r * 1.3, v: mid }, anchor: 'start' },
    { at: { u: at.u - r * 1.3, v: mid }, anchor: 'end' },
    { at: { u: at.u + r * 0.9, v: above }, anchor: 'start' },
    { at: { u: at.u + r * 0.9, v: below }, anchor: 'start' },
    { at: { u: at.u - r * 0.9, v: above }, anchor: 'end' },
    { at: { u: at.u - r * 0.9, v: below }, anchor: 'end' },
    { at: { u: at.u, v: above }, anchor: 'middle' },
    { at: { u: at.u, v: below }, anchor: 'middle' },
    { at: { u: at.u + r * 1.3, v: mid - sizeMm * 1.3 }, anchor: 'start' },
    { at: { u: at.u + r * 1.3, v: mid + sizeMm * 1.3 }, anchor: 'start' },
    { at: { u: at.u - r * 1.3, v: mid - sizeMm * 1.3 }, anchor: 'end' },
    { at: { u: at.u - r * 1.3, v: mid + sizeMm * 1.3 }, anchor: 'end' },
    { at: { u: at.u, v: above + sizeMm * 1.2 }, anchor: 'middle' },
    { at: { u: at.u, v: below - sizeMm * 1.2 }, anchor: 'middle' },
  ];
  let best: PlacedLabel | null = null;
  let bestCover = Infinity;
  let bestHits = Infinity;
  for (const c of candidates) {
    const box = textBox(c.at, words, sizeMm, c.anchor);
    const cover = taken.reduce((sum, t) => sum + overlapArea(box, t), 0);
    const hits = cover === 0 || cover <= bestCover ? tubeHits(box, tubes, sizeMm * 0.4) : Infinity;
    if (cover === 0 && hits === 0) return { ...c, box };
    if (cover < bestCover || (cover === bestCover && hits < bestHits)) {
      best = { ...c, box };
      bestCover = cover;
      bestHits = hits;
    }
  }
  return best!;
}
