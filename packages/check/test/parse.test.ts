import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { parseNumber, parseIsoDate } from '../src/parse.ts';

describe('parseNumber', () => {
  it('agrees with ECMAScript Number() on plain decimal text (the language spec rounds correctly)', () => {
    // Oracle: Number(), whose StringToNumber is specified to round to the nearest double.
    const text = fc
      .tuple(fc.constantFrom('', '-', '+'), fc.stringMatching(/^[0-9]{1,18}$/), fc.option(fc.stringMatching(/^[0-9]{0,18}$/)))
      .map(([s, a, b]) => (b === null ? `${s}${a}` : `${s}${a}.${b}`));
    fc.assert(
      fc.property(text, (t) => {
        expect(Object.is(parseNumber(t, false), Number(t) + 0)).toBe(true);
      }),
      { numRuns: 2000, seed: 11 },
    );
  });

  it('reads a decimal comma only when asked, and then refuses a full stop', () => {
    expect(parseNumber('2,5', true)).toBe(2.5);
    expect(parseNumber('2,5', false)).toBeNaN();
    expect(parseNumber('2.5', true)).toBeNaN();
    expect(parseNumber('-9', true)).toBe(-9);
  });

  it('refuses what Number() is lenient about', () => {
    for (const t of ['', ' 7', '0x1A', 'Infinity', '1e', '.', '-', '1.2.3', '1,000', 'NaN']) expect(parseNumber(t, false)).toBeNaN();
    expect(parseNumber('1e3', false)).toBe(1000);
    expect(Object.is(parseNumber('-0', false), 0)).toBe(true);
  });
});

describe('parseIsoDate', () => {
  it('counts days from 1970-01-01 and knows the Gregorian leap-year rule', () => {
    // First principles: 1970-01-02 is one day after the epoch; 2000 is a leap year (divisible
    // by 400), 1900 is not (divisible by 100 but not 400).
    expect(parseIsoDate('1970-01-02')).toBe(1);
    expect(parseIsoDate('1969-12-31')).toBe(-1);
    expect(parseIsoDate('2000-02-29')).not.toBeNaN();
    expect(parseIsoDate('1900-02-29')).toBeNaN();
    expect(parseIsoDate('2023-02-30')).toBeNaN();
    expect(parseIsoDate('14/03/2026')).toBeNaN();
    // 2000-03-01 minus 2000-02-28 is 2 days in a leap year.
    expect(parseIsoDate('2000-03-01') - parseIsoDate('2000-02-28')).toBe(2);
  });
});
