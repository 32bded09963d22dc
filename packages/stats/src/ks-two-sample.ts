/** The two-sample Kolmogorov-Smirnov test (two-sided). */
import { sortedValid } from './sort.ts';

export interface KsTwoSample {
  /** D = sup |F_x - F_y| over the pooled values (the empirical distribution functions). */
  statistic: number;
  /** Two-sided p-value, P(D >= observed) under the null hypothesis of one distribution. */
  p: number;
  /** `exact`: the permutation distribution given the pooled values (ties included); `asymptotic`: Kolmogorov's limit. */
  method: 'exact' | 'asymptotic';
  nx: number;
  ny: number;
}

export interface KsOptions {
  /**
   * true: exact p-value; false: asymptotic. Default: exact when nx * ny < 10,000, asymptotic
   * otherwise (the choice R's `ks.test` makes by default).
   */
  exact?: boolean;
}

/** Largest pair count for which the exact p-value is the default. */
export const KS_EXACT_BELOW = 10_000;

/**
 * Upper tail P(K > x) of Kolmogorov's limiting distribution,
 * K(x) = 1 - 2 sum_{k>=1} (-1)^(k-1) exp(-2 k^2 x^2).
 *
 * Convention: for x < 1 the lower tail is summed in its theta-function form
 * sqrt(2 pi) / x sum_{k odd} exp(-k^2 pi^2 / (8 x^2)), which converges fast there, and the upper
 * tail is 1 minus it; for x >= 1 the alternating series of the upper tail is summed directly
 * (so p-values like 1e-30 keep their digits), both to full double precision.
 * Returns 1 for x <= 0. Cost: O(1) (a few terms). Throws nothing.
 * @example kolmogorovUpperTail(1.3581) // about 0.05
 */
export function kolmogorovUpperTail(x: number): number {
  if (Number.isNaN(x)) return NaN;
  if (x <= 0) return 1;
  if (x < 1) {
    const z = -(Math.PI * Math.PI) / (8 * x * x);
    let s = 0;
    for (let k = 1; k < 200; k += 2) {
      const term = Math.exp(k * k * z);
      s += term;
      if (term < 1e-17 * s) break;
    }
    return Math.max(0, 1 - (Math.sqrt(2 * Math.PI) / x) * s);
  }
  let s = 0;
  for (let k = 1; k < 200; k++) {
    const term = Math.exp(-2 * k * k * x * x);
    s += k % 2 === 1 ? term : -term;
    if (term < 1e-17 * Math.abs(s) || term === 0) break;
  }
  return Math.min(1, 2 * s);
}

/**
 * The integer form of D: max |i ny - j nx| over the pooled distinct values, where i and j count
 * the x and y values at or below each value. D = K / (nx ny).
 */
function latticeStatistic(xs: ArrayLike<number>, ys: ArrayLike<number>): number {
  const m = xs.length;
  const n = ys.length;
  let i = 0;
  let j = 0;
  let best = 0;
  while (i < m || j < n) {
    const v = j >= n || (i < m && xs[i]! <= ys[j]!) ? xs[i]! : ys[j]!;
    while (i < m && xs[i]! === v) i++;
    while (j < n && ys[j]! === v) j++;
    const d = Math.abs(i * n - j * m);
    if (d > best) best = d;
  }
  return best;
}

/**
 * Exact P(K >= k) for random label assignments of the pooled sorted values: a walk over the
 * lattice from (0, 0) to (m, n), one step a pooled value (x: i + 1, y: j + 1) with each of the
 * C(m + n, m) paths equally likely, absorbed where |i n - j m| >= k at a point that ends a run
 * of equal values (inside a run of ties the functions are not evaluated). Probabilities, not
 * path counts, are carried, so nothing overflows.
 */
