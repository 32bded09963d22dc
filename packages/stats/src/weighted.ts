import { RADIX_ORDER_MIN, radixSort } from './sort.ts';

/**
 * Weighted mean sum(w x) / sum(w).
 *
 * Convention: weights are non-negative; zero-weight values do not count. Computed as a running
 * weighted mean (West's update) so data far from zero keep their digits. Cost: O(n).
 * Throws nothing; NaN when the weights sum to 0 or the lengths differ.
 * @example weightedMean([1, 2, 3], [1, 1, 2]) // 2.25
 */
export function weightedMean(values: ArrayLike<number>, weights: ArrayLike<number>): number {
  return weightedMoments(values, weights).mean;
}

/**
 * Weighted standard deviation with frequency-weight semantics:
 * sqrt(sum(w (x - mean_w)^2) / (sum(w) - 1)).
 *
 * Convention: frequency weights (a weight of 3 counts as three identical cases), so with whole
 * weights it equals the ordinary n - 1 sd of the data with each value repeated w times. Survey
 * weights that do not sum to a count make sum(w) - 1 a convention, not an unbiased variance;
 * the result is then descriptive only. West's online update. Cost: O(n). Throws nothing; NaN
 * when sum(w) <= 1 or the lengths differ.
 * @example weightedSd([1, 2], [2, 2]) // sd of [1, 1, 2, 2]
 */
export function weightedSd(values: ArrayLike<number>, weights: ArrayLike<number>): number {
  const m = weightedMoments(values, weights);
  return m.sumOfWeights > 1 ? Math.sqrt(m.m2 / (m.sumOfWeights - 1)) : Number.NaN;
}

/**
 * Sum of weights, weighted mean and weighted sum of squared deviations (West's update).
 * With `skipNaN` a NaN value is passed over with its weight (the figures of the valid values
 * only, without copying them out first).
 * Cost: O(n). Throws nothing; mean NaN when the weights sum to 0 or the lengths differ.
 */
export function weightedMoments(
  values: ArrayLike<number>,
  weights: ArrayLike<number>,
  skipNaN = false,
): { sumOfWeights: number; mean: number; m2: number } {
  if (values.length !== weights.length) return { sumOfWeights: 0, mean: Number.NaN, m2: Number.NaN };
  let sw = 0;
  let mean = 0;
  let m2 = 0;
  for (let i = 0; i < values.length; i++) {
    const w = weights[i]!;
    if (!(w > 0)) continue;
    const x = values[i]!;
    if (skipNaN && Number.isNaN(x)) continue;
    sw += w;
    const delta = x - mean;
    const r = (delta * w) / sw;
    mean += r;
    m2 += w * delta * (x - mean);
  }
  return { sumOfWeights: sw, mean: sw > 0 ? mean : Number.NaN, m2 };
}

/**
 * Weighted p-quantile as the inverse of the weighted empirical distribution function: the
 * smallest value x whose cumulative weight share (sum of weights of values <= x, over the total)
 * is >= p; p = 0 gives the minimum. No interpolation, so the answer is always an observed value;
 * with equal weights it equals Hyndman-Fan type 1.
 *
 * Convention: weighted ECDF inverse (type 1 analogue); zero and negative weights are ignored;
 * the share comparison allows 4 machine epsilons so that p = 0.5 on a table of exact halves is
 * not lost to rounding. Cost: O(n) by a radix sort from {@link RADIX_ORDER_MIN} positive weights on,
 * O(n log n) by a comparison sort below (see {@link weightedQuantiles}). Throws nothing; NaN when
 * no weight is positive, p is outside [0, 1] or the lengths differ.
 * @example weightedQuantile([1, 2, 3], [1, 1, 2], 0.5) // 2
 */
export function weightedQuantile(values: ArrayLike<number>, weights: ArrayLike<number>, p: number): number {
  return weightedQuantiles(values, weights, [p])[0]!;
}

/**
 * Several weighted quantiles (see {@link weightedQuantile}) from one sort and one cumulative
 * walk; `ps` may come in any order and the answers follow it.
 *
 * Convention: as {@link weightedQuantile}. Ties keep their input order (a stable sort, -0 tied
 * with +0), and the weights are summed along the sorted order, so the result is the same, bit
 * for bit, as sorting positions with the comparator `values[a] - values[b]` and scanning from
 * the start once per p. A NaN value among the positive weights (which that comparator does not
 * order consistently) takes the comparator sort itself.
 * Cost: O(n + k log k) for k probabilities with a radix sort (see `radixSort`) from
 * {@link RADIX_ORDER_MIN} positive weights on, O(n log n + k log k) with a comparison sort below.
 * Throws nothing.
 */
