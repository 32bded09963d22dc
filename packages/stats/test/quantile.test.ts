import { describe, it, expect } from 'vitest';
import { quantile, quantileSorted, type QuantileType } from '../src/quantile.ts';
import { sortedCopy } from '../src/sort.ts';
import { R } from './oracle.ts';

const TYPES: QuantileType[] = [1, 2, 3, 4, 5, 6, 7, 8, 9];

describe('quantile: all nine Hyndman-Fan types against R', () => {
  for (const name of ['ties10', 'odd7', 'normal1000', 'skewed500'] as const) {
    const s = R.samples[name];
    for (const type of TYPES) {
      it(`${name}, type ${type}`, () => {
        const sorted = sortedCopy(s.x);
        R.probs.forEach((p, k) => {
          // R 4.2.2 quantile(x, probs, type = type); R prints 15 significant digits.
          const expected = s.quantile[`type${type}`]![k]!;
          expect(quantileSorted(sorted, p, type)).toBeCloseTo(expected, 10);
          expect(quantile(s.x, p, type)).toBeCloseTo(expected, 10);
        });
      });
    }
    it(`${name}, default type is 7 and median matches R median()`, () => {
      // R 4.2.2 median(x) equals quantile type 7 at 0.5.
      expect(quantile(s.x, 0.5)).toBeCloseTo(s.median, 10);
    });
  }

  it('returns NaN for empty input and p outside [0, 1] (first principles: no order statistic exists)', () => {
    expect(quantile([], 0.5)).toBeNaN();
    expect(quantile([1, 2], 1.5)).toBeNaN();
    expect(quantile([1, 2], Number.NaN)).toBeNaN();
  });

  it('leaves its input unchanged', () => {
    const xs = [3, 1, 2];
    quantile(xs, 0.5);
    expect(xs).toEqual([3, 1, 2]);
  });
});

describe('quantile properties (first principles, fast-check)', () => {
  it('is monotone in p and stays within [min, max] for every type', async () => {
    const fc = (await import('fast-check')).default;
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: -1000, max: 1000 }), { minLength: 1, maxLength: 40 }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (xs, a, b) => {
          const sorted = sortedCopy(xs);
          const [lo, hi] = a <= b ? [a, b] : [b, a];
          for (const type of TYPES) {
            const qa = quantileSorted(sorted, lo, type);
            const qb = quantileSorted(sorted, hi, type);
            if (!(qa <= qb + 1e-9)) return false;
            if (qa < sorted[0]! || qb > sorted[sorted.length - 1]!) return false;
          }
          return true;
        },
      ),
      { numRuns: 300, seed: 20261201 },
    );
  });
});
