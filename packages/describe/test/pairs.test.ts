import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { CompiledCodebook, CompiledItem, Level, Role } from '@codeweir/codebook';
import type { CheckResult, ItemColumn } from '@codeweir/check';
import { describePairs } from '../src/pairs.ts';
import type { PairCategorical, PairContinuous, PairMixed } from '../src/types.ts';

// Outside oracles: R 4.2.2 values in test/reference/r-oracle.json and jStat 1.9.6.
const R = JSON.parse(readFileSync(new URL('../../../test/reference/r-oracle.json', import.meta.url), 'utf8')) as {
  chisq: Record<'t2x2' | 't3x4' | 'sparse', { table: number[][]; statistic: number; df: number; p: number; expected: number[][]; cramersV: number; phi: number | null }>;
  correlation: { x: number[]; y: number[]; pearson: number; spearman: number };
  mahalanobis: { cutoff_chisq2_0999: number; flagged_rows_1based: number[]; max_d2: number };
  etaSquared: { group: number[]; y: number[]; etaSquared: number };
};
const jStat = (
  createRequire(import.meta.url)('jstat') as {
    jStat: {
      spearmancoeff(x: number[], y: number[]): number;
      corrcoeff(x: number[], y: number[]): number;
      mean(a: number[]): number;
      stdev(a: number[], sample: boolean): number;
      percentile(a: number[], k: number, exclusive?: boolean): number;
    };
  }
).jStat;

// ---- hand-built codebooks and stores ------------------------------------------------------

interface ItemSpec {
  name: string;
  level?: Level;
  role?: Role;
  type?: CompiledItem['type'];
  /** Number of codes (coded items); labels are "code <k>". */
  codes?: number;
}

function compile(specs: ItemSpec[]): CompiledCodebook {
  const items: CompiledItem[] = specs.map((s, index) => ({
    index,
    name: s.name,
    label: `label of ${s.name}`,
    role: s.role ?? 'item',
    type: s.type ?? (s.codes ? 'integer' : 'decimal'),
    level: s.level,
    codes: Array.from({ length: s.codes ?? 0 }, (_, i) => ({ index: i, code: i + 1, text: String(i + 1), label: `code ${i + 1}` })),
    codeByText: new Map(),
    binned: false,
    bins: [],
    missing: [],
    missingByText: new Map(),
    unique: s.role === 'id',
  }));
  return {
    source: null,
    id: 'pairs-test',
    version: '1',
    title: 'pairs test',
    items,
    byName: new Map(items.map((i) => [i.name, i])),
    idItem: items.find((i) => i.role === 'id'),
    groupItems: items.filter((i) => i.role === 'group'),
    weightItem: items.find((i) => i.role === 'weight'),
    rules: [],
  };
}

/** Columns: arrays of code indices (1-based, 0 = not valid) become coded, number arrays with NaN numeric. */
function store(columns: Record<string, { codes: number[] } | { values: number[] }>): CheckResult {
  const built: Record<string, ItemColumn> = {};
  let rows = 0;
  for (const [item, c] of Object.entries(columns)) {
    if ('codes' in c) {
      built[item] = { kind: 'coded', item, codes: Uint16Array.from(c.codes) };
      rows = c.codes.length;
    } else {
      built[item] = { kind: 'numeric', item, values: Float64Array.from(c.values) };
      rows = c.values.length;
    }
  }
  return { summary: {} as CheckResult['summary'], findings: [], store: { rows, columns: built } };
}

/** One (row code, column code) observation per counted unit of a table, codes 1-based. */
function expand(table: number[][]): { x: number[]; y: number[] } {
  const x: number[] = [];
  const y: number[] = [];
  table.forEach((row, i) => row.forEach((count, j) => {
    for (let k = 0; k < count; k++) {
      x.push(i + 1);
      y.push(j + 1);
    }
  }));
  return { x, y };
}

// ---- categorical x categorical ------------------------------------------------------------

