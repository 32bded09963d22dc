/**
 * An ascending Float64Array copy of `values`.
 *
 * Convention: numeric order via Float64Array.prototype.sort (a typed-array sort compares
 * numbers, not strings). The input is assumed NaN-free: callers drop invalid cells first.
 * Cost: O(n log n) time, one n-element copy. Throws nothing.
 * @example sortedCopy([3, 1, 2]) // Float64Array [1, 2, 3]
 */
export function sortedCopy(values: ArrayLike<number>): Float64Array {
  const out = Float64Array.from(values);
  out.sort();
  return out;
}
