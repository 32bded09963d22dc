import type { QuantileType } from '@codeweir/stats';

/** Names of the conventions a description can rest on. */
export type ConventionKey =
  | 'quantileType'
  | 'ordinalQuantiles'
  | 'percent'
  | 'mode'
  | 'sd'
  | 'skewness'
  | 'kurtosis'
  | 'fences'
  | 'outlierNote'
  | 'histogram'
  | 'cv'
  | 'geometricMean'
  | 'groupedMedian'
  | 'weights'
  | 'weightedMean'
  | 'weightedSd'
  | 'weightedQuantiles'
  | 'listwise';

/** Share of the sd (and of the sd itself) by which outliers must move mean or sd to earn a note. */
export const OUTLIER_NOTE_SHARE = 0.1;

/** One sentence per convention, worded for the report and the JSON. */
export function conventionText(key: ConventionKey, quantileType: QuantileType): string {
  switch (key) {
    case 'quantileType':
      return `Hyndman-Fan type ${quantileType} sample quantiles for the median, quartiles and percentiles of interval and ratio items`;
    case 'ordinalQuantiles':
      return 'Hyndman-Fan type 1 (inverse of the empirical distribution) on scale positions, so the median and quartiles of an ordinal item are always categories of its scale; IQR in scale steps';
    case 'percent':
      return 'percent of valid cells (0 to 100); missing and invalid cells are counted apart';
    case 'mode':
      return 'every most frequent value when tied';
    case 'sd':
      return 'sample standard deviation with n - 1 denominator (ddof = 1)';
    case 'skewness':
      return 'adjusted Fisher-Pearson standardized moment coefficient G1';
    case 'kurtosis':
      return 'adjusted sample excess kurtosis G2 (0 for a normal distribution)';
    case 'fences':
      return 'Tukey fences 1.5 x IQR (inner) and 3 x IQR (outer) beyond the quartiles; outliers are values between the inner and outer fences, extremes values beyond the outer fences';
    case 'outlierNote':
      return `a note is given when dropping the values beyond the inner fences moves the mean by more than ${100 * OUTLIER_NOTE_SHARE}% of the sd without them, or changes the sd by more than ${100 * OUTLIER_NOTE_SHARE}% (common practice)`;
    case 'histogram':
      return 'Freedman-Diaconis bins (width 2 IQR n^(-1/3), type 7 IQR), Sturges when the IQR is 0; bins left-closed, the last closed';
    case 'cv':
      return 'coefficient of variation sd (n - 1) / mean, as a ratio; ratio items with a positive mean only';
    case 'geometricMean':
      return 'exp(mean(ln x)); only when every value is > 0';
    case 'groupedMedian':
      return 'grouped-data median L + ((n/2 - F) / f) w within the median bin; bin boundaries halfway between adjacent bin limits; withheld when the median bin is open-ended';
    case 'weights':
      return 'rows whose weight is missing, invalid or negative are left out of the weighted figures and counted as excluded';
    case 'weightedMean':
      return 'weighted mean sum(w x) / sum(w)';
    case 'weightedSd':
      return 'weighted sd with frequency-weight semantics: sqrt(sum(w (x - mean)^2) / (sum(w) - 1))';
    case 'weightedQuantiles':
      return 'weighted quantiles as the inverse of the weighted empirical distribution: the smallest value whose cumulative weight share is at least p (no interpolation)';
    case 'listwise':
      return 'pairs use only rows where every item of every requested pair is valid (listwise deletion); univariate figures always use all valid cells of the item';
  }
}

/** A conventions record for the given keys. Cost: O(keys). Throws nothing. */
export function conventionsFor(keys: readonly ConventionKey[], quantileType: QuantileType): Record<string, string> {
  const out: Record<string, string> = {};
  for (const k of keys) out[k] = conventionText(k, quantileType);
  return out;
}
