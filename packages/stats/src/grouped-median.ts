/** One class of grouped data: true class boundaries and the class count. */
export interface GroupedClass {
  lower: number;
  /** Infinity for an open-ended top class ("15 or more"). */
  upper: number;
  count: number;
}

export type GroupedMedianResult =
  | { ok: true; value: number; classIndex: number }
  | { ok: false; reason: string };

/**
 * Median of grouped data, interpolated within the median class.
 *
 * Convention: the textbook grouped-data formula median = L + ((n / 2 - F) / f) w, where the
 * median class is the first class whose cumulative count reaches n / 2, L its lower boundary,
 * F the cumulative count below it, f its count and w its width. Values are taken as spread
 * evenly within each class. Classes must be in ascending order. Withheld (ok: false, with the
 * reason) when there are no counts or the median class is open-ended (no width to interpolate).
 * Cost: O(k) for k classes. Throws nothing.
 * @example groupedMedian([{ lower: 0, upper: 10, count: 5 }, { lower: 10, upper: 20, count: 5 }]) // value 10
 */
export function groupedMedian(classes: readonly GroupedClass[]): GroupedMedianResult {
  let n = 0;
  for (const c of classes) n += c.count;
  if (!(n > 0)) return { ok: false, reason: 'there are no counts to take a median of' };
  const half = n / 2;
  let below = 0;
  for (let k = 0; k < classes.length; k++) {
    const c = classes[k]!;
    if (c.count > 0 && below + c.count >= half) {
      if (!Number.isFinite(c.upper) || !Number.isFinite(c.lower)) {
        return { ok: false, reason: 'the median falls in an open-ended class, which has no width to interpolate in' };
      }
      return { ok: true, value: c.lower + ((half - below) / c.count) * (c.upper - c.lower), classIndex: k };
    }
    below += c.count;
  }
  return { ok: false, reason: 'there are no counts to take a median of' };
}

/**
 * True class boundaries from stated class limits (ascending, non-overlapping), e.g. bins
 * 0-0, 1-3, 4-7, 8+ of a count. Where one class ends at the next one's start (continuous
 * limits), that value is the boundary; where there is a gap (integer limits 1-3, 4-7), the
 * boundary is the midpoint of the gap (3.5), and the outer boundaries of the first and last
 * closed classes extend by half the nearest gap. `max: null` gives an open top (Infinity).
 * Convention: the textbook class-boundary rule (limits +- half the unit gap). Cost: O(k).
 * Throws nothing.
 * @example classBoundaries([{ min: 1, max: 3 }, { min: 4, max: 7 }]) // [{ lower: 0.5, upper: 3.5 }, { lower: 3.5, upper: 7.5 }]
 */
export function classBoundaries(
  limits: ReadonlyArray<{ min: number; max: number | null }>,
): Array<{ lower: number; upper: number }> {
  const k = limits.length;
  const gaps: number[] = [];
  for (let i = 0; i + 1 < k; i++) {
    const top = limits[i]!.max;
    gaps.push(top === null ? 0 : Math.max(0, limits[i + 1]!.min - top));
  }
  const out: Array<{ lower: number; upper: number }> = [];
  for (let i = 0; i < k; i++) {
    const l = limits[i]!;
    const gapBelow = i > 0 ? gaps[i - 1]! : (gaps[0] ?? 0);
    const gapAbove = i + 1 < k ? gaps[i]! : (gaps[k - 2] ?? 0);
    out.push({
      lower: l.min - gapBelow / 2,
      upper: l.max === null ? Number.POSITIVE_INFINITY : l.max + gapAbove / 2,
    });
  }
  return out;
}