describe('describePairs: categorical x categorical', () => {
  it('R t3x4 table with missing cells interleaved: pairwise n, table, chi-square, V', () => {
    const t = R.chisq.t3x4;
    const { x, y } = expand(t.table);
    // Three extra rows per observation-free slot: x missing, y missing, both missing.
    const xs = [...x, 0, 2, 0];
    const ys = [...y, 1, 0, 0];
    const cb = compile([
      { name: 'a', level: 'nominal', codes: 3 },
      { name: 'b', level: 'nominal', codes: 4 },
    ]);
    const [pair] = describePairs(store({ a: { codes: xs }, b: { codes: ys } }), cb, { quantileType: 7, pairs: [['a', 'b']] }) as PairCategorical[];
    // First principles: the 300 expanded observations are the only rows valid on both items.
    expect(pair.n).toBe(300);
    expect(pair.table).toEqual(t.table);
    expect(pair.rows.map((r) => r.label)).toEqual(['code 1', 'code 2', 'code 3']);
    expect(pair.columns.map((c) => c.code)).toEqual([1, 2, 3, 4]);
    // R 4.2.2 chisq.test(t, correct = FALSE)
    expect(pair.chiSquare).toBeCloseTo(t.statistic, 10);
    expect(pair.df).toBe(t.df);
    expect(pair.p! / t.p).toBeCloseTo(1, 8);
    t.expected.forEach((row, i) => row.forEach((v, j) => expect(pair.expected[i][j]).toBeCloseTo(v, 10)));
    expect(pair.cramersV).toBeCloseTo(t.cramersV, 12);
    expect(pair.phi).toBeNull();
    expect(pair.warnings).toEqual([]);
    expect(pair.spearman).toBeUndefined();
    // First principles: row 1 is 20 15 30 35 of 100; column 1 is 20, 25, 10 of 55; cell 20 of 300.
    expect(pair.rowPercent[0]).toEqual([20, 15, 30, 35]);
    expect(pair.columnPercent[1][0]).toBeCloseTo((100 * 25) / 55, 12);
    expect(pair.cellPercent[0][0]).toBeCloseTo((100 * 20) / 300, 12);
  });

  it('R t2x2 table: phi', () => {
    const t = R.chisq.t2x2;
    const { x, y } = expand(t.table);
    const cb = compile([
      { name: 'a', level: 'nominal', codes: 2 },
      { name: 'b', level: 'nominal', codes: 2 },
    ]);
    const [pair] = describePairs(store({ a: { codes: x }, b: { codes: y } }), cb, { quantileType: 7, pairs: [['a', 'b']] }) as PairCategorical[];
    // R 4.2.2: (ad - bc) / sqrt(prod(rowSums) prod(colSums)) and chisq.test(correct = FALSE)
    expect(pair.phi).toBeCloseTo(t.phi!, 12);
    expect(pair.chiSquare).toBeCloseTo(t.statistic, 10);
  });

  it('R sparse table: share of expected counts below 5 and the warning', () => {
    const t = R.chisq.sparse;
    const { x, y } = expand(t.table);
    const cb = compile([
      { name: 'a', level: 'nominal', codes: 3 },
      { name: 'b', level: 'nominal', codes: 3 },
    ]);
    const [pair] = describePairs(store({ a: { codes: x }, b: { codes: y } }), cb, { quantileType: 7, pairs: [['a', 'b']] }) as PairCategorical[];
    const e = t.expected.flat();
    // From R's expected counts (chisq.test(correct = FALSE)$expected); the 20% limit is Cochran's rule, common practice.
    const low = (100 * e.filter((v) => v < 5).length) / e.length;
    expect(pair.lowExpectedPercent).toBeCloseTo(low, 12);
    expect(low).toBeGreaterThan(20);
    expect(pair.warnings.some((w) => w.includes('of expected counts are below 5'))).toBe(true);
    expect(pair.chiSquare).toBeCloseTo(t.statistic, 10);
  });

  it('a code nobody chose stays in the table and leaves the test', () => {
    const t = R.chisq.t3x4;
    const { x, y } = expand(t.table);
    // x declares 4 codes; code 4 never occurs, so the test is R's 3 x 4 one.
    const cb = compile([
      { name: 'a', level: 'nominal', codes: 4 },
      { name: 'b', level: 'nominal', codes: 4 },
    ]);
    const [pair] = describePairs(store({ a: { codes: x }, b: { codes: y } }), cb, { quantileType: 7, pairs: [['a', 'b']] }) as PairCategorical[];
    expect(pair.table).toHaveLength(4);
    expect(pair.table[3]).toEqual([0, 0, 0, 0]);
    // R 4.2.2 chisq.test(t3x4, correct = FALSE)
    expect(pair.df).toBe(t.df);
    expect(pair.chiSquare).toBeCloseTo(t.statistic, 10);
    expect(pair.cramersV).toBeCloseTo(t.cramersV, 12);
    expect(pair.warnings).toEqual(['Codes of a with no valid pair (4 "code 4") are left out of the chi-square test and kept in the table.']);
  });

  it('ordinal x ordinal adds Spearman (jStat on the expanded rows) and gamma (pairs counted by hand)', () => {
    const table = [
      [2, 1],
      [1, 2],
    ];
    const { x, y } = expand(table);
    const cb = compile([
      { name: 'a', level: 'ordinal', codes: 2 },
      { name: 'b', level: 'ordinal', codes: 2 },
    ]);
    const [pair] = describePairs(store({ a: { codes: x }, b: { codes: y } }), cb, { quantileType: 7, pairs: [['a', 'b']] }) as PairCategorical[];
    // jStat 1.9.6 spearmancoeff of the expanded observations (ties averaged)
    expect(pair.spearman).toBeCloseTo(jStat.spearmancoeff(x, y), 12);
    // First principles: concordant pairs = n11 n22 = 2 * 2 = 4, discordant = n12 n21 = 1; gamma = 3 / 5.
    expect(pair.gamma).toBeCloseTo(0.6, 14);
  });

  it('no valid pair: a warning and no test', () => {
    const cb = compile([
      { name: 'a', level: 'nominal', codes: 2 },
      { name: 'b', level: 'nominal', codes: 2 },
    ]);
    const [pair] = describePairs(store({ a: { codes: [1, 0] }, b: { codes: [0, 2] } }), cb, { quantileType: 7, pairs: [['a', 'b']] }) as PairCategorical[];
    expect(pair).toMatchObject({ n: 0, chiSquare: null, p: null, cramersV: null, phi: null });
    expect(pair.warnings).toEqual(['No row has valid values on both a and b.']);
  });
});

