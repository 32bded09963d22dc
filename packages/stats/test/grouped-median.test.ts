import { describe, it, expect } from 'vitest';
import { groupedMedian, classBoundaries } from '../src/grouped-median.ts';

describe('groupedMedian (textbook grouped-median formula L + ((n/2 - F) / f) w)', () => {
  it('worked example recalled from memory: classes 0-10 ... 40-50 with frequencies 5, 8, 20, 15, 7', () => {
    // Textbook grouped-median formula; worked example recalled from memory. Derivation from
    // first principles: n = 55, n/2 = 27.5; cumulative 5, 13, 33 so the median class is 20-30,
    // L = 20, F = 13, f = 20, w = 10: 20 + (27.5 - 13) / 20 x 10 = 27.25.
    const r = groupedMedian([
      { lower: 0, upper: 10, count: 5 },
      { lower: 10, upper: 20, count: 8 },
      { lower: 20, upper: 30, count: 20 },
      { lower: 30, upper: 40, count: 15 },
      { lower: 40, upper: 50, count: 7 },
    ]);
    expect(r).toEqual({ ok: true, value: 27.25, classIndex: 2 });
  });

  it('integer class limits use boundaries half a unit out (first principles)', () => {
    // Limits 10-19, 20-29, 30-39 with counts 4, 6, 2: boundaries 9.5, 19.5, 29.5, 39.5.
    // n/2 = 6, median class 20-29 (cumulative 4 then 10): 19.5 + (6 - 4) / 6 x 10 = 22.8333...
    const b = classBoundaries([
      { min: 10, max: 19 },
      { min: 20, max: 29 },
      { min: 30, max: 39 },
    ]);
    expect(b).toEqual([
      { lower: 9.5, upper: 19.5 },
      { lower: 19.5, upper: 29.5 },
      { lower: 29.5, upper: 39.5 },
    ]);
    const counts = [4, 6, 2];
    const r = groupedMedian(b.map((c, i) => ({ ...c, count: counts[i]! })));
    expect(r.ok && r.value).toBeCloseTo(19.5 + (2 / 6) * 10, 12);
  });

  it('withholds the median when it falls in the open-ended top class', () => {
    const b = classBoundaries([
      { min: 0, max: 3 },
      { min: 4, max: null },
    ]);
    expect(b[1]!.upper).toBe(Number.POSITIVE_INFINITY);
    const r = groupedMedian([
      { ...b[0]!, count: 1 },
      { ...b[1]!, count: 5 },
    ]);
    expect(r.ok).toBe(false);
    expect(!r.ok && r.reason).toMatch(/open-ended/);
    // ...but gives it when the median class is closed (n/2 = 3 reached in the first class).
    const ok = groupedMedian([
      { ...b[0]!, count: 4 },
      { ...b[1]!, count: 2 },
    ]);
    // Boundaries -0.5..3.5: -0.5 + (3 - 0) / 4 x 4 = 2.5.
    expect(ok).toEqual({ ok: true, value: 2.5, classIndex: 0 });
  });

  it('withholds with no counts', () => {
    expect(groupedMedian([{ lower: 0, upper: 1, count: 0 }]).ok).toBe(false);
  });
});
