import { describe, it, expect } from 'vitest';
import { weightedMean, weightedSd, weightedQuantile, weightedQuantiles } from '../src/weighted.ts';
import { quantile } from '../src/quantile.ts';
import { R, jStat, seeded } from './oracle.ts';

describe('weightedMean against R weighted.mean(x, 1:n)', () => {
  for (const name of ['ties10', 'odd7', 'normal1000', 'skewed500'] as const) {
    it(name, () => {
      const s = R.samples[name];
      const w = s.x.map((_, i) => i + 1);
      // R 4.2.2 weighted.mean(x, w = 1:n)
      expect(weightedMean(s.x, w)).toBeCloseTo(s.weightedMean_w1to_n, 10);
    });
  }
});

describe('weightedSd (frequency weights, sum(w) - 1)', () => {
  it('equals the n - 1 sd of the data with each value repeated w times (jStat 1.9.6 stdev(x, true))', () => {
    const rnd = seeded(42);
    const xs = Array.from({ length: 60 }, () => 100 * rnd());
    const ws = xs.map(() => 1 + Math.floor(5 * rnd()));
    const expanded = xs.flatMap((x, i) => new Array<number>(ws[i]!).fill(x));
    expect(weightedSd(xs, ws)).toBeCloseTo(jStat.stdev(expanded, true), 10);
    expect(weightedMean(xs, ws)).toBeCloseTo(jStat.mean(expanded), 10);
  });
  it('ignores zero weights and is NaN when sum(w) <= 1', () => {
    expect(weightedMean([1, 100, 3], [1, 0, 1])).toBe(2);
    expect(weightedSd([1, 2], [0.5, 0.5])).toBeNaN();
  });
});

describe('weightedQuantile (weighted ECDF inverse)', () => {
  it('with unit weights equals Hyndman-Fan type 1 as given by R 4.2.2 quantile(x, p, type = 1)', () => {
    for (const name of ['ties10', 'odd7', 'skewed500'] as const) {
      const s = R.samples[name];
      const got = weightedQuantiles(s.x, s.x.map(() => 1), R.probs);
      expect(got).toEqual(s.quantile.type1);
    }
  });
  it('with whole weights equals type 1 on the data with each value repeated w times', () => {
    const rnd = seeded(3);
    const xs = Array.from({ length: 40 }, () => Math.round(50 * rnd()));
    const ws = xs.map(() => Math.floor(4 * rnd()));
    const expanded = xs.flatMap((x, i) => new Array<number>(ws[i]!).fill(x));
    for (const p of [0, 0.1, 0.25, 0.5, 0.75, 0.9, 1]) {
      expect(weightedQuantile(xs, ws, p)).toBe(quantile(expanded, p, 1));
    }
  });
  it('first principles: values 1, 2, 3 with weights 1, 1, 2 have weight shares 0.25, 0.5, 1', () => {
    expect(weightedQuantiles([3, 1, 2], [2, 1, 1], [0.25, 0.5, 0.51])).toEqual([1, 2, 3]);
    expect(weightedQuantile([1], [0], 0.5)).toBeNaN();
  });
});
