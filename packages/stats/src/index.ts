// Order statistics
export { sortedCopy, sortedValid, sortedValidWith } from './sort.ts';
export { quantile, quantileSorted, type QuantileType } from './quantile.ts';
export { quantilesInPlace, selectKth } from './select.ts';
export { tukeyFences, OUTLIER_MULTIPLIER, EXTREME_MULTIPLIER, type Fences } from './fences.ts';
// Moments
export { Moments } from './moments.ts';
// Ranks and correlation
export { averageRanks, sortColumn, ranksAlongOrder, type SortedColumn } from './ranks.ts';
export { coMoments, pearson, pearsonFromMoments, type CoMoments } from './pearson.ts';
export { spearman, spearmanFromTable } from './spearman.ts';
export { mahalanobisSquared, mahalanobisCutoff, bivariateOutliers, type BivariateOutliers } from './mahalanobis.ts';
// Contingency tables
export { crossTabulate, margins, expectedCounts, tablePercents, type Table, type Margins, type TablePercents } from './contingency.ts';
export { pearsonChiSquare, chiSquareUpperTail, type ChiSquareTest } from './chi-square.ts';
export { cramersV } from './cramers-v.ts';
export { phi } from './phi.ts';
export { goodmanKruskalGamma } from './gamma.ts';
// Comparing two samples (drift between deliveries)
export { ksTwoSample, ksTwoSampleSorted, kolmogorovUpperTail, KS_EXACT_BELOW, type KsTwoSample, type KsOptions } from './ks-two-sample.ts';
export { psiFromCounts, psiSorted, psiCutPoints, PSI_EMPTY_SHARE, PSI_BINS, type Psi } from './psi.ts';
// Group comparisons
export { etaSquared } from './eta-squared.ts';
// Shape and spread
export { skewness } from './skewness.ts';
export { kurtosis } from './kurtosis.ts';
export { geometricMean } from './geometric-mean.ts';
export { coefficientOfVariation, cvFromMoments } from './cv.ts';
// Counts and tables
export { modes, modesSorted, modeIndices } from './mode.ts';
export { frequencies, type FrequencyRow } from './frequencies.ts';
export { histogramSorted, MAX_BINS, type Histogram } from './histogram.ts';
// Grouped and weighted data
export { groupedMedian, classBoundaries, type GroupedClass, type GroupedMedianResult } from './grouped-median.ts';
export { weightedMean, weightedSd, weightedMoments, weightedQuantile, weightedQuantiles, weightedQuantilesSorted } from './weighted.ts';
// Complex samples: design-based estimates
export { resolveSampleDesign, designDegreesOfFreedom, type SampleDesign, type SampleDesignInput, type SingleClusterRule } from './sample-design.ts';
export { designMean, designProportions, type DesignEstimate, type DesignBase, type Domain } from './taylor-variance.ts';
export { designEffect, type DesignEffect, type DeffBasis } from './design-effect.ts';
export { meanInterval, logitInterval, type ConfidenceInterval } from './design-interval.ts';
export { suppressCells, tableTotals, type Suppression, type SuppressionMargins, type SuppressionPreset, type MarginShown, type CellState } from './cell-suppression.ts';
