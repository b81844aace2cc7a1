// The number reader: every way builders write a number, read as they mean it or refused with the
// reason (issue 9 §1). A "2,800 lb" car read as 2.8 lb lands in the lightest tube band: a false pass.
import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { readTypedNumber, type TypedNumberRefusal } from '@backend/domain/typed-number';
import type { UnitSystem } from '@backend/domain/units';

describe('read as meant', () => {
  test.each<[string, UnitSystem, number]>([
    ['2,800', 'imperial', 2800], // inch-pound mode: a comma groups thousands
    ['2 800', 'imperial', 2800],
    ['2 800', 'metric', 2800],
    ['2\u202F800', 'metric', 2800], // a narrow no-break space, as some keyboards and locales group
    ['2.800,5', 'imperial', 2800.5], // both marks: the last one is the decimal
    ['2.800,5', 'metric', 2800.5],
    ['2,800.5', 'metric', 2800.5],
    ['2 800,5', 'metric', 2800.5],
    ['1,000,000', 'metric', 1_000_000], // two commas cannot be decimals
    ['1.000.000', 'imperial', 1_000_000],
    ['50,000', 'imperial', 50_000], // a yield strength in psi, as rulebooks print it
    ['1,5', 'metric', 1.5], // a decimal comma: "1,5" cannot be a thousands group
    ['2,8', 'metric', 2.8],
    ['0,800', 'metric', 0.8], // "0" cannot lead a group
    ['1.5', 'imperial', 1.5],
    ['1.5', 'metric', 1.5],
    ['1.500', 'imperial', 1.5], // the trade's three decimals for inch sizes
    ['.095', 'imperial', 0.095],
    ['0.095', 'metric', 0.095],
    ['2800', 'metric', 2800],
    ['-12.5', 'metric', -12.5],
    ['\u221212,5', 'metric', -12.5], // a typographic minus
    ['1-5/8', 'imperial', 1.625],
    ['1 5/8', 'metric', 1.625],
    ['5/8', 'imperial', 0.625],
    ['-1 1/2', 'imperial', -1.5],
  ])('"%s" in %s mode is %d', (text, system, value) => {
    expect(readTypedNumber(text, system)).toEqual({ ok: true, value });
  });
});

describe('refused, saying why', () => {
  test.each<[string, UnitSystem, TypedNumberRefusal, string]>([
    ['2,8', 'imperial', 'comma_in_inch_pound', '"2,8": in inch-pound units a comma groups thousands (2,800), so this is not clear. Type a decimal with a point (2.8).'],
    ['1,5', 'imperial', 'comma_in_inch_pound', '"1,5": in inch-pound units a comma groups thousands (2,800), so this is not clear. Type a decimal with a point (1.5).'],
    ['2,800', 'metric', 'ambiguous', '"2,800" could mean 2800 or 2.8. Type 2800 or 2.8 to say which.'],
    ['2.800', 'metric', 'ambiguous', '"2.800" could mean 2.8 or 2800. Type 2.8 or 2800 to say which.'],
    // three decimals would be read as a group again, so the suggestion carries a fourth
    ['2,125', 'metric', 'ambiguous', '"2,125" could mean 2125 or 2.125. Type 2125 or 2.1250 to say which.'],
    ['12,34,567', 'imperial', 'inconsistent_grouping', '"12,34,567" is not grouped consistently: use one separator, with three digits in each group after the first (2,800 or 12 500), and one decimal mark.'],
    ['2,80', 'imperial', 'comma_in_inch_pound', '"2,80": in inch-pound units a comma groups thousands (2,800), so this is not clear. Type a decimal with a point (2.8).'],
    ['1,234 567', 'metric', 'inconsistent_grouping', '"1,234 567" is not grouped consistently: use one separator, with three digits in each group after the first (2,800 or 12 500), and one decimal mark.'],
    ['1.2.3', 'metric', 'inconsistent_grouping', '"1.2.3" is not grouped consistently: use one separator, with three digits in each group after the first (2,800 or 12 500), and one decimal mark.'],
    ['1..5', 'imperial', 'not_a_number', '"1..5" is not a number.'],
    ['2800.', 'imperial', 'not_a_number', '"2800." is not a number.'],
    ['1 5', 'metric', 'inconsistent_grouping', '"1 5" is not grouped consistently: use one separator, with three digits in each group after the first (2,800 or 12 500), and one decimal mark.'],
    ['abc', 'metric', 'not_a_number', '"abc" is not a number.'],
    ['1e3', 'metric', 'not_a_number', '"1e3" is not a number.'],
    ['', 'metric', 'empty', 'Enter a value.'],
    ['1/0', 'imperial', 'bad_fraction', '"1/0" divides by zero.'],
    ['1 9/8', 'imperial', 'bad_fraction', '"1 9/8": the fraction after the whole number must be less than one.'],
    ['1/2/3', 'imperial', 'bad_fraction', '"1/2/3" is not a fraction: write 5/8, 1 5/8 or 1-5/8.'],
  ])('"%s" in %s mode: %s', (text, system, reason, message) => {
    expect(readTypedNumber(text, system)).toEqual({ ok: false, reason, message });
  });
});

