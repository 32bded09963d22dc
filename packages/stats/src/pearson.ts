/**
 * Pearson's product-moment correlation, from centred co-moments computed in two passes so that
 * large offsets (values near 10,000,000) do not cancel the digits that matter.
 */
import { CodeweirError } from '@codeweir/core';

/** Sums of centred squares and products of two paired samples. */
export interface CoMoments {
  n: number;
  meanX: number;
  meanY: number;
  /** Sum of (x - meanX)^2. */
  sxx: number;
  /** Sum of (y - meanY)^2. */
  syy: number;
  /** Sum of (x - meanX) (y - meanY). */
  sxy: number;
}

/**
 * Means and centred sums of squares and cross-products of paired samples `x` and `y`.
 *
 * Convention: two passes (means first, then centred sums, with the first-pass rounding error of
 * the mean corrected), which is stable for data far from zero. Divide by n - 1 for the sample
 * covariance. Every pair is used: callers pass pairwise-complete values.
 * Cost: two linear passes, O(1) extra memory.
 * Throws CodeweirError (CW_USAGE) when `x` and `y` differ in length.
 *
 * @example coMoments([1, 2, 3], [2, 4, 6]) // { n: 3, meanX: 2, meanY: 4, sxx: 2, syy: 8, sxy: 4 }
 */
export function coMoments(x: ArrayLike<number>, y: ArrayLike<number>): CoMoments {
  const n = x.length;
  if (y.length !== n) {
    throw new CodeweirError('CW_USAGE', `Paired samples must have the same length, got ${n} and ${y.length}.`);
  }
  if (n === 0) return { n: 0, meanX: NaN, meanY: NaN, sxx: 0, syy: 0, sxy: 0 };
  let sumX = 0;
  let sumY = 0;
  for (let i = 0; i < n; i++) {
    sumX += x[i];
    sumY += y[i];
  }
  let meanX = sumX / n;
  let meanY = sumY / n;
  // The centred sums of the residuals correct the rounding error of the first-pass means.
  let cx = 0;
  let cy = 0;
  for (let i = 0; i < n; i++) {
    cx += x[i] - meanX;
    cy += y[i] - meanY;
  }
  meanX += cx / n;
  meanY += cy / n;
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    const dx = x[i] - meanX;
    const dy = y[i] - meanY;
    sxx += dx * dx;
    syy += dy * dy;
    sxy += dx * dy;
  }
  return { n, meanX, meanY, sxx, syy, sxy };
}

/**
 * Pearson's r from co-moments: sxy / sqrt(sxx syy), or null when there are fewer than two pairs
 * or either variable is constant (r is undefined there).
 *
 * Convention: product-moment correlation; the n - 1 divisors cancel. Clamped to [-1, 1] against
 * rounding. Cost: O(1). Throws nothing.
 */
export function pearsonFromMoments(m: CoMoments): number | null {
  if (m.n < 2 || !(m.sxx > 0) || !(m.syy > 0)) return null;
  const r = m.sxy / Math.sqrt(m.sxx * m.syy);
  return Math.max(-1, Math.min(1, r));
}

/**
 * Pearson's product-moment correlation of paired samples.
 *
 * Convention: two-pass centred co-moments (see `coMoments`); null for fewer than two pairs or a
 * constant variable. Callers pass pairwise-complete values (no NaN).
 * Cost: O(n) time, O(1) memory.
 * Throws CodeweirError (CW_USAGE) when the lengths differ.
 *
 * @example pearson([1, 2, 3, 4], [2, 4, 5, 9]) // 0.9568...
 */
export function pearson(x: ArrayLike<number>, y: ArrayLike<number>): number | null {
  return pearsonFromMoments(coMoments(x, y));
}
