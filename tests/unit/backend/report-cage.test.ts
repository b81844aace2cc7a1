// The cage page of the PDF report: the same SVG views as the screen, rendered by pdfmake with their
// words in the embedded Noto Sans (pdfmake's SVG text would otherwise look for font files on disk).
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { buildReportDocument } from '@backend/pdf/report-document';
import { cageFor } from '@backend/pdf/report-cage';
import { renderPdf } from '@backend/pdf/pdf-engine';
import { sampleReportInput } from '../../bench/pdf';
import { sampleModelSpecification } from '../domain/geometry/sample-model';

function pdfText(pdf: Buffer): string {
  const dir = mkdtempSync(join(tmpdir(), 'cw-cage-pdf-'));
  writeFileSync(join(dir, 'r.pdf'), pdf);
  return execFileSync('pdftotext', [join(dir, 'r.pdf'), '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
}

describe('the cage page of the report', () => {
  it('draws the three views with the builder’s names, the derived measurements and the legend', async () => {
    const input = await sampleReportInput('metric', 0);
    const cage = cageFor(sampleModelSpecification(), input.report, 'metric');
    expect(cage?.drawnMembers).toBe(5);
    const text = pdfText(await renderPdf(buildReportDocument({ ...input, cage })));
    expect(text).toContain('The cage, drawn from its model');
    for (const words of ['backstay left', 'front hoop', 'from vertical', 'below the hoop top', 'Fails a rule', 'Passes', 'No rule checks it']) expect(text).toContain(words);
    expect(text).toContain('pre-check only'); // the caution in every page's footer
  }, 30000);

  it('has no cage page when the specification has no model', async () => {
    const input = await sampleReportInput('metric', 0);
    const { model: _none, ...spec } = sampleModelSpecification();
    expect(cageFor(spec, input.report, 'metric')).toBeUndefined();
    const text = pdfText(await renderPdf(buildReportDocument(input)));
    expect(text).not.toContain('The cage, drawn from its model');
  }, 30000);
});
