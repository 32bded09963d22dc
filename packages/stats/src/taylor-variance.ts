/**
 * Design-based estimates of a weighted mean and of the percent of each category, with standard
 * errors by Taylor linearisation.
 *
 * Convention (the ratio estimator, first-stage with-replacement approximation): the mean is
 * sum(w y) / sum(w) over the cases used; each case's linearised value is
 * z = w (y - mean) / sum(w), z is summed per cluster, and the variance is
 * sum over strata of (1 - f_h) n_h / (n_h - 1) sum over the stratum's clusters of
 * (t_c - mean t of the stratum)^2, with n_h the clusters of the stratum in the whole sample. A
 * stratum with a single cluster ('adjust') contributes (1 - f_h) (t_c - mean t over all
 * clusters)^2. Domains are estimated as domains: z is 0 outside the domain and every cluster of
 * the design keeps its place (not a subset). A proportion is the mean of a 0/1 indicator.
 * Cases used: a valid value, a usable design row (positive weight, known stratum and cluster)
 * and, for a domain, the domain's code.
 */
import type { SampleDesign } from './sample-design.ts';
import { designDegreesOfFreedom } from './sample-design.ts';
import { designEffect, type DeffBasis } from './design-effect.ts';
import { logitInterval, meanInterval, type ConfidenceInterval } from './design-interval.ts';

/** A domain: the rows whose `of` value equals `code`. */
export interface Domain {
  of: ArrayLike<number>;
  code: number;
}

/** One design-based estimate. Proportions are 0 to 1. */
export interface DesignEstimate {
  estimate: number;
  se: number;
  variance: number;
  deff: number;
  deffBasis: DeffBasis;
  nEffective: number;
  ci: ConfidenceInterval | null;
}

/** What the estimates of one item (in one domain) were computed from. */
export interface DesignBase {
  /** Cases used. */
  n: number;
  sumOfWeights: number;
  /** Design degrees of freedom of the cases used: clusters minus strata. */
  df: number;
}

/** Variance from per-cluster totals, with the stratum rule of the file comment. Cost: O(clusters). */
function clusterVariance(design: SampleDesign, totals: Float64Array): number {
  const strata = design.clustersInStratum.length;
  const sums = new Float64Array(strata);
  const clusters = design.stratumOfCluster.length;
  let all = 0;
  for (let c = 0; c < clusters; c++) {
    const t = totals[c]!;
    sums[design.stratumOfCluster[c]!]! += t;
    all += t;
  }
  const grand = all / clusters;
  let v = 0;
  for (let c = 0; c < clusters; c++) {
    const s = design.stratumOfCluster[c]!;
    const n = design.clustersInStratum[s]!;
    const d = totals[c]! - (n > 1 ? sums[s]! / n : grand);
    v += design.fpcFactor[s]! * (n > 1 ? n / (n - 1) : 1) * d * d;
  }
  return v;
}

function inDomain(domain: Domain | undefined, r: number): boolean {
  return domain === undefined || domain.of[r] === domain.code;
}

/**
 * The design-based weighted mean of `values` (NaN: not valid), optionally in a domain, with its
 * linearised standard error, design effect, effective sample size and t interval (see the file
 * comment and design-effect.ts, design-interval.ts). Cost: O(rows + clusters), three passes.
 * Throws nothing; null when no case is used.
 * @example designMean(resolveSampleDesign({ weights: [1, 1, 1, 1] }), [1, 2, 3, 4])!.estimate // 2.5
 */
