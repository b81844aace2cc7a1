// The SVG string of a view: well-formed, to scale (viewBox in mm, tubes stroked at their OD), marked
// by verdict through presentation attributes only (pdfmake's converter ignores classes and CSS), and
// named for screen readers.
import { describe, expect, it } from 'vitest';
import { XmlDocument, type XmlElement } from 'xmldoc';
import { projectView, VIEW_NAMES } from '@backend/domain/geometry/projection';
import { cageViewSvg, type SvgMemberInfo } from '@backend/domain/geometry/view-svg';
import { VERDICT_MARKS } from '@backend/domain/geometry/verdict-marks';
import type { GeometryMark } from '@backend/domain/geometry/geometry-marks';
import { SAMPLE_CAGE } from './sample-cage';

const members = new Map<string, SvgMemberInfo>([
  ['mh', { name: 'main hoop', sizeText: '45.0 × 2.50 mm', verdict: 'pass', rule: null }],
  ['rb-l', { name: 'backstay left', sizeText: '38.0 × 2.00 mm', verdict: 'fail', rule: '§ 4.2 Rear brace angle: 24.0° is under 30°' }],
  ['rb-r', { name: 'backstay right', sizeText: '38.0 × 2.00 mm', verdict: 'needs_information', rule: null }],
]);

function all(el: XmlElement, out: XmlElement[] = []): XmlElement[] {
  out.push(el);
  for (const c of el.children) if (c.type === 'element') all(c as XmlElement, out);
  return out;
}

function parse(view: (typeof VIEW_NAMES)[number], marks: GeometryMark[] = []) {
  const svg = cageViewSvg(projectView(SAMPLE_CAGE, view), { members, units: 'metric', marks, labels: true, highlightId: 'rb-l' });
  return { svg, doc: new XmlDocument(svg) };
}

describe('cageViewSvg', () => {
  it.each(VIEW_NAMES)('the %s view is well-formed, an image with a title, and uses no classes or style sheets', (view) => {
    const { doc } = parse(view);
    expect(doc.name).toBe('svg');
    expect(doc.attr.role).toBe('img');
    expect(doc.childNamed('title')?.val).toMatch(new RegExp(view, 'i'));
    for (const el of all(doc)) {
      expect(el.name).not.toBe('style');
      expect(el.attr.class).toBeUndefined();
      expect(el.attr.style).toBeUndefined();
    }
    expect(doc.attr['font-family']).toMatch(/Noto Sans/);
  });

  it('frames the drawing in millimetres around every tube (side view: x from 0 to -900 mm is u 0 to 900)', () => {
    const { doc } = parse('side');
    const [minU, minY, width, height] = doc.attr.viewBox!.split(' ').map(Number) as [number, number, number, number];
    // The hoop's foot sits at u = 0 and the backstays' feet at u = 900; the hoop's top at z = 1150 + OD/2.
    expect(minU).toBeLessThan(-22.5);
    expect(minU + width).toBeGreaterThan(900 + 19);
    expect(-minY).toBeGreaterThan(1150 + 22.5);
    expect(-(minY + height)).toBeLessThan(0); // the floor is inside the frame
  });

  it('strokes each tube at its OD and marks a fail with its dash pattern, a halo when highlighted, and the hover words', () => {
    const { doc } = parse('side');
    const group = all(doc).find((e) => e.name === 'g' && e.attr['data-member-id'] === 'rb-l' && e.childNamed('title'))!;
    expect(group.attr['data-verdict']).toBe('fail');
    expect(group.childNamed('title')!.val).toBe('backstay left · 38.0 × 2.00 mm · Fails a rule · § 4.2 Rear brace angle: 24.0° is under 30°');
    const paths = group.childrenNamed('path');
    expect(paths.map((p) => Number(p.attr['stroke-width']))).toEqual([38 * 2.6, 38 * 1.16, 38 * 0.96, 38 * 0.3].map((w) => Math.round(w * 10) / 10));
    expect(paths[2]!.attr.stroke).toBe(VERDICT_MARKS.fail.tint);
    expect(paths[3]!.attr['stroke-dasharray']).toBe('60.8 30.4');
    expect(paths[3]!.attr.d).toBe('M50 -1100 L900 -300');
  });

  it('draws a cross for the fail and a question mark for the missing measurement, and leaves a member with no finding unmarked', () => {
    const { svg } = parse('front');
    expect(svg).toContain('>?</text>');
    const doc = new XmlDocument(svg);
    const symbols = all(doc).filter((e) => e.name === 'g' && !e.childNamed('title') && e.attr['data-member-id']);
    expect(symbols.map((s) => s.attr['data-member-id']).sort()).toEqual(['hb', 'mh', 'rb-l', 'rb-r']);
    const hb = all(doc).find((e) => e.attr['data-member-id'] === 'hb' && e.childNamed('title'))!;
    expect(hb.attr['data-verdict']).toBe('unchecked');
  });

  it('draws the measured geometry only on the views that show it, with the derived words', () => {
    const marks: GeometryMark[] = [
      { kind: 'angle', views: ['side'], vertex: { x: -50, y: 450, z: 1100 }, from: { x: -50, y: 450, z: 600 }, to: { x: -900, y: 450, z: 300 }, label: '46.7° from vertical' },
      { kind: 'drop', views: ['side'], top: { x: -50, y: 450, z: 1172.5 }, bottom: { x: -50, y: 450, z: 1100 }, label: '73 mm below the top' },
      { kind: 'sphere', views: ['side', 'front'], centre: { x: 300, y: 0, z: 950 }, radiusMm: 150, label: 'helmet' },
    ];
    expect(parse('side', marks).svg).toContain('46.7° from vertical');
    expect(parse('side', marks).svg).toContain('73 mm below the top');
    expect(parse('front', marks).svg).not.toContain('46.7°');
    expect(parse('front', marks).svg).toContain('>helmet</text>');
  });

  it('says so when no member has a path yet', () => {
    const svg = cageViewSvg(projectView([], 'top'), { members: new Map(), units: 'imperial' });
    expect(svg).toContain('No members with a path to draw yet');
    expect(svg).toMatch(/>\d+ in<\/text>/); // the scale bar in the reader's units
  });
});

describe('typed names in the drawing', () => {
  it('a member name with markup stays text: escaped in titles and labels, no element of its own', () => {
    const hostile = '<script>alert(1)</script> & "hoop" <img src=x onerror=alert(2)>';
    const named = new Map(members);
    named.set('mh', { ...members.get('mh')!, name: hostile });
    const svg = cageViewSvg(projectView(SAMPLE_CAGE, 'front'), { members: named, units: 'metric', marks: [], labels: true, highlightId: 'mh' });
    const doc = new XmlDocument(svg);
    const names = all(doc).map((el) => el.name);
    expect(names).not.toContain('script');
    expect(names).not.toContain('img');
    expect(svg).not.toContain('<script');
    expect(svg).not.toContain('<img');
    // The words are still there for a reader, as text.
    const texts = all(doc).filter((el) => el.name === 'title' || el.name === 'text').map((el) => el.val);
    expect(texts.some((t) => t.includes(hostile))).toBe(true);
  });
});