// ---- continuous x continuous --------------------------------------------------------------

describe('describePairs: continuous x continuous', () => {
  it('R correlation sample with invalid cells prepended: r, rho, outlier rows', () => {
    const { x, y } = R.correlation;
    // Two rows in front (one invalid on each item) shift every data row by 2.
    const cb = compile([
      { name: 'u', level: 'ratio' },
      { name: 'v', level: 'interval' },
    ]);
    const result = store({ u: { values: [NaN, 1, ...x] }, v: { values: [2, NaN, ...y] } });
    const [pair] = describePairs(result, cb, { quantileType: 7, pairs: [['u', 'v']] }) as PairContinuous[];
    expect(pair.n).toBe(1000);
    // R 4.2.2 cor(x, y) and cor(x, y, method = "spearman")
    expect(pair.pearson).toBeCloseTo(R.correlation.pearson, 12);
    expect(pair.spearman).toBeCloseTo(R.correlation.spearman, 12);
    // R 4.2.2 which(mahalanobis(m, colMeans(m), cov(m)) > qchisq(0.999, 2)), shifted by the 2 leading rows
    expect(pair.bivariateOutliers).toEqual(R.mahalanobis.flagged_rows_1based.map((r) => r + 2));
    expect(pair.mahalanobisCutoff).toBeCloseTo(R.mahalanobis.cutoff_chisq2_0999, 10);
    expect(pair.maxMahalanobis).toBeCloseTo(R.mahalanobis.max_d2, 8);
    expect(pair.notes.some((n) => n.includes("can distort Pearson's r"))).toBe(true);
    // |0.528 - 0.591| < 0.1 (the rule of thumb, common practice): no gap note.
    expect(pair.notes.some((n) => n.includes('differ by more than'))).toBe(false);
    // First principles: 1000 points are below the 2,000-point limit, so the sample is every pair.
    expect(pair.sample).toHaveLength(1000);
    expect(pair.sampleRows![0]).toBe(3);
    expect(pair.sample![0]).toEqual([x[0], y[0]]);
  });

  it('notes a gap between r and rho for a monotone curve', () => {
    const x = Array.from({ length: 40 }, (_, i) => i + 1);
    const y = x.map((v) => Math.exp(v / 4));
    const cb = compile([
      { name: 'u', level: 'ratio' },
      { name: 'v', level: 'ratio' },
    ]);
    const [pair] = describePairs(store({ u: { values: x }, v: { values: y } }), cb, { quantileType: 7, pairs: [['u', 'v']] }) as PairContinuous[];
    // First principles: y increases with x, so the ranks agree exactly and rho = 1, while the curve is far from a line.
    expect(pair.spearman).toBe(1);
    expect(pair.pearson!).toBeLessThan(0.9);
    expect(pair.notes.some((n) => n.includes('differ by more than 0.1'))).toBe(true);
  });

  it('a large pair: sample of at most 2,000 points, evenly strided, outliers included, deterministic', () => {
    const n = 5000;
    // A deterministic cloud (a rotated lattice), two points planted far away at rows 1234 and 4321.
    const x = Array.from({ length: n }, (_, i) => (i % 50) + 0.3 * Math.floor(i / 50));
    const y = Array.from({ length: n }, (_, i) => Math.floor(i / 50) + 0.3 * (i % 50));
    x[1233] = 500;
    y[1233] = -500;
    x[4320] = -400;
    y[4320] = 900;
    const cb = compile([
      { name: 'u', level: 'ratio' },
      { name: 'v', level: 'ratio' },
    ]);
    const result = store({ u: { values: x }, v: { values: y } });
    const [pair] = describePairs(result, cb, { quantileType: 7, pairs: [['u', 'v']] }) as PairContinuous[];
    expect(pair.bivariateOutliers).toEqual(expect.arrayContaining([1234, 4321]));
    expect(pair.sample!.length).toBeLessThanOrEqual(2000);
    expect(pair.sample!.length).toBe(pair.sampleRows!.length);
    for (const row of pair.bivariateOutliers) expect(pair.sampleRows).toContain(row);
    // First principles: an even stride of 5000 / (2000 - outliers) starts at the first row.
    expect(pair.sampleRows![0]).toBe(1);
    expect([...pair.sampleRows!].sort((a, b) => a - b)).toEqual(pair.sampleRows);
    const again = describePairs(result, cb, { quantileType: 7, pairs: [['u', 'v']] })[0] as PairContinuous;
    expect(again.sampleRows).toEqual(pair.sampleRows);
  });
});

