// The 1:1 cope template as a pdfmake document, built by a pure function from a computed cope. Each
// landscape page carries a tile of the unrolled saddle (at the branch's outside circumference), the
// cut-back table every 15° beside it, a 100 mm ruler and a 4 in ruler, the caution to print at actual
// size, the member's name and tube size, and the fabrication caution. All drawing is in pdfmake's
// canvas, in points computed from millimetres (72 / 25.4 pt per mm), so the scale is exact in the
// PDF's own coordinates. A template larger than a page is tiled with an overlap; crosses at the same
// template point on both tiles, labelled with the join, line the pages up.
import type { Content, ContentCanvas, TDocumentDefinitions } from 'pdfmake/interfaces';
import { copeMarkingTable, type Cope } from '../domain/fabrication/cope';
import { formatQuantity, type UnitSystem } from '../domain/units';
import { pdfSafe, SAFETY_CAUTION } from './report-document';
import type { PageSize } from '../contracts/fabrication';

export const PT_PER_MM = 72 / 25.4;
export const PRINT_CAUTION = 'Print at actual size, then check the ruler.';
export const TEMPLATE_TITLE = 'Cagewright cope template';
export const NUMBERS_CAUTION = 'The numbers are an aid, not a substitute for measuring the car and the tubes.';

/** Landscape page sizes in mm. */
const PAGE_MM: Readonly<Record<PageSize, { w: number; h: number }>> = { A4: { w: 297, h: 210 }, Letter: { w: 279.4, h: 215.9 } };
const MARGIN_MM = 12;
const HEADER_MM = 17;
const FOOTER_MM = 12;
const RULERS_MM = 20;
const TABLE_MM = 60;
const GAP_MM = 5;
const OVERLAP_MM = 10;
/** Space above the tip line (its label) and below the deepest point (a band to tape round the tube). */
const ABOVE_TIP_MM = 8;
const WRAP_BAND_MM = 22;
const INK = '#1d2327';
const MUTED = '#5b6670';
const WASTE = '#e3e7ea';

export interface CopeTemplateInput {
  cope: Cope;
  pageSize: PageSize;
  units: UnitSystem;
  memberName: string;
  /** "44.5 × 2.4 mm branch on 50.0 mm run, 60°, offset 0 mm" */
  tubeText: string;
}

interface Tile {
  col: number;
  row: number;
  /** Template window in template mm (x round the tube, y down from the tip line). */
  x0: number;
  y0: number;
}

const pt = (mm: number) => mm * PT_PER_MM;

/** Liang–Barsky: the part of a segment inside a rectangle, or null. */
function clip(a: [number, number], b: [number, number], r: { x0: number; y0: number; x1: number; y1: number }): [[number, number], [number, number]] | null {
  let t0 = 0;
  let t1 = 1;
  const dx = b[0] - a[0];
  const dy = b[1] - a[1];
  const edges: [number, number][] = [[-dx, a[0] - r.x0], [dx, r.x1 - a[0]], [-dy, a[1] - r.y0], [dy, r.y1 - a[1]]];
  for (const [p, q] of edges) {
    if (p === 0) {
      if (q < 0) return null;
    } else {
      const t = q / p;
      if (p < 0) t0 = Math.max(t0, t);
      else t1 = Math.min(t1, t);
    }
  }
  if (t0 > t1) return null;
  return [[a[0] + t0 * dx, a[1] + t0 * dy], [a[0] + t1 * dx, a[1] + t1 * dy]];
}

type Pt2 = [number, number];

/** Sutherland–Hodgman: a polygon clipped to a rectangle (the waste region of one tile). */
function clipPolygon(poly: Pt2[], r: { x0: number; y0: number; x1: number; y1: number }): Pt2[] {
  const edges: [(p: Pt2) => boolean, (a: Pt2, b: Pt2) => Pt2][] = [
    [(p) => p[0] >= r.x0, (a, b) => [r.x0, a[1] + ((b[1] - a[1]) * (r.x0 - a[0])) / (b[0] - a[0])]],
    [(p) => p[0] <= r.x1, (a, b) => [r.x1, a[1] + ((b[1] - a[1]) * (r.x1 - a[0])) / (b[0] - a[0])]],
    [(p) => p[1] >= r.y0, (a, b) => [a[0] + ((b[0] - a[0]) * (r.y0 - a[1])) / (b[1] - a[1]), r.y0]],
    [(p) => p[1] <= r.y1, (a, b) => [a[0] + ((b[0] - a[0]) * (r.y1 - a[1])) / (b[1] - a[1]), r.y1]],
  ];
  let out = poly;
  for (const [inside, cut] of edges) {
    const input = out;
    out = [];
    for (let i = 0; i < input.length; i++) {
      const cur = input[i]!;
      const prev = input[(i + input.length - 1) % input.length]!;
      if (inside(cur)) {
        if (!inside(prev)) out.push(cut(prev, cur));
        out.push(cur);
      } else if (inside(prev)) out.push(cut(prev, cur));
    }
    if (out.length === 0) break;
  }
  return out;
}

