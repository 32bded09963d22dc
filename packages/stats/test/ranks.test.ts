import { describe, it, expect } from 'vitest';
import { averageRanks, ranksAlongOrder, sortColumn } from '../src/ranks.ts';
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

  it('orders negatives, signed zeros, infinities and tiny and huge magnitudes as numbers', () => {
    const rnd = seeded(29);
    const specials = [-0, 0, Infinity, -Infinity, 5e-324, -5e-324, 1e308, -1e308, 1, -1];
    const values = Array.from({ length: 400 }, (_, i) => (i % 4 === 0 ? specials[i % specials.length] : (rnd() - 0.5) * 10 ** Math.floor(rnd() * 40 - 20)));
    // First principles: the counting definition with < and === (under which -0 equals 0).
    expect(Array.from(averageRanks(values))).toEqual(bruteForceRanks(values));
  });

  it('gives NaN a NaN rank and ranks the rest among themselves', () => {
    const ranks = averageRanks([3, NaN, 1, 3]);
    expect(Number.isNaN(ranks[1])).toBe(true);
    expect([ranks[0], ranks[2], ranks[3]]).toEqual([2.5, 1, 2.5]);
  });
});

describe('sortColumn and ranksAlongOrder', () => {
  it('orders positions by value, stably, without NaN', () => {
    // First principles: 10 at 2, then the two 20s at 3 and 4 in position order, then 30 at 0.
    const column = sortColumn([30, NaN, 10, 20, 20]);
    expect(Array.from(column.order)).toEqual([2, 3, 4, 0]);
    expect(Array.from(column.sorted)).toEqual([10, 20, 20, 30]);
    expect(column.length).toBe(5);
  });

  it('gives back the values themselves, negatives and extremes included', () => {
    const values = [-1e308, 5e-324, -5e-324, -2.5, 0, -0, Infinity, -Infinity, 3.25, 1e-300];
    const column = sortColumn(values);
    // First principles: the sorted values are the input in numeric order, each at its recorded position.
    expect(Array.from(column.sorted)).toEqual([...values].sort((a, b) => a - b).map((v) => v + 0));
    column.order.forEach((position, k) => expect(values[position] === column.sorted[k]).toBe(true));
  });

  it('ranks a subset among itself, matching the counting definition on the subset', () => {
    const rnd = seeded(31);
    const values = Array.from({ length: 300 }, () => Math.floor(rnd() * 30));
    const include = Uint8Array.from(values, () => (rnd() < 0.6 ? 1 : 0));
    const ranks = ranksAlongOrder(sortColumn(values), include);
    const subset = values.filter((_, i) => include[i] === 1);
    const expected = bruteForceRanks(subset);
    expect(Array.from(ranks).filter((_, i) => include[i] === 1)).toEqual(expected);
    expect(Array.from(ranks).every((r, i) => include[i] === 1 || Number.isNaN(r))).toBe(true);
  });
});
