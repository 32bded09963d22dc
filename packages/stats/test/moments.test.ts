import { describe, it, expect } from 'vitest';
import { Moments } from '../src/moments.ts';
import { R, jStat, seeded, largeOffsetValues } from './oracle.ts';

/** G1 from jStat's g1 (population standardized third moment): G1 = g1 sqrt(n (n - 1)) / (n - 2). */
const adjustSkew = (g1: number, n: number) => (g1 * Math.sqrt(n * (n - 1))) / (n - 2);
/** G2 from jStat's g2 (population excess kurtosis): G2 = ((n + 1) g2 + 6) (n - 1) / ((n - 2)(n - 3)). */
const adjustKurt = (g2: number, n: number) => (((n + 1) * g2 + 6) * (n - 1)) / ((n - 2) * (n - 3));

describe('Moments against R', () => {
  for (const name of ['ties10', 'odd7', 'normal1000', 'skewed500'] as const) {
    it(`${name}: mean, sd, var`, () => {
      const s = R.samples[name];
      const m = Moments.of(s.x);
      expect(m.n).toBe(s.n);
      // R 4.2.2 mean(x), sd(x), var(x) (n - 1 denominator)
      expect(m.mean).toBeCloseTo(s.mean, 10);
      expect(m.sd()).toBeCloseTo(s.sd, 10);
      expect(m.variance()).toBeCloseTo(s.var, 9);
    });
  }

  it('large offset: mean 10000000.2 and sd 0.1, to the limit the binary inputs allow', () => {
    const xs = largeOffsetValues();
    const m = Moments.of(xs);
    // First principles: doubles in [2^23, 2^24) are whole multiples of 2^-29, so x * 2^29 is an
    // exact integer and BigInt arithmetic gives the exact variance of the values as stored:
    // var = (n sum(k^2) - (sum k)^2) / (n (n - 1)) / 2^58.
    const ks = xs.map((x) => BigInt(x * 2 ** 29));
    const n = BigInt(xs.length);
    const sum = ks.reduce((a, b) => a + b, 0n);
    const sumSq = ks.reduce((a, b) => a + b * b, 0n);
    const exactVar = Number(n * sumSq - sum * sum) / Number(n * (n - 1n)) / 2 ** 58;
    const exactSd = Math.sqrt(exactVar);
    // Online updates round once per value: 2e-11 relative measured, asserted below 1e-10.
    expect(Math.abs(m.sd() - exactSd) / exactSd).toBeLessThan(1e-10);
    // Certified by construction (r-oracle.json largeOffset): mean 10000000.2, sd 0.1. The decimal
    // inputs 10000000.1 and .3 are stored 2^-29-grid roundings (up to ~1.9e-9 away), which moves
    // the true sd of the stored values by 5.6e-9 relative; R 4.2.2 sd(x) reports the same
    // 0.100000000558794. Our figure agrees with R to 1e-10 and with the certificate to 1e-8.
    expect(Math.abs(m.mean - R.largeOffset.certifiedMean) / R.largeOffset.certifiedMean).toBeLessThan(1e-15);
    expect(Math.abs(m.sd() - R.largeOffset.rSd) / R.largeOffset.rSd).toBeLessThan(1e-10);
    expect(Math.abs(m.sd() - R.largeOffset.certifiedSd) / R.largeOffset.certifiedSd).toBeLessThan(1e-8);
  });
});

describe('Moments against jStat 1.9.6 on seeded data', () => {
  const rnd = seeded(20261201);
  const xs = Array.from({ length: 300 }, () => Math.exp(2 * rnd()) * 10 + rnd());
  const n = xs.length;
  const m = Moments.of(xs);

  it('mean and sd', () => {
    expect(m.mean).toBeCloseTo(jStat.mean(xs), 10); // jStat.mean
    expect(m.sd()).toBeCloseTo(jStat.stdev(xs, true), 10); // jStat.stdev(x, true): n - 1
    expect(m.sd(0)).toBeCloseTo(jStat.stdev(xs), 10); // jStat.stdev(x): n
  });

  it('adjusted skewness G1 and adjusted excess kurtosis G2', () => {
    expect(m.skewness()).toBeCloseTo(adjustSkew(jStat.skewness(xs), n), 10);
    expect(m.kurtosis()).toBeCloseTo(adjustKurt(jStat.kurtosis(xs), n), 10);
  });

  it('merge of split data equals one pass', () => {
    for (const cut of [1, 7, 150, 299]) {
      const a = Moments.of(xs.slice(0, cut));
      const b = Moments.of(xs.slice(cut));
      const merged = a.merge(b);
      expect(merged.n).toBe(m.n);
      expect(merged.mean).toBeCloseTo(m.mean, 11);
      expect(merged.m2 / m.m2).toBeCloseTo(1, 12);
      expect(merged.m3 / m.m3).toBeCloseTo(1, 10);
      expect(merged.m4 / m.m4).toBeCloseTo(1, 11);
    }
    // Merging with an empty accumulator is the identity, either way round.
    expect(new Moments().merge(Moments.of(xs)).m4).toBe(m.m4);
    expect(Moments.of(xs).merge(new Moments()).m2).toBe(m.m2);
  });

  it('small-sample guards: NaN when the estimator is undefined (first principles)', () => {
    expect(Moments.of([1, 2]).skewness()).toBeNaN(); // G1 needs n >= 3
    expect(Moments.of([1, 2, 3]).kurtosis()).toBeNaN(); // G2 needs n >= 4
    expect(Moments.of([5, 5, 5, 5]).skewness()).toBeNaN(); // zero variance
    expect(new Moments().sd()).toBeNaN();
  });
});
