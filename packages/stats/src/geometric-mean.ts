import { Moments } from './moments.ts';

/**
 * Geometric mean exp(mean(ln x)) of strictly positive values.
 *
 * Convention: defined only when every value is > 0 (a zero or a negative value has no
 * logarithm); the mean of logarithms is taken with the two-pass Moments mean, which avoids the
 * overflow of a running product. Cost: O(n). Throws nothing; NaN for empty input or any value <= 0.
 * @example geometricMean([1, 10, 100]) // 10
 */
export function geometricMean(values: ArrayLike<number>): number {
  const n = values.length;
  if (n === 0) return Number.NaN;
  const logs = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const v = values[i]!;
    if (!(v > 0)) return Number.NaN;
    logs[i] = Math.log(v);
  }
  return Math.exp(Moments.of(logs).mean);
}
