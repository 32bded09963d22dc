import { describe as suite, it, expect } from 'vitest';
import { describe } from '../src/describe.ts';
import { R } from '../../stats/test/oracle.ts';
import { codebook, checkResult, coded, numeric } from './fixtures.ts';

suite('weighted figures beside the unweighted ones', () => {
  const cb = codebook([
    { name: 'age', level: 'ratio' },
    { name: 'sex', level: 'nominal', codes: [{ code: 1, label: 'f' }, { code: 2, label: 'm' }] },
    { name: 'edu', level: 'ordinal', codes: [{ code: 1 }, { code: 2 }, { code: 3 }] },
    { name: 'wt', role: 'weight', level: 'ratio' },
  ]);

  it('weighted mean equals R weighted.mean(x, 1:n) on normal1000 (R 4.2.2); the unweighted mean stays R mean(x)', () => {
    const s = R.samples.normal1000;
    const res = checkResult([numeric('age', s.x), numeric('wt', s.x.map((_, i) => i + 1))]);
    const d = describe(res, cb).items.age!;
    expect(d.weighted!.mean).toBeCloseTo(s.weightedMean_w1to_n, 9);
    expect(d.mean).toBeCloseTo(s.mean, 10);
    expect(d.n).toBe(1000);
    expect(d.weighted!.n).toBe(1000);
    expect(d.weighted!.sumOfWeights).toBe((1000 * 1001) / 2);
    expect(d.conventions!.weightedSd).toMatch(/sum\(w\) - 1/);
  });

  it('excludes and counts rows with missing or negative weight (first principles)', () => {
    // age 10, 20, 30, 40 with weights 1, 3, NaN, -2: only the first two count.
    // Weighted mean (10 + 60) / 4 = 17.5; frequency-weight sd: sum w (x - m)^2 = 1 x 56.25 + 3 x 6.25
    // = 75 over sum(w) - 1 = 3 -> sd 5. Weighted ECDF shares 0.25, 1: median 20, q1 10.
    const res = checkResult([numeric('age', [10, 20, 30, 40]), numeric('wt', [1, 3, Number.NaN, -2])]);
    const out = describe(res, cb);
    const w = out.items.age!.weighted!;
    expect(out.weight).toBe('wt');
    expect(w.excluded).toBe(2);
    expect(w.n).toBe(2);
    expect(w.sumOfWeights).toBe(4);
    expect(w.mean).toBe(17.5);
    expect(w.sd).toBeCloseTo(5, 12);
    expect(w.median).toBe(20);
    expect(w.q1).toBe(10);
    expect(out.items.age!.mean).toBe(25);
  });

  it('weighted counts and percents for coded items, weighted median as a category', () => {
    // sex f, m, m with weights 3, 1, 1: weighted f 60%, m 40%; unweighted f 33.3%.
    // edu 1, 2, 3 with the same weights: weighted shares 0.6, 0.8, 1 -> median category 1.
    const res = checkResult([coded('sex', [1, 2, 2]), coded('edu', [1, 2, 3]), numeric('wt', [3, 1, 1])]);
    const out = describe(res, cb);
    const sex = out.items.sex!;
    expect(sex.frequencies![0]!.weightedCount).toBe(3);
    expect(sex.frequencies![0]!.weightedPercent).toBe(60);
    expect(sex.frequencies![0]!.percent).toBeCloseTo(100 / 3, 12);
    expect(sex.weighted!.percent).toEqual({ '1': 60, '2': 40 });
    const edu = out.items.edu!;
    expect(edu.weighted!.medianCode!.code).toBe(1);
    expect(edu.medianCode!.code).toBe(2);
  });

  it('the weight option overrides the codebook weight item and an unknown name fails clearly', () => {
    const res = checkResult([numeric('age', [1, 2]), numeric('wt', [1, 1])]);
    expect(() => describe(res, cb, { weight: 'nope' })).toThrow(/--weight names "nope", which is not an item/);
    expect(() => describe(res, cb, { weight: 'sex' })).toThrow(/no column/);
    expect(describe(res, cb, { weight: 'age' }).weight).toBe('age');
  });

  it('without a weight item there are no weighted figures', () => {
    const plain = codebook([{ name: 'age', level: 'ratio' }]);
    const out = describe(checkResult([numeric('age', [1, 2, 3])]), plain);
    expect(out.weight).toBeUndefined();
    expect(out.items.age!.weighted).toBeUndefined();
  });
});
