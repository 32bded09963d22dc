import { quantileSorted } from './quantile.ts';

export interface Histogram {
  /** The binning rule that produced the edges. */
  rule: string;
  /** k + 1 ascending edges; bins are [e_i, e_i+1) except the last, which is closed. */
  edges: number[];
  counts: number[];
}

/** Largest number of bins drawn; past it a wider bin keeps a histogram readable. */
export const MAX_BINS = 200;

/**
 * Histogram of sorted values with Freedman-Diaconis bins.
 *
 * Convention: bin width 2 IQR n^(-1/3), IQR from Hyndman-Fan type 7 quartiles, k = ceil(range
 * / width) bins starting at the minimum. When the IQR is 0 (over half the values equal) the width
 * would be 0, so Sturges' rule k = ceil(log2 n) + 1 is used instead; all values equal give one
 * bin. k is capped at MAX_BINS (common practice, to keep the chart readable); `rule` names which
 * rule applied. Bins are left-closed, the last also right-closed. Cost: O(n) on sorted input.
 * Throws nothing; empty input gives no bins.
 * @example histogramSorted(Float64Array.of(1, 2, 2, 3, 9))
 */
export function histogramSorted(sorted: ArrayLike<number>): Histogram {
  const n = sorted.length;
  if (n === 0) return { rule: 'Freedman-Diaconis', edges: [], counts: [] };
  const min = sorted[0]!;
  const max = sorted[n - 1]!;
  const range = max - min;
  if (range === 0) return { rule: 'single value', edges: [min, max], counts: [n] };
  const iqr = quantileSorted(sorted, 0.75, 7) - quantileSorted(sorted, 0.25, 7);
  let rule: string;
  let k: number;
  if (iqr > 0) {
    rule = 'Freedman-Diaconis';
    k = Math.max(1, Math.ceil(range / (2 * iqr * Math.pow(n, -1 / 3))));
  } else {
    rule = 'Sturges (IQR is 0)';
    k = Math.ceil(Math.log2(n)) + 1;
  }
  if (k > MAX_BINS) {
    k = MAX_BINS;
    rule += `, capped at ${MAX_BINS} bins`;
  }
  const width = range / k;
  const edges: number[] = [];
  for (let i = 0; i < k; i++) edges.push(min + i * width);
  edges.push(max);
  const counts = new Array<number>(k).fill(0);
  let bin = 0;
  for (let i = 0; i < n; i++) {
    const v = sorted[i]!;
    while (bin < k - 1 && v >= edges[bin + 1]!) bin++;
    counts[bin]!++;
  }
  return { rule, edges, counts };
}
