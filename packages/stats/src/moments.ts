/**
 * A mergeable accumulator of count, mean and the second to fourth central moment sums.
 *
 * Conventions:
 * - Updates are online (Welford for m2, Terriberry's extension for m3 and m4): each value moves
 *   the running mean and the central sums directly, so no sum of squares of raw values is ever
 *   formed and data far from zero (10,000,000.2 +- 0.1) keeps its digits.
 * - `merge` is the pairwise update of Chan, Golub and LeVeque (with Pebay's higher-moment
 *   terms); counts add exactly, so splitting the data and merging matches one pass to rounding.
 * - `variance(ddof)` divides m2 by n - ddof (default ddof = 1, the sample variance).
 * - `skewness()` is the adjusted Fisher-Pearson standardized moment coefficient
 *   G1 = g1 sqrt(n (n - 1)) / (n - 2), g1 = (m3 / n) / (m2 / n)^1.5.
 * - `kurtosis()` is the adjusted sample excess kurtosis
 *   G2 = ((n + 1) g2 + 6) (n - 1) / ((n - 2) (n - 3)), g2 = (m4 / n) / (m2 / n)^2 - 3.
 *   G1 and G2 are the estimators most statistics packages and spreadsheets report by default.
 */
export class Moments {
  n = 0;
  mean = 0;
  /** Sum of squared deviations from the mean. */
  m2 = 0;
  /** Sum of cubed deviations from the mean. */
  m3 = 0;
  /** Sum of fourth-power deviations from the mean. */
  m4 = 0;

  /**
   * Adds one value (finite numbers only; the caller drops invalid cells).
   * Cost: O(1). Throws nothing.
   */
  push(x: number): void {
    const n1 = this.n;
    const n = n1 + 1;
    const delta = x - this.mean;
    const dn = delta / n;
    const dn2 = dn * dn;
    const term1 = delta * dn * n1;
    this.n = n;
    this.mean += dn;
    this.m4 += term1 * dn2 * (n * n - 3 * n + 3) + 6 * dn2 * this.m2 - 4 * dn * this.m3;
    this.m3 += term1 * dn * (n - 2) - 3 * dn * this.m2;
    this.m2 += term1;
  }

  /**
   * Combines another accumulator into this one (pairwise update) and returns this.
   * Cost: O(1). Throws nothing; `o` is not changed.
   * @example a.merge(b).mean // mean of the union of both samples
   */
  merge(o: Moments): Moments {
    if (o.n === 0) return this;
    if (this.n === 0) {
      this.n = o.n;
      this.mean = o.mean;
      this.m2 = o.m2;
      this.m3 = o.m3;
      this.m4 = o.m4;
      return this;
    }
    const na = this.n;
    const nb = o.n;
    const n = na + nb;
    const delta = o.mean - this.mean;
    const d2 = delta * delta;
    const m2 = this.m2 + o.m2 + (d2 * na * nb) / n;
    const m3 =
      this.m3 +
      o.m3 +
      (d2 * delta * na * nb * (na - nb)) / (n * n) +
      (3 * delta * (na * o.m2 - nb * this.m2)) / n;
    const m4 =
      this.m4 +
      o.m4 +
      (d2 * d2 * na * nb * (na * na - na * nb + nb * nb)) / (n * n * n) +
      (6 * d2 * (na * na * o.m2 + nb * nb * this.m2)) / (n * n) +
      (4 * delta * (na * o.m3 - nb * this.m3)) / n;
    this.mean += (delta * nb) / n;
    this.n = n;
    this.m2 = m2;
    this.m3 = m3;
    this.m4 = m4;
    return this;
  }

  /**
   * Variance m2 / (n - ddof); default ddof = 1 (sample variance). NaN when n <= ddof.
   * Cost: O(1). Throws nothing.
   */
  variance(ddof = 1): number {
    return this.n > ddof ? this.m2 / (this.n - ddof) : Number.NaN;
  }

  /**
   * Standard deviation sqrt(m2 / (n - ddof)); default ddof = 1. NaN when n <= ddof.
   * Cost: O(1). Throws nothing.
   */
  sd(ddof = 1): number {
    return Math.sqrt(this.variance(ddof));
  }

  /**
   * Adjusted Fisher-Pearson skewness G1 (see the class comment). NaN when n < 3 or all
   * values are equal. Cost: O(1). Throws nothing.
   */
  skewness(): number {
    const n = this.n;
    if (n < 3 || !(this.m2 > 0)) return Number.NaN;
    const g1 = this.m3 / n / Math.pow(this.m2 / n, 1.5);
    return (g1 * Math.sqrt(n * (n - 1))) / (n - 2);
  }

  /**
   * Adjusted sample excess kurtosis G2 (see the class comment; 0 for a normal population).
   * NaN when n < 4 or all values are equal. Cost: O(1). Throws nothing.
   */
  kurtosis(): number {
    const n = this.n;
    if (n < 4 || !(this.m2 > 0)) return Number.NaN;
    const g2 = this.m4 / n / Math.pow(this.m2 / n, 2) - 3;
    return (((n + 1) * g2 + 6) * (n - 1)) / ((n - 2) * (n - 3));
  }

  /**
   * Accumulates all values of `values`. With every value at hand it takes two passes: the
   * first finds the mean (sum / n, then one correction term), the second pushes deviations from
   * it, which are small, so the online updates lose almost nothing even when the data sit far
   * from zero. Same result as pushing each value, to rounding.
   * Cost: O(n), two passes. Throws nothing.
   * @example Moments.of([1, 2, 3]).mean // 2
   */
  static of(values: ArrayLike<number>): Moments {
    const len = values.length;
    let sum = 0;
    for (let i = 0; i < len; i++) sum += values[i]!;
    let shift = len > 0 ? sum / len : 0;
    // One correction step: the mean of residuals from the rough mean (corrected two-pass).
    let resid = 0;
    for (let i = 0; i < len; i++) resid += values[i]! - shift;
    if (len > 0) shift += resid / len;
    const m = new Moments();
    for (let i = 0; i < len; i++) m.push(values[i]! - shift);
    m.mean += shift;
    return m;
  }
}
