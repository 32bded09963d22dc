/** Pearson's chi-square test of independence for a contingency table. */
import gammainc from '@stdlib/math-base-special-gammainc';
import { expectedCounts, margins, type Table } from './contingency.ts';

/**
 * Upper tail P(X >= x) of the chi-square distribution with `df` degrees of freedom.
 *
 * Convention: the regularized upper incomplete gamma Q(df / 2, x / 2), computed directly rather
 * than as 1 - cdf, so p-values such as 1e-20 keep their digits instead of rounding to 0.
 * Returns 1 for x <= 0 and NaN for NaN input or df <= 0. Cost: O(1) (a series or continued
 * fraction). Throws nothing.
 *
 * @example chiSquareUpperTail(3.841458820694124, 1) // 0.05
 */
export function chiSquareUpperTail(x: number, df: number): number {
  if (Number.isNaN(x) || Number.isNaN(df) || !(df > 0)) return NaN;
  if (x <= 0) return 1;
  return gammainc(x / 2, df / 2, true, true);
}

export interface ChiSquareTest {
  /** Pearson's X^2 over the tested rows and columns; null when fewer than 2 of either are occupied. */
  statistic: number | null;
  /** (r' - 1)(c' - 1) over the r' rows and c' columns with non-zero margins; 0 when untestable. */
  df: number;
  p: number | null;
  n: number;
  /** Expected counts for the whole table (0 in empty rows and columns). */
  expected: number[][];
  /** Indices of the rows and columns with non-zero margins, the ones the test uses. */
  testedRows: number[];
  testedColumns: number[];
  /** Share (0 to 100) of the tested cells whose expected count is below 5. */
  lowExpectedPercent: number;
  /** Number of tested cells whose expected count is below 1. */
  expectedBelowOne: number;
}

/**
 * Pearson's chi-square test of independence: X^2 = sum (O - E)^2 / E, E = rowSum colSum / n.
 *
 * Convention: no continuity correction (also for 2 x 2 tables). Rows and columns whose margin is
 * 0 (a code nobody chose) are dropped from the test: they contribute no terms and no degrees of
 * freedom, so df = (r' - 1)(c' - 1) over the occupied rows and columns; they stay in the
 * displayed table with expected counts of 0. p is the chi-square upper tail (see
 * `chiSquareUpperTail`). The share of expected counts below 5 is reported for a warning when it
 * exceeds 20% (Cochran's rule, common practice).
 * Cost: O(r c). Throws nothing.
 *
 * @example pearsonChiSquare([[30, 10], [15, 45]]).statistic // 24.2424...
 */
export function pearsonChiSquare(table: Table): ChiSquareTest {
  const { rowSums, columnSums, n } = margins(table);
  const expected = expectedCounts(table);
  const testedRows = indicesWhere(rowSums, (v) => v > 0);
  const testedColumns = indicesWhere(columnSums, (v) => v > 0);
  let statistic = 0;
  let low = 0;
  let belowOne = 0;
  for (const i of testedRows) {
    for (const j of testedColumns) {
      const e = expected[i][j];
      const d = table[i][j] - e;
      statistic += (d * d) / e;
      if (e < 5) low++;
      if (e < 1) belowOne++;
    }
  }
  const cells = testedRows.length * testedColumns.length;
  const lowExpectedPercent = cells > 0 ? (100 * low) / cells : 0;
  const base = { n, expected, testedRows, testedColumns, lowExpectedPercent, expectedBelowOne: belowOne };
  if (testedRows.length < 2 || testedColumns.length < 2) return { ...base, statistic: null, df: 0, p: null };
  const df = (testedRows.length - 1) * (testedColumns.length - 1);
  return { ...base, statistic, df, p: chiSquareUpperTail(statistic, df) };
}

function indicesWhere(values: readonly number[], keep: (v: number) => boolean): number[] {
  const out: number[] = [];
  values.forEach((v, i) => {
    if (keep(v)) out.push(i);
  });
  return out;
}
