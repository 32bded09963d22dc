/** Goodman and Kruskal's gamma for two ordinal variables. */
import type { Table } from './contingency.ts';

/**
 * Goodman-Kruskal gamma = (P - Q) / (P + Q), P concordant and Q discordant pairs of
 * observations, from a table whose rows and columns are both in scale order.
 *
 * Convention: pairs tied on either variable are left out (that is what separates gamma from
 * Kendall's tau-b). P = sum over cells n_ij times the count strictly below and to the right;
 * Q = sum n_ij times the count strictly below and to the left. Null when P + Q = 0.
 * Cost: O(r c) with a suffix-sum table rather than the O(r^2 c^2) double loop over cells.
 * Throws nothing.
 *
 * @example goodmanKruskalGamma([[10, 0], [0, 10]]) // 1
 */
export function goodmanKruskalGamma(table: Table): number | null {
  const r = table.length;
  const c = r === 0 ? 0 : table[0].length;
  // below[i][j] = count in rows >= i and columns >= j, with a zero row and column of padding.
  const w = c + 1;
  const below = new Float64Array((r + 1) * w);
  for (let i = r - 1; i >= 0; i--) {
    for (let j = c - 1; j >= 0; j--) {
      below[i * w + j] = table[i][j] + below[(i + 1) * w + j] + below[i * w + j + 1] - below[(i + 1) * w + j + 1];
    }
  }
  let concordant = 0;
  let discordant = 0;
  for (let i = 0; i < r - 1; i++) {
    const next = (i + 1) * w;
    for (let j = 0; j < c; j++) {
      const v = table[i][j];
      if (v === 0) continue;
      concordant += v * below[next + j + 1];
      discordant += v * (below[next] - below[next + j]);
    }
  }
  const total = concordant + discordant;
  return total > 0 ? (concordant - discordant) / total : null;
}
