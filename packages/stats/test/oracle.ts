// Shared access to the outside oracles used by the stats tests: R 4.2.2 values in
// test/reference/r-oracle.json and the jStat library (npm `jstat`).
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';

export interface RSample {
  x: number[];
  n: number;
  mean: number;
  sd: number;
  var: number;
  median: number;
  quantile: Record<string, number[]>;
  weightedMean_w1to_n: number;
}

export interface ROracle {
  probs: number[];
  samples: Record<'ties10' | 'odd7' | 'normal1000' | 'skewed500', RSample>;
  largeOffset: { construction: string; certifiedMean: number; certifiedSd: number; rMean: number; rSd: number };
}

export const R: ROracle = JSON.parse(readFileSync(new URL('../../../test/reference/r-oracle.json', import.meta.url), 'utf8'));

/** The few jStat functions the tests call (jstat ships no type declarations). */
export interface JStatSubset {
  mean(a: number[]): number;
  stdev(a: number[], sample?: boolean): number;
  skewness(a: number[]): number;
  kurtosis(a: number[]): number;
  geomean(a: number[]): number;
}

export const jStat = (createRequire(import.meta.url)('jstat') as { jStat: JStatSubset }).jStat;

/** Seeded pseudo-random uniform numbers in [0, 1), shared with the benchmark generator. */
export { seededRandom as seeded } from '../../../bench/generate.ts';

/** The 1001 values of the large-offset set: 10000000.2 then 500 pairs (10000000.1, 10000000.3). */
export function largeOffsetValues(): number[] {
  const xs = [10000000.2];
  for (let i = 0; i < 500; i++) xs.push(10000000.1, 10000000.3);
  return xs;
}
