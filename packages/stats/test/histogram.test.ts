import { describe, it, expect } from 'vitest';
import { histogramSorted } from '../src/histogram.ts';
import { sortedCopy } from '../src/sort.ts';
import { R } from './oracle.ts';

describe('histogramSorted', () => {
  for (const name of ['normal1000', 'skewed500'] as const) {
    it(`${name}: Freedman-Diaconis bin count from R's type 7 quartiles, counts by brute force`, () => {
      const s = R.samples[name];
      const sorted = sortedCopy(s.x);
      const h = histogramSorted(sorted);
      // Freedman-Diaconis: width 2 IQR n^(-1/3); IQR from R 4.2.2 quantile(x, c(.25, .75), type = 7).
      const q = s.quantile.type7!;
      const iqr = q[4]! - q[2]!;
      const k = Math.ceil((q[6]! - q[0]!) / (2 * iqr * Math.pow(s.n, -1 / 3)));
      expect(h.rule).toBe('Freedman-Diaconis');
      expect(h.counts.length).toBe(k);
      expect(h.edges.length).toBe(k + 1);
      expect(h.edges[0]).toBe(q[0]);
      expect(h.edges[k]).toBe(q[6]);
      // Each count recounted directly: left-closed bins, the last closed on the right too.
      const brute = h.counts.map(
        (_, i) => s.x.filter((v) => v >= h.edges[i]! && (i === k - 1 ? v <= h.edges[i + 1]! : v < h.edges[i + 1]!)).length,
      );
      expect(h.counts).toEqual(brute);
      expect(h.counts.reduce((a, b) => a + b, 0)).toBe(s.n);
    });
  }

  it("falls back to Sturges' rule when the IQR is 0", () => {
    // 9 values, IQR 0: Sturges k = ceil(log2 9) + 1 = 5 bins over [1, 10].
    const h = histogramSorted(Float64Array.of(1, 5, 5, 5, 5, 5, 5, 5, 10));
    expect(h.rule).toMatch(/^Sturges/);
    expect(h.counts.length).toBe(5);
    expect(h.counts).toEqual([1, 0, 7, 0, 1]);
  });

  it('one bin for a single repeated value, none for no values', () => {
    expect(histogramSorted(Float64Array.of(4, 4))).toEqual({ rule: 'single value', edges: [4, 4], counts: [2] });
    expect(histogramSorted(new Float64Array(0)).counts).toEqual([]);
  });
});