export interface TemplateLayout {
  pageMm: { w: number; h: number };
  tileMm: { w: number; h: number };
  templateMm: { w: number; h: number };
  cols: number;
  rows: number;
}

export function copeTemplateLayout(cope: Cope, pageSize: PageSize): TemplateLayout {
  const pageMm = PAGE_MM[pageSize];
  const tileMm = { w: pageMm.w - 2 * MARGIN_MM - TABLE_MM - GAP_MM, h: pageMm.h - 2 * MARGIN_MM - HEADER_MM - RULERS_MM - FOOTER_MM };
  const templateMm = { w: cope.unrolledLengthMm, h: ABOVE_TIP_MM + cope.depthMm + WRAP_BAND_MM };
  const count = (total: number, tile: number) => Math.max(1, Math.ceil((total - OVERLAP_MM) / (tile - OVERLAP_MM)));
  return { pageMm, tileMm, templateMm, cols: count(templateMm.w, tileMm.w), rows: count(templateMm.h, tileMm.h) };
}

function rulers(x: number, y: number): ContentCanvas['canvas'] {
  const out: ContentCanvas['canvas'] = [];
  // 100 mm: a tick every mm, longer every 5 and 10.
  // The baseline is one line of its own (the 1:1 check reads it); the ticks hang from it as one
  // zig-zag path, down each tick and back up, which draws the same and costs one element.
  out.push({ type: 'line', x1: pt(x), y1: pt(y), x2: pt(x + 100), y2: pt(y), lineWidth: 0.6, lineColor: INK });
  const ticks: { x: number; y: number }[] = [];
  for (let i = 0; i <= 100; i++) {
    const len = i % 10 === 0 ? 3.2 : i % 5 === 0 ? 2.2 : 1.2;
    ticks.push({ x: pt(x + i), y: pt(y) }, { x: pt(x + i), y: pt(y + len) }, { x: pt(x + i), y: pt(y) });
  }
  out.push({ type: 'polyline', points: ticks, lineWidth: 0.25, lineColor: INK });
  // 4 in: a tick every 1/8 in, longer at 1/2 and whole inches.
  const x2 = x + 112;
  out.push({ type: 'line', x1: pt(x2), y1: pt(y), x2: pt(x2) + 4 * 72, y2: pt(y), lineWidth: 0.6, lineColor: INK });
  const inchTicks: { x: number; y: number }[] = [];
  for (let i = 0; i <= 32; i++) {
    const len = i % 8 === 0 ? 3.2 : i % 4 === 0 ? 2.2 : 1.2;
    inchTicks.push({ x: pt(x2) + i * 9, y: pt(y) }, { x: pt(x2) + i * 9, y: pt(y + len) }, { x: pt(x2) + i * 9, y: pt(y) });
  }
  out.push({ type: 'polyline', points: inchTicks, lineWidth: 0.25, lineColor: INK });
  return out;
}

function rulerLabels(x: number, y: number): Content[] {
  const label = (text: string, atPt: number, fontSize = 6): Content => ({ text, fontSize, color: INK, noWrap: true, absolutePosition: { x: atPt - 3, y: pt(y + 3.6) } });
  const out: Content[] = [];
  // Every text costs layout time on each page, so the rulers carry few numbers: 0, 5 and 10 cm; each inch.
  for (let i = 0; i <= 100; i += 50) out.push(label(String(i / 10), pt(x + i)));
  for (let i = 0; i <= 4; i++) out.push(label(String(i), pt(x + 112) + i * 72));
  out.push({ text: '100 mm (numbers in cm): must measure 100 mm', fontSize: 7, color: MUTED, noWrap: true, absolutePosition: { x: pt(x), y: pt(y + 7.5) } });
  out.push({ text: '4 in: must measure 4 in', fontSize: 7, color: MUTED, noWrap: true, absolutePosition: { x: pt(x + 112), y: pt(y + 7.5) } });
  return out;
}

