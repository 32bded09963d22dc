import { describe as suite, it, expect } from 'vitest';
import { describe } from '../src/describe.ts';
import { R, jStat } from '../../stats/test/oracle.ts';
import { codebook, checkResult, coded, numeric } from './fixtures.ts';

const pct = (count: number, n: number) => (100 * count) / n;

suite('nominal items', () => {
  const cb = codebook([
    { name: 'hh_id', role: 'id', type: 'text' },
    { name: 'water', level: 'nominal', codes: [{ code: 1, label: 'piped' }, { code: 2, label: 'well' }, { code: 3, label: 'river' }] },
  ]);
  // Rows: piped, well, well, river, well, piped, blank, invalid.
  const res = checkResult([numeric('hh_id', [1, 2, 3, 4, 5, 6, 7, 8]), coded('water', [1, 2, 2, 3, 2, 1, 0, 0])], {
    water: { valid: 6, invalid: 1, missing: { blank: 1 } },
  });
  const d = describe(res, cb).items.water!;

  it('counts, percent of valid cells and the mode, in code order (first principles: count / 6 valid)', () => {
    expect(d.n).toBe(6);
    expect(d.order).toBe('code');
    expect(d.frequencies!.map((f) => [f.code, f.label, f.count])).toEqual([
      [1, 'piped', 2],
      [2, 'well', 3],
      [3, 'river', 1],
    ]);
    expect(d.frequencies!.map((f) => f.percent)).toEqual([pct(2, 6), pct(3, 6), pct(1, 6)]);
    expect(d.frequencies!.every((f) => f.cumulativePercent === undefined)).toBe(true);
    expect(d.mode).toEqual([2]);
  });

  it('reports missing by kind and invalid beside the item, and skips the id item', () => {
    expect(d.missing).toEqual({ blank: 1 });
    expect(d.invalid).toBe(1);
    expect(describe(res, cb).items.hh_id).toBeUndefined();
  });

  it('withholds order and arithmetic statistics with reasons', () => {
    for (const s of ['median', 'q1', 'q3', 'iqr', 'medianCode', 'cumulativePercent']) expect(d.withheld[s]).toMatch(/no order/);
    for (const s of ['mean', 'sd', 'skewness', 'min', 'cv']) expect(d.withheld[s]).toMatch(/no arithmetic meaning/);
    expect(d.mean).toBeUndefined();
    expect(d.median).toBeUndefined();
  });

  it('reports every tied mode', () => {
    const r = checkResult([coded('water', [1, 2, 1, 2, 3])]);
    expect(describe(r, cb).items.water!.mode).toEqual([1, 2]);
  });
});

suite('ordinal items', () => {
  // The R sample ties10 (3 7 7 2 9 4 7 12 5 3) as positions on a 12-step scale whose codes
  // run 1..12: type 1 quantiles of the positions must be R's type 1 quantiles of the values.
  const scale = Array.from({ length: 12 }, (_, i) => ({ code: i + 1, label: `step ${i + 1}` }));
  const cb = codebook([{ name: 'trust', level: 'ordinal', codes: scale }]);
  const res = checkResult([coded('trust', R.samples.ties10.x)]);
  const d = describe(res, cb, { percentiles: [10, 90] }).items.trust!;
  const type1 = R.samples.ties10.quantile.type1!; // R 4.2.2 quantile(x, probs, type = 1)

  it('median and quartiles are categories equal to R type 1 quantiles', () => {
    expect(d.q1Code).toEqual({ code: type1[2], label: `step ${type1[2]}` });
    expect(d.medianCode!.code).toBe(type1[3]);
    expect(d.q3Code!.code).toBe(type1[4]);
    expect(d.iqr).toBe(type1[4]! - type1[2]!); // scale steps
    expect(d.percentileCodes!['10']!.code).toBe(type1[1]);
    expect(d.percentileCodes!['90']!.code).toBe(type1[5]);
  });

  it('frequencies in scale order with cumulative percent; mode 7 (counted by hand: three 7s)', () => {
    expect(d.order).toBe('scale');
    expect(d.frequencies!.length).toBe(12);
    // Cumulative percent at step 5: values <= 5 are 3, 2, 4, 5, 3 -> 5 of 10.
    expect(d.frequencies![4]!.cumulativePercent).toBe(50);
    expect(d.frequencies![11]!.cumulativePercent).toBe(100);
    expect(d.mode).toEqual([7]);
  });

  it('the median follows scale order, not code value (codes declared 5..1)', () => {
    const rev = codebook([{ name: 'agree', level: 'ordinal', codes: [5, 4, 3, 2, 1].map((c) => ({ code: c })) }]);
    // Positions 1,1,2,3,3: scale order first principles, median position 2 -> code 4.
    const r = describe(checkResult([coded('agree', [1, 1, 2, 3, 3])]), rev).items.agree!;
    expect(r.medianCode!.code).toBe(4);
    expect(r.q1Code!.code).toBe(5);
    expect(r.q3Code!.code).toBe(3);
  });

  it('never gives a mean of codes', () => {
    expect(d.mean).toBeUndefined();
    expect(d.withheld.mean).toMatch(/ranks, not quantities/);
    expect(d.withheld.median).toMatch(/categories/);
  });
});

