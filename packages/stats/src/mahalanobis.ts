/** Squared Mahalanobis distances of two variables, for flagging bivariate outliers. */
import chisquareQuantile from '@stdlib/stats-base-dists-chisquare-quantile';
import { coMoments, type CoMoments } from './pearson.ts';

/**
 * Squared Mahalanobis distance of each pair (x_i, y_i) from the centroid, d^2 = v' S^-1 v with
 * v the deviation from the means and S the 2 x 2 covariance matrix.
 *
 * Convention: sample covariance (divisor n - 1), means and covariance from all the pairs given
 * (pairwise complete). Null when n < 3 or S is singular (a constant variable, or all points on
 * one line), where the distance is undefined. Pass `moments` when already computed.
 * Cost: O(n) time (two passes for the moments, one for the distances), one Float64Array of n.
 * Throws CodeweirError (CW_USAGE) when the lengths differ.
 *
 * @example mahalanobisSquared([1, 2, 3, 4], [1, 3, 2, 4])
 */
export function mahalanobisSquared(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  moments: CoMoments = coMoments(x, y),
): Float64Array | null {
  const { n, meanX, meanY, sxx, syy, sxy } = moments;
  if (n < 3) return null;
  const a = sxx / (n - 1);
  const c = syy / (n - 1);
  const b = sxy / (n - 1);
  const det = a * c - b * b;
  // Relative test: det is a c (1 - r^2), so this asks for |r| short of 1 by more than rounding.
  if (!(a > 0) || !(c > 0) || !(det > a * c * 1e-12)) return null;
  const d2 = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const dx = x[i] - meanX;
    const dy = y[i] - meanY;
    d2[i] = (c * dx * dx - 2 * b * dx * dy + a * dy * dy) / det;
  }
  return d2;
}

/**
 * The chi-square quantile used as the cut-off for squared Mahalanobis distances: under
 * bivariate normality d^2 follows chi-square with 2 degrees of freedom, so 0.999 flags about one
 * row in a thousand by chance.
 *
 * Convention: chi-square(df) quantile at `probability`; defaults df = 2, probability = 0.999
 * (13.8155...). Cost: O(1). Throws nothing (NaN for a probability outside [0, 1]).
 *
 * @example mahalanobisCutoff() // 13.815510557964274
 */
export function mahalanobisCutoff(probability = 0.999, df = 2): number {
  return chisquareQuantile(probability, df);
}

export interface BivariateOutliers {
  cutoff: number;
  /** 0-based indices of the pairs whose d^2 exceeds the cut-off, ascending. */
  indices: number[];
  d2: Float64Array;
  maxD2: number;
}

/**
 * Pairs whose squared Mahalanobis distance exceeds the chi-square(2) quantile at `probability`.
 *
 * Convention: sample covariance (n - 1), cut-off `mahalanobisCutoff(probability, 2)`, strictly
 * greater than. Null when the distances are undefined (see `mahalanobisSquared`).
 * Cost: O(n). Throws CodeweirError (CW_USAGE) when the lengths differ.
 *
 * @example bivariateOutliers(x, y)?.indices // [4, 16, 766]
 */
export function bivariateOutliers(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  probability = 0.999,
  moments?: CoMoments,
): BivariateOutliers | null {
  const d2 = mahalanobisSquared(x, y, moments ?? coMoments(x, y));
  if (d2 === null) return null;
  const cutoff = mahalanobisCutoff(probability, 2);
  const indices: number[] = [];
  let maxD2 = 0;
  for (let i = 0; i < d2.length; i++) {
    if (d2[i] > cutoff) indices.push(i);
    if (d2[i] > maxD2) maxD2 = d2[i];
  }
  return { cutoff, indices, d2, maxD2 };
}
