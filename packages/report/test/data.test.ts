import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { tukeyFences } from '@codeweir/stats';
import { seededRandom } from '@codeweir/core';
import { boxFromValues, thin, MAX_BOX_POINTS } from '../src/data.ts';

interface RSample {
  x: number[];
  fivenum: number[];
  boxplotStats: { stats: number[]; out: number[] };
}
const R: { samples: Record<string, RSample> } = JSON.parse(readFileSync(new URL('../../../test/reference/r-oracle.json', import.meta.url), 'utf8'));

describe('boxFromValues', () => {
  // R 4.2.2 boxplot.stats(x, coef = 1.5): whiskers at the most extreme values within
  // hinge -/+ 1.5 x (upper hinge - lower hinge), and `out` the values beyond. Passing fences
  // built from R's own hinges (fivenum) must give R's whiskers and R's out values.
  for (const name of ['skewed500', 'normal1000', 'odd7', 'ties10']) {
    it(`matches R's boxplot.stats whiskers and out values on ${name}`, () => {
      const s = R.samples[name]!;
      const [, h1, md, h3] = s.fivenum as [number, number, number, number, number];
      const sorted = Float64Array.from(s.x).sort();
      const r = boxFromValues(name, { q1: h1, median: md, q3: h3, fences: tukeyFences(h1, h3) }, sorted);
      expect(r.exact).toBe(true);
      expect(r.box.low).toBe(s.boxplotStats.stats[0]);
      expect(r.box.high).toBe(s.boxplotStats.stats[4]);
      const out = [...new Set(s.boxplotStats.out)].sort((a, b) => a - b);
      expect(out.length).toBeLessThanOrEqual(MAX_BOX_POINTS);
      expect(r.points.map((p) => p.value)).toEqual(out);
      // Extremes: beyond hinge -/+ 3 x hinge spread (Tukey's outer fences), first principles.
      const spread = h3 - h1;
      for (const p of r.points) expect(p.kind).toBe(p.value < h1 - 3 * spread || p.value > h3 + 3 * spread ? 'extreme' : 'outlier');
    });
  }

  it('keeps the values farthest from the box when there are too many to draw', () => {
    // 100 distinct values far above the upper fence of a box over 0..3 (IQR 1.5 from the stated quartiles).
    const values = Float64Array.from([0, 1, 2, 3, ...Array.from({ length: 100 }, (_, i) => 100 + i)]);
    const r = boxFromValues('x', { q1: 0.75, median: 1.5, q3: 2.25, fences: tukeyFences(0.75, 2.25) }, values);
    expect(r.points).toHaveLength(MAX_BOX_POINTS);
    expect(r.points.at(-1)!.value).toBe(199);
    expect(r.points[0]!.value).toBe(200 - MAX_BOX_POINTS);
  });

  it('draws whiskers to the fences and says so when the values are not retained', () => {
    const r = boxFromValues('x', { q1: 10, median: 15, q3: 20, min: -40, max: 90, fences: tukeyFences(10, 20), outliers: 3 }, undefined);
    expect(r.exact).toBe(false);
    // Fences of quartiles 10 and 20: 10 - 15 = -5 and 20 + 15 = 35 (first principles).
    expect([r.box.low, r.box.high]).toEqual([-5, 35]);
  });
});

describe('thin', () => {
  it('keeps every k-th point so that at most cap remain, deterministically', () => {
    const xs = Array.from({ length: 10 }, (_, i) => i);
    // 10 values to 4: step 2.5, indices floor(0, 2.5, 5, 7.5) = 0, 2, 5, 7.
    expect(thin(xs, 4)).toEqual([0, 2, 5, 7]);
    expect(thin(xs, 20)).toEqual(xs);
  });
});

/**
 * Reference: the whiskers and marks read off the sorted valid values, as stated: low is the
 * first sorted value not below the lower fence, high the last not above the upper one (the
 * quartiles when no value lies between), marks the distinct values of the sorted prefix below
 * and suffix above, capped to the MAX_BOX_POINTS farthest from the box.
 */
function fromSorted(values: Float64Array, q1: number, q3: number) {
  const f = tukeyFences(q1, q3);
  const sorted = Float64Array.from(values.filter((v) => !Number.isNaN(v))).sort();
  let lo = 0;
  while (lo < sorted.length && sorted[lo]! < f.lower) lo++;
  let hi = sorted.length - 1;
  while (hi >= 0 && sorted[hi]! > f.upper) hi--;
  const marks = (part: Float64Array) => [...part].filter((v, i) => i === 0 || v !== part[i - 1]);
  const below = marks(sorted.subarray(0, lo)).slice(0, MAX_BOX_POINTS);
  const above = marks(sorted.subarray(hi + 1)).slice(-MAX_BOX_POINTS);
  return { low: lo <= hi ? sorted[lo]! : q1, high: lo <= hi ? sorted[hi]! : q3, values: [...below, ...above] };
}

/** The values as text that tells -0 from +0. */
const signed = (xs: number[]) => xs.map((v) => (Object.is(v, -0) ? '-0' : String(v)));

describe('boxFromValues on values in row order', () => {
  it('gives what the sorted valid values give, on seeded shuffled data with NaN, ties and signed zeros', () => {
    const rnd = seededRandom(17);
    for (const n of [1, 5, 40, 2000]) {
      const values = Float64Array.from({ length: n }, () => {
        const r = rnd();
        if (r < 0.1) return Number.NaN;
        if (r < 0.2) return rnd() < 0.5 ? -0 : 0;
        if (r < 0.25) return (rnd() - 0.5) * 1e4;
        return Math.floor(rnd() * 20) - 10;
      });
      // Quartiles chosen so that zeros sit on a fence or inside, and some values fall beyond.
      for (const [q1, q3] of [[-3, 3], [0, 0], [1.5, 4], [-12, -11]] as const) {
        const r = boxFromValues('x', { q1, median: (q1 + q3) / 2, q3, fences: tukeyFences(q1, q3) }, values);
        const want = fromSorted(values, q1, q3);
        if (values.some((v) => !Number.isNaN(v))) {
          expect(signed([r.box.low, r.box.high])).toEqual(signed([want.low, want.high]));
          expect(signed(r.points.map((p) => p.value))).toEqual(signed(want.values));
        }
        expect(r.exact).toBe(true);
      }
    }
  });

  it('takes -0 for the low whisker and +0 for the high one when both zeros are the ends (worked example)', () => {
    // Quartiles 0 and 0: IQR 0, both fences at 0. Sorted valid values: -5, -0, 0, 7 (NaN dropped);
    // -5 is below and 7 above the fences; between them -0 then +0, so low -0 and high +0.
    const r = boxFromValues('x', { q1: 0, median: 0, q3: 0, fences: tukeyFences(0, 0) }, Float64Array.of(0, 7, NaN, -0, -5));
    expect(signed([r.box.low, r.box.high])).toEqual(['-0', '0']);
    expect(r.points.map((p) => p.value)).toEqual([-5, 7]);
  });
});
