// The cope template PDF proves its own 1:1 scale: in the PDF's coordinates the 100 mm ruler is
// 283.46 pt long and the 4 in ruler 288 pt (72 pt per inch by the PDF definition, 25.4 mm per inch,
// F-UNIT-1), on every page; the cautions, the member's name and the tiling are on every page too.
import { inflateSync } from 'node:zlib';
import { describe, expect, test } from 'vitest';
import { computeCope } from '@backend/domain/fabrication/cope';
import { buildCopeTemplateDocument, copeTemplateLayout, PRINT_CAUTION } from '@backend/pdf/cope-template';
import { renderPdf } from '@backend/pdf/pdf-engine';
import { SAFETY_CAUTION } from '@backend/pdf/report-document';

/** The decompressed content streams of a PDF, one per page in order. */
function pageStreams(pdf: Buffer): string[] {
  const out: string[] = [];
  const bin = pdf.toString('latin1');
  const re = /stream\r?\n/g;
  let m: RegExpExecArray | null;
  while ((m = re.exec(bin))) {
    const start = m.index + m[0].length;
    const end = bin.indexOf('endstream', start);
    const dict = bin.slice(bin.lastIndexOf('<<', m.index), m.index);
    if (!dict.includes('FlateDecode')) continue;
    try {
      const text = inflateSync(Buffer.from(bin.slice(start, end), 'latin1')).toString('latin1');
      if (/\b(m|l|re)\b/.test(text) && /\bBT\b/.test(text)) out.push(text);
    } catch {
      // Not a deflated content stream (fonts, images).
    }
  }
  return out;
}

/** Horizontal lines drawn as "x y m x y l S", their lengths in points. */
function horizontalLineLengths(stream: string): number[] {
  const out: number[] = [];
  const re = /(-?[\d.]+) (-?[\d.]+) m\s+(-?[\d.]+) (-?[\d.]+) l/g;
  let m: RegExpExecArray | null;
  while ((m = re.exec(stream))) {
    const [x1, y1, x2, y2] = m.slice(1).map(Number) as [number, number, number, number];
    if (Math.abs(y1 - y2) < 1e-6) out.push(Math.abs(x2 - x1));
  }
  return out;
}

const member = { memberName: 'backstay left, top end', tubeText: 'Branch 44.45 mm on 50 mm run', units: 'metric' as const };

describe('cope template PDF', () => {
  test('one page for a small cope, A4 landscape in size', async () => {
    const cope = computeCope({ branchOdMm: 44.45, runOdMm: 50, angleDeg: 60, offsetMm: 0 });
    const doc = buildCopeTemplateDocument({ cope, pageSize: 'A4', ...member });
    expect(doc.pageSize).toEqual({ width: expect.closeTo(841.89, 1), height: expect.closeTo(595.28, 1) });
    const pdf = await renderPdf(doc);
    expect(pageStreams(pdf)).toHaveLength(1);
  });

  test.each(['A4', 'Letter'] as const)('%s: every page carries the 100 mm ruler at 283.46 pt and the 4 in ruler at 288 pt', async (pageSize) => {
    // A large, shallow cope tiles over several pages.
    const cope = computeCope({ branchOdMm: 100, runOdMm: 120, angleDeg: 30, offsetMm: 5 });
    const layout = copeTemplateLayout(cope, pageSize);
    expect(layout.cols * layout.rows).toBeGreaterThan(1);
    const pdf = await renderPdf(buildCopeTemplateDocument({ cope, pageSize, ...member }));
    const pages = pageStreams(pdf);
    expect(pages).toHaveLength(layout.cols * layout.rows);
    for (const page of pages) {
      // No transform scales the drawing: the only matrix is pdfkit's unit-scale flip of the y axis.
      for (const cm of page.match(/[-\d. ]+ cm/g) ?? []) expect(cm.trim()).toMatch(/^1 0 0 -1 0 [\d.]+ cm$/);
      const lengths = horizontalLineLengths(page);
      expect(lengths.some((l) => Math.abs(l - 283.46) < 0.01)).toBe(true);
      expect(lengths.some((l) => Math.abs(l - 288) < 0.01)).toBe(true);
    }
  });

  test('the document names the member and the tube and carries both cautions on every page', () => {
    const cope = computeCope({ branchOdMm: 100, runOdMm: 120, angleDeg: 30, offsetMm: 5 });
    const doc = buildCopeTemplateDocument({ cope, pageSize: 'Letter', ...member });
    const json = JSON.stringify(doc.content);
    const pages = copeTemplateLayout(cope, 'Letter');
    const count = (s: string) => json.split(s).length - 1;
    expect(count(PRINT_CAUTION)).toBe(pages.cols * pages.rows);
    expect(count('backstay left, top end')).toBe(pages.cols * pages.rows);
    expect(count('Marking by hand')).toBe(pages.cols * pages.rows);
    const footer = (doc.footer as (p: number, n: number) => unknown)(2, 4);
    expect(JSON.stringify(footer)).toContain(SAFETY_CAUTION);
  });
});
