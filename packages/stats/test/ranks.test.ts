import { describe, it, expect } from 'vitest';
import { averageRanks } from '../src/ranks.ts';
import { RB } from './bivariate-oracle.ts';
import { seeded } from './oracle.ts';

/** First principles: the average rank of v is (number of values below v) + (ties of v + 1) / 2. */
function bruteForceRanks(values: number[]): number[] {
  return values.map((v) => {
    const below = values.filter((w) => w < v).length;
    const equal = values.filter((w) => w === v).length;
    return below + (equal + 1) / 2;
  });
}

describe('averageRanks', () => {
  it('averages tied positions (R oracle tied sample, ranks worked by hand)', () => {
    // Sorted positions of R's tiesX: 1 at 1; 2 at 2-3 -> 2.5; 3 at 4; 4 at 5-7 -> 6; 5, 6, 7 at 8, 9, 10.
    expect(Array.from(averageRanks(RB.correlation.tiesX))).toEqual([1, 2.5, 2.5, 4, 6, 6, 6, 8, 9, 10]);
  });

  it('matches the counting definition on seeded data with many ties', () => {
    const rnd = seeded(11);
    const values = Array.from({ length: 300 }, () => Math.floor(rnd() * 40) / 4);
    const ranks = averageRanks(values);
    expect(Array.from(ranks)).toEqual(bruteForceRanks(values));
    // First principles: average ranks always sum to n (n + 1) / 2.
    expect(ranks.reduce((a, b) => a + b, 0)).toBe((300 * 301) / 2);
  });

  it('gives NaN a NaN rank and ranks the rest among themselves', () => {
    const ranks = averageRanks([3, NaN, 1, 3]);
    expect(Number.isNaN(ranks[1])).toBe(true);
    expect([ranks[0], ranks[2], ranks[3]]).toEqual([2.5, 1, 2.5]);
  });
});
