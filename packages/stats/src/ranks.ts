/**
 * Ranks with ties averaged (the "average" or "fractional" ranking): tied values all get the mean
 * of the ranks they occupy, so the ranks always sum to n (n + 1) / 2.
 */
import { radixSort } from './sort.ts';

/**
 * 1-based ranks of `values`, ties given the average of the positions they span.
 *
 * Convention: average ranks for ties (a run of equal values at sorted positions i..j, 1-based,
 * all get (i + j) / 2); -0 and 0 are equal. NaN gets rank NaN and is not counted among the
 * ranked values.
 * Cost: O(n) time (see `sortColumn`) and about 32 bytes per value. Throws nothing.
 *
 * @example averageRanks([10, 20, 20, 30]) // Float64Array [1, 2.5, 2.5, 4]
 */
export function averageRanks(values: ArrayLike<number>): Float64Array {
  return ranksAlongOrder(sortColumn(values));
}

/** A column's non-NaN values in ascending order, with the position each came from. */
export interface SortedColumn {
  /** Number of entries of the column, NaN included. */
  length: number;
  /** Positions of the non-NaN entries, ascending by value (stable: ties keep position order). */
  order: Uint32Array;
  /** The values in that order: sorted[k] = values[order[k]]. */
  sorted: Float64Array;
}

/**
 * Sorts the non-NaN entries of `values` and keeps the position each came from. Sorting once and
 * reusing the result lets a caller rank many subsets of one column (the pairwise-complete rows
 * of different pairs) or split it into sorted groups in one linear walk each.
 *
 * Convention: numeric order, -0 equal to 0 (stored as 0), NaN left out, stable.
 * Cost: O(n) time and about 24 bytes per value: a radix sort (see `radixSort`) carries each
 * position along, without comparator callbacks (a comparator sort of positions is several times
 * slower than the native value sort on a million values). Throws nothing.
 *
 * @example sortColumn([30, NaN, 10, 20]) // { length: 4, order: [2, 3, 0], sorted: [10, 20, 30] }
 */
export function sortColumn(values: ArrayLike<number>): SortedColumn {
  const n = values.length;
  const keys = new Float64Array(n);
  const positions = new Uint32Array(n);
  let m = 0;
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (Number.isNaN(v)) continue;
    // Adding 0 turns -0 into 0 so that the two, equal as numbers, share one bit pattern.
    keys[m] = v + 0;
    positions[m] = i;
    m++;
  }
  const { order, sorted } = radixSort(keys.subarray(0, m), positions.subarray(0, m));
  return { length: n, order: order!, sorted };
}

/**
 * Average ranks of the entries of a sorted column (see `sortColumn`) whose include[position]
 * is 1, or of all its non-NaN entries without `include`; every other position gets NaN. Ranks
 * count only the included entries, so this ranks a subset without sorting it again.
 *
 * Convention: 1-based average ranks for ties, equality by === (so -0 equals 0).
 * Cost: O(n) (one walk along the order). Throws nothing.
 *
 * @example ranksAlongOrder(sortColumn([30, 10, 20]), Uint8Array.of(1, 0, 1)) // [2, NaN, 1]
 */
export function ranksAlongOrder(column: SortedColumn, include?: Uint8Array): Float64Array {
  const { order, sorted } = column;
  const ranks = new Float64Array(column.length).fill(NaN);
  const m = order.length;
  let placed = 0;
  let k = 0;
  while (k < m) {
    const v = sorted[k];
    // Equal values are contiguous in the order; excluded entries may sit among them.
    let end = k;
    let tied = 0;
    while (end < m && sorted[end] === v) {
      if (include === undefined || include[order[end]] === 1) tied++;
      end++;
    }
    if (tied > 0) {
      // The run takes ranks placed+1 .. placed+tied; their mean is placed + (tied + 1) / 2.
      const rank = placed + (tied + 1) / 2;
      for (let j = k; j < end; j++) if (include === undefined || include[order[j]] === 1) ranks[order[j]] = rank;
      placed += tied;
    }
    k = end;
  }
  return ranks;
}
