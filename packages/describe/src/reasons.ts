/** Why a statistic is not given, one sentence fragment per situation. */
export const REASON = {
  nominalOrder: 'nominal categories have no order',
  nominalArithmetic: 'nominal codes have no arithmetic meaning',
  ordinalArithmetic: 'ordinal codes are ranks, not quantities: scale steps are not known to be equal',
  ordinalAsCodes: 'an ordinal median and quartiles are given as categories (medianCode, q1Code, q3Code)',
  ordinalPercentiles: 'ordinal percentiles are given as categories (percentileCodes)',
  numericQuantiles: 'interval and ratio quantiles are given as numbers (median, q1, q3, percentiles)',
  ordinalExtremes: 'the lowest and highest categories used are in the frequency table',
  binnedArithmetic: "a binned item's codes stand for ranges of a quantity; a mean of codes is meaningless",
  notBinned: 'only binned items have bins to interpolate a median in',
  intervalZero: 'the scale has no absolute zero',
  noRepeat: 'no value occurs more than once',
  noValues: 'there are no valid values',
  tooFewSkewness: 'skewness G1 needs at least 3 values that are not all equal',
  tooFewKurtosis: 'kurtosis G2 needs at least 4 values that are not all equal',
  tooFewSd: 'an sd with n - 1 denominator needs at least 2 values',
  noPercentiles: 'no percentiles were requested',
  continuousFrequencies: 'a frequency table of an interval or ratio item is given as a histogram',
} as const;

/** Adds `reason` for each name not already withheld. Cost: O(names). Throws nothing. */
export function withhold(withheld: Record<string, string>, names: readonly string[], reason: string): void {
  for (const n of names) if (!(n in withheld)) withheld[n] = reason;
}
