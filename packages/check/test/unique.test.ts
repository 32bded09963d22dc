/**
 * The first-occurrence tables of unique items. The expectation is computed in the test from
 * first principles: a value's first occurrence is the lowest row holding it (a plain scan with
 * a JS Map), and every later row holding it is a duplicate.
 */
import { describe, it, expect } from 'vitest';
import { NumberFirsts, TextFirsts, hashText } from '../src/unique.ts';
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

describe('TextFirsts', () => {
  const rand = seededRandom(11);
  // Ids with repeats, texts that differ only in case, accents, surrogate pairs, the empty text
  // and long texts: the first-occurrence table must agree with a plain scan with a JS Map.
  const pool = ['', 'a', 'A', 'é', 'e\u0301', '😀', '\ud83d', 'x'.repeat(5000), 'x'.repeat(4999) + 'y'];
  const texts = Array.from({ length: 20_000 }, () => (rand() < 0.05 ? pool[Math.floor(rand() * pool.length)]! : `HH-${String(Math.floor(rand() * 9000)).padStart(8, '0')}`));
  const want = (() => {
    const first = new Map<string, number>();
    const duplicates: number[] = [];
    texts.forEach((v, i) => (first.has(v) ? duplicates.push(i + 1) : first.set(v, i + 1)));
    return { keys: [...first.keys()], rows: [...first.values()], duplicates };
  })();

  for (const expected of [0, want.keys.length]) {
    it(`gives the first occurrences and duplicates of a plain scan, sized for ${expected} values`, () => {
      const t = new TextFirsts(true, expected);
      const duplicates: number[] = [];
      texts.forEach((v, i) => {
        if (!t.add(v, i + 1, `id${i}`)) duplicates.push(i + 1);
      });
      const e = t.entries();
      expect(e.keys).toEqual(want.keys);
      expect(Array.from(e.rows)).toEqual(want.rows);
      expect(e.ids).toEqual(want.rows.map((r) => `id${r - 1}`));
      expect(duplicates).toEqual(want.duplicates);
    });
  }

  it('merges tables with the hashes they kept as a plain scan of all rows does', () => {
    // Two halves, each with its own table, then merged in row order reusing the kept hashes.
    const half = texts.length / 2;
    const parts = [texts.slice(0, half), texts.slice(half)].map((part, k) => {
      const t = new TextFirsts(false);
      part.forEach((v, i) => t.add(v, k * half + i + 1, ''));
      return t.entries();
    });
    const merged = new TextFirsts(false, parts[0]!.keys.length + parts[1]!.keys.length);
    const duplicates: number[] = [];
    for (const e of parts) {
      if (e.kind !== 'text') throw new Error('text entries expected');
      expect(Array.from(e.hashes!)).toEqual(e.keys.map(hashText));
      e.keys.forEach((v, j) => {
        if (!merged.add(v, e.rows[j]!, '', e.hashes![j])) duplicates.push(e.rows[j]!);
      });
    }
    expect(merged.entries().keys).toEqual(want.keys);
    expect(Array.from(merged.entries().rows)).toEqual(want.rows);
    // The merge sees each half's first occurrences only: its duplicates are the first rows of
    // the second half holding a value the first half already had.
    const first = new Set(texts.slice(0, half));
    const seenSecond = new Set<string>();
    const acrossHalves: number[] = [];
    texts.slice(half).forEach((v, i) => {
      if (seenSecond.has(v)) return;
      seenSecond.add(v);
      if (first.has(v)) acrossHalves.push(half + i + 1);
    });
    expect(duplicates).toEqual(acrossHalves);
  });

  it('tells texts with the same hash apart by comparing them', () => {
    // Collisions are forced: every entry is added with hash 7, so only the text comparison separates them.
    const t = new TextFirsts(false);
    expect(t.add('one', 1, '', 7)).toBe(true);
    expect(t.add('two', 2, '', 7)).toBe(true);
    expect(t.add('one', 3, '', 7)).toBe(false);
    expect(t.entries().keys).toEqual(['one', 'two']);
  });
});
