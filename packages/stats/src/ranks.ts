/**
 * Ranks with ties averaged (the "average" or "fractional" ranking): tied values all get the mean
 * of the ranks they occupy, so the ranks always sum to n (n + 1) / 2.
 */
import { sortedCopy } from './sort.ts';

/**
 * 1-based ranks of `values`, ties given the average of the positions they span.
 *
 * Convention: average ranks for ties (a run of equal values at sorted positions i..j, 1-based,
 * all get (i + j) / 2). NaN gets rank NaN and is not counted among the ranked values.
 * Cost: one native sort of a Float64Array copy, O(n log n), plus two binary searches per value;
 * no comparator callbacks and no per-value objects, so a million values stay cheap.
 * Throws nothing.
 *
 * @example averageRanks([10, 20, 20, 30]) // Float64Array [1, 2.5, 2.5, 4]
 */
export function averageRanks(values: ArrayLike<number>): Float64Array {
  const n = values.length;
  // The typed-array sort is numeric and puts NaN last, so the ranked values are the prefix.
  const sorted = sortedCopy(values);
  let m = n;
  while (m > 0 && Number.isNaN(sorted[m - 1])) m--;
  const ranks = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (Number.isNaN(v)) {
      ranks[i] = NaN;
      continue;
    }
    const first = lowerBound(sorted, m, v);
    const last = upperBound(sorted, m, v); // one past the last equal value
    // 0-based positions first..last-1 are 1-based first+1..last; their mean is (first + 1 + last) / 2.
    ranks[i] = (first + 1 + last) / 2;
  }
  return ranks;
}

/** First index in sorted[0, m) whose value is >= v. */
function lowerBound(sorted: Float64Array, m: number, v: number): number {
  let lo = 0;
  let hi = m;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** First index in sorted[0, m) whose value is > v. */
function upperBound(sorted: Float64Array, m: number, v: number): number {
  let lo = 0;
  let hi = m;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] <= v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