suite('binned items', () => {
  // Trips per week: 0, 1-3, 4-7, 8 or more (open top).
  const bins = [
    { code: 1, label: 'none', bin: { min: 0, max: 0 } },
    { code: 2, label: '1 to 3', bin: { min: 1, max: 3 } },
    { code: 3, label: '4 to 7', bin: { min: 4, max: 7 } },
    { code: 4, label: '8 or more', bin: { min: 8, max: null } },
  ];
  const cb = codebook([{ name: 'trips', level: 'ordinal', codes: bins }]);

  it('grouped median by the textbook formula within the median bin (first principles)', () => {
    // Counts 2, 3, 4, 1 (n = 10). Boundaries -0.5, 0.5, 3.5, 7.5, open. n/2 = 5: cumulative
    // 2, 5 -> median bin "1 to 3", L = 0.5, F = 2, f = 3, w = 3: 0.5 + (5 - 2) / 3 x 3 = 3.5.
    const res = checkResult([coded('trips', [1, 1, 2, 2, 2, 3, 3, 3, 3, 4])]);
    const d = describe(res, cb).items.trips!;
    expect(d.binned).toBe(true);
    expect(d.groupedMedian).toBeCloseTo(3.5, 12);
    expect(d.medianCode!.code).toBe(2);
    expect(d.withheld.mean).toMatch(/binned/);
  });

  it('withholds the grouped median when it falls in the open top bin', () => {
    const res = checkResult([coded('trips', [1, 4, 4, 4])]);
    const d = describe(res, cb).items.trips!;
    expect(d.groupedMedian).toBeUndefined();
    expect(d.withheld.groupedMedian).toMatch(/open-ended/);
  });
});

