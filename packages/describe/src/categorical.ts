import { classBoundaries, frequencies, groupedMedian, modeIndices, weightedQuantiles } from '@codeweir/stats';
import type { Frequency, ItemDescription, OrdinalPosition } from './types.ts';
import type { NormalizedDescribeOptions } from './options.ts';
import type { ConventionKey } from './conventions.ts';
import { REASON, withhold } from './reasons.ts';

/** One category of a coded item, in the item's code (scale) order. */
export interface Category {
  code: number | string;
  label: string;
  bin?: { min: number; max: number | null };
}

/** Input of the categorical summary: the categories and each row's category (or -1). */
export interface CategoricalInput {
  categories: readonly Category[];
  /**
   * Category index per row; -1 where the cell is not valid. Or, for a coded column, its codes
   * as stored (1 + category index; 0 where the cell is not valid), read without a copy.
   */
  rowCategory: Int32Array | { codes: Uint16Array };
  level: 'nominal' | 'ordinal';
  binned: boolean;
  weights?: Float64Array;
}

const ARITHMETIC = ['mean', 'sd', 'min', 'max', 'range', 'skewness', 'kurtosis', 'cv', 'geometricMean', 'fences', 'outliers', 'extremes', 'histogram'];
const QUARTILES = ['median', 'q1', 'q3', 'iqr', 'percentiles'];

function position(categories: readonly Category[], index: number): OrdinalPosition {
  const c = categories[index]!;
  return { code: c.code, label: c.label };
}

/**
 * Fills the frequency table, mode(s) and, for ordinal items, the cumulative percents, median
 * and quartiles as categories, IQR in scale steps, requested percentiles and (binned items)
 * the grouped median; with weights also their weighted counterparts. Returns the convention
 * keys used. Cost: O(rows + categories log categories).
 */
export function describeCategorical(d: ItemDescription, input: CategoricalInput, opts: NormalizedDescribeOptions): ConventionKey[] {
  const { categories, rowCategory, level, binned, weights } = input;
  const k = categories.length;
  const counts = new Float64Array(k);
  const wCounts = new Float64Array(k);
  const { n, wn, excluded } = rowCategory instanceof Int32Array ? tally(rowCategory, 0, counts, wCounts, weights) : tally(rowCategory.codes, 1, counts, wCounts, weights);
  d.n = n;
  const ordered = level === 'ordinal';
  const conventions: ConventionKey[] = ['percent', 'mode'];
  const rows = frequencies(counts);
  const wRows = weights ? frequencies(wCounts) : undefined;
  d.frequencies = categories.map((c, i): Frequency => {
    const f: Frequency = { code: c.code, label: c.label, count: rows[i]!.count, percent: rows[i]!.percent };
    if (ordered) f.cumulativePercent = rows[i]!.cumulativePercent;
    if (wRows) {
      f.weightedCount = wRows[i]!.count;
      f.weightedPercent = wRows[i]!.percent;
    }
    return f;
  });
  d.order = ordered ? 'scale' : 'code';
  d.mode = modeIndices(counts).map((i) => categories[i]!.code);
  if (d.mode.length === 0) withhold(d.withheld, ['mode'], REASON.noValues);

  if (!ordered) {
    withhold(d.withheld, [...QUARTILES, 'medianCode', 'q1Code', 'q3Code', 'percentileCodes', 'cumulativePercent', 'groupedMedian'], REASON.nominalOrder);
    withhold(d.withheld, ARITHMETIC, REASON.nominalArithmetic);
  } else {
    conventions.push('ordinalQuantiles');
    const positions = Float64Array.from({ length: k }, (_, i) => i);
    const ps = [0.25, 0.5, 0.75, ...opts.percentiles.map((p) => p / 100)];
    if (n > 0) {
      const [q1, med, q3, ...pct] = weightedQuantiles(positions, counts, ps);
      d.q1Code = position(categories, q1!);
      d.medianCode = position(categories, med!);
      d.q3Code = position(categories, q3!);
      d.iqr = q3! - q1!;
      if (opts.percentiles.length > 0) {
        d.percentileCodes = {};
        opts.percentiles.forEach((p, i) => (d.percentileCodes![String(p)] = position(categories, pct[i]!)));
      }
    } else {
      withhold(d.withheld, ['medianCode', 'q1Code', 'q3Code', 'iqr'], REASON.noValues);
    }
    if (opts.percentiles.length === 0) withhold(d.withheld, ['percentileCodes'], REASON.noPercentiles);
    withhold(d.withheld, ['median', 'q1', 'q3'], REASON.ordinalAsCodes);
    withhold(d.withheld, ['percentiles'], REASON.ordinalPercentiles);
    withhold(d.withheld, ['min', 'max', 'range'], REASON.ordinalExtremes);
    withhold(d.withheld, ARITHMETIC, binned ? REASON.binnedArithmetic : REASON.ordinalArithmetic);
    if (binned) {
      conventions.push('groupedMedian');
      groupedMedianOf(d, categories, counts);
    } else {
      withhold(d.withheld, ['groupedMedian'], REASON.notBinned);
    }
  }

  if (weights) {
    conventions.push('weights');
    const percent: Record<string, number> = {};
    categories.forEach((c, i) => (percent[String(c.code)] = wRows![i]!.percent));
    let sum = 0;
    for (let i = 0; i < k; i++) sum += wCounts[i]!;
    d.weighted = { sumOfWeights: sum, n: wn, excluded, percent };
    if (ordered && sum > 0) {
      conventions.push('weightedQuantiles');
      const positions = Float64Array.from({ length: k }, (_, i) => i);
      const [q1, med, q3] = weightedQuantiles(positions, wCounts, [0.25, 0.5, 0.75]);
      d.weighted.q1Code = position(categories, q1!);
      d.weighted.medianCode = position(categories, med!);
      d.weighted.q3Code = position(categories, q3!);
    }
  }
  return conventions;
}

/**
 * Counts (and weighted counts) per category from each row's category index plus `offset` (a
 * value below `offset` is not a valid cell), the weights summed in row order; a NaN weight
 * leaves its cell out of the weighted counts and is counted in `excluded`. Cost: O(rows).
 */
function tally(
  rowCategory: Int32Array | Uint16Array,
  offset: number,
  counts: Float64Array,
  wCounts: Float64Array,
  weights: Float64Array | undefined,
): { n: number; wn: number; excluded: number } {
  let n = 0;
  let wn = 0;
  let excluded = 0;
  for (let r = 0; r < rowCategory.length; r++) {
    const c = rowCategory[r]! - offset;
    if (c < 0) continue;
    counts[c]!++;
    n++;
    if (weights) {
      const w = weights[r]!;
      if (Number.isNaN(w)) excluded++;
      else {
        wCounts[c]! += w;
        wn++;
      }
    }
  }
  return { n, wn, excluded };
}

/** Grouped median of a binned item from its bins (sorted by lower limit) and code counts. */
function groupedMedianOf(d: ItemDescription, categories: readonly Category[], counts: Float64Array): void {
  const order = categories.map((c, i) => ({ i, bin: c.bin })).filter((c) => c.bin !== undefined);
  if (order.length !== categories.length) {
    withhold(d.withheld, ['groupedMedian'], 'some codes of this binned item carry no bin');
    return;
  }
  order.sort((a, b) => a.bin!.min - b.bin!.min);
  const bounds = classBoundaries(order.map((c) => c.bin!));
  const r = groupedMedian(order.map((c, j) => ({ ...bounds[j]!, count: counts[c.i]! })));
  if (r.ok) d.groupedMedian = r.value;
  else withhold(d.withheld, ['groupedMedian'], r.reason);
}
