import { Moments } from './moments.ts';

/**
 * Coefficient of variation sd / mean, a ratio (multiply by 100 for percent).
 *
 * Convention: sd with n - 1 denominator (ddof = 1). Meaningful on ratio scales only, where
 * zero is absolute; the caller decides that. Cost: O(n). Throws nothing; NaN when n < 2 or
 * the mean is 0.
 * @example coefficientOfVariation([2, 4, 6]) // 0.5
 */
export function coefficientOfVariation(values: ArrayLike<number>): number {
  return cvFromMoments(Moments.of(values));
}

/**
 * Coefficient of variation from an accumulator: sd (ddof = 1) / mean.
 * Cost: O(1). Throws nothing; NaN when n < 2 or the mean is 0.
 */
export function cvFromMoments(m: Moments): number {
  return m.mean === 0 ? Number.NaN : m.sd(1) / m.mean;
}
