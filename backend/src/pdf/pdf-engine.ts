// The one place the server renders PDFs. Fonts are read from disk once per process into pdfmake's
// virtual file system, and documents may neither fetch URLs nor read local files.
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import pdfmake from 'pdfmake';
import type { TDocumentDefinitions } from 'pdfmake/interfaces';

const require = createRequire(import.meta.url);

const FONT_FILES = {
  normal: 'NotoSans_400Regular.ttf',
  bold: 'NotoSans_700Bold.ttf',
  italics: 'NotoSans_400Regular_Italic.ttf',
  bolditalics: 'NotoSans_700Bold_Italic.ttf',
} as const;

// pdfmake's server build keeps an in-memory file system that its typings do not describe.
const virtualFs = (pdfmake as unknown as { virtualfs: { writeFileSync(name: string, data: Buffer): void } })
  .virtualfs;

let ready = false;

function fontFolder(): string {
  // The package's entry sits at its root; each weight lives in a folder named after it.
  return dirname(require.resolve('@expo-google-fonts/noto-sans/package.json'));
}

/** Loads Noto Sans into pdfmake once; later calls are free. */
export function preparePdfEngine(): void {
  if (ready) return;
  const root = fontFolder();
  for (const file of Object.values(FONT_FILES)) {
    const weightFolder = file.replace(/^NotoSans_/, '').replace(/\.ttf$/, '');
    virtualFs.writeFileSync(file, readFileSync(join(root, weightFolder, file)));
  }
  pdfmake.setFonts({ NotoSans: { ...FONT_FILES } });
  pdfmake.setUrlAccessPolicy(() => false);
  pdfmake.setLocalAccessPolicy(() => false);
  ready = true;
}

/** Renders a document definition to a PDF buffer, with Noto Sans as the default font. */
export async function renderPdf(doc: TDocumentDefinitions): Promise<Buffer> {
  preparePdfEngine();
  const withFont: TDocumentDefinitions = {
    ...doc,
    defaultStyle: { font: 'NotoSans', fontSize: 9.5, ...(doc.defaultStyle ?? {}) },
  };
  return pdfmake.createPdf(withFont).getBuffer();
}
