/**
 * Drift of one item's distribution between two deliveries: a test of whether both are samples
 * of one distribution, chosen by level of measurement, with the population stability index
 * beside it as a measure of how large the shift is.
 */
import { ksTwoSampleSorted, pearsonChiSquare, psiFromCounts, psiSorted, PSI_BINS, PSI_EMPTY_SHARE, KS_EXACT_BELOW } from '@codeweir/stats';
import { CodeweirError } from '@codeweir/core';

export interface DriftThresholds {
  /** A test's p-value below this counts as evidence of drift. Default 0.01 (common practice). */
  p: number;
  /** A PSI at or above this counts as a shift worth attention. Default 0.1 (common practice: 0.1 moderate, 0.25 major). */
  psi: number;
}

export const DEFAULT_THRESHOLDS: DriftThresholds = { p: 0.01, psi: 0.1 };

export interface Drift {
  test: 'chi-square' | 'kolmogorov-smirnov';
  /** Pearson's X^2, or the Kolmogorov-Smirnov D; null when the test cannot be made (one code in use, an empty side). */
  statistic: number | null;
  /** Degrees of freedom of the chi-square test; null for Kolmogorov-Smirnov. */
  df: number | null;
  p: number | null;
  /** Kolmogorov-Smirnov only: `exact` or `asymptotic` p-value. */
  method?: 'exact' | 'asymptotic';
  psi: number | null;
  /** p below the p threshold and PSI at or above the PSI threshold. */
  flagged: boolean;
  /** Valid values compared on each side. */
  n: { previous: number; current: number };
  /** Chi-square only: share (0 to 100) of expected counts below 5; above 20 the p-value is rough (Cochran's rule, common practice). */
  lowExpectedPercent?: number;
}

/** The conventions of the drift statistics, as stated in compare's JSON and the report. */
export function driftConventions(t: DriftThresholds): Record<string, string | number> {
  return {
    chiSquare: 'nominal and ordinal items: Pearson chi-square test of homogeneity on the 2 x codes table of valid counts, no continuity correction, codes unused in both deliveries left out',
    kolmogorovSmirnov: `interval and ratio items: two-sided two-sample Kolmogorov-Smirnov test; exact p-value (permutation distribution given the pooled values, ties included) when previous n x current n < ${KS_EXACT_BELOW}, otherwise the asymptotic Kolmogorov limit`,
    psi: `population stability index sum (current share - previous share) ln(current share / previous share), over codes, or over ${PSI_BINS} bins cut at the previous delivery's deciles (Hyndman-Fan type 7) for interval and ratio items; an empty share counts as ${PSI_EMPTY_SHARE}`,
    flagged: `p < ${t.p} and PSI >= ${t.psi} (thresholds: --drift-p, --drift-psi; the defaults 0.01 and 0.1 are common practice)`,
    pThreshold: t.p,
    psiThreshold: t.psi,
  };
}

/**
 * Validates user thresholds (`--drift-p`, `--drift-psi`), one block per option.
 * Throws CodeweirError CW_USAGE with the bad value, e.g. "--drift-p takes a probability between 0 and 1, got 2."
 */
export function normalizeThresholds(raw: { p?: unknown; psi?: unknown } = {}): DriftThresholds {
  let p = DEFAULT_THRESHOLDS.p;
  if (raw.p !== undefined) {
    p = Number(raw.p);
    if (!(p > 0 && p < 1)) throw new CodeweirError('CW_USAGE', `--drift-p takes a probability between 0 and 1, got ${String(raw.p)}.`);
  }
  let psi = DEFAULT_THRESHOLDS.psi;
  if (raw.psi !== undefined) {
    psi = Number(raw.psi);
    if (!(psi > 0) || !Number.isFinite(psi)) throw new CodeweirError('CW_USAGE', `--drift-psi takes a positive number, got ${String(raw.psi)}.`);
  }
  return { p, psi };
}

function finite(x: number | null): number | null {
  return x === null || !Number.isFinite(x) ? null : x;
}

function flag(p: number | null, psi: number | null, t: DriftThresholds): boolean {
  return p !== null && psi !== null && p < t.p && psi >= t.psi;
}

/**
 * Drift of a nominal or ordinal item from its valid counts by code (same codes, same order on
 * both sides): chi-square test of homogeneity (see {@link driftConventions}) and PSI over the codes.
 * Cost: O(codes). Throws nothing.
 */
export function codedDrift(previous: readonly number[], current: readonly number[], t: DriftThresholds): Drift {
  const test = pearsonChiSquare([[...previous], [...current]]);
  const psi = finite(psiFromCounts(previous, current).psi);
  const p = test.p;
  const n = { previous: previous.reduce((a, b) => a + b, 0), current: current.reduce((a, b) => a + b, 0) };
  return { test: 'chi-square', statistic: test.statistic, df: test.statistic === null ? null : test.df, p, psi, flagged: flag(p, psi, t), n, lowExpectedPercent: test.lowExpectedPercent };
}

/**
 * Drift of an interval or ratio item from its sorted valid values: two-sample
 * Kolmogorov-Smirnov test and PSI over the previous delivery's deciles (see {@link driftConventions}).
 * Cost: O(n) and O(nx ny) for an exact p-value (only below 10,000 pairs). Throws nothing.
 */
export function numericDrift(previous: Float64Array, current: Float64Array, t: DriftThresholds): Drift {
  const ks = ksTwoSampleSorted(previous, current);
  const psi = finite(psiSorted(previous, current).psi);
  const p = finite(ks.p);
  return { test: 'kolmogorov-smirnov', statistic: finite(ks.statistic), df: null, p, method: ks.method, psi, flagged: flag(p, psi, t), n: { previous: previous.length, current: current.length } };
}
