import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { psiFromCounts, psiSorted, psiCutPoints } from '../src/psi.ts';
import { sortedCopy } from '../src/sort.ts';

interface Binned { reference: number[]; current: number[]; cuts: number[] | number; psi: number }
// PSI computed in R 4.2.2 from its definition (quantile(type = 7), findInterval(left.open = TRUE)),
// made by test/reference/drift.R.
const R = JSON.parse(readFileSync(resolve(import.meta.dirname, '../../../test/reference/drift.json'), 'utf8')) as {
  psi: { counts: Record<string, { previous: number[]; current: number[]; psi: number }>; binned_shift: Binned; binned_ties: Binned };
};

describe('psiFromCounts against R', () => {
  for (const [name, c] of Object.entries(R.psi.counts)) {
    it(name, () => {
      expect(psiFromCounts(c.previous, c.current).psi).toBeCloseTo(c.psi, 12);
    });
  }

  it('is 0 for identical shares and NaN without counts', () => {
    // First principles: every term (c - r) ln(c / r) is 0 when c = r.
    expect(psiFromCounts([10, 20, 30], [20, 40, 60]).psi).toBe(0);
    expect(Number.isNaN(psiFromCounts([0, 0], [1, 2]).psi)).toBe(true);
  });
});

describe('psiSorted against R', () => {
  for (const name of ['binned_shift', 'binned_ties'] as const) {
    it(`${name}: cut points at the reference deciles, then the PSI`, () => {
      const c = R.psi[name];
      const ref = sortedCopy(c.reference);
      const cuts = Array.isArray(c.cuts) ? c.cuts : [c.cuts];
      // R: unique(quantile(reference, (1:9) / 10, type = 7))
      psiCutPoints(ref).forEach((v, i) => expect(v).toBeCloseTo(cuts[i]!, 12));
      expect(psiCutPoints(ref)).toHaveLength(cuts.length);
      expect(psiSorted(ref, sortedCopy(c.current)).psi).toBeCloseTo(c.psi, 12);
    });
  }
});
