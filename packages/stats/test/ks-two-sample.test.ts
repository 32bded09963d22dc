import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { ksTwoSample, ksTwoSampleSorted, kolmogorovUpperTail } from '../src/ks-two-sample.ts';

interface KsCase { x: number[]; y: number[]; exact: boolean | null; statistic: number; p: number; method: string }
// Values from R 4.2.2's ks.test (stats package), made by test/reference/drift.R.
const R = JSON.parse(readFileSync(resolve(import.meta.dirname, '../../../test/reference/drift.json'), 'utf8')) as { ks: Record<string, KsCase> };

describe('ksTwoSample against R ks.test', () => {
  for (const [name, c] of Object.entries(R.ks)) {
    it(`${name}: D, p and the exact/asymptotic choice`, () => {
      const r = ksTwoSample(c.x, c.y, c.exact === null ? {} : { exact: c.exact });
      // R: ks.test(x, y[, exact = ...])$statistic and $method
      expect(r.statistic).toBeCloseTo(c.statistic, 12);
      expect(r.method).toBe(c.method.startsWith('Exact') ? 'exact' : 'asymptotic');
      // R: ks.test(...)$p.value. The exact path is a probability sum (agrees to rounding); R's
      // asymptotic series stops at a tolerance of 1e-6, ours runs to full precision.
      if (r.method === 'exact') expect(r.p).toBeCloseTo(c.p, 10);
      else if (c.p > 1e-5) expect(Math.abs(r.p - c.p)).toBeLessThan(2e-6);
      else expect(r.p).toBeLessThan(1e-5);
    });
  }

  it('is symmetric in its two samples', () => {
    // First principles: |F_x - F_y| does not depend on which sample is named first.
    const c = R.ks.unequal_sizes!;
    const a = ksTwoSample(c.x, c.y);
    const b = ksTwoSample(c.y, c.x);
    expect(b.statistic).toBe(a.statistic);
    expect(b.p).toBeCloseTo(a.p, 12);
  });

  it('the exact p of fully separated samples is 2 / C(m + n, m)', () => {
    // First principles: D = 1 only for the two paths that take all x first or all y first.
    const r = ksTwoSampleSorted([1, 2, 3, 4], [5, 6, 7], { exact: true });
    expect(r.statistic).toBe(1);
    expect(r.p).toBeCloseTo(2 / 35, 14);
  });

  it('an empty sample gives NaN', () => {
    expect(Number.isNaN(ksTwoSample([], [1, 2]).p)).toBe(true);
  });
});

describe('kolmogorovUpperTail', () => {
  it('the 5% and 1% critical values of the limit', () => {
    // Kolmogorov distribution critical values 1.3581 (alpha 0.05) and 1.6276 (alpha 0.01),
    // from published tables (recalled from memory).
    expect(kolmogorovUpperTail(1.3581)).toBeCloseTo(0.05, 4);
    expect(kolmogorovUpperTail(1.6276)).toBeCloseTo(0.01, 4);
  });

  it('both series agree where they meet', () => {
    // First principles: at x = 1 the theta-function and alternating forms are the same function.
    expect(Math.abs(kolmogorovUpperTail(1 - 1e-12) - kolmogorovUpperTail(1))).toBeLessThan(1e-10);
  });
});
