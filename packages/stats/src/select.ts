import { quantileSorted, type QuantileType } from './quantile.ts';

/** Below this many elements a range is partitioned around its own middle, without sampling. */
const SAMPLE_FROM = 600;

function swap(a: Float64Array, i: number, j: number): void {
  const t = a[i]!;
  a[i] = a[j]!;
  a[j] = t;
}

/**
 * Moves the k-th smallest value of a[left..right] to index k, smaller-or-equal values before
 * it and greater-or-equal values after it (within that range).
 *
 * Convention: Floyd and Rivest's (1975) SELECT: a large range is first narrowed by recursing
 * on a sample around the expected position of k, then partitioned around a[k]. Ties are kept
 * on both sides, so heavily tied data (survey answers) does not degrade. Comparison is by `<`
 * and `>`, so -0 and +0 count as equal (see {@link quantilesInPlace} for their order).
 * Cost: O(right - left) expected time, O(log n) stack, no allocation. NaN-free input assumed.
 * Throws nothing.
 */
export function selectKth(a: Float64Array, k: number, left = 0, right = a.length - 1): void {
  while (right > left) {
    if (right - left > SAMPLE_FROM) {
      const n = right - left + 1;
      const i = k - left + 1;
      const z = Math.log(n);
      const s = 0.5 * Math.exp((2 * z) / 3);
      const sd = 0.5 * Math.sqrt((z * s * (n - s)) / n) * (i - n / 2 < 0 ? -1 : 1);
      const newLeft = Math.max(left, Math.floor(k - (i * s) / n + sd));
      const newRight = Math.min(right, Math.floor(k + ((n - i) * s) / n + sd));
      selectKth(a, k, newLeft, newRight);
    }
    const t = a[k]!;
    let i = left;
    let j = right;
    swap(a, left, k);
    if (a[right]! > t) swap(a, left, right);
    while (i < j) {
      swap(a, i, j);
      i++;
      j--;
      while (a[i]! < t) i++;
      while (a[j]! > t) j--;
    }
    if (a[left] === t) swap(a, left, j);
    else {
      j++;
      swap(a, j, right);
    }
    if (j <= k) left = j + 1;
    if (k <= j) right = j - 1;
  }
}

/**
 * Puts the order statistics of ranks lo..hi (0-based) of a[left..right] at indices lo..hi in
 * ascending order, with no greater value before lo and no smaller value after hi.
 * `a[left..right]` must hold exactly the values of ranks left..right of the whole array (true
 * for the whole array, or for the part after a range placed by an earlier call).
 * Cost: two selections, O(right - left) expected, plus an insertion sort of hi - lo values.
 * Throws nothing.
 */
function placeRange(a: Float64Array, lo: number, hi: number, left: number, right: number): void {
  selectKth(a, lo, left, right);
  if (hi <= lo) return;
  selectKth(a, hi, lo + 1, right);
  for (let i = lo + 2; i < hi; i++) {
    const v = a[i]!;
    let j = i - 1;
    while (j > lo && a[j]! > v) {
      a[j + 1] = a[j]!;
      j--;
    }
    a[j + 1] = v;
  }
}

/**
 * Half-width of the index window around floor(n p) that holds every order statistic
 * quantileSorted reads: it reads 0-based j - 1 and j with j = floor(n p + m + fuzz), and m lies
 * in [-1/2, 1] for all nine types, so j - 1 and j lie within floor(n p) - 2 .. floor(n p) + 2.
 * One more on each side keeps the window safe against rounding in n p.
 */
const WINDOW = 3;

/**
 * Sample quantiles of `values` at each p in `ps`, without a full sort: the result is identical
 * (to the bit, including the sign of a zero) to `quantileSorted(sortedCopy(values), p, type)`.
 *
 * Convention: Hyndman and Fan (1996) type `type` (default 7), computed by
 * {@link quantileSorted} on `values` after the few order statistics it reads around n p have
 * been put in place by selection (Floyd-Rivest). A typed-array sort puts -0 before +0 while
 * selection treats them as equal, so a zero placed in a window gets the sign that its rank has
 * in sorted order (one extra pass over `values`, only when a placed value is zero).
 * REORDERS `values` and may flip the sign of its zeros (pass a copy to keep the original).
 * NaN-free input assumed.
 * Cost: O(n) expected time per p, no allocation beyond the result. Throws nothing; NaN for
 * empty input or a p outside [0, 1], as quantileSorted.
 * @example quantilesInPlace(Float64Array.of(4, 1, 3, 2), [0.25, 0.75], 6) // [1.25, 3.75]
 */
export function quantilesInPlace(values: Float64Array, ps: readonly number[], type: QuantileType = 7): number[] {
  const n = values.length;
  const order = ps.map((p, k) => ({ p, k })).filter((e) => e.p >= 0 && e.p <= 1);
  order.sort((x, y) => x.p - y.p);
  let placed = -1; // values[0..placed] hold their sorted order statistics
  let zeros = false;
  const windows: Array<[number, number]> = [];
  for (const { p } of order) {
    if (n === 0) break;
    const mid = Math.floor(n * p);
    const lo = Math.max(mid - WINDOW, placed + 1, 0);
    const hi = Math.min(mid + WINDOW, n - 1);
    if (lo > hi) continue;
    placeRange(values, lo, hi, placed + 1, n - 1);
    windows.push([lo, hi]);
    for (let i = lo; i <= hi; i++) if (values[i] === 0) zeros = true;
    placed = hi;
  }
  if (zeros) signZeros(values, windows);
  const out = ps.map(() => Number.NaN);
  for (const { p, k } of order) out[k] = quantileSorted(values, p, type);
  return out;
}

/** Gives each zero in the placed windows the sign its rank has in sorted order: negatives, then -0, then +0. */
function signZeros(values: Float64Array, windows: ReadonlyArray<[number, number]>): void {
  let below = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (v < 0 || Object.is(v, -0)) below++;
  }
  for (const [lo, hi] of windows) {
    for (let i = lo; i <= hi; i++) if (values[i] === 0) values[i] = i < below ? -0 : 0;
  }
}
