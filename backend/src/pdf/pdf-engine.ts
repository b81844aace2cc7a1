// The one place the server renders PDFs. Fonts are read from disk once per process into pdfmake's
// virtual file system, and documents may neither fetch URLs nor read local files. The parsed fonts
// are kept too (see reuseParsedFonts), since parsing Noto Sans anew was most of a report's cost.
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
const virtualFs = (pdfmake as unknown as { virtualfs: VirtualFs }).virtualfs;

interface VirtualFs {
  writeFileSync(name: string, data: Buffer): void;
  existsSync(name: string): boolean;
  readFileSync(name: string): Buffer;
}

let ready = false;

interface FontkitFormat {
  probe(buffer: Uint8Array): boolean;
}
interface GlyphRun {
  positions: Record<string, number>[];
}
interface FontkitFont {
  constructor: FontkitFormat;
  layout(text: string, features?: unknown): GlyphRun;
}
interface FontkitModule {
  create(buffer: Uint8Array): FontkitFont;
  registerFormat(format: unknown): void;
}

const LAYOUT_CACHE_LIMIT = 20_000;

/**
 * Shaping a word (GSUB/GPOS lookups) was the largest cost left once fonts were shared, and a report
 * shapes the same words every time. The shaped run depends only on the font, the text and the
 * features, so it is kept per font. pdfkit scales a run's positions in place, so each caller gets
 * fresh position objects; the glyphs are shared, as fontkit itself shares them.
 */
function memoiseLayout(font: FontkitFont): void {
  const layout = font.layout.bind(font);
  let cache = new Map<string, GlyphRun>();
  font.layout = (text, features) => {
    const key = features === undefined ? text : `${JSON.stringify(features)}\u0000${text}`;
    let run = cache.get(key);
    if (!run) {
      if (cache.size >= LAYOUT_CACHE_LIMIT) cache = new Map();
      run = layout(text, features);
      cache.set(key, run);
    }
    const copy = Object.create(Object.getPrototypeOf(run) as object) as GlyphRun;
    return Object.assign(copy, run, { positions: run.positions.map((p) => Object.assign(Object.create(Object.getPrototypeOf(p) as object) as object, p)) });
  };
}

/**
 * pdfmake hands pdfkit the font bytes for every document, and pdfkit has fontkit parse them again
 * each time (tables, then the large GSUB/GPOS lookups on first layout). A parsed fontkit font is
 * read-only once built (each document makes its own subset from it), so the same object can serve
 * every document. fontkit picks the first registered format whose probe accepts the bytes; for our
 * own font buffers the TrueType format steps aside and a format that returns the parsed font takes
 * over (a constructor may return another object). Every other font is parsed as before.
 */
function reuseParsedFonts(buffers: Buffer[]): void {
  const fontkit = require('fontkit') as FontkitModule;
  const parsed = new Map<Uint8Array, FontkitFont>(buffers.map((b) => [b, fontkit.create(b)]));
  for (const font of parsed.values()) memoiseLayout(font);
  const trueType = parsed.values().next().value!.constructor;
  const probe = trueType.probe.bind(trueType);
  trueType.probe = (buffer) => !parsed.has(buffer) && probe(buffer);
  class ParsedFont {
    static probe(buffer: Uint8Array): boolean {
      return parsed.has(buffer);
    }
    constructor(stream: { buffer: Uint8Array }) {
      return parsed.get(stream.buffer) as ParsedFont;
    }
  }
  fontkit.registerFormat(ParsedFont);
}

type FontMethod = (this: unknown, src: unknown, family?: unknown, size?: unknown) => unknown;

/**
 * Text inside an SVG (the cage views) reaches pdfkit as the font's file name, not its bytes:
 * pdfmake 0.3's SVG font callback returns the name it was given in setFonts, and pdfkit then reads
 * that name from the real disk, where it does not exist. Names of our own fonts in the virtual file
 * system are resolved to their bytes here; pdfkit then finds the font already
 * embedded for the body text (same PostScript name) and reuses it. Nothing else changes meaning.
 */
function letSvgTextUseOurFonts(): void {
  const pdfkit = createRequire(require.resolve('pdfmake'))('pdfkit') as { prototype: { font: FontMethod } };
  const font = pdfkit.prototype.font;
  pdfkit.prototype.font = function (this: unknown, src, family, size) {
    if (typeof src === 'string' && Object.values(FONT_FILES).includes(src as (typeof FONT_FILES)[keyof typeof FONT_FILES]) && virtualFs.existsSync(src)) {
      // No family argument: for pdfkit that names a face inside a collection, which a TTF has not.
      return font.call(this, virtualFs.readFileSync(src), typeof family === 'number' ? family : size);
    }
    return font.call(this, src, family, size);
  };
}

function fontFolder(): string {
  // The package's entry sits at its root; each weight lives in a folder named after it.
  return dirname(require.resolve('@expo-google-fonts/noto-sans/package.json'));
}

/** Loads Noto Sans into pdfmake once; later calls are free. */
export function preparePdfEngine(): void {
  if (ready) return;
  const root = fontFolder();
  const buffers: Buffer[] = [];
  for (const file of Object.values(FONT_FILES)) {
    const weightFolder = file.replace(/^NotoSans_/, '').replace(/\.ttf$/, '');
    const bytes = readFileSync(join(root, weightFolder, file));
    virtualFs.writeFileSync(file, bytes);
    buffers.push(bytes);
  }
  reuseParsedFonts(buffers);
  letSvgTextUseOurFonts();
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
