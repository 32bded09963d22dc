// Order statistics
export { sortedCopy } from './sort.ts';
export { quantile, quantileSorted, type QuantileType } from './quantile.ts';
export { tukeyFences, OUTLIER_MULTIPLIER, EXTREME_MULTIPLIER, type Fences } from './fences.ts';
// Moments
export { Moments } from './moments.ts';
