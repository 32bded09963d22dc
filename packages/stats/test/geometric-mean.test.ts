import { describe, it, expect } from 'vitest';
import { geometricMean } from '../src/geometric-mean.ts';
import { coefficientOfVariation } from '../src/cv.ts';
import { R, jStat, seeded } from './oracle.ts';

describe('geometricMean', () => {
  it('matches jStat 1.9.6 geomean on seeded positive data', () => {
    const rnd = seeded(7);
    const xs = Array.from({ length: 200 }, () => 0.5 + 100 * rnd());
    expect(geometricMean(xs)).toBeCloseTo(jStat.geomean(xs), 10);
  });
  it('is 10 for 1, 10, 100 (first principles: cube root of 1000)', () => {
    expect(geometricMean([1, 10, 100])).toBeCloseTo(10, 13);
  });
  it('is NaN when a value is zero or negative (no logarithm) or there are none', () => {
    expect(geometricMean([1, 0, 3])).toBeNaN();
    expect(geometricMean([1, -2])).toBeNaN();
    expect(geometricMean([])).toBeNaN();
  });
});

describe('coefficientOfVariation', () => {
  it('is R sd(x) / mean(x) on skewed500 (R 4.2.2)', () => {
    const s = R.samples.skewed500;
    expect(coefficientOfVariation(s.x)).toBeCloseTo(s.sd / s.mean, 10);
  });
  it('is NaN for a zero mean', () => {
    expect(coefficientOfVariation([-1, 1])).toBeNaN();
  });
});
