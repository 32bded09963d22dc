/**
 * 95% (or other) confidence intervals for design-based estimates, on the t distribution with the
 * design's degrees of freedom (clusters minus strata among the cases used).
 *
 * Conventions: a mean's interval is estimate +- t(df, 1 - alpha/2) x se. A proportion's is the
 * logit interval: logit(p) +- t x se / (p (1 - p)), transformed back, so it stays inside 0 to 1
 * (the delta-method standard error of logit p); a proportion of exactly 0 or 1 has the
 * interval [p, p]. With df < 1 there is no interval (null).
 */
import tQuantile from '@stdlib/stats-base-dists-t-quantile';

export interface ConfidenceInterval {
  low: number;
  high: number;
  method: string;
}

/**
 * The t interval of a mean (see the file comment). Cost: O(1). Throws nothing; null when
 * df < 1 or se is not finite.
 * @example meanInterval(10, 1, 30).low // 10 - 2.042...
 */
export function meanInterval(estimate: number, se: number, df: number, level = 0.95): ConfidenceInterval | null {
  if (!(df >= 1) || !Number.isFinite(se)) return null;
  const t = tQuantile(1 - (1 - level) / 2, df);
  return { low: estimate - t * se, high: estimate + t * se, method: `t on ${df} design degrees of freedom` };
}

/**
 * The logit interval of a proportion p (0 to 1) with standard error se (see the file comment).
 * Cost: O(1). Throws nothing; null when df < 1 or se is not finite.
 * @example logitInterval(0.5, 0.05, 100) // { low: 0.40..., high: 0.59..., method: ... }
 */
export function logitInterval(p: number, se: number, df: number, level = 0.95): ConfidenceInterval | null {
  if (!(df >= 1) || !Number.isFinite(se) || !(p >= 0 && p <= 1)) return null;
  const method = `logit, t on ${df} design degrees of freedom`;
  if (p === 0 || p === 1) return { low: p, high: p, method };
  const t = tQuantile(1 - (1 - level) / 2, df);
  const centre = Math.log(p / (1 - p));
  const half = (t * se) / (p * (1 - p));
  const expit = (x: number): number => 1 / (1 + Math.exp(-x));
  return { low: expit(centre - half), high: expit(centre + half), method };
}
