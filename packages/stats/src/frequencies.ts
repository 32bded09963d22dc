/** One row of a frequency table. Percents are 0 to 100. */
export interface FrequencyRow {
  count: number;
  percent: number;
  cumulativePercent: number;
}

/**
 * Percent and cumulative percent of a table of counts, in the order given.
 *
 * Convention: percent of the table total (the valid cells when the caller passes valid counts
 * only), 0 to 100; cumulative percent is the running sum of counts over the total, so the last
 * row is exactly 100 (no summed rounding). Works for weighted counts too. Cost: O(k).
 * Throws nothing; all percents are 0 when the total is 0.
 * @example frequencies([1, 3]) // [{ count: 1, percent: 25, cumulativePercent: 25 }, { count: 3, percent: 75, cumulativePercent: 100 }]
 */
export function frequencies(counts: ArrayLike<number>): FrequencyRow[] {
  let total = 0;
  for (let i = 0; i < counts.length; i++) total += counts[i]!;
  const out: FrequencyRow[] = [];
  let running = 0;
  for (let i = 0; i < counts.length; i++) {
    const c = counts[i]!;
    running += c;
    out.push({
      count: c,
      percent: total > 0 ? (100 * c) / total : 0,
      cumulativePercent: total > 0 ? (100 * running) / total : 0,
    });
  }
  return out;
}
