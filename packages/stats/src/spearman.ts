/** Spearman's rank correlation, for raw paired values and for an ordinal-by-ordinal table. */
import { averageRanks } from './ranks.ts';
import { pearson } from './pearson.ts';

/**
 * Spearman's rho of paired samples: Pearson's r of their ranks.
 *
 * Convention: ranks with ties averaged, then the product-moment correlation of the ranks (not the
 * 1 - 6 sum d^2 / (n (n^2 - 1)) shortcut, which is exact only without ties). Null for fewer
 * than two pairs or when either variable is constant. Callers pass pairwise-complete values.
 * Cost: two O(n log n) rankings and one O(n) correlation; two Float64Arrays of n.
 * Throws CodeweirError (CW_USAGE) when the lengths differ.
 *
 * @example spearman([1, 2, 3, 4], [1, 3, 2, 4]) // 0.8
 */
export function spearman(x: ArrayLike<number>, y: ArrayLike<number>): number | null {
  return pearson(averageRanks(x), averageRanks(y));
}

/**
 * Spearman's rho from a contingency table of two ordinal variables (rows and columns in scale
 * order): every observation in row i gets the average rank of row category i, every observation
 * in column j that of column category j, and rho is the count-weighted Pearson r of those ranks.
 *
 * Convention: average ranks for ties (all observations of one category are tied), the same value
 * `spearman` gives on the expanded observations. Null when n < 2 or only one row or one column
 * category is occupied. Cost: O(r c). Throws nothing.
 *
 * @example spearmanFromTable([[2, 0], [0, 2]]) // 1
 */
export function spearmanFromTable(table: ReadonlyArray<ReadonlyArray<number>>): number | null {
  const r = table.length;
  const c = r === 0 ? 0 : table[0].length;
  const rowSums = new Float64Array(r);
  const colSums = new Float64Array(c);
  let n = 0;
  for (let i = 0; i < r; i++) {
    for (let j = 0; j < c; j++) {
      const v = table[i][j];
      rowSums[i] += v;
      colSums[j] += v;
      n += v;
    }
  }
  if (n < 2) return null;
  const rowRank = categoryRanks(rowSums);
  const colRank = categoryRanks(colSums);
  // The mean rank of n observations is (n + 1) / 2 whatever the ties, so centre on it directly.
  const mid = (n + 1) / 2;
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  for (let i = 0; i < r; i++) sxx += rowSums[i] * (rowRank[i] - mid) ** 2;
  for (let j = 0; j < c; j++) syy += colSums[j] * (colRank[j] - mid) ** 2;
  for (let i = 0; i < r; i++) {
    for (let j = 0; j < c; j++) sxy += table[i][j] * (rowRank[i] - mid) * (colRank[j] - mid);
  }
  if (!(sxx > 0) || !(syy > 0)) return null;
  return Math.max(-1, Math.min(1, sxy / Math.sqrt(sxx * syy)));
}

/** Average rank of each category's observations, categories in order. */
function categoryRanks(counts: Float64Array): Float64Array {
  const ranks = new Float64Array(counts.length);
  let before = 0;
  for (let k = 0; k < counts.length; k++) {
    ranks[k] = before + (counts[k] + 1) / 2;
    before += counts[k];
  }
  return ranks;
}
