import { describe, it, expect } from 'vitest';
import { bivariateOutliers, mahalanobisCutoff, mahalanobisSquared } from '../src/mahalanobis.ts';
import { RB, jStat } from './bivariate-oracle.ts';

describe('bivariate outliers by squared Mahalanobis distance', () => {
  it('matches R: cut-off, flagged rows and largest distance', () => {
    const { x, y } = RB.correlation;
    const result = bivariateOutliers(x, y)!;
    // R 4.2.2 qchisq(0.999, 2); which(mahalanobis(m, colMeans(m), cov(m)) > qchisq(0.999, 2)); max(d2)
    expect(result.cutoff).toBeCloseTo(RB.mahalanobis.cutoff_chisq2_0999, 10);
    expect(result.indices.map((i) => i + 1)).toEqual(RB.mahalanobis.flagged_rows_1based);
    expect(result.maxD2).toBeCloseTo(RB.mahalanobis.max_d2, 8);
  });

  it('cut-off agrees with jStat and with the closed form for 2 df', () => {
    // jStat 1.9.6 chisquare.inv(0.999, 2); first principles: for 2 df the quantile is -2 ln(1 - p).
    expect(mahalanobisCutoff()).toBeCloseTo(jStat.chisquare.inv(0.999, 2), 8);
    expect(mahalanobisCutoff(0.95)).toBeCloseTo(-2 * Math.log(0.05), 10);
  });

  it('distances sum to 2 (n - 1)', () => {
    // First principles: with the sample covariance, sum of d^2 over the sample is p (n - 1), p = 2.
    const d2 = mahalanobisSquared(RB.correlation.x, RB.correlation.y)!;
    const n = d2.length;
    expect(d2.reduce((a, b) => a + b, 0)).toBeCloseTo(2 * (n - 1), 8);
  });

  it('is null for a constant variable, collinear points or fewer than three pairs', () => {
    expect(mahalanobisSquared([1, 2, 3, 4], [2, 2, 2, 2])).toBeNull();
    expect(mahalanobisSquared([1, 2, 3, 4], [3, 5, 7, 9])).toBeNull();
    expect(bivariateOutliers([1, 2], [2, 1])).toBeNull();
  });
});
