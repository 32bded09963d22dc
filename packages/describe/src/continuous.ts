import {
  Moments,
  cvFromMoments,
  geometricMean,
  histogramSorted,
  modesSorted,
  quantileSorted,
  sortedValid,
  sortedValidWith,
  tukeyFences,
  weightedMoments,
  weightedQuantiles,
  weightedQuantilesSorted,
} from '@codeweir/stats';
import type { ItemDescription } from './types.ts';
import type { NormalizedDescribeOptions } from './options.ts';
import { OUTLIER_NOTE_SHARE, type ConventionKey } from './conventions.ts';
import { REASON, withhold } from './reasons.ts';

/** How many of the most extreme values beyond the fences are listed on each side. */
export const OUTLIER_VALUES_SHOWN = 5;

const ALL = [
  'mean', 'sd', 'min', 'max', 'range', 'median', 'q1', 'q3', 'iqr', 'mode', 'skewness', 'kurtosis',
  'fences', 'outliers', 'extremes', 'histogram', 'cv', 'geometricMean', 'percentiles',
];

const round = (x: number) => Number(x.toPrecision(4));

/**
 * Fills the interval/ratio summary from one numeric column: n, min, max, range, mean, sd,
 * quartiles, IQR, percentiles, modes, G1, G2, Tukey fences with outlier counts and values, the
 * outlier note, a histogram, and for ratio items cv and geometric mean; with weights the
 * weighted mean, sd and quartiles. Returns the convention keys used.
 * Cost: O(rows) with one sort of the valid values (`sortedValid`: a radix sort from 16,384 values on;
 * with weights the sort also carries each value's weight, and the weighted quantiles walk that order).
 */
export function describeContinuous(
  d: ItemDescription,
  values: Float64Array,
  ratio: boolean,
  opts: NormalizedDescribeOptions,
  weights?: Float64Array,
): ConventionKey[] {
  // With weights, one sort that carries each value's weight serves the weighted quantiles too.
  const ordered = weights ? sortedValidWith(values, weights) : undefined;
  const sorted = ordered ? ordered.sorted : sortedValid(values);
  const n = sorted.length;
  d.n = n;
  withhold(d.withheld, ['frequencies'], REASON.continuousFrequencies);
  withhold(d.withheld, ['medianCode', 'q1Code', 'q3Code', 'percentileCodes'], REASON.numericQuantiles);
  withhold(d.withheld, ['groupedMedian'], REASON.notBinned);
  if (!ratio) withhold(d.withheld, ['cv', 'geometricMean'], REASON.intervalZero);
  const conventions: ConventionKey[] = ['quantileType', 'sd', 'skewness', 'kurtosis', 'mode', 'fences', 'outlierNote', 'histogram'];
  if (ratio) conventions.push('cv', 'geometricMean');
  if (n === 0) {
    withhold(d.withheld, ALL, REASON.noValues);
    return conventions;
  }
  const t = opts.quantileType;
  const m = Moments.of(sorted);
  d.min = sorted[0]!;
  d.max = sorted[n - 1]!;
  d.range = d.max - d.min;
  d.mean = m.mean;
  if (n >= 2) d.sd = m.sd(1);
  else withhold(d.withheld, ['sd'], REASON.tooFewSd);
  d.median = quantileSorted(sorted, 0.5, t);
  d.q1 = quantileSorted(sorted, 0.25, t);
  d.q3 = quantileSorted(sorted, 0.75, t);
  d.iqr = d.q3 - d.q1;
  if (opts.percentiles.length > 0) {
    d.percentiles = {};
    for (const p of opts.percentiles) d.percentiles[String(p)] = quantileSorted(sorted, p / 100, t);
  } else {
    withhold(d.withheld, ['percentiles'], REASON.noPercentiles);
  }
  const md = modesSorted(sorted);
  if (md.count > 1) d.mode = md.values;
  else withhold(d.withheld, ['mode'], REASON.noRepeat);
  const g1 = m.skewness();
  if (Number.isFinite(g1)) d.skewness = g1;
  else withhold(d.withheld, ['skewness'], REASON.tooFewSkewness);
  const g2 = m.kurtosis();
  if (Number.isFinite(g2)) d.kurtosis = g2;
  else withhold(d.withheld, ['kurtosis'], REASON.tooFewKurtosis);

  fencesOf(d, sorted);
  d.histogram = histogramSorted(sorted);

  if (ratio) {
    if (d.mean > 0 && n >= 2) d.cv = cvFromMoments(m);
    else withhold(d.withheld, ['cv'], n < 2 ? REASON.tooFewSd : 'the mean is not positive');
    const gm = geometricMean(sorted);
    if (Number.isFinite(gm)) d.geometricMean = gm;
    else withhold(d.withheld, ['geometricMean'], `the geometric mean needs every value > 0; the smallest is ${d.min}`);
  }

  if (weights) {
    conventions.push('weights', 'weightedMean', 'weightedSd', 'weightedQuantiles');
    const { m, excluded } = weightCounts(values, weights);
    // In row order over the valid values, as over a copy of them with their weights.
    const wm = weightedMoments(values, weights, true);
    d.weighted = { sumOfWeights: wm.sumOfWeights, n: m, excluded };
    if (wm.sumOfWeights > 0) {
      d.weighted.mean = wm.mean;
      if (wm.sumOfWeights > 1) d.weighted.sd = Math.sqrt(wm.m2 / (wm.sumOfWeights - 1));
      const ps = [0.25, 0.5, 0.75];
      // The sort above puts -0 before +0 where the weighted order ties them: then sort again.
      const [q1, med, q3] = ordered && !ordered.negativeZero ? weightedQuantilesSorted(sorted, ordered.carried, wm.sumOfWeights, ps) : weightedQuantiles(...weightedPairs(values, weights, m), ps);
      d.weighted.q1 = q1!;
      d.weighted.median = med!;
      d.weighted.q3 = q3!;
    }
  }
  return conventions;
}