// ---- categorical x continuous -------------------------------------------------------------

describe('describePairs: categorical x continuous', () => {
  it('R one-way layout: groups in code order, jStat group statistics, R eta squared; continuous-first is swapped', () => {
    const { group, y } = R.etaSquared;
    const cb = compile([
      { name: 'score', level: 'interval' },
      { name: 'team', level: 'nominal', role: 'group', codes: 4 },
    ]);
    const result = store({ score: { values: y }, team: { codes: group } });
    const [pair] = describePairs(result, cb, { quantileType: 7, pairs: [['score', 'team']] }) as PairMixed[];
    expect(pair).toMatchObject({ x: 'team', y: 'score', kind: 'categorical-continuous', swapped: true, n: 100 });
    // R 4.2.2 anova(lm(y ~ factor(g))): SS between / SS total
    expect(pair.etaSquared).toBeCloseTo(R.etaSquared.etaSquared, 12);
    expect(pair.groups.map((g) => g.code)).toEqual([1, 2, 3, 4]);
    for (const g of pair.groups) {
      const values = y.filter((_, i) => group[i] === g.code);
      expect(g.n).toBe(25);
      // jStat 1.9.6 mean, stdev(sample = true) and percentile (inclusive: Hyndman-Fan type 7)
      expect(g.mean).toBeCloseTo(jStat.mean(values), 12);
      expect(g.sd).toBeCloseTo(jStat.stdev(values, true), 12);
      expect(g.median).toBeCloseTo(jStat.percentile(values, 0.5), 12);
      expect(g.q1).toBeCloseTo(jStat.percentile(values, 0.25), 12);
      expect(g.q3).toBeCloseTo(jStat.percentile(values, 0.75), 12);
    }
    // jStat 1.9.6 percentile(exclusive = true) is Hyndman-Fan type 6: the quantile type is honoured.
    const six = describePairs(result, cb, { quantileType: 6, pairs: [['team', 'score']] })[0] as PairMixed;
    expect(six.swapped).toBeUndefined();
    const first = y.filter((_, i) => group[i] === 1);
    expect(six.groups[0].q1).toBeCloseTo(jStat.percentile(first, 0.25, true), 12);
  });

  it('Tukey fences and outlier/extreme counts per group, an empty group, a group of one', () => {
    const cb = compile([
      { name: 'g', level: 'nominal', codes: 4 },
      { name: 'v', level: 'ratio' },
    ]);
    const result = store({
      g: { codes: [1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 4, 0] },
      v: { values: [1, 2, 3, 4, 100, 1, 2, 3, 4, 8, 5, 7] },
    });
    const [pair] = describePairs(result, cb, { quantileType: 7, pairs: [['g', 'v']] }) as PairMixed[];
    // First principles, type 7 on (1, 2, 3, 4, z): q1 = 2, q3 = 4, IQR 2; inner fences -1 and 7, outer -4 and 10.
    expect(pair.groups[0]).toMatchObject({ n: 5, q1: 2, median: 3, q3: 4, fences: { lower: -1, upper: 7, lowerExtreme: -4, upperExtreme: 10 }, outliers: 0, extremes: 1 });
    expect(pair.groups[1]).toMatchObject({ outliers: 1, extremes: 0 });
    expect(pair.groups[2]).toMatchObject({ code: 3, n: 0, mean: null, sd: null, median: null, fences: null });
    // A single value has a mean and a median but no sample sd (n - 1 = 0).
    expect(pair.groups[3]).toMatchObject({ n: 1, mean: 5, sd: null, median: 5 });
    // First principles: the last row has no valid group, so 11 rows pair.
    expect(pair.n).toBe(11);
  });

  it('counts outliers and extremes on both sides of every group as the definition does', () => {
    const cb = compile([
      { name: 'g', level: 'nominal', codes: 3 },
      { name: 'v', level: 'ratio' },
    ]);
    // Heavy tails on both sides (tan of an evenly spread fraction: the golden-ratio sequence),
    // rounded so that values tie, every 37th cell NaN, codes 0 (no group) to 3 in turn.
    const codes: number[] = [];
    const values: number[] = [];
    for (let r = 0; r < 3000; r++) {
      codes.push(r % 4);
      const u = (r * 0.6180339887) % 1;
      values.push(r % 37 === 5 ? Number.NaN : Math.round(Math.tan(Math.PI * (u - 0.5)) * 4));
    }
    const [pair] = describePairs(store({ g: { codes }, v: { values } }), cb, { quantileType: 7, pairs: [['g', 'v']] }) as PairMixed[];
    pair.groups.forEach((g, i) => {
      const mine = values.filter((v, r) => codes[r] === i + 1 && !Number.isNaN(v));
      // Definition: extremes beyond the outer fences; outliers beyond the inner fences only.
      const f = g.fences!;
      const extremes = mine.filter((v) => v < f.lowerExtreme || v > f.upperExtreme).length;
      const outliers = mine.filter((v) => (v < f.lower || v > f.upper) && !(v < f.lowerExtreme || v > f.upperExtreme)).length;
      expect(g.n).toBe(mine.length);
      expect([g.outliers, g.extremes]).toEqual([outliers, extremes]);
      expect(mine.some((v) => v < f.lowerExtreme) && mine.some((v) => v > f.upperExtreme) && outliers > 0).toBe(true);
    });
  });
});

