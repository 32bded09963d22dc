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
 * Cost: O(n). Throws nothing; mean NaN when the weights sum to 0 or the lengths differ.
 */
export function weightedMoments(
  values: ArrayLike<number>,
  weights: ArrayLike<number>,
): { sumOfWeights: number; mean: number; m2: number } {
  if (values.length !== weights.length) return { sumOfWeights: 0, mean: Number.NaN, m2: Number.NaN };
  let sw = 0;
  let mean = 0;
  let m2 = 0;
  for (let i = 0; i < values.length; i++) {
    const w = weights[i]!;
    if (!(w > 0)) continue;
    const x = values[i]!;
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
 * not lost to rounding. Cost: O(n log n) for the sort. Throws nothing; NaN when no weight is
 * positive, p is outside [0, 1] or the lengths differ.
 * @example weightedQuantile([1, 2, 3], [1, 1, 2], 0.5) // 2
 */
export function weightedQuantile(values: ArrayLike<number>, weights: ArrayLike<number>, p: number): number {
  return weightedQuantiles(values, weights, [p])[0]!;
}

/**
 * Several weighted quantiles (see {@link weightedQuantile}) from one sort.
 * Cost: O(n log n + n k). Throws nothing.
 */
export function weightedQuantiles(
  values: ArrayLike<number>,
  weights: ArrayLike<number>,
  ps: readonly number[],
): number[] {
  if (values.length !== weights.length) return ps.map(() => Number.NaN);
  const idx: number[] = [];
  let total = 0;
  for (let i = 0; i < values.length; i++) {
    if (weights[i]! > 0) {
      idx.push(i);
      total += weights[i]!;
    }
  }
  if (!(total > 0)) return ps.map(() => Number.NaN);
  idx.sort((a, b) => values[a]! - values[b]!);
  const eps = 4 * Number.EPSILON;
  return ps.map((p) => {
    if (!(p >= 0 && p <= 1)) return Number.NaN;
    let cum = 0;
    for (const i of idx) {
      cum += weights[i]!;
      if (cum / total >= p - eps) return values[i]!;
    }
    return values[idx[idx.length - 1]!]!;
  });
}
