import { describe, it, expect } from 'vitest';
import { spearman, spearmanFromTable } from '../src/spearman.ts';
import { RB, jStat, expandTable } from './bivariate-oracle.ts';
import { seeded } from './oracle.ts';

describe('spearman', () => {
  it('matches R on 1000 pairs with two planted outliers', () => {
    // R 4.2.2 cor(x, y, method = "spearman") (r-oracle.json correlation.spearman)
    expect(spearman(RB.correlation.x, RB.correlation.y)).toBeCloseTo(RB.correlation.spearman, 12);
  });

  it('matches R on the small tied sample (ties averaged)', () => {
    // R 4.2.2 cor(xt, yt, method = "spearman") (r-oracle.json correlation.tiesSpearman)
    expect(spearman(RB.correlation.tiesX, RB.correlation.tiesY)).toBeCloseTo(RB.correlation.tiesSpearman, 12);
  });

  it('matches jStat.spearmancoeff on seeded random data with ties', () => {
    const rnd = seeded(19);
    const x = Array.from({ length: 300 }, () => Math.floor(rnd() * 20));
    const y = x.map((v) => Math.floor(v / 2 + rnd() * 8));
    // jStat 1.9.6 spearmancoeff(x, y)
    expect(spearman(x, y)).toBeCloseTo(jStat.spearmancoeff(x, y), 12);
  });

  it('reproduces a textbook worked example (IQ against weekly hours of television, recalled from memory)', () => {
    const iq = [106, 100, 86, 101, 99, 103, 97, 113, 112, 110];
    const tv = [7, 27, 2, 50, 28, 29, 20, 12, 6, 17];
    // Verified by first principles: ranks of iq 7 4 1 5 3 6 2 10 9 8, of tv 3 7 1 10 8 9 6 4 2 5;
    // d = 4 -3 0 -5 -5 -3 -4 6 7 3, sum d^2 = 194; without ties rho = 1 - 6 * 194 / (10 (10^2 - 1)) = -29/165.
    expect(spearman(iq, tv)).toBeCloseTo(1 - (6 * 194) / (10 * 99), 14);
    expect(spearman(iq, tv)).toBeCloseTo(-0.1758, 4);
  });
});

describe('spearmanFromTable', () => {
  it('equals Spearman on the expanded observations (jStat as the oracle)', () => {
    for (const table of [
      [
        [5, 3, 1],
        [2, 6, 4],
        [0, 2, 7],
      ],
      [
        [4, 0, 2, 1],
        [0, 0, 0, 0],
        [1, 3, 5, 2],
      ],
      [
        [30, 10],
        [15, 45],
      ],
    ]) {
      const { rows, columns } = expandTable(table);
      // jStat 1.9.6 spearmancoeff on one observation per counted unit (ties averaged)
      expect(spearmanFromTable(table)).toBeCloseTo(jStat.spearmancoeff(rows, columns), 12);
    }
  });

  it('is null when only one category of a variable is occupied', () => {
    // First principles: all observations tied on one variable leave its ranks constant.
    expect(
      spearmanFromTable([
        [3, 4],
        [0, 0],
      ]),
    ).toBeNull();
    expect(spearmanFromTable([[1]])).toBeNull();
  });
});