// ---- selection, completeness and errors ---------------------------------------------------

describe('describePairs: which pairs, which rows', () => {
  const cb = compile([
    { name: 'id', role: 'id', type: 'text' },
    { name: 'site', level: 'nominal', role: 'group', codes: 2 },
    { name: 'age', level: 'ratio' },
    { name: 'note', type: 'text' },
    { name: 'w', level: 'ratio', role: 'weight' },
    { name: 'sat', level: 'ordinal', codes: 3 },
    { name: 'income', level: 'ratio' },
  ]);
  const result = store({
    site: { codes: [1, 2, 1, 2, 1, 2, 0, 1] },
    age: { values: [30, 41, NaN, 25, 60, 33, 47, 52] },
    w: { values: [1, 1, 1, 1, 1, 1, 1, 1] },
    sat: { codes: [1, 3, 2, 0, 3, 2, 1, 1] },
    income: { values: [10, 20, 15, 12, NaN, 30, 22, 9] },
  });

  it("'all' pairs every describable item in codebook order (no id, weight or text), categorical first in mixed pairs", () => {
    const pairs = describePairs(result, cb, { quantileType: 7, pairs: 'all' });
    // First principles: describable items site, age, sat, income give 4 * 3 / 2 = 6 pairs.
    expect(pairs.map((p) => `${p.x}:${p.y}:${p.kind}`)).toEqual([
      'site:age:categorical-continuous',
      'site:sat:categorical-categorical',
      'site:income:categorical-continuous',
      'sat:age:categorical-continuous',
      'age:income:continuous-continuous',
      'sat:income:categorical-continuous',
    ]);
    expect((pairs[3] as PairMixed).swapped).toBe(true);
  });

  it('counts pairwise-complete rows per pair', () => {
    const pairs = describePairs(result, cb, { quantileType: 7, pairs: [['site', 'age'], ['sat', 'income'], ['age', 'income']] });
    // First principles: site:age loses rows 3 (age) and 7 (site); sat:income rows 4 (sat) and 5 (income);
    // age:income rows 3 and 5.
    expect(pairs.map((p) => p.n)).toEqual([6, 6, 6]);
    expect(pairs.every((p) => p.listwise === undefined)).toBe(true);
  });

  it('listwise uses only rows valid on every requested item and says so', () => {
    const pairs = describePairs(result, cb, { quantileType: 7, pairs: [['site', 'age'], ['sat', 'income'], ['age', 'income']], listwise: true });
    // First principles: rows 3, 4, 5 and 7 each miss one of site, age, sat, income; rows 1, 2, 6, 8 remain.
    expect(pairs.map((p) => p.n)).toEqual([4, 4, 4]);
    expect(pairs.every((p) => p.listwise === true)).toBe(true);
    // jStat 1.9.6 corrcoeff and spearmancoeff on rows 1, 2, 6 and 8 of age and income
    const continuous = pairs[2] as PairContinuous;
    expect(continuous.pearson).toBeCloseTo(jStat.corrcoeff([30, 41, 33, 52], [10, 20, 30, 9]), 12);
    expect(continuous.spearman).toBeCloseTo(jStat.spearmancoeff([30, 41, 33, 52], [10, 20, 30, 9]), 12);
    expect(continuous.sampleRows).toEqual([1, 2, 6, 8]);
  });

  it('keeps the requested order and describes a:b and b:a once', () => {
    const pairs = describePairs(result, cb, { quantileType: 7, pairs: [['income', 'age'], ['sat', 'site'], ['age', 'income']] });
    expect(pairs.map((p) => `${p.x}:${p.y}`)).toEqual(['income:age', 'sat:site']);
    expect(describePairs(result, cb, { quantileType: 7 })).toEqual([]);
  });

  it('rejects unknown items, items that cannot be paired and an item paired with itself', () => {
    const run = (pairs: Array<[string, string]>) => () => describePairs(result, cb, { quantileType: 7, pairs });
    expect(run([['age', 'agee']])).toThrow(expect.objectContaining({ code: 'CW_USAGE', message: '--pair age:agee names "agee", which is not an item of the codebook.' }));
    expect(run([['id', 'age']])).toThrow(/cannot use "id": it is the id item/);
    expect(run([['w', 'age']])).toThrow(/cannot use "w": it is the weight item/);
    expect(run([['note', 'age']])).toThrow(/cannot use "note": it has no level of measurement/);
    expect(run([['age', 'age']])).toThrow(/names the same item twice/);
  });
});