// Property: strings written by people of either convention, grouped or not, with or without decimals.
// Each is read as its writer meant, or refused; never a third value. Inch-pound mode presumes the
// point convention for the one form both read ("2,800"); its builders are tested for exactness.
type Writer = 'point' | 'comma';
interface Written { text: string; meant: number; writer: Writer }

const written = fc
  .record({
    writer: fc.constantFrom<Writer>('point', 'comma'),
    whole: fc.oneof(fc.integer({ min: 0, max: 999 }), fc.integer({ min: 0, max: 99_999_999 })),
    decimals: fc.oneof(fc.constant(''), fc.stringMatching(/^\d{1,4}$/)),
    grouping: fc.constantFrom<'none' | 'mark' | 'space'>('none', 'mark', 'space'),
    negative: fc.boolean(),
  })
  .map(({ writer, whole, decimals, grouping, negative }): Written => {
    const groupMark = grouping === 'none' ? '' : grouping === 'space' ? ' ' : writer === 'point' ? ',' : '.';
    const decimalMark = writer === 'point' ? '.' : ',';
    const wholeText = String(whole).replace(/\B(?=(\d{3})+(?!\d))/g, groupMark);
    const text = `${negative ? '-' : ''}${wholeText}${decimals ? decimalMark + decimals : ''}`;
    const meant = (negative ? -1 : 1) * Number(`${whole}${decimals ? `.${decimals}` : ''}`);
    return { text, meant, writer };
  });

const fraction = fc
  .record({ whole: fc.integer({ min: 0, max: 9 }), den: fc.constantFrom(2, 4, 8, 16, 32, 64), join: fc.constantFrom(' ', '-') })
  .chain(({ whole, den, join }) =>
    fc.integer({ min: 1, max: den - 1 }).map((num) => ({ text: whole === 0 ? `${num}/${den}` : `${whole}${join}${num}/${den}`, meant: whole + num / den })),
  );

/** Is `text` something a point-convention writer could have written? */
const readsAsPointConvention = (text: string) => /^-?(\d{1,3}(,\d{3})+|\d{1,3}( \d{3})+|\d+)(\.\d+)?$/.test(text) && !/^-?0[, ]/.test(text);

describe('property: read as the writer meant, or refused', () => {
  test('metric mode presumes neither convention', () => {
    fc.assert(
      fc.property(written, ({ text, meant }) => {
        const read = readTypedNumber(text, 'metric');
        if (read.ok) expect(read.value).toBe(meant);
        else expect(['ambiguous', 'inconsistent_grouping']).toContain(read.reason);
      }),
      { numRuns: 2000 },
    );
  });

  test('inch-pound mode: a point-convention writer is always read exactly', () => {
    fc.assert(
      fc.property(written.filter((w) => w.writer === 'point'), ({ text, meant }) => {
        expect(readTypedNumber(text, 'imperial')).toEqual({ ok: true, value: meant });
      }),
      { numRuns: 2000 },
    );
  });

  test('inch-pound mode: a comma-convention writer is read as meant or refused, unless the text is also a point-convention number', () => {
    fc.assert(
      fc.property(written.filter((w) => w.writer === 'comma' && !readsAsPointConvention(w.text)), ({ text, meant }) => {
        const read = readTypedNumber(text, 'imperial');
        if (read.ok) expect(read.value).toBe(meant);
        else expect(['comma_in_inch_pound', 'inconsistent_grouping']).toContain(read.reason);
      }),
      { numRuns: 2000 },
    );
  });

  test('plain numbers (no grouping, a decimal part other than three digits) are never refused', () => {
    fc.assert(
      fc.property(
        fc.constantFrom<UnitSystem>('imperial', 'metric'),
        fc.integer({ min: 0, max: 99_999_999 }),
        fc.oneof(fc.constant(''), fc.stringMatching(/^(\d{1,2}|\d{4})$/)),
        (system, whole, decimals) => {
          const text = decimals ? `${whole}.${decimals}` : String(whole);
          expect(readTypedNumber(text, system)).toEqual({ ok: true, value: Number(text) });
        },
      ),
    );
  });

  test('fractions read the same in both modes', () => {
    fc.assert(
      fc.property(fraction, fc.constantFrom<UnitSystem>('imperial', 'metric'), ({ text, meant }, system) => {
        expect(readTypedNumber(text, system)).toEqual({ ok: true, value: meant });
      }),
    );
  });
});
