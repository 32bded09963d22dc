import { describe, it, expect } from 'vitest';
import { crossTabulate, expectedCounts, margins, tablePercents } from '../src/contingency.ts';
import { RB } from './bivariate-oracle.ts';
import { seeded } from './oracle.ts';

describe('crossTabulate', () => {
  it('counts pairwise-complete rows, matching a brute-force count on seeded codes', () => {
    const rnd = seeded(5);
    const len = 500;
    // Codes 0..3 on x (0 = not valid) and 0..4 on y, as the column store holds them.
    const x = Uint16Array.from({ length: len }, () => Math.floor(rnd() * 4));
    const y = Uint16Array.from({ length: len }, () => Math.floor(rnd() * 5));
    const table = crossTabulate(x, y, 3, 4);
    // First principles: cell [i][j] is the number of rows with x = i + 1 and y = j + 1.
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 4; j++) {
        let count = 0;
        for (let r = 0; r < len; r++) if (x[r] === i + 1 && y[r] === j + 1) count++;
        expect(table[i][j]).toBe(count);
      }
    }
    let complete = 0;
    for (let r = 0; r < len; r++) if (x[r] > 0 && y[r] > 0) complete++;
    expect(margins(table).n).toBe(complete);
  });

  it('counts only included rows when given a listwise mask', () => {
    // First principles: rows 1 and 3 excluded leave (1,1) and (2,2).
    const table = crossTabulate(Uint16Array.of(1, 2, 2, 1), Uint16Array.of(1, 1, 2, 2), 2, 2, Uint8Array.of(1, 0, 1, 0));
    expect(table).toEqual([
      [1, 0],
      [0, 1],
    ]);
  });

  it('rejects columns of different lengths and code indices beyond the table', () => {
    expect(() => crossTabulate(Uint16Array.of(1), Uint16Array.of(1, 1), 1, 1)).toThrow(
      expect.objectContaining({ code: 'CW_USAGE' }),
    );
    expect(() => crossTabulate(Uint16Array.of(3), Uint16Array.of(1), 2, 1)).toThrow(/beyond the 2 x 1 table/);
  });
});

describe('expectedCounts and percentages', () => {
  for (const name of ['t2x2', 't3x4', 'sparse'] as const) {
    it(`expected counts of ${name} match R`, () => {
      const t = RB.chisq[name];
      const e = expectedCounts(t.table);
      // R 4.2.2 chisq.test(t, correct = FALSE)$expected
      t.expected.forEach((row, i) => row.forEach((v, j) => expect(e[i][j]).toBeCloseTo(v, 10)));
    });
  }

  it('gives an empty row zero expected counts', () => {
    // First principles: E = rowSum colSum / n with rowSum 0.
    expect(expectedCounts([
      [2, 2],
      [0, 0],
    ])).toEqual([
      [2, 2],
      [0, 0],
    ]);
  });

  it('cell, row and column percentages of R t2x2 table, worked by hand', () => {
    const p = tablePercents(RB.chisq.t2x2.table);
    // First principles on [[30, 10], [15, 45]]: n = 100, row sums 40 and 60, column sums 45 and 55.
    expect(p.cell).toEqual([
      [30, 10],
      [15, 45],
    ]);
    expect(p.row).toEqual([
      [75, 25],
      [25, 75],
    ]);
    expect(p.column[0][0]).toBeCloseTo((100 * 30) / 45, 12);
    expect(p.column[1][1]).toBeCloseTo((100 * 45) / 55, 12);
    expect(tablePercents([[0, 0]]).row).toEqual([[0, 0]]);
  });
});
