import { Moments } from './moments.ts';

/**
 * Sample excess kurtosis of `values` (0 for a normal population).
 *
 * Convention: the adjusted estimator G2 = ((n + 1) g2 + 6) (n - 1) / ((n - 2) (n - 3)) with
 * g2 = m4 / m2^2 - 3 (population central moments).
 * Cost: O(n). Throws nothing; NaN when n < 4 or all values are equal.
 * @example kurtosis([1, 2, 3, 4, 10])
 */
export function kurtosis(values: ArrayLike<number>): number {
  return Moments.of(values).kurtosis();
}
