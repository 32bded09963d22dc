import { Moments } from './moments.ts';

/**
 * Sample skewness of `values`.
 *
 * Convention: the adjusted Fisher-Pearson standardized moment coefficient
 * G1 = g1 sqrt(n (n - 1)) / (n - 2) with g1 = m3 / m2^1.5 (population central moments).
 * Cost: O(n). Throws nothing; NaN when n < 3 or all values are equal.
 * @example skewness([1, 2, 3, 10]) // 1.763...
 */
export function skewness(values: ArrayLike<number>): number {
  return Moments.of(values).skewness();
}
