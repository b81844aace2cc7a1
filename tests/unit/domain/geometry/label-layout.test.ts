// Names beside the tubes on a printed view: each goes where it covers no other words and no symbol,
// and crosses as few tubes as it can (the PDF has no hover to name a tube).
import { describe, expect, it } from 'vitest';
import { XmlDocument, type XmlElement } from 'xmldoc';
import { overlapArea, placeBesideSymbol, textBox, tubeHits, type Anchor, type Box } from '@backend/domain/geometry/label-layout';
import { projectView, VIEW_NAMES } from '@backend/domain/geometry/projection';
import { cageViewSvg, type SvgMemberInfo } from '@backend/domain/geometry/view-svg';
import type { GeometryMark } from '@backend/domain/geometry/geometry-marks';
import { SAMPLE_CAGE } from './sample-cage';

describe('placeBesideSymbol', () => {
  const at = { u: 100, v: 100 };
  it('puts a name right of its symbol when that place is clear', () => {
    const placed = placeBesideSymbol(at, 10, 'main hoop', 8, []);
    expect(placed.anchor).toBe('start');
    expect(placed.at.u).toBeGreaterThan(110);
    expect(placed.box.minV).toBeLessThan(100);
    expect(placed.box.maxV).toBeGreaterThan(100);
  });

  it('moves the name when the place right of the symbol holds other words, and covers none of them', () => {
    const other = textBox({ u: 112, v: 97 }, '25 mm below the hoop top', 8, 'start');
    const placed = placeBesideSymbol(at, 10, 'main hoop', 8, [other]);
    expect(overlapArea(placed.box, other)).toBe(0);
    expect(placed.at.u).not.toBeCloseTo(113);
  });

  it('keeps off a tube when a clear place exists, and stays beside the symbol', () => {
    // A vertical tube just right of the symbol.
    const tube = { points: [{ u: 125, v: 0 }, { u: 125, v: 200 }], halfWidthMm: 5 };
    const placed = placeBesideSymbol(at, 10, 'harness bar', 8, [], [tube]);
    expect(tubeHits(placed.box, [tube], 2)).toBe(0);
    expect(placed.anchor).toBe('end');
    expect(Math.abs(placed.box.maxU - at.u)).toBeLessThan(20);
  });

  it('with every place taken, takes the one that covers least', () => {
    const wall: Box = { minU: 0, maxU: 400, minV: 0, maxV: 200 };
    const placed = placeBesideSymbol(at, 10, 'x', 8, [wall]);
    expect(placed).toBeDefined();
    expect(overlapArea(placed.box, wall)).toBeGreaterThan(0);
  });
});

describe('names on a labelled view', () => {
  const members = new Map<string, SvgMemberInfo>([
    ['mh', { name: 'main hoop', sizeText: '45.0 × 2.50 mm', verdict: 'pass', rule: null }],
    ['rb-l', { name: 'backstay left', sizeText: '38.0 × 2.00 mm', verdict: 'fail', rule: null }],
    ['rb-r', { name: 'backstay right', sizeText: '38.0 × 2.00 mm', verdict: 'fail', rule: null }],
    ['hb', { name: 'harness bar', sizeText: '38.0 × 2.00 mm', verdict: 'pass', rule: null }],
  ]);
  // The measured geometry's words, crowded round the hoop top and the backstays as on a real sheet.
  const marks: GeometryMark[] = [
    { kind: 'angle', views: ['side'], vertex: { x: -50, y: 450, z: 1100 }, from: { x: -50, y: 450, z: 600 }, to: { x: -900, y: 450, z: 300 }, label: '46.7° from vertical' },
    { kind: 'drop', views: ['side'], top: { x: -50, y: 450, z: 1172.5 }, bottom: { x: -50, y: 450, z: 1100 }, label: '73 mm below the top' },
    { kind: 'line', views: ['side', 'front'], a: { x: -50, y: 0, z: 1172.5 }, b: { x: -475, y: 0, z: 700 }, label: 'line of the hoop tops' },
  ];

  function texts(el: XmlElement, out: XmlElement[] = []): XmlElement[] {
    if (el.name === 'text') out.push(el);
    for (const c of el.children) if (c.type === 'element') texts(c as XmlElement, out);
    return out;
  }

  it.each(VIEW_NAMES)('the %s view: no name covers another name or the geometry words', (view) => {
    const doc = new XmlDocument(cageViewSvg(projectView(SAMPLE_CAGE, view), { members, units: 'metric', marks, labels: true }));
    const words = new Set([...[...members.values()].map((m) => m.name), ...marks.map((m) => m.label)]);
    const boxes = texts(doc)
      .filter((t) => [...words].some((w) => t.val.includes(w)))
      .map((t) => ({ words: t.val, box: textBox({ u: Number(t.attr.x), v: -Number(t.attr.y) }, t.val, Number(t.attr['font-size']), (t.attr['text-anchor'] ?? 'start') as Anchor) }));
    expect(boxes.length).toBeGreaterThan(1);
    for (let i = 0; i < boxes.length; i++) {
      for (let j = i + 1; j < boxes.length; j++) {
        expect(overlapArea(boxes[i]!.box, boxes[j]!.box), `"${boxes[i]!.words}" and "${boxes[j]!.words}"`).toBe(0);
      }
    }
  });

  it("the top view: no name lies across the car's centreline, though the hoop and harness bar share a symbol on it", () => {
    const doc = new XmlDocument(cageViewSvg(projectView(SAMPLE_CAGE, 'top'), { members, units: 'metric', marks: [], labels: true }));
    const names = texts(doc).filter((t) => [...members.values()].some((m) => t.val.includes(m.name)));
    expect(names.map((t) => t.val).sort()).toEqual(['backstay left', 'backstay right', 'main hoop / harness bar']);
    for (const t of names) {
      const box = textBox({ u: Number(t.attr.x), v: -Number(t.attr.y) }, t.val, Number(t.attr['font-size']), (t.attr['text-anchor'] ?? 'start') as Anchor);
      expect(box.minV > 0 || box.maxV < 0, `"${t.val}" spans v ${box.minV.toFixed(0)}…${box.maxV.toFixed(0)}`).toBe(true);
    }
  });
});
