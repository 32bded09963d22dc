import { describe, it, expect } from 'vitest';
import { coMoments, pearson, pearsonFromMoments } from '../src/pearson.ts';
import { RB, jStat } from './bivariate-oracle.ts';
import { seeded } from './oracle.ts';

describe('pearson', () => {
  it('matches R on 1000 pairs with two planted outliers', () => {
    // R 4.2.2 cor(x, y) (r-oracle.json correlation.pearson)
    expect(pearson(RB.correlation.x, RB.correlation.y)).toBeCloseTo(RB.correlation.pearson, 12);
  });

  it('matches R on the small tied sample', () => {
    // R 4.2.2 cor(xt, yt) (r-oracle.json correlation.tiesPearson)
    expect(pearson(RB.correlation.tiesX, RB.correlation.tiesY)).toBeCloseTo(RB.correlation.tiesPearson, 12);
  });

  it('matches jStat.corrcoeff on seeded random data', () => {
    const rnd = seeded(7);
    for (let trial = 0; trial < 5; trial++) {
      const x = Array.from({ length: 200 }, () => rnd() * 100);
      const y = x.map((v) => 0.3 * v + rnd() * 50 * (trial + 1));
      // jStat 1.9.6 corrcoeff(x, y)
      expect(pearson(x, y)).toBeCloseTo(jStat.corrcoeff(x, y), 12);
    }
  });

  it('keeps its digits far from zero', () => {
    // First principles: r is invariant under shifting either variable, so adding 1e7 to every value
    // must leave r as it is, up to the representation error of the shifted inputs.
    const rnd = seeded(3);
    const x = Array.from({ length: 500 }, () => rnd());
    const y = x.map((v) => v + rnd());
    const shifted = pearson(
      x.map((v) => v + 1e7),
      y.map((v) => v + 1e7),
    );
    expect(shifted).toBeCloseTo(pearson(x, y)!, 7);
  });

  it('is null for a constant variable or fewer than two pairs, and rejects unequal lengths', () => {
    // First principles: r divides by both standard deviations, undefined when one is 0.
    expect(pearson([1, 2, 3], [5, 5, 5])).toBeNull();
    expect(pearson([1], [2])).toBeNull();
    expect(pearsonFromMoments(coMoments([], []))).toBeNull();
    expect(() => pearson([1, 2], [1])).toThrow(expect.objectContaining({ code: 'CW_USAGE' }));
  });

  it('co-moments of a small sample, worked by hand', () => {
    // First principles: x = 1, 2, 3 (mean 2), y = 2, 4, 6 (mean 4): sxx = 1 + 0 + 1, syy = 4 + 0 + 4, sxy = 2 + 0 + 2.
    expect(coMoments([1, 2, 3], [2, 4, 6])).toEqual({ n: 3, meanX: 2, meanY: 4, sxx: 2, syy: 8, sxy: 4 });
  });
});
