/** Cramer's V, the chi-square statistic scaled to 0..1. */

/**
 * Cramer's V = sqrt(X^2 / (n (min(r, c) - 1))).
 *
 * Convention: the uncorrected Pearson X^2 (no continuity correction) and the dimensions of the
 * tested table (rows and columns with non-zero margins, as `pearsonChiSquare` reports them); no
 * small-sample bias correction. Null when X^2 is null, n is 0 or min(r, c) < 2. Clamped to 1
 * against rounding. Cost: O(1). Throws nothing.
 *
 * @example cramersV(24.242424242424242, 100, 2, 2) // 0.4924
 */
export function cramersV(statistic: number | null, n: number, rows: number, columns: number): number | null {
  const k = Math.min(rows, columns) - 1;
  if (statistic === null || !(n > 0) || k < 1) return null;
  return Math.min(1, Math.sqrt(statistic / (n * k)));
}
