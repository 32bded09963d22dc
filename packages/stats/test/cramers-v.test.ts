import { describe, it, expect } from 'vitest';
import { cramersV } from '../src/cramers-v.ts';
import { pearsonChiSquare } from '../src/chi-square.ts';
import { RB } from './bivariate-oracle.ts';

describe('cramersV', () => {
  for (const name of ['t2x2', 't3x4', 'sparse'] as const) {
    it(`${name} matches R`, () => {
      const t = RB.chisq[name];
      const test = pearsonChiSquare(t.table);
      // R 4.2.2: sqrt(chisq.test(t, correct = FALSE)$statistic / (n (min(dim(t)) - 1)))
      expect(cramersV(test.statistic, test.n, test.testedRows.length, test.testedColumns.length)).toBeCloseTo(t.cramersV, 12);
    });
  }

  it('reproduces the worked example (party identification by gender, recalled from memory)', () => {
    // First principles from the published X^2 = 30.07, n = 2757, min(2, 3) - 1 = 1: V = sqrt(30.07 / 2757) = 0.104.
    const test = pearsonChiSquare([
      [762, 327, 468],
      [484, 239, 477],
    ]);
    expect(cramersV(test.statistic, test.n, 2, 3)).toBeCloseTo(Math.sqrt(30.07 / 2757), 4);
  });

  it('is null without a statistic, without observations or with one category', () => {
    expect(cramersV(null, 10, 2, 2)).toBeNull();
    expect(cramersV(0, 0, 2, 2)).toBeNull();
    expect(cramersV(1, 10, 1, 3)).toBeNull();
  });
});
