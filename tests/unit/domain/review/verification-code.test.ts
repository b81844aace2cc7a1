// Verification codes: ≥ 128 random bits in Crockford base32, grouped, with a check character;
// normalising what people type (case, separators, confusable letters).
import { describe, expect, test } from 'vitest';
import { randomBytes } from 'node:crypto';
import {
  CODE_LENGTH,
  CODE_RANDOM_BITS,
  CODE_RANDOM_BYTES,
  CROCKFORD_ALPHABET,
  codeForLookup,
  isWellFormedVerificationCode,
  LEGACY_CHECK_RUN_CODE_LENGTH,
  newVerificationCode,
  normaliseVerificationCode,
} from '@backend/domain/review/verification-code';

const bytes = (...xs: number[]) => Uint8Array.from(xs);
const zeros = new Uint8Array(CODE_RANDOM_BYTES);
const ones = new Uint8Array(CODE_RANDOM_BYTES).fill(255);

describe('newVerificationCode', () => {
  test('carries at least 128 random bits', () => {
    expect(CODE_RANDOM_BITS).toBeGreaterThanOrEqual(128);
    expect(CODE_RANDOM_BYTES).toBe(17);
  });

  test('all-zero bytes: 27 zeros and the check character 0', () => {
    expect(newVerificationCode(zeros)).toBe('0000-0000-0000-0000-0000-0000-0000');
  });

  test('all-one bits: 27 Z (31) then the Luhn mod 32 check character', () => {
    // Each Z doubled alternately: 2 × 31 = 62 → 1 + 30 = 31; sum = 14 × 31 + 13 × 31 = 837; 837 mod 32 = 5 → check 27 = V
    expect(newVerificationCode(ones)).toBe('ZZZZ-ZZZZ-ZZZZ-ZZZZ-ZZZZ-ZZZZ-ZZZV');
  });

  test('the bits are read most significant first, five at a time', () => {
    // 0b00001 00010 00011 ... : bytes 0x08 0x86 … give 1, 2, 3 …
    const code = newVerificationCode(
      Uint8Array.from([0x08, 0x86, 0x42, 0x98, 0xe8, ...new Array(12).fill(0)]),
    ).replace(/-/g, '');
    expect(code.slice(0, 8)).toBe('12345678');
  });

  test('only the first 17 bytes are used', () => {
    expect(newVerificationCode(new Uint8Array(40))).toBe(newVerificationCode(zeros));
  });

  test('too few bytes is an error', () => {
    expect(() => newVerificationCode(bytes(1, 2, 3))).toThrow(RangeError);
  });

  test('random codes are well formed, grouped in fours and distinct', () => {
    const seen = new Set<string>();
    for (let i = 0; i < 200; i++) {
      const code = newVerificationCode(randomBytes(CODE_RANDOM_BYTES));
      expect(code).toMatch(/^([0-9A-HJKMNP-TV-Z]{4}-){6}[0-9A-HJKMNP-TV-Z]{4}$/);
      expect(isWellFormedVerificationCode(code)).toBe(true);
      seen.add(code);
    }
    expect(seen.size).toBe(200);
  });
});

describe('normalise and check what people type', () => {
  const code = newVerificationCode(Uint8Array.from({ length: 17 }, (_x, i) => (i * 37 + 11) & 255));
  const plain = code.replace(/-/g, '');

  test.each([
    ['as printed', code],
    ['lower case', code.toLowerCase()],
    ['no dashes', plain],
    ['spaces instead of dashes', code.replace(/-/g, ' ')],
    ['surrounding space and en dashes', `  ${code.replace(/-/g, '–')}  `],
  ])('%s', (_n, typed) => {
    expect(normaliseVerificationCode(typed)).toBe(code);
    expect(isWellFormedVerificationCode(typed)).toBe(true);
  });

  test('confusable letters read as digits in a known code', () => {
    expect(normaliseVerificationCode('oooo-oooo-oooo-oooo-oooo-oooo-oooo')).toBe(
      '0000-0000-0000-0000-0000-0000-0000',
    );
    expect(isWellFormedVerificationCode('OOOO OOOO OOOO OOOO OOOO OOOO OOOO')).toBe(true);
    expect(normaliseVerificationCode('1Il1')).toBe('1111');
  });

  test('one mistyped character is caught by the check character', () => {
    for (let i = 0; i < CODE_LENGTH; i++) {
      const c = plain[i];
      const other = CROCKFORD_ALPHABET[(CROCKFORD_ALPHABET.indexOf(c) + 1) % 32];
      expect(
        isWellFormedVerificationCode(plain.slice(0, i) + other + plain.slice(i + 1)),
        `position ${i}`,
      ).toBe(false);
    }
  });

  test('two swapped neighbours are caught', () => {
    let caught = 0;
    let swaps = 0;
    for (let i = 0; i < CODE_LENGTH - 1; i++) {
      if (plain[i] === plain[i + 1]) continue;
      swaps++;
      if (!isWellFormedVerificationCode(plain.slice(0, i) + plain[i + 1] + plain[i] + plain.slice(i + 2)))
        caught++;
    }
    // Luhn mod N misses a few transpositions (pairs whose weighted sums coincide); nearly all are caught.
    expect(caught).toBeGreaterThanOrEqual(swaps - 2);
  });

  test.each([
    ['empty', ''],
    ['too short', plain.slice(0, -1)],
    ['too long', `${plain}0`],
    ['U is not in the alphabet', `U${plain.slice(1)}`],
    ['punctuation', `${plain.slice(0, -1)}!`],
  ])('not well formed: %s', (_n, typed) => {
    expect(isWellFormedVerificationCode(typed)).toBe(false);
  });

  test('an incomplete input comes back cleaned, not grouped', () => {
    expect(normaliseVerificationCode(' ab-cd ef ')).toBe('ABCDEF');
  });
});

describe('what a typed code is looked up as (issue 9 §5)', () => {
  const current = newVerificationCode(Uint8Array.from({ length: 17 }, (_x, i) => (i * 53 + 7) & 255));
  // The older check-run form: 24 characters of the same alphabet, no groups, no check character.
  const legacy = '7K2QMX9D4HBT0ZRS5WNC8EPA';
  test.each([
    ['a current code as printed', current, { form: 'current', code: current }],
    ['a current code typed loosely', current.replace(/-/g, ' ').toLowerCase(), { form: 'current', code: current }],
    ['an older check-run code', legacy, { form: 'legacy_check_run', code: legacy }],
    ['an older check-run code typed in fours, lower case, O for 0', '7k2q-mx9d-4hbt-ozrs-5wnc-8epa', { form: 'legacy_check_run', code: legacy }],
    ['a current code with one character wrong', current.slice(0, -1) + (current.endsWith('0') ? '1' : '0'), { form: 'malformed' }],
    ['25 characters', `${legacy}0`, { form: 'malformed' }],
    ['U is in neither alphabet', `U${legacy.slice(1)}`, { form: 'malformed' }],
  ])('%s', (_n, typed, expected) => {
    expect(codeForLookup(typed)).toMatchObject(expected);
  });
  test('the older length is not the current one, so the two forms never meet', () => {
    expect(LEGACY_CHECK_RUN_CODE_LENGTH).not.toBe(CODE_LENGTH);
  });
});