function tileDrawing(cope: Cope, tile: Tile, layout: TemplateLayout, origin: { x: number; y: number }, joinLabel: (c: number, r: number) => string): { canvas: ContentCanvas['canvas']; texts: Content[] } {
  const { tileMm, templateMm } = layout;
  const rect = { x0: tile.x0, y0: tile.y0, x1: tile.x0 + tileMm.w, y1: tile.y0 + tileMm.h };
  const toPage = (p: [number, number]): [number, number] => [pt(origin.x + p[0] - tile.x0), pt(origin.y + p[1] - tile.y0)];
  const canvas: ContentCanvas['canvas'] = [];
  const texts: Content[] = [];
  const seg = (a: [number, number], b: [number, number], lineWidth: number, lineColor = INK, dash?: { length: number; space: number }) => {
    const c = clip(a, b, rect);
    if (!c) return;
    const [p, q] = [toPage(c[0]), toPage(c[1])];
    canvas.push({ type: 'line', x1: p[0], y1: p[1], x2: q[0], y2: q[1], lineWidth, lineColor, ...(dash ? { dash } : {}) });
  };
  // Template y: 0 at the tip line; the curve lies at ABOVE_TIP + cut back.
  const yOf = (axial: number) => ABOVE_TIP_MM + axial;
  const points = cope.curve.map((p) => [p.arcMm, yOf(p.axialMm)] as [number, number]);
  // The waste between the tip line and the curve, shaded: one polygon, clipped to the tile.
  const waste = clipPolygon([[points[0]![0], ABOVE_TIP_MM], ...points, [points[points.length - 1]![0], ABOVE_TIP_MM]], rect);
  if (waste.length >= 3) canvas.push({ type: 'polyline', points: waste.map((p) => { const q = toPage(p); return { x: q[0], y: q[1] }; }), closePath: true, color: WASTE, lineWidth: 0, lineColor: WASTE });
  // Outline of the paper: tip line, both wrap edges, bottom of the band.
  seg([0, ABOVE_TIP_MM], [templateMm.w, ABOVE_TIP_MM], 0.8);
  seg([0, 0], [0, templateMm.h], 0.5);
  seg([templateMm.w, 0], [templateMm.w, templateMm.h], 0.5);
  seg([0, templateMm.h], [templateMm.w, templateMm.h], 0.5);
  // A line along the tube every 15°, the 0°/90°/180°/270° ones heavier.
  // Numbers every 45° (the table lists every 15°); each text costs layout time on each page.
  const labelStep = 45;
  for (let deg = 0; deg <= 360; deg += 15) {
    const x = (deg / 360) * cope.unrolledLengthMm;
    seg([x, ABOVE_TIP_MM], [x, templateMm.h], deg % 90 === 0 ? 0.45 : 0.2, MUTED, deg % 90 === 0 ? undefined : { length: 2, space: 2 });
    if (deg % labelStep === 0 && x >= rect.x0 && x <= rect.x1 && ABOVE_TIP_MM + cope.depthMm + 4 >= rect.y0 && ABOVE_TIP_MM + cope.depthMm + 4 <= rect.y1) {
      const [px, py] = toPage([x, ABOVE_TIP_MM + cope.depthMm + 4]);
      texts.push({ text: `${deg}°`, fontSize: 6.5, color: MUTED, noWrap: true, absolutePosition: { x: px + 1, y: py } });
    }
  }
  // The cut line itself: one polyline per stretch that stays on this tile.
  let run: { x: number; y: number }[] = [];
  const flush = () => {
    if (run.length >= 2) canvas.push({ type: 'polyline', points: run, lineWidth: 1.3, lineColor: INK });
    run = [];
  };
  for (let i = 1; i < points.length; i++) {
    const c = clip(points[i - 1]!, points[i]!, rect);
    if (!c) {
      flush();
      continue;
    }
    const [p, q] = [toPage(c[0]), toPage(c[1])];
    const last = run[run.length - 1];
    if (!last || Math.abs(last.x - p[0]) > 1e-6 || Math.abs(last.y - p[1]) > 1e-6) {
      flush();
      run.push({ x: p[0], y: p[1] });
    }
    run.push({ x: q[0], y: q[1] });
  }
  flush();
  // Labels that belong to the template, drawn on the tile that holds them.
  const label = (at: [number, number], text: string, fontSize = 7, color = INK) => {
    if (at[0] < rect.x0 || at[0] > rect.x1 - 20 || at[1] < rect.y0 || at[1] > rect.y1 - 3) return;
    const [px, py] = toPage(at);
    texts.push({ text, fontSize, color, noWrap: true, absolutePosition: { x: px, y: py } });
  };
  label([2, 1.5], 'Tube end (tip line): line this edge up with the square-cut end of the tube', 7);
  label([2, ABOVE_TIP_MM + cope.depthMm + 10], 'Wrap round the tube with 0° on the line marked along it; cut away the shaded part', 7, MUTED);
  // Alignment crosses in the middle of each overlap, identical on both tiles.
  const cross = (x: number, y: number, name: string) => {
    seg([x - 4, y], [x + 4, y], 0.5);
    seg([x, y - 4], [x, y + 4], 0.5);
    label([x + 1.2, y + 1.2], name, 6.5);
  };
  for (let c = 1; c < layout.cols; c++) {
    const x = c * (tileMm.w - OVERLAP_MM) + OVERLAP_MM / 2;
    for (const y of [templateMm.h * 0.3, templateMm.h * 0.75]) cross(x, y, joinLabel(c, -1));
  }
  for (let r = 1; r < layout.rows; r++) {
    const y = r * (tileMm.h - OVERLAP_MM) + OVERLAP_MM / 2;
    for (const x of [templateMm.w * 0.3, templateMm.w * 0.7]) cross(x, y, joinLabel(-1, r));
  }
  // Where this tile joins its neighbours: dashed lines at the overlap's edges.
  if (tile.col > 0) seg([tile.x0 + OVERLAP_MM, tile.y0], [tile.x0 + OVERLAP_MM, tile.y0 + tileMm.h], 0.3, MUTED, { length: 1, space: 2 });
  if (tile.row > 0) seg([tile.x0, tile.y0 + OVERLAP_MM], [tile.x0 + tileMm.w, tile.y0 + OVERLAP_MM], 0.3, MUTED, { length: 1, space: 2 });
  return { canvas, texts };
}

