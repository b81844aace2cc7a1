// Cope template PDF benchmark (issue 11): a 10-page tiled template (a 280 mm branch on a 300 mm run at
// 60°, A4) once fonts are loaded, beside a baseline measured in the same run: a 10-page document of
// plain text pages through the same engine, so the ratio is what the template's drawing costs.
// Target: at most 300 ms.
import type { Content } from 'pdfmake/interfaces';
import { computeCope } from '../../backend/src/domain/fabrication/cope';
import { buildCopeTemplateDocument, copeTemplateLayout } from '../../backend/src/pdf/cope-template';
import { renderPdf } from '../../backend/src/pdf/pdf-engine';

export const COPE_PDF_TARGET_MS = 300;

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

/** Median wall time and median CPU time of this process (user + system) per run, in ms. */
async function timeIt(runs: number, fn: () => Promise<unknown>): Promise<{ wallMs: number; cpuMs: number }> {
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let i = 0; i < runs; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    await fn();
    wall.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000);
  }
  return { wallMs: median(wall), cpuMs: median(cpu) };
}

export interface CopePdfBench {
  pages: number;
  /** Median wall time of one template. */
  medianMs: number;
  /** Median CPU time of one template: on a shared, overloaded machine closer to an idle machine's wall time. */
  cpuMs: number;
  baselineMs: number;
  baselineCpuMs: number;
}

export async function runCopePdfBench(options: { log?: boolean; runs?: number } = {}): Promise<CopePdfBench> {
  const runs = options.runs ?? 9;
  const input = { branchOdMm: 280, runOdMm: 300, angleDeg: 60, offsetMm: 0 };
  const layout = copeTemplateLayout(computeCope(input), 'A4');
  const pages = layout.cols * layout.rows;
  const template = () => renderPdf(buildCopeTemplateDocument({ cope: computeCope(input), pageSize: 'A4', units: 'metric', memberName: 'bench cope', tubeText: 'Branch 280 mm on a 300 mm run, 60°' }));
  const textPages = (): Content[] => Array.from({ length: pages }, (_, i) => ({ text: `Page ${i + 1}: plain text for the baseline.`, ...(i > 0 ? { pageBreak: 'before' as const } : {}) }));
  const baseline = () => renderPdf({ pageSize: 'A4', pageOrientation: 'landscape', content: textPages() });
  // The first PDF of a process loads and parses the fonts: warm both paths first.
  await template();
  await baseline();
  const t = await timeIt(runs, template);
  const b = await timeIt(runs, baseline);
  if (options.log)
    console.log(`cope template: ${pages} pages, median ${t.wallMs.toFixed(0)} ms wall, ${t.cpuMs.toFixed(0)} ms CPU; ${pages} plain text pages ${b.wallMs.toFixed(0)} ms wall, ${b.cpuMs.toFixed(0)} ms CPU (${(t.wallMs / b.wallMs).toFixed(1)}×)`);
  return { pages, medianMs: t.wallMs, cpuMs: t.cpuMs, baselineMs: b.wallMs, baselineCpuMs: b.cpuMs };
}
