// Contrast of the theme's text colours on the surfaces they are read on, by the WCAG 2.x relative
// luminance and contrast ratio formulas. Source: WCAG 2.2, Success Criterion 1.4.3 Contrast (Minimum),
// level AA: at least 4.5:1 for normal text (3:1 only for large text, which these are not all).
// https://www.w3.org/TR/WCAG22/#contrast-minimum and its definitions of "relative luminance" and
// "contrast ratio". The backgrounds and the heading, link and error colours are read from base.css,
// so a change there is measured too.
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, test } from 'vitest';
import Aura from '@primeuix/themes/aura';
import { signalAmber, steel, textTokens } from '@/theme/preset';

/** sRGB channel (0–255) to linear light, WCAG 2.x definition of relative luminance. */
function linear(channel255: number): number {
  const c = channel255 / 255;
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
}

/** L = 0.2126 R + 0.7152 G + 0.0722 B of a #rrggbb colour. */
export function relativeLuminance(hex: string): number {
  const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex);
  if (!m) throw new Error(`not a #rrggbb colour: ${hex}`);
  const [r, g, b] = [m[1]!, m[2]!, m[3]!].map((h) => linear(parseInt(h, 16)));
  return 0.2126 * r! + 0.7152 * g! + 0.0722 * b!;
}

/** (L1 + 0.05) / (L2 + 0.05), the lighter colour's luminance over the darker's. */
export function contrastRatio(a: string, b: string): number {
  const [hi, lo] = [relativeLuminance(a), relativeLuminance(b)].sort((x, y) => y - x);
  return (hi! + 0.05) / (lo! + 0.05);
}

const palettes: Record<string, Record<string | number, string>> = {
  surface: steel,
  primary: signalAmber,
  red: (Aura as unknown as { primitive: Record<string, Record<string, string>> }).primitive.red!,
};

/** '{surface.600}' or the CSS variable name 'surface-600' to its hex value. */
function token(ref: string): string {
  const m = /^\{?(\w+)[.-](\d+)\}?$/.exec(ref);
  const value = m ? palettes[m[1]!]?.[m[2]!] : undefined;
  if (!value) throw new Error(`unknown colour token ${ref}`);
  return value;
}

const baseCss = readFileSync(resolve(__dirname, '../../../frontend/src/assets/base.css'), 'utf8');

/** The palette variable a CSS declaration in base.css uses, e.g. ("a", "color") → "primary-800". */
function cssToken(pattern: RegExp): string {
  const m = pattern.exec(baseCss);
  if (!m) throw new Error(`base.css no longer matches ${pattern}`);
  return m[1]!;
}

const surfaces = {
  'the page background (--cw-page)': token(cssToken(/--cw-page:\s*var\(--p-(\w+-\d+)\)/)),
  'a panel (.cw-panel)': token(cssToken(/\.cw-panel\s*\{[^}]*background:\s*var\(--p-(\w+-\d+)\)/)),
  'a subtle box (surface 50)': steel[50],
};

const texts = {
  'body text (text.color)': token(textTokens.color),
  'muted text (text.mutedColor)': token(textTokens.mutedColor),
  'headings (h1, h2, h3)': token(cssToken(/h3\s*\{[^}]*color:\s*var\(--p-(\w+-\d+)\)/)),
  'links (a)': token(cssToken(/\ba\s*\{[^}]*color:\s*var\(--p-(\w+-\d+)\)/)),
  'field errors (.cw-field-error)': token(cssToken(/\.cw-field-error\s*\{[^}]*color:\s*var\(--p-(\w+-\d+)\)/)),
};

describe('the formula (WCAG 2.2 SC 1.4.3 definitions)', () => {
  test.each([
    ['#000000', '#ffffff', 21],
    ['#ffffff', '#ffffff', 1],
    // The muted tone this test was written for: steel 500 on steel 100, reported at 3.96:1.
    ['#63738a', '#e5e9ef', 3.96],
  ])('%s on %s is %d:1', (fg, bg, ratio) => {
    expect(contrastRatio(fg, bg)).toBeCloseTo(ratio, 2);
  });
});

describe('text tokens on the surfaces they sit on: at least 4.5:1 (WCAG 2.2 SC 1.4.3, normal text)', () => {
  const pairs = Object.entries(texts).flatMap(([text, fg]) => Object.entries(surfaces).map(([surface, bg]) => [text, surface, fg, bg] as const));
  test.each(pairs)('%s on %s', (_text, _surface, fg, bg) => {
    expect(contrastRatio(fg, bg)).toBeGreaterThanOrEqual(4.5);
  });
});