/**
 * The cut-back every 15°, beside the template. Three right-aligned text columns (one text node each)
 * rather than a pdfmake table: a table per page was most of a tiled template's cost.
 */
function markingTable(cope: Cope, units: UnitSystem, x: number, y: number): { texts: Content[]; rules: ContentCanvas['canvas'] } {
  const len = (mm: number) => formatQuantity(mm, 'length', units, units === 'metric' ? { decimals: 1 } : { decimals: 3 }).text;
  const rows = copeMarkingTable(cope);
  // One 7 pt line of Noto Sans at lineHeight 1: (ascender − descender) / em = (1069 + 293) / 1000.
  const lineMm = (7 * 1.362) / PT_PER_MM;
  const top = y + 11.5;
  const col = (text: string, at: number, width: number, bold = false): Content => ({
    columns: [{ text, bold, fontSize: 7, lineHeight: 1, alignment: 'right', width: pt(width) }], absolutePosition: { x: pt(at), y: pt(top) },
  });
  const texts: Content[] = [
    { text: 'Marking by hand', bold: true, fontSize: 8.5, noWrap: true, absolutePosition: { x: pt(x), y: pt(y) } },
    { columns: [{ text: 'Round the tube from the 0° line, and how far back from the tube end the cut lies there.', fontSize: 6.5, color: MUTED, width: pt(TABLE_MM) }], absolutePosition: { x: pt(x), y: pt(y + 4) } },
    col(['Angle', ...rows.map((r) => `${r.angleDeg}°`)].join('\n'), x, 12, false),
    col(['Round', ...rows.map((r) => len(r.arcMm))].join('\n'), x + 14, 21),
    col(['Cut back', ...rows.map((r) => len(r.axialMm))].join('\n'), x + 37, 22, true),
    { text: `Depth ${len(cope.depthMm)}; template ${len(cope.unrolledLengthMm)} round.`, fontSize: 7, noWrap: true, absolutePosition: { x: pt(x), y: pt(top + (rows.length + 1) * lineMm + 2) } },
  ];
  const rules: ContentCanvas['canvas'] = [];
  for (let i = 1; i <= rows.length + 1; i++) {
    const ry = pt(top + i * lineMm - 0.1);
    rules.push({ type: 'line', x1: pt(x), y1: ry, x2: pt(x + TABLE_MM), y2: ry, lineWidth: i === 1 ? 0.5 : 0.15, lineColor: '#c9d0d6' });
  }
  return { texts, rules };
}

