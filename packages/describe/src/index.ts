export type * from './types.ts';
export { describe } from './describe.ts';
export { describeParallel, type DescribeThreads } from './parallel.ts';
export {
  normalizeDescribeOptions,
  type DescribeOptions,
  type DescribeOptionsInput,
  type NormalizedDescribeOptions,
} from './options.ts';
export { conventionText, conventionsFor, OUTLIER_NOTE_SHARE, type ConventionKey } from './conventions.ts';
export { describePairs, type PairOptions } from './pairs.ts';
export { addDesignEstimates, designActive, designWeightName, DESIGN_CONVENTIONS } from './design.ts';
export { suppressDescription, suppressItem, suppressPair, oneRow, hideFrequency, hideFrequencies } from './disclosure.ts';
