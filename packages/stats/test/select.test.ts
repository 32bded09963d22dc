import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { quantilesInPlace, selectKth } from '../src/select.ts';
import { quantileSorted, type QuantileType } from '../src/quantile.ts';
import { sortedCopy } from '../src/sort.ts';
import { R } from './oracle.ts';

const TYPES: QuantileType[] = [1, 2, 3, 4, 5, 6, 7, 8, 9];

/** Values drawn from a few integers (many ties, as survey answers), signed zeros included, or any finite double. */
const tiedValue = fc.oneof(
  fc.integer({ min: -3, max: 3 }),
  fc.constantFrom(-0, 0, 0.1, 2.5),
  fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e6, max: 1e6 }),
);
/** Short arrays exercise the window edges; long ones (over 600) the sampling step of the selection. */
const values = fc.oneof(fc.array(tiedValue, { maxLength: 40 }), fc.array(tiedValue, { minLength: 601, maxLength: 3000 }));

describe('quantilesInPlace: identical to quantileSorted of a sorted copy', () => {
  it('for all nine types at p = 0.25, 0.75 and a random p, on random data with ties (first principles: selection must reproduce the sorted order statistics)', () => {
    fc.assert(
      fc.property(values, fc.constantFrom(...TYPES), fc.double({ min: 0, max: 1, noNaN: true }), (xs, type, p) => {
        const ps = [0.25, 0.75, p];
        const sorted = sortedCopy(xs);
        const expected = ps.map((q) => quantileSorted(sorted, q, type));
        const got = quantilesInPlace(Float64Array.from(xs), ps, type);
        // Object.is: the same bits, including the sign of a zero.
        got.forEach((v, k) => expect(Object.is(v, expected[k]), `p ${ps[k]} type ${type}: ${v} vs ${expected[k]}`).toBe(true));
      }),
      { numRuns: 400 },
    );
  });

  it('at p that make n p + m land on an integer, for every n up to 40 (first principles: the integer test is where order statistics switch)', () => {
    for (let n = 1; n <= 40; n++) {
      const xs = Array.from({ length: n }, (_, i) => ((i * 7) % 5) - 2 + (i % 3) * 0.5);
      const sorted = sortedCopy(xs);
      for (const type of TYPES) {
        for (let k = 0; k <= 2 * n; k++) {
          const p = k / (2 * n);
          const [got] = quantilesInPlace(Float64Array.from(xs), [p], type);
          expect(Object.is(got, quantileSorted(sorted, p, type))).toBe(true);
        }
      }
    }
  });

  for (const name of ['ties10', 'odd7', 'normal1000', 'skewed500'] as const) {
    it(`matches R on the ${name} sample for all nine types`, () => {
      const s = R.samples[name];
      for (const type of TYPES) {
        // R 4.2.2 quantile(x, probs, type = type); R prints 15 significant digits.
        const got = quantilesInPlace(Float64Array.from(s.x), R.probs, type);
        R.probs.forEach((_, k) => expect(got[k]).toBeCloseTo(s.quantile[`type${type}`]![k]!, 10));
      }
    });
  }

  it('returns NaN for empty input and for p outside [0, 1] (first principles: no order statistic exists)', () => {
    expect(quantilesInPlace(new Float64Array(0), [0.5])[0]).toBeNaN();
    const got = quantilesInPlace(Float64Array.of(1, 2, 3), [1.5, Number.NaN, 0.5], 7);
    expect(got[0]).toBeNaN();
    expect(got[1]).toBeNaN();
    // Type 7 median of 1, 2, 3 is the middle value (first principles).
    expect(got[2]).toBe(2);
  });
});

describe('selectKth', () => {
  it('puts the k-th smallest at k with no greater value before and no smaller after (first principles: definition of an order statistic)', () => {
    fc.assert(
      fc.property(values.filter((xs) => xs.length > 0), fc.nat(), (xs, seed) => {
        const k = seed % xs.length;
        const a = Float64Array.from(xs);
        selectKth(a, k);
        const sorted = sortedCopy(xs);
        expect(a[k]! === sorted[k]!).toBe(true);
        let before = true;
        let after = true;
        for (let i = 0; i < k; i++) before &&= a[i]! <= a[k]!;
        for (let i = k + 1; i < a.length; i++) after &&= a[i]! >= a[k]!;
        expect(before && after).toBe(true);
        // A permutation of the input: same sorted contents.
        expect(Array.from(sortedCopy(a)).map((v) => v + 0)).toEqual(Array.from(sorted).map((v) => v + 0));
      }),
      { numRuns: 200 },
    );
  });
});
