import { describe, it, expect } from 'vitest';
import { phi } from '../src/phi.ts';
import { RB, jStat, expandTable } from './bivariate-oracle.ts';

describe('phi', () => {
  it('matches R on the 2 x 2 table', () => {
    // R 4.2.2: (t[1,1] t[2,2] - t[1,2] t[2,1]) / sqrt(prod(rowSums(t)) prod(colSums(t)))
    expect(phi(RB.chisq.t2x2.table)).toBeCloseTo(RB.chisq.t2x2.phi!, 12);
  });

  it('is signed: swapping the columns flips it, and it equals Pearson r of the indicators', () => {
    const table = [
      [10, 30],
      [45, 15],
    ];
    const { rows, columns } = expandTable(table);
    // jStat 1.9.6 corrcoeff of the 0/1 row and column indicators
    expect(phi(table)).toBeCloseTo(jStat.corrcoeff(rows, columns), 12);
    expect(phi(table)).toBeLessThan(0);
  });

  it('is null for a table that is not 2 x 2 or has an empty margin', () => {
    expect(phi(RB.chisq.t3x4.table)).toBeNull();
    expect(
      phi([
        [1, 2],
        [0, 0],
      ]),
    ).toBeNull();
  });
});