suite('interval and ratio items against R', () => {
  const s = R.samples.skewed500;
  const cb = codebook([
    { name: 'commute', level: 'ratio', unit: 'minutes' },
    { name: 'temp', level: 'interval' },
  ]);
  const res = checkResult([numeric('commute', [...s.x, Number.NaN]), numeric('temp', [...s.x, Number.NaN])], {
    commute: { missing: { refused: 1 } },
  });
  const out = describe(res, cb);
  const d = out.items.commute!;

  it('n, mean, sd, median, quartiles (R 4.2.2 mean, sd, quantile type 7)', () => {
    expect(d.n).toBe(500);
    expect(d.missing).toEqual({ refused: 1 });
    expect(d.mean).toBeCloseTo(s.mean, 10);
    expect(d.sd).toBeCloseTo(s.sd, 10);
    expect(d.median).toBeCloseTo(s.median, 10);
    expect(d.q1).toBeCloseTo(s.quantile.type7![2]!, 10);
    expect(d.q3).toBeCloseTo(s.quantile.type7![4]!, 10);
    expect(d.min).toBe(s.quantile.type7![0]);
    expect(d.max).toBe(s.quantile.type7![6]);
    expect(d.range).toBeCloseTo(s.quantile.type7![6]! - s.quantile.type7![0]!, 12);
  });

  it('quantile type from the options (R 4.2.2 quantile type 6)', () => {
    const d6 = describe(res, cb, { quantileType: 6, percentiles: [10, 90] }).items.commute!;
    expect(d6.q1).toBeCloseTo(s.quantile.type6![2]!, 10);
    expect(d6.median).toBeCloseTo(s.quantile.type6![3]!, 10);
    expect(d6.percentiles!['90']).toBeCloseTo(s.quantile.type6![5]!, 10);
    expect(d6.conventions!.quantileType).toMatch(/type 6/);
  });

  it('G1, G2 (jStat 1.9.6 g1, g2 with the adjustment factors), cv (R sd / mean), geometric mean (jStat geomean)', () => {
    const n = s.n;
    expect(d.skewness).toBeCloseTo((jStat.skewness(s.x) * Math.sqrt(n * (n - 1))) / (n - 2), 10);
    expect(d.kurtosis).toBeCloseTo((((n + 1) * jStat.kurtosis(s.x) + 6) * (n - 1)) / ((n - 2) * (n - 3)), 10);
    expect(d.cv).toBeCloseTo(s.sd / s.mean, 10);
    expect(d.geometricMean).toBeCloseTo(jStat.geomean(s.x), 10);
  });

  it('Tukey fences from the type 7 quartiles; outliers and extremes counted by brute force', () => {
    const q1 = s.quantile.type7![2]!;
    const q3 = s.quantile.type7![4]!;
    const iqr = q3 - q1;
    expect(d.fences!.upper).toBeCloseTo(q3 + 1.5 * iqr, 10);
    expect(d.fences!.upperExtreme).toBeCloseTo(q3 + 3 * iqr, 10);
    const extremes = s.x.filter((v) => v > q3 + 3 * iqr || v < q1 - 3 * iqr).length;
    const beyondInner = s.x.filter((v) => v > q3 + 1.5 * iqr || v < q1 - 1.5 * iqr).length;
    expect(d.extremes).toBe(extremes);
    expect(d.outliers).toBe(beyondInner - extremes);
    const top = [...s.x].sort((a, b) => b - a).slice(0, 5);
    expect(d.outlierValues!.high).toEqual(top);
    expect(d.histogram!.counts.reduce((a, b) => a + b, 0)).toBe(500);
    expect(d.histogram!.rule).toBe('Freedman-Diaconis');
  });

  it('interval items withhold cv and geometric mean: no absolute zero', () => {
    const t = out.items.temp!;
    expect(t.cv).toBeUndefined();
    expect(t.geometricMean).toBeUndefined();
    expect(t.withheld.cv).toBe('the scale has no absolute zero');
    expect(t.withheld.geometricMean).toBe('the scale has no absolute zero');
    expect(t.mean).toBeCloseTo(s.mean, 10);
  });

  it('names its conventions on the result and on the item', () => {
    expect(out.quantileType).toBe(7);
    expect(out.conventions.sd).toMatch(/n - 1/);
    expect(out.conventions.skewness).toMatch(/G1/);
    expect(out.conventions.kurtosis).toMatch(/G2/);
    expect(out.conventions.fences).toMatch(/1\.5 x IQR.*3 x IQR/);
    expect(out.conventions.histogram).toMatch(/Freedman-Diaconis/);
    expect(d.conventions!.geometricMean).toBeDefined();
  });

  it('large offset: certified mean 10000000.2, sd 0.1 (r-oracle.json largeOffset) to 1e-9 relative', () => {
    const xs = [10000000.2];
    for (let i = 0; i < 500; i++) xs.push(10000000.1, 10000000.3);
    const big = describe(checkResult([numeric('temp', xs)]), cb).items.temp!;
    expect(Math.abs(big.mean! - R.largeOffset.certifiedMean) / R.largeOffset.certifiedMean).toBeLessThan(1e-15);
    // The stored doubles' own sd is 0.1000000005588 (R 4.2.2 sd(x)); both within 1e-8 of 0.1.
    expect(Math.abs(big.sd! - R.largeOffset.rSd) / R.largeOffset.rSd).toBeLessThan(1e-9);
    expect(Math.abs(big.sd! - R.largeOffset.certifiedSd) / R.largeOffset.certifiedSd).toBeLessThan(1e-8);
  });
});

