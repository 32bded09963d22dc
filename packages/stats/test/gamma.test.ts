import { describe, it, expect } from 'vitest';
import { goodmanKruskalGamma } from '../src/gamma.ts';
import { expandTable } from './bivariate-oracle.ts';
import { seeded } from './oracle.ts';

/** First principles: count every pair of observations as concordant, discordant or tied. */
function bruteForceGamma(table: number[][]): number | null {
  const { rows, columns } = expandTable(table);
  let p = 0;
  let q = 0;
  for (let a = 0; a < rows.length; a++) {
    for (let b = a + 1; b < rows.length; b++) {
      const s = Math.sign(rows[a] - rows[b]) * Math.sign(columns[a] - columns[b]);
      if (s > 0) p++;
      else if (s < 0) q++;
    }
  }
  return p + q > 0 ? (p - q) / (p + q) : null;
}

describe('goodmanKruskalGamma', () => {
  it('matches a brute-force pair count on a small table', () => {
    const table = [
      [5, 3, 1],
      [2, 6, 4],
      [1, 2, 7],
    ];
    expect(goodmanKruskalGamma(table)).toBeCloseTo(bruteForceGamma(table)!, 14);
  });

  it('matches the brute-force count on seeded tables of several shapes, including empty rows', () => {
    const rnd = seeded(23);
    for (const [r, c] of [
      [2, 2],
      [3, 5],
      [4, 3],
      [5, 5],
    ]) {
      const table = Array.from({ length: r }, (_, i) => Array.from({ length: c }, () => (r > 2 && i === 1 ? 0 : 1 + Math.floor(rnd() * 6))));
      const expected = bruteForceGamma(table);
      expect(expected).not.toBeNull();
      expect(goodmanKruskalGamma(table)).toBeCloseTo(expected!, 14);
    }
  });

  it('is 1 and -1 for perfectly ordered tables and null without untied pairs', () => {
    // First principles: a diagonal table has only concordant pairs, an anti-diagonal only discordant.
    expect(goodmanKruskalGamma([
      [4, 0],
      [0, 3],
    ])).toBe(1);
    expect(goodmanKruskalGamma([
      [0, 4],
      [3, 0],
    ])).toBe(-1);
    expect(goodmanKruskalGamma([[2, 5]])).toBeNull();
  });
});
