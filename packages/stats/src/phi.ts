/** The phi coefficient of a 2 x 2 table. */
import type { Table } from './contingency.ts';

/**
 * Signed phi of a 2 x 2 table [[a, b], [c, d]]: (a d - b c) / sqrt((a + b)(c + d)(a + c)(b + d)).
 *
 * Convention: signed (positive when the diagonal a, d dominates), so |phi| equals Cramer's V for
 * a 2 x 2 table; equal to Pearson's r of the two 0/1 indicator variables. Null when the table is
 * not 2 x 2 or a margin is 0. Cost: O(1). Throws nothing.
 *
 * @example phi([[30, 10], [15, 45]]) // 0.4924
 */
export function phi(table: Table): number | null {
  if (table.length !== 2 || table[0].length !== 2 || table[1].length !== 2) return null;
  const [[a, b], [c, d]] = table;
  const product = (a + b) * (c + d) * (a + c) * (b + d);
  if (!(product > 0)) return null;
  return (a * d - b * c) / Math.sqrt(product);
}