export function designMean(design: SampleDesign, values: ArrayLike<number>, domain?: Domain): (DesignEstimate & DesignBase) | null {
  const { weights, clusterOfRow } = design;
  let sw = 0;
  let swy = 0;
  let n = 0;
  for (let r = 0; r < design.rows; r++) {
    const y = values[r]!;
    if (clusterOfRow[r]! < 0 || Number.isNaN(y) || !inDomain(domain, r)) continue;
    const w = weights[r]!;
    sw += w;
    swy += w * y;
    n++;
  }
  if (n === 0) return null;
  let mean = swy / sw;
  // A second pass refines the mean (sum of w (y - mean) / sum(w)) so large offsets keep their digits.
  let shift = 0;
  for (let r = 0; r < design.rows; r++) {
    const y = values[r]!;
    if (clusterOfRow[r]! < 0 || Number.isNaN(y) || !inDomain(domain, r)) continue;
    shift += weights[r]! * (y - mean);
  }
  mean += shift / sw;
  const totals = new Float64Array(design.stratumOfCluster.length);
  let ss = 0;
  for (let r = 0; r < design.rows; r++) {
    const y = values[r]!;
    const c = clusterOfRow[r]!;
    if (c < 0 || Number.isNaN(y) || !inDomain(domain, r)) continue;
    const w = weights[r]!;
    const d = y - mean;
    totals[c]! += (w * d) / sw;
    ss += w * d * d;
  }
  const variance = clusterVariance(design, totals);
  const se = Math.sqrt(variance);
  const df = designDegreesOfFreedom(design, (r) => !Number.isNaN(values[r]!) && inDomain(domain, r));
  const effect = designEffect(variance, ss / sw, n, sw);
  return {
    estimate: mean,
    se,
    variance,
    deff: effect.deff,
    deffBasis: effect.basis,
    nEffective: effect.nEffective,
    ci: meanInterval(mean, se, df),
    n,
    sumOfWeights: sw,
    df,
  };
}

/**
 * The design-based proportion (0 to 1) of each of `k` categories, from `categories` (the 0-based
 * category of each row, -1 where not valid), optionally in a domain: each with its linearised
 * standard error, design effect, effective sample size and logit interval (see the file
 * comment). Cost: O(rows + clusters x k), two passes over the rows. Throws nothing; null when no
 * case is used.
 * @example designProportions(resolveSampleDesign({ weights: [1, 1, 1, 1] }), [0, 0, 1, 1], 2)!.categories[0]!.estimate // 0.5
 */
export function designProportions(
  design: SampleDesign,
  categories: ArrayLike<number>,
  k: number,
  domain?: Domain,
): (DesignBase & { categories: DesignEstimate[] }) | null {
  const { weights, clusterOfRow } = design;
  const clusters = design.stratumOfCluster.length;
  const stride = k + 1;
  // Per cluster: the weight of each category and, in the last slot, of every case used.
  const sums = new Float64Array(clusters * stride);
  const byCategory = new Float64Array(k);
  let sw = 0;
  let n = 0;
  for (let r = 0; r < design.rows; r++) {
    const cat = categories[r]!;
    const c = clusterOfRow[r]!;
    if (c < 0 || !(cat >= 0 && cat < k) || !inDomain(domain, r)) continue;
    const w = weights[r]!;
    sums[c * stride + cat]! += w;
    sums[c * stride + k]! += w;
    byCategory[cat]! += w;
    sw += w;
    n++;
  }
  if (n === 0) return null;
  const df = designDegreesOfFreedom(design, (r) => {
    const cat = categories[r]!;
    return cat >= 0 && cat < k && inDomain(domain, r);
  });
  const totals = new Float64Array(clusters);
  const out: DesignEstimate[] = [];
  for (let j = 0; j < k; j++) {
    const p = byCategory[j]! / sw;
    for (let c = 0; c < clusters; c++) totals[c] = (sums[c * stride + j]! - p * sums[c * stride + k]!) / sw;
    const variance = clusterVariance(design, totals);
    const se = Math.sqrt(variance);
    const effect = designEffect(variance, p * (1 - p), n, sw);
    out.push({ estimate: p, se, variance, deff: effect.deff, deffBasis: effect.basis, nEffective: effect.nEffective, ci: logitInterval(p, se, df) });
  }
  return { n, sumOfWeights: sw, df, categories: out };
}
