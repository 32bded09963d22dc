import { describe, it, expect } from 'vitest';
import { skewness } from '../src/skewness.ts';
import { kurtosis } from '../src/kurtosis.ts';
import { R, jStat } from './oracle.ts';

describe('skewness and kurtosis against jStat 1.9.6 on the R samples', () => {
  for (const name of ['normal1000', 'skewed500', 'ties10'] as const) {
    it(name, () => {
      const x = R.samples[name].x;
      const n = x.length;
      // jStat.skewness/kurtosis are the population ratios g1 and g2; the adjusted G1 and G2
      // follow by the published adjustment factors.
      const G1 = (jStat.skewness(x) * Math.sqrt(n * (n - 1))) / (n - 2);
      const G2 = (((n + 1) * jStat.kurtosis(x) + 6) * (n - 1)) / ((n - 2) * (n - 3));
      expect(skewness(x)).toBeCloseTo(G1, 10);
      expect(kurtosis(x)).toBeCloseTo(G2, 10);
    });
  }
  it('is 0 for a symmetric sample (first principles: odd central moments cancel)', () => {
    expect(skewness([1, 2, 3, 4, 5])).toBeCloseTo(0, 14);
  });
});