/**
 * How many valid values have a valid weight (m), and how many have a missing one (excluded).
 * Cost: O(rows). Throws nothing.
 */
function weightCounts(values: Float64Array, weights: Float64Array): { m: number; excluded: number } {
  let m = 0;
  let excluded = 0;
  for (let r = 0; r < values.length; r++) {
    if (Number.isNaN(values[r]!)) continue;
    if (Number.isNaN(weights[r]!)) excluded++;
    else m++;
  }
  return { m, excluded };
}

/**
 * The `m` valid values that have a valid weight, with those weights, in row order.
 * Cost: O(rows). Throws nothing.
 */
function weightedPairs(values: Float64Array, weights: Float64Array, m: number): [Float64Array, Float64Array] {
  const wv = new Float64Array(m);
  const ww = new Float64Array(m);
  let k = 0;
  for (let r = 0; r < values.length; r++) {
    const v = values[r]!;
    const w = weights[r]!;
    if (Number.isNaN(v) || Number.isNaN(w)) continue;
    wv[k] = v;
    ww[k++] = w;
  }
  return [wv, ww];
}

/** Tukey fences, outlier and extreme counts, the most extreme values and the outlier note. */
function fencesOf(d: ItemDescription, sorted: Float64Array): void {
  const f = tukeyFences(d.q1!, d.q3!);
  d.fences = f;
  const n = sorted.length;
  let outliers = 0;
  let extremes = 0;
  const inside = new Moments();
  for (let i = 0; i < n; i++) {
    const v = sorted[i]!;
    if (v < f.lowerExtreme || v > f.upperExtreme) extremes++;
    else if (v < f.lower || v > f.upper) outliers++;
    else inside.push(v);
  }
  d.outliers = outliers;
  d.extremes = extremes;
  if (outliers + extremes === 0) return;
  const low: number[] = [];
  for (let i = 0; i < n && low.length < OUTLIER_VALUES_SHOWN && sorted[i]! < f.lower; i++) low.push(sorted[i]!);
  const high: number[] = [];
  for (let i = n - 1; i >= 0 && high.length < OUTLIER_VALUES_SHOWN && sorted[i]! > f.upper; i--) high.push(sorted[i]!);
  d.outlierValues = { low, high };
  // Compare the figures with and without the values beyond the inner fences.
  const sdIn = inside.sd(1);
  if (!(inside.n >= 2) || d.sd === undefined) return;
  const meanShift = Math.abs(d.mean! - inside.mean);
  const sdShift = sdIn > 0 ? Math.abs(d.sd - sdIn) / sdIn : Number.POSITIVE_INFINITY;
  const meanMoves = meanShift > OUTLIER_NOTE_SHARE * (sdIn > 0 ? sdIn : 0);
  const sdMoves = sdShift > OUTLIER_NOTE_SHARE;
  if (!meanMoves && !sdMoves) return;
  const count = outliers + extremes;
  const what = [
    meanMoves ? `the mean from ${round(inside.mean)} to ${round(d.mean!)}` : '',
    sdMoves ? `the sd from ${round(sdIn)} to ${round(d.sd)}` : '',
  ]
    .filter(Boolean)
    .join(' and ');
  d.outlierNote =
    `${count} value${count === 1 ? '' : 's'} beyond the Tukey fences move${count === 1 ? 's' : ''} ${what}; ` +
    `the median (${round(d.median!)}) and IQR (${round(d.iqr!)}) describe this item better.`;
}
