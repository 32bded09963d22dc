import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { bivariateOutliers, coMoments, pearson, pearsonFromMoments, ranksAlongOrder, sortColumn } from '@codeweir/stats';
import { ranksAmong, type OrderedColumn } from '../src/pairs-kernels.ts';
import { describePairs, describePlannedPair, planPairs, PairScratch } from '../src/pairs.ts';
import type { PairContinuous } from '../src/types.ts';
import { checkResult, codebook, numeric } from './fixtures.ts';

// Outside oracle: R 4.2.2 values in test/reference/r-oracle.json (made by test/reference/r-oracle.R):
// cor(xt, yt) and cor(xt, yt, method = "spearman") on a sample with ties.
const R = JSON.parse(readFileSync(new URL('../../../test/reference/r-oracle.json', import.meta.url), 'utf8')) as {
  correlation: { tiesX: number[]; tiesY: number[]; tiesPearson: number; tiesSpearman: number; x: number[]; y: number[]; spearman: number };
};

/** A seeded linear congruential generator (first principles: the test needs only repeatable numbers). */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

/** The column's order and tie-run starts as planPairs keeps them. */
function ordered(values: Float64Array): OrderedColumn {
  const { order, sorted } = sortColumn(values);
  return { values, order, runStarts: Uint8Array.from(sorted, (v, k) => (k === 0 || v !== sorted[k - 1] ? 1 : 0)) };
}

/**
 * Average rank by the definition (first principles): among the included values, the number
 * smaller than v plus (the number equal to v, itself included, + 1) / 2. O(n^2).
 */
function rankByDefinition(values: Float64Array, include: Uint8Array, r: number): number {
  let below = 0;
  let equal = 0;
  for (let i = 0; i < values.length; i++) {
    if (include[i] !== 1 || Number.isNaN(values[i])) continue;
    if (values[i] < values[r]) below++;
    else if (values[i] === values[r]) equal++;
  }
  return below + (equal + 1) / 2;
}

describe('ranksAmong', () => {
  it('gives every included row its average rank by the definition and as ranksAlongOrder, with ties, -0 and NaN', () => {
    const rand = lcg(17);
    for (const spread of [3, 40, 1e6]) {
      const values = Float64Array.from({ length: 400 }, () => {
        const u = rand();
        if (u < 0.05) return NaN;
        if (u < 0.08) return -0;
        return Math.floor(rand() * spread) - spread / 2;
      });
      const include = Uint8Array.from(values, () => (rand() < 0.7 ? 1 : 0));
      const column = ordered(values);
      const ranks = new Float64Array(values.length).fill(-1);
      ranksAmong(column, include, ranks);
      const reference = ranksAlongOrder(sortColumn(values), include);
      for (let r = 0; r < values.length; r++) {
        if (include[r] === 1 && !Number.isNaN(values[r])) {
          expect(ranks[r]).toBe(rankByDefinition(values, include, r));
          expect(ranks[r]).toBe(reference[r]);
        } else expect(ranks[r]).toBe(-1); // left as it was
      }
    }
  });

  it("Pearson's r of its ranks is R's Spearman rho on the sample with ties and on the plain sample", () => {
    for (const [xs, ys, rho] of [
      [R.correlation.tiesX, R.correlation.tiesY, R.correlation.tiesSpearman],
      [R.correlation.x, R.correlation.y, R.correlation.spearman],
    ] as const) {
      const x = Float64Array.from(xs);
      const y = Float64Array.from(ys);
      const all = new Uint8Array(x.length).fill(1);
      const rx = new Float64Array(x.length);
      const ry = new Float64Array(y.length);
      ranksAmong(ordered(x), all, rx);
      ranksAmong(ordered(y), all, ry);
      expect(pearson(rx, ry)!).toBeCloseTo(rho, 12);
    }
  });
});

