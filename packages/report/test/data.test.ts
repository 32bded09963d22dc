import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { tukeyFences } from '@codeweir/stats';
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
