/**
 * Missing codes against ranges and bins: the declared missing code wins (a warning where it lies
 * inside the range), and only the truly undecidable overlaps are errors. The classification
 * side of the rule is checked in test/legacy-codebook.test.ts with the check itself.
 */
import { describe, it, expect } from 'vitest';
import { household, lint, codesAndPaths } from './fixtures.ts';

describe('missing codes inside ranges and bins', () => {
  it('a missing code inside the range is a warning naming the item and the code; the codebook stays valid', () => {
    const cb = household();
    cb.items[3].missing = [{ code: 9, kind: 'refused' }, { code: -9, kind: 'refused' }];
    const r = lint(cb);
    expect(r.ok).toBe(true);
    expect(codesAndPaths(r.problems)).toEqual(['missing-in-range /items/3/missing/0/code']);
    const p = r.problems[0]!;
    expect(p.severity).toBe('warning');
    expect(p.item).toBe('hh_size');
    expect(p.message).toBe('missing code 9 (refused) of item "hh_size" lies inside its range 1 to 40: a cell "9" is read as that missing code, never as a value');
  });

  it('an open range counts too (income 9999998 with only min 0)', () => {
    const cb = household();
    cb.items[5].missing = [{ code: 9999998, kind: 'dont-know' }];
    const r = lint(cb);
    expect(r.ok).toBe(true);
    expect(r.problems.map((p) => [p.code, p.item])).toEqual([['missing-in-range', 'school_km']]);
    expect(r.problems[0]!.message).toContain('range 0 or more');
  });

  it('--strict: the same codebook is refused', () => {
    const cb = household();
    cb.items[3].missing = [{ code: 9, kind: 'refused' }];
    const text = JSON.stringify(cb, null, 2);
    expect(lint(cb).ok).toBe(true);
    return import('../src/index.ts').then(({ parseCodebook }) => {
      const r = parseCodebook(text, 'x.json', { strict: true });
      expect(r.ok).toBe(false);
      expect(r.problems.map((p) => p.code)).toEqual(['missing-in-range']);
    });
  });

  it('a missing code that is also a valid code stays an error, saying why', () => {
    const cb = household();
    cb.items[1].missing = [{ code: 2, kind: 'refused' }];
    const r = lint(cb);
    expect(r.ok).toBe(false);
    expect(codesAndPaths(r.problems)).toEqual(['missing-collides /items/1/missing/0/code']);
    expect(r.problems[0]!.message).toMatch(/both a valid answer and missing/);
  });

  it('a missing code inside a bin of a binned item is an error, saying why', () => {
    const cb = household();
    cb.items[4].missing = [{ code: 9, kind: 'refused' }];
    const r = lint(cb);
    expect(r.ok).toBe(false);
    expect(codesAndPaths(r.problems)).toEqual(['missing-in-bin /items/4/missing/0/code']);
    expect(r.problems[0]!.item).toBe('water_trips');
    expect(r.problems[0]!.message).toMatch(/inside the bin 8 or more of code 4: .*raw quantities/);
    // A missing code outside every bin (the usual negative codes) is fine.
    cb.items[4].missing = [{ code: -9, kind: 'refused' }];
    expect(lint(cb).problems).toEqual([]);
  });
});
