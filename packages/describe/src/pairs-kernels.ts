/**
 * Ranking a subset of a continuous column's rows (a pair's complete rows) along the column's
 * stored sort order, into a buffer the caller reuses: the ranks equal `ranksAlongOrder`'s
 * (the tests compare them), without a row-length array per call and without the sorted values.
 */

/** A continuous column with the positions of its non-NaN values in ascending value order (stable) and where each run of equal values starts. */
export interface OrderedColumn {
  values: Float64Array;
  /** Rows of the non-NaN values, ascending by value, ties in row order (`sortColumn`'s order). */
  order: Uint32Array;
  /** runStarts[k] = 1 where the value at order[k] differs from the one before it (===, so -0 equals 0). */
  runStarts: Uint8Array;
}

/**
 * Writes into ranks[r], for every row r with include[r] = 1 and a value, its average rank among
 * those rows; other entries are left as they were.
 *
 * Convention: 1-based ranks, a run of t tied included values after p smaller ones all get
 * p + (t + 1) / 2 (ties averaged), as `ranksAlongOrder`. Cost: O(m) for m values, no allocation.
 * Throws nothing.
 *
 * @example ranksAmong({ values, order: [1, 2, 0], runStarts: [1, 1, 1] }, Uint8Array.of(1, 0, 1), out) // out[1] = 1, out[0] = 2
 */
export function ranksAmong(column: OrderedColumn, include: Uint8Array, ranks: Float64Array): void {
  const { order, runStarts } = column;
  const m = order.length;
  let placed = 0;
  let k = 0;
  while (k < m) {
    let end = k + 1;
    while (end < m && runStarts[end] === 0) end++;
    if (end === k + 1) {
      const r = order[k];
      // A run of one: placed + (1 + 1) / 2.
      if (include[r] === 1) ranks[r] = ++placed;
    } else {
      let tied = 0;
      for (let j = k; j < end; j++) if (include[order[j]] === 1) tied++;
      if (tied > 0) {
        const rank = placed + (tied + 1) / 2;
        for (let j = k; j < end; j++) if (include[order[j]] === 1) ranks[order[j]] = rank;
        placed += tied;
      }
    }
    k = end;
  }
}
