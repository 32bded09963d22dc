import { describe, it, expect } from 'vitest';
import { tukeyFences } from '../src/fences.ts';
import { quantile } from '../src/quantile.ts';
import { R } from './oracle.ts';

describe('tukeyFences', () => {
  it('sits 1.5 and 3 IQR beyond the quartiles (Tukey fences, first principles)', () => {
    // q1 = 10, q3 = 20: IQR 10, inner fences -5 and 35, outer fences -20 and 50.
    expect(tukeyFences(10, 20)).toEqual({ lower: -5, upper: 35, lowerExtreme: -20, upperExtreme: 50 });
  });

  it('with Tukey hinges as quartiles reproduces R boxplot.stats outliers on skewed500', () => {
    // R 4.2.2 boxplot.stats(x, coef = 1.5) flags values beyond 1.5 x (upper hinge - lower hinge)
    // from the hinges (fivenum); with those hinges our fences must flag the same values.
    const s = R.samples.skewed500 as typeof R.samples.skewed500 & { fivenum: number[]; boxplotStats: { out: number[] } };
    const f = tukeyFences(s.fivenum[1]!, s.fivenum[3]!);
    const out = s.x.filter((v) => v < f.lower || v > f.upper).sort((a, b) => a - b);
    expect(out).toEqual([...s.boxplotStats.out].sort((a, b) => a - b));
    // And the fences from type 7 quartiles are those quartiles +- 1.5 IQR.
    const q1 = quantile(s.x, 0.25);
    const q3 = quantile(s.x, 0.75);
    expect(tukeyFences(q1, q3).upper).toBeCloseTo(q3 + 1.5 * (q3 - q1), 12);
  });
});
