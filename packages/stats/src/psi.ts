/** The population stability index between a reference and a current distribution. */
import { quantileSorted } from './quantile.ts';

/**
 * Share given to a bin with no count on one side, so that the logarithm stays finite
 * (0.0001 = 0.01%, common practice). Shares are not renormalised after the substitution.
 */
export const PSI_EMPTY_SHARE = 1e-4;

/** Bins of the binned PSI: the reference sample's deciles (common practice). */
export const PSI_BINS = 10;

export interface Psi {
  /** sum over bins of (current share - reference share) x ln(current share / reference share). */
  psi: number;
  /** Bins that entered the sum (those with a count on at least one side). */
  bins: number;
}

/**
 * Population stability index of two count vectors over the same bins (codes of a nominal or
 * ordinal item, or intervals): PSI = sum_b (c_b - r_b) ln(c_b / r_b) with r and c the shares of
 * each side. 0 means identical shares; by common practice below 0.1 is read as stable, 0.1 to
 * 0.25 as a moderate shift and above 0.25 as a major one.
 *
 * Convention: a share of 0 on one side is replaced by {@link PSI_EMPTY_SHARE} (not renormalised);
 * bins empty on both sides are left out. Cost: O(bins). Throws nothing; NaN when either side
 * has no counts.
 * @example psiFromCounts([50, 50], [40, 60]).psi // about 0.0405
 */
export function psiFromCounts(reference: ArrayLike<number>, current: ArrayLike<number>): Psi {
  let nr = 0;
  let nc = 0;
  for (let b = 0; b < reference.length; b++) nr += reference[b]!;
  for (let b = 0; b < current.length; b++) nc += current[b]!;
  if (!(nr > 0) || !(nc > 0)) return { psi: NaN, bins: 0 };
  let psi = 0;
  let bins = 0;
  const len = Math.max(reference.length, current.length);
  for (let b = 0; b < len; b++) {
    const r0 = reference[b] ?? 0;
    const c0 = current[b] ?? 0;
    if (r0 === 0 && c0 === 0) continue;
    bins++;
    const r = r0 === 0 ? PSI_EMPTY_SHARE : r0 / nr;
    const c = c0 === 0 ? PSI_EMPTY_SHARE : c0 / nc;
    psi += (c - r) * Math.log(c / r);
  }
  return { psi, bins };
}

/** Number of values of a sorted array at or below `v` (binary search). */
function countAtOrBelow(sorted: ArrayLike<number>, v: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid]! <= v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Cut points of the binned PSI: the reference sample's quantiles at 1/bins, ..., (bins-1)/bins
 * (Hyndman-Fan type 7), repeated values kept once.
 */
export function psiCutPoints(referenceSorted: ArrayLike<number>, bins = PSI_BINS): number[] {
  const cuts: number[] = [];
  if (referenceSorted.length === 0) return cuts;
  for (let k = 1; k < bins; k++) {
    const q = quantileSorted(referenceSorted, k / bins, 7);
    if (cuts.length === 0 || q > cuts[cuts.length - 1]!) cuts.push(q);
  }
  return cuts;
}

/**
 * Population stability index of an interval or ratio item between two sorted samples
 * (NaN-free): the values are put into bins cut at the reference sample's deciles
 * ({@link psiCutPoints}: Hyndman-Fan type 7, equal cut points merged, bins right-closed
 * (a, b], the first open below, the last open above), then {@link psiFromCounts}.
 * Cost: O(bins log n). Throws nothing; NaN when either sample is empty.
 * @example psiSorted([1, 2, 3, 4], [1, 2, 3, 4]).psi // 0
 */
export function psiSorted(referenceSorted: ArrayLike<number>, currentSorted: ArrayLike<number>, bins = PSI_BINS): Psi {
  const cuts = psiCutPoints(referenceSorted, bins);
  const count = (s: ArrayLike<number>): number[] => {
    const out: number[] = [];
    let below = 0;
    for (const c of cuts) {
      const at = countAtOrBelow(s, c);
      out.push(at - below);
      below = at;
    }
    out.push(s.length - below);
    return out;
  };
  return psiFromCounts(count(referenceSorted), count(currentSorted));
}
