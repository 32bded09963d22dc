import { describe, it, expect } from 'vitest';
import { normalizeCheckOptions } from '../src/options.ts';

describe('normalizeCheckOptions', () => {
  it('fills the defaults', () => {
    expect(normalizeCheckOptions({})).toMatchObject({ maxFindingsPerRule: 1000, quantileType: 7, decimalComma: false, maxPatternLength: 10_000, unbinnedColumnShare: 0.5 });
  });

  it('accepts CLI strings and canonical spellings', () => {
    const o = normalizeCheckOptions({ quantileType: '6', maxFindingsPerRule: '25', delimiter: 'tab', encoding: 'CP1252' });
    expect(o).toMatchObject({ quantileType: 6, maxFindingsPerRule: 25, delimiter: '\t', encoding: 'windows-1252' });
  });

  it('fails fast with the bad value in one sentence', () => {
    const bad: Array<[Record<string, unknown>, string]> = [
      [{ quantileType: 12 }, '--quantiles takes 1 to 9, got 12.'],
      [{ quantileType: '2.5' }, '--quantiles takes 1 to 9, got 2.5.'],
      [{ maxFindingsPerRule: '0' }, '--max-findings-per-rule takes a whole number of at least 1, got 0.'],
      [{ encoding: 'ebcdic' }, '--encoding takes one of utf-8, windows-1252, latin1, utf-16le, utf-16be, got ebcdic.'],
      [{ delimiter: ';;' }, '--delimiter takes one character other than a quote or line break, got ";;".'],
    ];
    for (const [raw, message] of bad) {
      expect(() => normalizeCheckOptions(raw)).toThrow(message);
      try {
        normalizeCheckOptions(raw);
      } catch (e) {
        expect(e).toMatchObject({ code: 'CW_USAGE', exitCode: 2 });
      }
    }
  });
});