function exactUpperTail(k: number, xs: ArrayLike<number>, ys: ArrayLike<number>): number {
  const m = xs.length;
  const n = ys.length;
  const total = m + n;
  if (k <= 0) return 1;
  // boundary[t]: after t pooled values, the next value differs (or the walk is at its end).
  const pooled = new Float64Array(total);
  let a = 0;
  let b = 0;
  for (let t = 0; t < total; t++) pooled[t] = b >= n || (a < m && xs[a]! <= ys[b]!) ? xs[a++]! : ys[b++]!;
  let prob = new Float64Array(m + 1);
  let next = new Float64Array(m + 1);
  prob[0] = 1;
  let hit = 0;
  for (let t = 0; t <= total; t++) {
    const lo = Math.max(0, t - n);
    const hi = Math.min(m, t);
    const boundary = t === total || (t > 0 && pooled[t - 1] !== pooled[t]);
    if (boundary) {
      for (let i = lo; i <= hi; i++) {
        if (prob[i] !== 0 && Math.abs(i * n - (t - i) * m) >= k) {
          hit += prob[i]!;
          prob[i] = 0;
        }
      }
    }
    if (t === total) break;
    next.fill(0, Math.max(0, lo), Math.min(m, hi + 1) + 1);
    const left = total - t;
    for (let i = lo; i <= hi; i++) {
      const p = prob[i]!;
      if (p === 0) continue;
      const j = t - i;
      if (i < m) next[i + 1] += (p * (m - i)) / left;
      if (j < n) next[i] += (p * (n - j)) / left;
    }
    [prob, next] = [next, prob];
  }
  return Math.min(1, hit);
}

/**
 * Two-sided two-sample Kolmogorov-Smirnov test on two samples that are already sorted
 * ascending (NaN-free). D = max |F_x(v) - F_y(v)| over the pooled values.
 *
 * Convention: exact p-value when `exact` (default: nx ny < 10,000), computed as the
 * permutation probability of D >= observed given the pooled values, ties included (the
 * distribution functions are compared only where a run of equal values ends); otherwise
 * the asymptotic p = P(K >= sqrt(nx ny / (nx + ny)) D) from Kolmogorov's limit
 * ({@link kolmogorovUpperTail}), which treats the data as continuous. D is found on the integer
 * lattice (K = D nx ny), so the exact comparison has no rounding fuzz.
 * Cost: O(nx + ny) for D and the asymptotic p, O(nx ny) time and O(min) memory for the exact
 * p. Throws nothing; an empty sample gives NaN statistic and p.
 * @example ksTwoSampleSorted([1, 2, 3], [4, 5, 6]).statistic // 1
 */
export function ksTwoSampleSorted(xs: ArrayLike<number>, ys: ArrayLike<number>, options: KsOptions = {}): KsTwoSample {
  const m = xs.length;
  const n = ys.length;
  const exact = options.exact ?? m * n < KS_EXACT_BELOW;
  const method = exact ? 'exact' : 'asymptotic';
  if (m === 0 || n === 0) return { statistic: NaN, p: NaN, method, nx: m, ny: n };
  const k = latticeStatistic(xs, ys);
  const statistic = k / (m * n);
  // The walk's arrays run along the first sample: give it the shorter one (|i n - j m| is symmetric).
  const p = exact ? (m <= n ? exactUpperTail(k, xs, ys) : exactUpperTail(k, ys, xs)) : kolmogorovUpperTail(Math.sqrt((m * n) / (m + n)) * statistic);
  return { statistic, p, method, nx: m, ny: n };
}

/**
 * Two-sided two-sample Kolmogorov-Smirnov test: sorts copies of `x` and `y` (NaN dropped),
 * then {@link ksTwoSampleSorted}. Convention and cost as there, plus the sorts ({@link sortedValid}).
 * Throws nothing.
 * @example ksTwoSample([0.61, 0.29, 0.06], [2.3, 1.1, 4.0], { exact: true }).p // 0.1
 */
export function ksTwoSample(x: ArrayLike<number>, y: ArrayLike<number>, options: KsOptions = {}): KsTwoSample {
  return ksTwoSampleSorted(sortedValid(x), sortedValid(y), options);
}
