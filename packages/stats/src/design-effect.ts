/**
 * The design effect of an estimated mean or proportion: its design-based variance over the
 * variance the same estimate would have under simple random sampling of the same number of
 * cases.
 *
 * Convention: the simple-random-sampling variance is s2 (N - n) / (N n), sampling without
 * replacement from N = the sum of the weights, where s2 = n / (n - 1) x sum(w (y - mean)^2) /
 * sum(w) is the weighted population variance estimate and n counts the cases with positive
 * weight: the same comparison whether or not the design has a finite population correction.
 * When the weights do not sum to more than n (weights scaled to the sample size, so N says
 * nothing about the population), the comparison is with sampling with replacement, s2 / n, and
 * `basis` says so. The effective sample size is n / deff (Kish).
 */

export type DeffBasis = 'without-replacement' | 'with-replacement';

export interface DesignEffect {
  deff: number;
  basis: DeffBasis;
  nEffective: number;
}

/**
 * Design effect and effective sample size from the design variance, the weighted sum of squared
 * deviations divided by the sum of weights (`meanSquare`), the case count n and the sum of
 * weights N (see the file comment). Cost: O(1). Throws nothing; NaN deff (and nEffective) when
 * n < 2 or the comparison variance is 0 (every case the same value).
 * @example designEffect(2, 10, 11, 1000).basis // 'without-replacement'
 */
export function designEffect(variance: number, meanSquare: number, n: number, sumOfWeights: number): DesignEffect {
  const basis: DeffBasis = sumOfWeights > n ? 'without-replacement' : 'with-replacement';
  const s2 = n > 1 ? (meanSquare * n) / (n - 1) : Number.NaN;
  const srs = basis === 'without-replacement' ? (s2 * (sumOfWeights - n)) / (sumOfWeights * n) : s2 / n;
  const deff = srs > 0 ? variance / srs : Number.NaN;
  return { deff, basis, nEffective: deff > 0 ? n / deff : Number.NaN };
}
