import { describe, it, expect } from 'vitest';
import { RADIX_SORT_MIN, radixSort, sortedValid, sortedValidWith } from '../src/sort.ts';
import { awkwardDoubles, signed } from './awkward.ts';

describe('radixSort', () => {
  it('sorts a hand-worked example and carries positions stably', () => {
    // Keys 2, -1, 2, -0, 0 at positions 0..4. Numeric order with -0 before +0: -1 (pos 1),
    // -0 (pos 3), 0 (pos 4), then the two 2s in position order (pos 0, then pos 2).
    const { sorted, order } = radixSort(Float64Array.of(2, -1, 2, -0, 0), Uint32Array.of(0, 1, 2, 3, 4));
    expect(signed(sorted)).toEqual(['-1', '-0', '0', '2', '2']);
    expect(Array.from(order!)).toEqual([1, 3, 4, 0, 2]);
  });

  it('gives the order of Float64Array.prototype.sort on seeded awkward doubles', () => {
    for (const n of [0, 1, 2, 17, 1000, 2 * RADIX_SORT_MIN]) {
      const values = awkwardDoubles(n + 5, n);
      const reference = Float64Array.from(values).sort();
      expect(signed(radixSort(Float64Array.from(values)).sorted)).toEqual(signed(reference));
    }
  });

  it('permutes positions as a stable comparator sort of positions does', () => {
    const values = awkwardDoubles(8, 20000).map((v) => v + 0);
    // Reference: Array.prototype.sort is stable (ECMAScript 2019), so ties keep position order.
    const reference = values.map((_, i) => i).sort((a, b) => values[a]! - values[b]!);
    const positions = Uint32Array.from(values, (_, i) => i);
    const { sorted, order } = radixSort(Float64Array.from(values), positions);
    expect(Array.from(order!)).toEqual(reference);
    expect(signed(sorted)).toEqual(signed(reference.map((i) => values[i]!)));
  });

  it('skips digits every key shares and still sorts (small whole numbers share their low words)', () => {
    // First principles: 0..99 reversed, as doubles, differ only in the high 32 bits.
    const values = Float64Array.from({ length: 100 }, (_, i) => 99 - i);
    expect(Array.from(radixSort(values).sorted)).toEqual(Array.from({ length: 100 }, (_, i) => i));
  });
});

describe('sortedValid', () => {
  it('drops NaN and sorts with -0 before +0 (worked example)', () => {
    // Without the NaN: 3, -0, 1, 0; ascending with -0 ahead of +0: -0, 0, 1, 3.
    expect(signed(sortedValid([3, NaN, -0, 1, 0]))).toEqual(['-0', '0', '1', '3']);
    expect(sortedValid([NaN]).length).toBe(0);
  });

  it('equals the typed-array sort of the non-NaN values, below and above the radix threshold', () => {
    for (const n of [50, RADIX_SORT_MIN - 1, RADIX_SORT_MIN, 3 * RADIX_SORT_MIN]) {
      // n valid values (so the threshold is straddled exactly) with a NaN after every sixth.
      const valid = awkwardDoubles(n, n);
      const values = valid.flatMap((v, i) => (i % 6 === 5 ? [v, Number.NaN] : [v]));
      const reference = Float64Array.from(valid).sort();
      const input = Float64Array.from(values);
      expect(signed(sortedValid(input))).toEqual(signed(reference));
      // The input is left as it was.
      expect(signed(input)).toEqual(signed(values));
    }
  });
});

describe('sortedValidWith', () => {
  it('sorts as sortedValid and carries each value\'s number along, stably, below and above the radix threshold', () => {
    for (const n of [0, 1, 50, RADIX_SORT_MIN - 1, RADIX_SORT_MIN, 3 * RADIX_SORT_MIN]) {
      const values = awkwardDoubles(n + 3, n).map((v, i) => (i % 7 === 3 ? Number.NaN : v));
      // The row number as the carried number, so the carried order can be checked directly.
      const rows = values.map((_, i) => i);
      const { sorted, carried, negativeZero } = sortedValidWith(values, rows);
      expect(signed(sorted)).toEqual(signed(sortedValid(values)));
      // Reference: a stable comparator sort of the valid rows (ECMAScript 2019 sorts are
      // stable), -0 before +0 as the typed-array sort orders them.
      const key = (i: number): [number, number] => [values[i]!, Object.is(values[i], -0) ? 0 : 1];
      const reference = rows.filter((i) => !Number.isNaN(values[i]!)).sort((a, b) => key(a)[0] - key(b)[0] || key(a)[1] - key(b)[1]);
      expect(Array.from(carried)).toEqual(reference);
      expect(negativeZero).toBe(values.some((v) => Object.is(v, -0)));
    }
  });
});