suite('outliers that move the mean', () => {
  const cb = codebook([{ name: 'income', level: 'ratio' }]);
  it('adds a note recommending median and IQR (rule: mean moves > 10% of the sd without them)', () => {
    // 10..19 and 100. Type 7: q1 = 12.5, q3 = 17.5, IQR 5, outer fence 32.5 -> 100 is extreme.
    // Without it mean 14.5, sd 3.03; with it mean 22.7: a shift of 8.2 > 0.303.
    const d = describe(checkResult([numeric('income', [10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 100])]), cb).items.income!;
    expect(d.q1).toBe(12.5);
    expect(d.q3).toBe(17.5);
    expect(d.extremes).toBe(1);
    expect(d.outliers).toBe(0);
    expect(d.outlierValues).toEqual({ low: [], high: [100] });
    expect(d.outlierNote).toMatch(/mean from 14\.5 to 22\./);
    expect(d.outlierNote).toMatch(/median \(15\) and IQR \(5\)/);
  });
  it('no note without outliers', () => {
    const d = describe(checkResult([numeric('income', [1, 2, 3, 4, 5])]), cb).items.income!;
    expect(d.outliers).toBe(0);
    expect(d.outlierNote).toBeUndefined();
    expect(d.withheld.mode).toMatch(/more than once/);
  });
  it('withholds the geometric mean when a value is 0', () => {
    const d = describe(checkResult([numeric('income', [0, 2, 3, 4, 5])]), cb).items.income!;
    expect(d.withheld.geometricMean).toMatch(/> 0/);
  });
});

suite('pairs are passed through to describePairs', () => {
  const cb = codebook([
    { name: 'sex', level: 'nominal', codes: [{ code: 1 }, { code: 2 }] },
    { name: 'age', level: 'ratio' },
  ]);
  const res = checkResult([coded('sex', [1, 2, 1, 2]), numeric('age', [20, 30, 40, 50])]);
  it('none unless asked; a requested pair arrives with its pairwise n (first principles: 4 complete rows)', () => {
    expect(describe(res, cb).pairs).toEqual([]);
    const p = describe(res, cb, { pairs: [['sex', 'age']] }).pairs;
    expect(p).toHaveLength(1);
    expect(p[0]!.kind).toBe('categorical-continuous');
    expect(p[0]!.n).toBe(4);
  });
  it("the pairs' conventions join the result's, keyed by pair kind", () => {
    const out = describe(res, cb, { pairs: [['sex', 'age']] });
    const keys = Object.keys(out.pairs[0]!.conventions ?? {});
    expect(keys.length).toBeGreaterThan(0);
    for (const k of keys) expect(out.conventions[`categorical-continuous ${k}`]).toBe(out.pairs[0]!.conventions![k]);
  });
  it('an unknown pair item is a usage error', () => {
    expect(() => describe(res, cb, { pairs: [['sex', 'nope']] })).toThrow(/nope/);
  });
});

suite('withheld statistics are absent', () => {
  it('no item of any level carries a statistic it names in withheld (first principles: the contract)', () => {
    const cb = codebook([
      { name: 'nom', level: 'nominal', codes: [{ code: 1 }, { code: 2 }] },
      { name: 'ord', level: 'ordinal', codes: [{ code: 1 }, { code: 2 }, { code: 3 }] },
      { name: 'bin', level: 'ordinal', codes: [{ code: 1, bin: { min: 0, max: 4 } }, { code: 2, bin: { min: 5, max: null } }] },
      { name: 'int', level: 'interval' },
      { name: 'rat', level: 'ratio' },
      { name: 'empty', level: 'ratio' },
    ]);
    const res = checkResult([
      coded('nom', [1, 2, 2, 1]),
      coded('ord', [1, 2, 3, 3]),
      coded('bin', [1, 1, 1, 2]),
      numeric('int', [-3, 0, 2, 40]),
      numeric('rat', [0, 1, 2, 2]),
      numeric('empty', [Number.NaN, Number.NaN, Number.NaN, Number.NaN]),
    ]);
    const out = describe(res, cb, { percentiles: [10] });
    expect(Object.keys(out.items).sort()).toEqual(['bin', 'empty', 'int', 'nom', 'ord', 'rat']);
    for (const [name, d] of Object.entries(out.items)) {
      const record = d as unknown as Record<string, unknown>;
      for (const key of Object.keys(d.withheld)) expect(record[key], `${name}.${key}`).toBeUndefined();
      expect(Object.keys(d.withheld).length, name).toBeGreaterThan(0);
    }
    expect(out.items.empty!.n).toBe(0);
    expect(out.items.empty!.withheld.mean).toBe('there are no valid values');
    expect(out.items.rat!.withheld.geometricMean).toMatch(/> 0/);
  });
});