export function weightedQuantiles(
  values: ArrayLike<number>,
  weights: ArrayLike<number>,
  ps: readonly number[],
): number[] {
  if (values.length !== weights.length) return ps.map(() => Number.NaN);
  let m = 0;
  let total = 0;
  let comparable = true;
  for (let i = 0; i < values.length; i++) {
    if (weights[i]! > 0) {
      m++;
      total += weights[i]!;
      if (Number.isNaN(values[i]!)) comparable = false;
    }
  }
  if (!(total > 0)) return ps.map(() => Number.NaN);
  const order = comparable && m >= RADIX_ORDER_MIN ? radixOrder(values, weights, m) : comparatorOrder(values, weights);
  return walkShares(values, weights, order, total, ps);
}

/** Positions with a positive weight, ascending by value, stable, via the radix sort. */
function radixOrder(values: ArrayLike<number>, weights: ArrayLike<number>, m: number): Uint32Array {
  const keys = new Float64Array(m);
  const positions = new Uint32Array(m);
  let k = 0;
  for (let i = 0; i < values.length; i++) {
    if (weights[i]! > 0) {
      // Adding 0 turns -0 into +0, so the two tie as they do under `a - b`.
      keys[k] = values[i]! + 0;
      positions[k++] = i;
    }
  }
  return radixSort(keys, positions).order!;
}

/** Positions with a positive weight, ascending by value, by Array.prototype.sort (stable). */
function comparatorOrder(values: ArrayLike<number>, weights: ArrayLike<number>): number[] {
  const idx: number[] = [];
  for (let i = 0; i < values.length; i++) if (weights[i]! > 0) idx.push(i);
  return idx.sort((a, b) => values[a]! - values[b]!);
}

/**
 * {@link weightedQuantiles} of the values of `sorted` (ascending, stable: equal values in row
 * order), `sortedWeights[k]` being the weight of sorted[k], where `total` is the sum of the
 * positive weights in row order (as {@link weightedMoments} sums them). Values whose weight is
 * not positive (NaN included) are passed over, so one sort serves the unweighted and the
 * weighted figures alike (see `sortedValidWith`).
 *
 * Convention: as {@link weightedQuantile}. The result is the same, bit for bit, as
 * weightedQuantiles of the values with their weights in row order when no value among them is
 * -0 (which this order puts before +0, and weightedQuantiles ties with it).
 * Cost: O(n + k log k), no sort, one sequential walk. Throws nothing; NaN when total is not positive.
 */
export function weightedQuantilesSorted(sorted: Float64Array, sortedWeights: Float64Array, total: number, ps: readonly number[]): number[] {
  if (!(total > 0) || sorted.length !== sortedWeights.length) return ps.map(() => Number.NaN);
  return walkShares(sorted, sortedWeights, undefined, total, ps);
}

/**
 * For each p, the first value along `order` whose cumulative weight share reaches p - eps (the
 * last value when none does), in one walk: the ps are visited in ascending order, and a share
 * that misses one p misses every larger p too, so each p is answered at its first success.
 * Without `order` the values and weights are already in sorted order. Entries whose
 * weight is not positive are passed over.
 */
function walkShares(
  values: ArrayLike<number>,
  weights: ArrayLike<number>,
  order: ArrayLike<number> | undefined,
  total: number,
  ps: readonly number[],
): number[] {
  const eps = 4 * Number.EPSILON;
  const out = ps.map(() => Number.NaN);
  const pending: number[] = [];
  ps.forEach((p, j) => {
    if (p >= 0 && p <= 1) pending.push(j);
  });
  pending.sort((a, b) => ps[a]! - ps[b]!);
  let next = 0;
  let cum = 0;
  let last = Number.NaN;
  const length = order ? order.length : values.length;
  for (let k = 0; k < length && next < pending.length; k++) {
    const i = order ? order[k]! : k;
    const w = weights[i]!;
    if (!(w > 0)) continue;
    const v = values[i]!;
    cum += w;
    last = v;
    const share = cum / total;
    while (next < pending.length && share >= ps[pending[next]!]! - eps) out[pending[next++]!] = v;
  }
  if (next < pending.length) {
    // The walk ended without reaching every p: the answer is the last value with a positive weight.
    for (let k = length - 1; k >= 0; k--) {
      const i = order ? order[k]! : k;
      if (weights[i]! > 0) {
        last = values[i]!;
        break;
      }
    }
  }
  while (next < pending.length) out[pending[next++]!] = last;
  return out;
}
