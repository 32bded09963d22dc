import { describe, it, expect } from 'vitest';
import { weightedMean, weightedMoments, weightedSd, weightedQuantile, weightedQuantiles, weightedQuantilesSorted } from '../src/weighted.ts';
import { quantile } from '../src/quantile.ts';
import { RADIX_ORDER_MIN, RADIX_SORT_MIN, sortedValidWith } from '../src/sort.ts';
import { R, jStat, seeded } from './oracle.ts';
import { awkwardDoubles, signed } from './awkward.ts';

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

/**
 * Reference: the straightforward definition, kept here as stated: positions with a positive
 * weight sorted by the comparator `values[a] - values[b]` (a stable sort), then for each p a
 * scan from the start for the first cumulative share >= p - 4 eps.
 */
function referenceQuantiles(values: ArrayLike<number>, weights: ArrayLike<number>, ps: readonly number[]): number[] {
  const idx: number[] = [];
  let total = 0;
  for (let i = 0; i < values.length; i++) {
    if (weights[i]! > 0) {
      idx.push(i);
      total += weights[i]!;
    }
  }
  if (!(total > 0)) return ps.map(() => Number.NaN);
  idx.sort((a, b) => values[a]! - values[b]!);
  return ps.map((p) => {
    if (!(p >= 0 && p <= 1)) return Number.NaN;
    let cum = 0;
    for (const i of idx) {
      cum += weights[i]!;
      if (cum / total >= p - 4 * Number.EPSILON) return values[i]!;
    }
    return values[idx[idx.length - 1]!]!;
  });
}

describe('weightedQuantiles against the comparator-sort reference', () => {
  const ps = [0.9, 0, 0.5, 0.25, -0, 1, 0.75, 0.5, 1e-12, 1 - 1e-12, 1.5, -0.1, Number.NaN];
  it('agrees bit for bit on seeded awkward values, weights with zeros and negatives, any size', () => {
    for (const n of [1, 9, 300, RADIX_ORDER_MIN + 1, 4 * RADIX_ORDER_MIN]) {
      const values = awkwardDoubles(n + 1, n);
      const rnd = seeded(n);
      const weights = values.map(() => (rnd() < 0.2 ? (rnd() < 0.5 ? 0 : -1) : rnd() < 0.5 ? 1 : rnd() * 3));
      expect(signed(weightedQuantiles(values, weights, ps))).toEqual(signed(referenceQuantiles(values, weights, ps)));
      expect(signed(weightedQuantiles(Float64Array.from(values), Float64Array.from(weights), ps))).toEqual(
        signed(referenceQuantiles(values, weights, ps)),
      );
    }
  });
  it('picks the first of tied -0 and +0 in input order, as the stable comparator sort does', () => {
    // n unit weights on 5s, except a +0 at position 7 and a -0 at position 8 (the second case
    // swaps them). Ascending and stable: position 7, position 8, then the 5s, with cumulative
    // shares 1/n, 2/n, 3/n, ...; so p = 1/n picks position 7, p = 2/n position 8, p = 0.5 a 5.
    const n = RADIX_ORDER_MIN + 2;
    const values = new Float64Array(n).fill(5);
    const weights = new Float64Array(n).fill(1);
    const ps = [1 / n, 2 / n, 0.5];
    values[7] = 0;
    values[8] = -0;
    expect(signed(weightedQuantiles(values, weights, ps))).toEqual(['0', '-0', '5']);
    values[7] = -0;
    values[8] = 0;
    expect(signed(weightedQuantiles(values, weights, ps))).toEqual(['-0', '0', '5']);
  });
  it('answers unsorted ps in their own order, from one walk (worked example)', () => {
    // Values 10, 20, 30, 40 with weights 1 each: shares 0.25, 0.5, 0.75, 1.
    expect(weightedQuantiles([40, 10, 30, 20], [1, 1, 1, 1], [1, 0.3, 0.5, 0, 0.76])).toEqual([40, 20, 20, 10, 40]);
  });
  it('keeps the comparator order when a NaN value has a positive weight', () => {
    const values = awkwardDoubles(4, 2 * RADIX_ORDER_MIN).map((v, i) => (i % 97 === 0 ? Number.NaN : v));
    const weights = values.map(() => 1);
    expect(signed(weightedQuantiles(values, weights, ps))).toEqual(signed(referenceQuantiles(values, weights, ps)));
  });
});

describe('weightedQuantilesSorted: the weighted quantiles from one sort that carries the weights', () => {
  const ps = [0.9, 0, 0.5, 0.25, 1, 0.75, 1e-12, 1 - 1e-12, 1.5];
  it('agrees bit for bit with the comparator-sort reference when no value is -0, NaN cells and NaN weights included', () => {
    for (const n of [1, 9, 300, RADIX_SORT_MIN + 1, 3 * RADIX_SORT_MIN]) {
      // -0 made +0: this order puts -0 first where the reference ties it with +0 (see the doc).
      const rnd = seeded(n + 7);
      const values = awkwardDoubles(n + 2, n).map((v) => (rnd() < 0.1 ? Number.NaN : v + 0));
      const weights = values.map(() => (rnd() < 0.2 ? [0, -1, Number.NaN][Math.floor(rnd() * 3)]! : rnd() < 0.5 ? 1 : rnd() * 3));
      const { sorted, carried, negativeZero } = sortedValidWith(values, weights);
      expect(negativeZero).toBe(false);
      // The total as weightedMoments sums it: the positive weights of the valid values, in row order.
      let total = 0;
      values.forEach((v, i) => {
        if (!Number.isNaN(v) && weights[i]! > 0) total += weights[i]!;
      });
      const valid = values.map((v) => !Number.isNaN(v));
      const reference = referenceQuantiles(values.filter((_, i) => valid[i]), weights.filter((_, i) => valid[i]), ps);
      expect(signed(weightedQuantilesSorted(sorted, carried, total, ps))).toEqual(signed(reference));
    }
  });
  it('is NaN without a positive total (first principles: no weight share is defined)', () => {
    expect(weightedQuantilesSorted(Float64Array.of(1, 2), Float64Array.of(0, 0), 0, [0.5])).toEqual([Number.NaN]);
  });
});

describe('weightedMoments with skipNaN', () => {
  it('gives, bit for bit, the moments of the valid values copied out with their weights (the same additions in the same order)', () => {
    const rnd = seeded(11);
    const values = Array.from({ length: 5000 }, () => (rnd() < 0.15 ? Number.NaN : 1000 * rnd() - 300));
    const weights = values.map(() => (rnd() < 0.1 ? Number.NaN : rnd() < 0.1 ? 0 : 3 * rnd()));
    const keep = values.map((v, i) => !Number.isNaN(v) && !Number.isNaN(weights[i]!));
    const copied = weightedMoments(values.filter((_, i) => keep[i]), weights.filter((_, i) => keep[i]));
    expect(weightedMoments(values, weights, true)).toEqual(copied);
    // Without skipNaN a NaN value with a positive weight makes the mean NaN (first principles).
    expect(weightedMoments(values, weights).mean).toBeNaN();
  });
});