describe('describePairs over a plan and reused buffers', () => {
  const rand = lcg(5);
  const rows = 6000;
  // Ties (values on a grid of 0.5), missing cells on either side and a few far points.
  const xs = Array.from({ length: rows }, () => (rand() < 0.04 ? NaN : Math.round(rand() * 200) / 2));
  const ys = xs.map((x, r) => (rand() < 0.04 ? NaN : (Number.isNaN(x) ? 1 : x) * 0.5 + Math.round(rand() * 40) / 2 + (r % 997 === 0 ? 400 : 0)));
  const zs = Array.from({ length: rows }, () => (rand() < 0.1 ? NaN : rand() * 1e7));
  const cb = codebook([
    { name: 'x', level: 'interval' },
    { name: 'y', level: 'ratio' },
    { name: 'z', level: 'interval' },
  ]);
  const result = checkResult([numeric('x', xs), numeric('y', ys), numeric('z', zs)]);

  it('equals the plain computation on the copied-out complete pairs (stats coMoments, ranksAlongOrder, bivariateOutliers), to the bit', () => {
    const [xy] = describePairs(result, cb, { quantileType: 7, pairs: [['x', 'y']] }) as PairContinuous[];
    // The plain computation: keep the rows valid on both, rank each side among them, correlate.
    const rowsBoth = xs.map((_, r) => r).filter((r) => !Number.isNaN(xs[r]!) && !Number.isNaN(ys[r]!));
    const both = new Uint8Array(rows);
    for (const r of rowsBoth) both[r] = 1;
    const x = Float64Array.from(rowsBoth, (r) => xs[r]!);
    const y = Float64Array.from(rowsBoth, (r) => ys[r]!);
    const rx = ranksAlongOrder(sortColumn(xs), both);
    const ry = ranksAlongOrder(sortColumn(ys), both);
    const moments = coMoments(x, y);
    const outliers = bivariateOutliers(x, y, 0.999, moments)!;
    expect(xy!.n).toBe(rowsBoth.length);
    expect(xy!.pearson).toBe(pearsonFromMoments(moments));
    expect(xy!.spearman).toBe(pearson(Float64Array.from(rowsBoth, (r) => rx[r]!), Float64Array.from(rowsBoth, (r) => ry[r]!)));
    expect(outliers.indices.length).toBeGreaterThan(0);
    expect(xy!.bivariateOutliers).toEqual(outliers.indices.map((k) => rowsBoth[k]! + 1));
    expect(xy!.maxMahalanobis).toBe(outliers.maxD2);
    // The scatter sample: at most 2,000 points, every outlier among them, each point its row's values.
    expect(xy!.sample!.length).toBeLessThanOrEqual(2000);
    for (const row of xy!.bivariateOutliers) expect(xy!.sampleRows!).toContain(row);
    for (const [i, row] of xy!.sampleRows!.entries()) expect(xy!.sample![i]).toEqual([xs[row - 1], ys[row - 1]]);
  });

  it('gives the same pairs whatever pairs a thread described before with the same buffers', () => {
    const plan = planPairs(result, cb, { quantileType: 7, pairs: 'all' });
    const scratch = new PairScratch(plan.rows);
    const forward = plan.pairs.map((_, k) => JSON.stringify(describePlannedPair(plan, k, cb, scratch)));
    const backward = plan.pairs.map((_, k) => plan.pairs.length - 1 - k).map((k) => JSON.stringify(describePlannedPair(plan, k, cb, scratch)));
    expect(backward.reverse()).toEqual(forward);
    // Each pair alone, with fresh buffers.
    expect(plan.pairs.map((_, k) => JSON.stringify(describePlannedPair(plan, k, cb, new PairScratch(plan.rows))))).toEqual(forward);
  });

  it('keeps a shared plan in SharedArrayBuffers (what the workers read)', () => {
    const plan = planPairs(result, cb, { quantileType: 7, pairs: 'all', listwise: true }, { shared: true });
    for (const column of Object.values(plan.columns)) {
      expect(column.kind).toBe('numeric');
      if (column.kind === 'numeric') for (const a of [column.values, column.order, column.runStarts]) expect(a.buffer).toBeInstanceOf(SharedArrayBuffer);
    }
    expect(plan.include!.buffer).toBeInstanceOf(SharedArrayBuffer);
    const scratch = new PairScratch(plan.rows);
    expect(JSON.stringify(plan.pairs.map((_, k) => describePlannedPair(plan, k, cb, scratch)))).toBe(
      JSON.stringify(describePairs(result, cb, { quantileType: 7, pairs: 'all', listwise: true })),
    );
  });
});
