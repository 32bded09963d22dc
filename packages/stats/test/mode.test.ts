import { describe, it, expect } from 'vitest';
import { modes, modeIndices } from '../src/mode.ts';
import { frequencies } from '../src/frequencies.ts';
import { R } from './oracle.ts';

describe('modes', () => {
  it('ties10: 7 occurs three times, every other value at most twice (counted by hand from the R sample)', () => {
    // x = 3 7 7 2 9 4 7 12 5 3: 7 x3, 3 x2, others once.
    expect(modes(R.samples.ties10.x)).toEqual([7]);
  });
  it('reports all tied modes ascending', () => {
    expect(modes([3, 1, 3, 1, 2])).toEqual([1, 3]);
    expect(modes([])).toEqual([]);
  });
  it('modeIndices of a count table reports all tied largest counts, none for an empty table', () => {
    expect(modeIndices([3, 5, 5, 1])).toEqual([1, 2]);
    expect(modeIndices([0, 0])).toEqual([]);
  });
});

describe('frequencies', () => {
  it('percent and cumulative percent of the total (first principles: count / total x 100)', () => {
    const rows = frequencies([1, 3, 4]);
    expect(rows.map((r) => r.percent)).toEqual([12.5, 37.5, 50]);
    expect(rows.map((r) => r.cumulativePercent)).toEqual([12.5, 50, 100]);
  });
  it('ends at exactly 100 even when thirds do not add up in binary', () => {
    const rows = frequencies([1, 1, 1]);
    expect(rows[2]!.cumulativePercent).toBe(100);
    expect(frequencies([0, 0]).every((r) => r.percent === 0)).toBe(true);
  });
});
