/** Tukey fences: inner (outlier) and outer (extreme) limits. */
export interface Fences {
  lower: number;
  upper: number;
  lowerExtreme: number;
  upperExtreme: number;
}

/** Inner fence multiplier of the IQR (Tukey). */
export const OUTLIER_MULTIPLIER = 1.5;
/** Outer fence multiplier of the IQR (Tukey). */
export const EXTREME_MULTIPLIER = 3;

/**
 * Tukey fences from the quartiles: q1 - 1.5 IQR and q3 + 1.5 IQR (outliers beyond), and
 * q1 - 3 IQR and q3 + 3 IQR (extremes beyond), with IQR = q3 - q1.
 *
 * Convention: the quartiles are whatever the caller computed (codeweir uses its configured
 * Hyndman-Fan type, not Tukey's hinges). Cost: O(1). Throws nothing.
 * @example tukeyFences(10, 20) // { lower: -5, upper: 35, lowerExtreme: -20, upperExtreme: 50 }
 */
export function tukeyFences(q1: number, q3: number): Fences {
  const iqr = q3 - q1;
  return {
    lower: q1 - OUTLIER_MULTIPLIER * iqr,
    upper: q3 + OUTLIER_MULTIPLIER * iqr,
    lowerExtreme: q1 - EXTREME_MULTIPLIER * iqr,
    upperExtreme: q3 + EXTREME_MULTIPLIER * iqr,
  };
}
