/**
 * The first-occurrence tables of unique items. The expectation is computed in the test from
 * first principles: a value's first occurrence is the lowest row holding it (a plain scan with
 * a JS Map), and every later row holding it is a duplicate.
 */
import { describe, it, expect } from 'vitest';
import { NumberFirsts } from '../src/unique.ts';
import { seededRandom } from '@codeweir/core';

function reference(values: number[]): { keys: number[]; rows: number[]; duplicates: number[] } {
  const first = new Map<number, number>();
  const duplicates: number[] = [];
  values.forEach((v, i) => {
    const x = v + 0; // -0 and 0 are one value
    if (first.has(x)) duplicates.push(i + 1);
    else first.set(x, i + 1);
  });
  return { keys: [...first.keys()], rows: [...first.values()], duplicates };
}

describe('NumberFirsts', () => {
  const rand = seededRandom(7);
  // 30,000 values from 12,000 distinct ones (ids with repeats), plus -0, 0 and fractions.
  const values = Array.from({ length: 30_000 }, () => Math.floor(rand() * 12_000) * (rand() < 0.1 ? 0.5 : 1));
  values.push(-0, 0, 1e300, -1e-300);
  const want = reference(values);

  for (const expected of [0, 100, want.keys.length, 10 * want.keys.length]) {
    it(`gives the first occurrences and duplicates of a plain scan, sized for ${expected} values`, () => {
      const t = new NumberFirsts(false, expected);
      const duplicates: number[] = [];
      values.forEach((v, i) => {
        if (!t.add(v, i + 1, '')) duplicates.push(i + 1);
      });
      const e = t.entries();
      expect(Array.from(e.keys as Float64Array)).toEqual(want.keys);
      expect(Array.from(e.rows)).toEqual(want.rows);
      expect(duplicates).toEqual(want.duplicates);
    });
  }
});
