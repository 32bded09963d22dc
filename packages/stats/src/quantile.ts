import { sortedCopy } from './sort.ts';

/** Hyndman and Fan (1996) sample quantile definitions 1 to 9. */
export type QuantileType = 1 | 2 | 3 | 4 | 5 | 6 | 7 | 8 | 9;

/**
 * Tolerance for deciding that n p + m is an integer: p such as 0.1 is not exact in binary,
 * and without it n p + m can land a hair below an integer and pick the wrong order statistic.
 * Four machine epsilons, the same size that common statistics packages use for this test.
 */
const FUZZ = 4 * Number.EPSILON;

/** m for the continuous types 4 to 9: m = alpha + p (1 - alpha - beta). */
function offset(type: QuantileType, p: number): number {
  switch (type) {
    case 1:
    case 2:
    case 4:
      return 0;
    case 3:
      return -0.5;
    case 5:
      return 0.5;
    case 6:
      return p;
    case 7:
      return 1 - p;
    case 8:
      return (p + 1) / 3;
    case 9:
      return p / 4 + 3 / 8;
  }
}

/** gamma in Q(p) = (1 - gamma) x[j] + gamma x[j + 1], from the fractional part g. */
function weightOf(type: QuantileType, j: number, g: number): number {
  switch (type) {
    case 1:
      return g > 0 ? 1 : 0;
    case 2:
      return g > 0 ? 1 : 0.5;
    case 3:
      // Nearest even order statistic: gamma is 0 only when g = 0 and j is even.
      return g === 0 && j % 2 === 0 ? 0 : 1;
    default:
      return g;
  }
}

/**
 * The p-th sample quantile of already sorted values.
 *
 * Convention: Hyndman and Fan (1996) type `type` (default 7, linear interpolation between
 * x[floor(h)] and x[ceil(h)] with h = (n - 1) p + 1). All nine types share one implementation:
 * j = floor(n p + m), g = n p + m - j, Q(p) = (1 - gamma) x[j] + gamma x[j + 1] with 1-based
 * order statistics clamped to x[1] and x[n]; m and gamma are the type's (m, gamma) pair.
 * Cost: O(1). Throws nothing; returns NaN for empty input or p outside [0, 1] or NaN.
 * @example quantileSorted(Float64Array.of(1, 2, 3, 4), 0.5) // 2.5
 */
export function quantileSorted(sorted: ArrayLike<number>, p: number, type: QuantileType = 7): number {
  const n = sorted.length;
  if (n === 0 || !(p >= 0 && p <= 1)) return Number.NaN;
  const npm = n * p + offset(type, p);
  const j = Math.floor(npm + FUZZ);
  let g = npm - j;
  if (Math.abs(g) < FUZZ) g = 0;
  const gamma = weightOf(type, j, g);
  const lo = sorted[Math.min(Math.max(j, 1), n) - 1]!;
  const hi = sorted[Math.min(Math.max(j + 1, 1), n) - 1]!;
  // Equal neighbours or a whole weight: return the order statistic itself, free of rounding.
  if (gamma === 0 || lo === hi) return lo;
  if (gamma === 1) return hi;
  return (1 - gamma) * lo + gamma * hi;
}

/**
 * The p-th sample quantile of unsorted values (copies and sorts; the input is not changed).
 *
 * Convention: as {@link quantileSorted} (Hyndman-Fan type, default 7); NaN-free input assumed.
 * Cost: O(n log n) time, one n-element copy. Throws nothing; NaN for empty input.
 * @example quantile([4, 1, 3, 2], 0.25, 6) // 1.25
 */
export function quantile(values: ArrayLike<number>, p: number, type: QuantileType = 7): number {
  return quantileSorted(sortedCopy(values), p, type);
}
