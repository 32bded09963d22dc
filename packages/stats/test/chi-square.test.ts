import { describe, it, expect } from 'vitest';
import { chiSquareUpperTail, pearsonChiSquare } from '../src/chi-square.ts';
import { RB, jStat } from './bivariate-oracle.ts';

describe('pearsonChiSquare against R', () => {
  for (const name of ['t2x2', 't3x4', 'sparse'] as const) {
    it(`${name}: statistic, df, p and expected counts`, () => {
      const t = RB.chisq[name];
      const result = pearsonChiSquare(t.table);
      // R 4.2.2 chisq.test(t, correct = FALSE): statistic, parameter, p.value, expected
      expect(result.statistic).toBeCloseTo(t.statistic, 10);
      expect(result.df).toBe(t.df);
      expect(result.p! / t.p).toBeCloseTo(1, 8);
      t.expected.forEach((row, i) => row.forEach((v, j) => expect(result.expected[i][j]).toBeCloseTo(v, 10)));
    });
  }

  it('sparse table: share of expected counts below 5', () => {
    // From R's expected counts of the sparse table: count the cells below 5 (Cochran's rule, common practice).
    const e = RB.chisq.sparse.expected.flat();
    const result = pearsonChiSquare(RB.chisq.sparse.table);
    expect(result.lowExpectedPercent).toBeCloseTo((100 * e.filter((v) => v < 5).length) / e.length, 12);
    expect(result.expectedBelowOne).toBe(e.filter((v) => v < 1).length);
  });

  it('drops empty rows and columns from the test and keeps them in the table', () => {
    // R t3x4 with an all-zero row and column inserted: same statistic, df and p as R's t3x4.
    const t = RB.chisq.t3x4;
    const padded = [...t.table.slice(0, 1), [0, 0, 0, 0], ...t.table.slice(1)].map((row) => [row[0], 0, ...row.slice(1)]);
    const result = pearsonChiSquare(padded);
    expect(result.statistic).toBeCloseTo(t.statistic, 10);
    expect(result.df).toBe(t.df);
    expect(result.p! / t.p).toBeCloseTo(1, 8);
    expect(result.testedRows).toEqual([0, 2, 3]);
    expect(result.testedColumns).toEqual([0, 2, 3, 4]);
    expect(result.expected[1]).toEqual([0, 0, 0, 0, 0]);
  });

  it('is untestable with a single occupied row', () => {
    // First principles: with one row there is no independence to test, df would be 0.
    const result = pearsonChiSquare([
      [3, 4],
      [0, 0],
    ]);
    expect(result).toMatchObject({ statistic: null, df: 0, p: null, n: 7 });
  });

  it('reproduces a published worked example (party identification by gender, recalled from memory)', () => {
    // A categorical-data textbook's 2 x 3 example (recalled from memory): X^2 = 30.07 on 2 df.
    const table = [
      [762, 327, 468],
      [484, 239, 477],
    ];
    const result = pearsonChiSquare(table);
    expect(result.statistic).toBeCloseTo(30.07, 2);
    // Verified by first principles: E = rowSum colSum / n with row sums 1557 and 1200, column
    // sums 1246, 566, 945 and n = 2757, and X^2 = sum (O - E)^2 / E.
    const rows = [1557, 1200];
    const cols = [1246, 566, 945];
    let x2 = 0;
    for (let i = 0; i < 2; i++) for (let j = 0; j < 3; j++) x2 += (table[i][j] - (rows[i] * cols[j]) / 2757) ** 2 / ((rows[i] * cols[j]) / 2757);
    expect(result.statistic).toBeCloseTo(x2, 10);
    // First principles: chi-square with 2 df is exponential with mean 2, so P(X >= x) = exp(-x / 2).
    expect(result.p! / Math.exp(-x2 / 2)).toBeCloseTo(1, 10);
  });
});

describe('chiSquareUpperTail', () => {
  it('agrees with 1 - jStat.chisquare.cdf where that difference is accurate', () => {
    for (const [x, df] of [
      [0.5, 1],
      [3.841458820694124, 1],
      [10, 4],
      [25, 12],
      [60, 40],
      [150, 120],
    ]) {
      // jStat 1.9.6 chisquare.cdf(x, df)
      expect(chiSquareUpperTail(x, df)).toBeCloseTo(1 - jStat.chisquare.cdf(x, df), 9);
    }
  });

  it('keeps its digits in the far tail where 1 - cdf is 0', () => {
    // First principles: for 2 df the upper tail is exp(-x / 2) exactly.
    for (const x of [40, 200, 1000]) expect(chiSquareUpperTail(x, 2) / Math.exp(-x / 2)).toBeCloseTo(1, 10);
    expect(1 - jStat.chisquare.cdf(200, 2)).toBe(0);
  });

  it('is 1 at and below zero and NaN for a bad df', () => {
    // First principles: X >= 0 always.
    expect(chiSquareUpperTail(0, 3)).toBe(1);
    expect(Number.isNaN(chiSquareUpperTail(1, 0))).toBe(true);
  });
});