export function buildCopeTemplateDocument(input: CopeTemplateInput): TDocumentDefinitions {
  const { cope, pageSize, units } = input;
  const layout = copeTemplateLayout(cope, pageSize);
  const { pageMm, tileMm, cols, rows } = layout;
  const pages = cols * rows;
  const joinLabel = (c: number, r: number) => (r < 0 ? `J${c}` : `K${r}`);
  const content: Content[] = [];
  let n = 0;
  for (let row = 0; row < rows; row++) {
    for (let col = 0; col < cols; col++) {
      n++;
      const tile: Tile = { col, row, x0: col * (tileMm.w - OVERLAP_MM), y0: row * (tileMm.h - OVERLAP_MM) };
      const origin = { x: MARGIN_MM, y: MARGIN_MM + HEADER_MM };
      const drawing = tileDrawing(cope, tile, layout, origin, joinLabel);
      const rulerY = MARGIN_MM + HEADER_MM + tileMm.h + 4;
      const table = markingTable(cope, units, pageMm.w - MARGIN_MM - TABLE_MM, MARGIN_MM + HEADER_MM);
      const pageItems: Content[] = [
        // Every text is one line placed where it belongs: noWrap spares pdfmake breaking it into words,
        // which was most of a tiled template's cost.
        { text: pdfSafe(`${TEMPLATE_TITLE}: ${input.memberName}`), bold: true, fontSize: 12, noWrap: true, absolutePosition: { x: pt(MARGIN_MM), y: pt(MARGIN_MM) } },
        { text: pdfSafe(input.tubeText), fontSize: 8.5, noWrap: true, absolutePosition: { x: pt(MARGIN_MM), y: pt(MARGIN_MM + 5.5) } },
        { text: PRINT_CAUTION, bold: true, fontSize: 10, color: '#a3261d', noWrap: true, absolutePosition: { x: pt(MARGIN_MM), y: pt(MARGIN_MM + 10) } },
        {
          text: pages > 1 ? `Sheet ${n} of ${pages}: column ${col + 1} of ${cols}, row ${row + 1} of ${rows}. Overlap the pages by ${OVERLAP_MM} mm on the crosses of the same name.` : 'One sheet.',
          fontSize: 7.5, color: MUTED, noWrap: true, absolutePosition: { x: pt(pageMm.w / 2), y: pt(MARGIN_MM + 11) },
        },
        { canvas: [...drawing.canvas, ...rulers(MARGIN_MM, rulerY), ...table.rules], absolutePosition: { x: 0, y: 0 } },
        ...drawing.texts,
        ...rulerLabels(MARGIN_MM, rulerY),
        ...table.texts,
      ];
      if (n > 1) pageItems.unshift({ text: '', pageBreak: 'before' });
      content.push(...pageItems);
    }
  }
  return {
    info: { title: pdfSafe(`${TEMPLATE_TITLE}: ${input.memberName}`), author: 'Cagewright', creator: 'Cagewright' },
    pageSize: { width: pt(pageMm.w), height: pt(pageMm.h) },
    pageOrientation: 'landscape',
    pageMargins: [pt(MARGIN_MM), pt(MARGIN_MM), pt(MARGIN_MM), pt(FOOTER_MM)],
    // Two set lines, not one text to wrap: breaking the caution into words on every page cost more than
    // the whole drawing of a page (a two-column footer more still).
    footer: (page: number, count: number) => ({
      stack: [
        { text: SAFETY_CAUTION, noWrap: true },
        { text: `${NUMBERS_CAUTION}   Page ${page} of ${count}.`, noWrap: true },
      ],
      fontSize: 7, color: MUTED, margin: [pt(MARGIN_MM), 3, pt(MARGIN_MM), 0],
    }),
    content,
    defaultStyle: { color: INK, lineHeight: 1.1 },
  };
}
