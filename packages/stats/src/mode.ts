/**
 * All modes of `values`: every value that occurs the greatest number of times, ascending.
 *
 * Convention: ties are all reported (no single mode is chosen); values compare with ===
 * after sorting, so 0 and -0 are one value. Cost: O(n log n) time, one n-element copy.
 * Throws nothing; [] for empty input.
 * @example modes([1, 2, 2, 3, 3]) // [2, 3]
 */
export function modes(values: ArrayLike<number>): number[] {
  const sorted = Float64Array.from(values).sort();
  return modesSorted(sorted).values;
}

/**
 * Modes of already sorted values and how often each occurs.
 * Cost: O(n). Throws nothing; `{ values: [], count: 0 }` for empty input.
 * @example modesSorted(Float64Array.of(1, 2, 2)) // { values: [2], count: 2 }
 */
export function modesSorted(sorted: ArrayLike<number>): { values: number[]; count: number } {
  let best = 0;
  let out: number[] = [];
  for (let i = 0; i < sorted.length; ) {
    const v = sorted[i]!;
    let j = i + 1;
    while (j < sorted.length && sorted[j] === v) j++;
    const run = j - i;
    if (run > best) {
      best = run;
      out = [v];
    } else if (run === best) {
      out.push(v);
    }
    i = j;
  }
  return { values: out, count: best };
}

/**
 * Indices of the largest entries of a count table (all of them when tied), ascending.
 * Convention: ties are all reported; an all-zero table has no mode. Cost: O(k). Throws nothing.
 * @example modeIndices([3, 5, 5, 1]) // [1, 2]
 */
export function modeIndices(counts: ArrayLike<number>): number[] {
  let best = 0;
  let out: number[] = [];
  for (let i = 0; i < counts.length; i++) {
    const c = counts[i]!;
    if (c > best) {
      best = c;
      out = [i];
    } else if (c === best && c > 0) {
      out.push(i);
    }
  }
  return out;
}
