/**
 * `codeweir describe --pairs all --json` on the demo delivery, recomputed independently: the
 * CSV read by csv-parse, every cell classified by the plain reading of the codebook contract in
 * support/independent.ts (no code shared with packages/**), and every summary recomputed by
 * first-principles arithmetic or jStat. Mismatches are collected per test and listed together,
 * so a failure names every item and statistic that disagrees.
 */
import { describe as suite, it, expect, beforeAll } from 'vitest';
import { readFile } from 'node:fs/promises';
import { fileURLToPath } from 'node:url';
import { run } from '@codeweir/cli';
import type { DescribeResult, PairCategorical, PairContinuous, PairMixed } from '@codeweir/describe';
import {
  ascending,
  chiSquare,
  gamma,
  jStat,
  mahalanobis2,
  quantile1,
  quantile7,
  readAndClassify,
  sumOfSquares,
  weightedQuantile,
  type Cell,
  type Classified,
  type RawCodebook,
  type RawItem,
} from './support/independent.ts';

const root = fileURLToPath(new URL('..', import.meta.url));
const CODEBOOK = 'examples/household.codebook.json';
const DELIVERY = 'examples/demo-delivery.csv';

/** Relative tolerance for means, sds, correlations and other floating results (the brief's 1e-9). */
const REL = 1e-9;
/** Absolute floor for results that are 0 up to rounding (a relative test cannot pass at 0). */
const FLOOR = 1e-12;

/** Collects disagreements instead of stopping at the first, so one run lists all of them. */
class Tally {
  problems: string[] = [];
  checks = 0;
  exact(what: string, got: unknown, want: unknown): void {
    this.checks++;
    if (JSON.stringify(got) !== JSON.stringify(want)) this.problems.push(`${what}: got ${JSON.stringify(got)}, expected ${JSON.stringify(want)}`);
  }
  near(what: string, got: number | null | undefined, want: number | null | undefined, rel = REL, floor = FLOOR): void {
    this.checks++;
    if (want === null || want === undefined || got === null || got === undefined) {
      if (got !== want && !(got == null && want == null)) this.problems.push(`${what}: got ${got}, expected ${want}`);
      return;
    }
    if (!(Math.abs(got - want) <= rel * Math.max(Math.abs(got), Math.abs(want)) + floor)) {
      this.problems.push(`${what}: got ${got}, expected ${want}`);
    }
  }
  /** Asserts nothing disagreed and that the checks were not vacuous. */
  done(atLeast: number): void {
    expect(this.problems).toEqual([]);
    expect(this.checks).toBeGreaterThanOrEqual(atLeast);
  }
}

let codebook: RawCodebook;
let ours: Classified;
let got: DescribeResult;
let exitCode: number;

/** Items with a level, except the id. */
let items: RawItem[];
/** Usable weight per row (valid and >= 0), else null. */
let weights: Array<number | null>;
let weightItem: string | undefined;
/** Items with a level by name. */
let byName: Map<string, RawItem>;

const categorical = (item: RawItem) => item.level === 'nominal' || item.level === 'ordinal';
const continuous = (item: RawItem) => item.level === 'interval' || item.level === 'ratio';

/** Scale position (code index) of each row's valid cell, or -1. */
function positions(item: RawItem): number[] {
  const codes = item.codes!;
  return ours.cells[item.name]!.map((c) => {
    if (c.state !== 'valid') return -1;
    return codes.findIndex((k) => (typeof c.value === 'number' ? Number(k.code) === c.value : String(k.code) === c.value));
  });
}

/** Each row's valid number, or null. */
function numbers(item: RawItem): Array<number | null> {
  return ours.cells[item.name]!.map((c) => (c.state === 'valid' ? (c.value as number) : null));
}

function missingByKind(cells: Cell[]): Record<string, number> {
  const out: Record<string, number> = {};
  for (const c of cells) if (c.state === 'missing') out[c.kind] = (out[c.kind] ?? 0) + 1;
  return out;
}

/** Keys in a fixed order, so two tallies compare equal whatever order they were built in. */
function sortedKeys(o: Record<string, number>): Record<string, number> {
  return Object.fromEntries(Object.entries(o).sort(([a], [b]) => (a < b ? -1 : 1)));
}

beforeAll(async () => {
  codebook = JSON.parse(await readFile(new URL(`../${CODEBOOK}`, import.meta.url), 'utf8')) as RawCodebook;
  ours = readAndClassify(codebook, await readFile(new URL(`../${DELIVERY}`, import.meta.url), 'utf8'));
  let out = '';
  exitCode = await run(['describe', DELIVERY, '--codebook', CODEBOOK, '--pairs', 'all', '--json'], {
    stdout: (t: string) => void (out += t),
    stderr: () => undefined,
    isTTY: false,
    cwd: root,
  });
  got = JSON.parse(out) as DescribeResult;
  items = codebook.items.filter((item) => item.level !== undefined && item.role !== 'id');
  byName = new Map(items.map((item) => [item.name, item]));
  weightItem = codebook.items.find((item) => item.role === 'weight')?.name;
  weights = weightItem ? numbers(codebook.items.find((item) => item.name === weightItem)!).map((w) => (w !== null && w >= 0 ? w : null)) : [];
});

suite('codeweir describe --pairs all --json on the demo delivery, recomputed independently', () => {
  it('prints the document and exits 1 for the planted error findings', () => {
    // Interface contract: exit 1 when the delivery has error findings; the summaries are printed all the same.
    expect(exitCode).toBe(1);
    // csv-parse (outside parser): data rows of the delivery.
    expect(got.rows).toBe(ours.rows);
    expect(got.quantileType).toBe(7);
    expect(got.weight).toBe(weightItem);
    // Every item with a level except the id is described (the weight item too).
    expect(Object.keys(got.items).sort()).toEqual(items.map((item) => item.name).sort());
  });

  it('counts valid, missing by kind and invalid cells of every item as the contract classifies them', () => {
    const t = new Tally();
    for (const item of items) {
      const cells = ours.cells[item.name]!;
      const d = got.items[item.name]!;
      // First principles: counts of the cells classified by support/independent.ts from the csv-parse records.
      t.exact(`${item.name} n`, d.n, cells.filter((c) => c.state === 'valid').length);
      t.exact(`${item.name} missing`, sortedKeys(d.missing as Record<string, number>), sortedKeys(missingByKind(cells)));
      t.exact(`${item.name} invalid`, d.invalid, cells.filter((c) => c.state === 'invalid').length);
    }
    t.done(3 * items.length);
  });

  it('gives frequencies, modes, ordinal quartile codes and the grouped median of every coded item', () => {
    const t = new Tally();
    for (const item of items.filter(categorical)) {
      const d = got.items[item.name]!;
      const codes = item.codes!;
      const pos = positions(item);
      const counts = codes.map((_, k) => pos.filter((p) => p === k).length);
      const n = counts.reduce((s, v) => s + v, 0);
      const ordinal = item.level === 'ordinal';
      t.exact(`${item.name} frequency codes`, d.frequencies?.map((f) => [f.code, f.label]), codes.map((c) => [c.code, c.label]));
      let running = 0;
      codes.forEach((c, k) => {
        const f = d.frequencies?.[k];
        running += counts[k]!;
        // First principles: count of valid cells with the code; percent = 100 count / n; cumulative in scale order.
        t.exact(`${item.name} count of ${c.code}`, f?.count, counts[k]);
        t.near(`${item.name} percent of ${c.code}`, f?.percent, (100 * counts[k]!) / n);
        if (ordinal) t.near(`${item.name} cumulative percent of ${c.code}`, f?.cumulativePercent, (100 * running) / n);
        else t.exact(`${item.name} cumulative percent of ${c.code} (nominal: none)`, f?.cumulativePercent, undefined);
      });
      // First principles: every code with the largest count.
      const top = Math.max(...counts);
      t.exact(`${item.name} mode`, d.mode, codes.filter((_, k) => counts[k] === top).map((c) => c.code));
      if (ordinal) {
        // Hyndman-Fan type 1 on scale positions (its published definition, support/independent.ts quantile1).
        const sorted = ascending(pos.filter((p) => p >= 0));
        const [q1, med, q3] = [0.25, 0.5, 0.75].map((p) => quantile1(sorted, p));
        t.exact(`${item.name} q1Code`, d.q1Code, { code: codes[q1!]!.code, label: codes[q1!]!.label });
        t.exact(`${item.name} medianCode`, d.medianCode, { code: codes[med!]!.code, label: codes[med!]!.label });
        t.exact(`${item.name} q3Code`, d.q3Code, { code: codes[q3!]!.code, label: codes[q3!]!.label });
        t.exact(`${item.name} iqr in scale steps`, d.iqr, q3! - q1!);
      }
      if (codes.every((c) => c.bin !== undefined)) {
        t.near(`${item.name} grouped median`, d.groupedMedian, groupedMedian(codes, counts));
      }
    }
    t.done(100);
  });

  it('gives mean, sd, quartiles, moments, fences, outliers, cv and geometric mean of every interval and ratio item', () => {
    const t = new Tally();
    for (const item of items.filter(continuous)) {
      const d = got.items[item.name]!;
      const x = numbers(item).filter((v): v is number => v !== null);
      const s = ascending(x);
      const n = x.length;
      t.exact(`${item.name} min`, d.min, s[0]);
      t.exact(`${item.name} max`, d.max, s[n - 1]);
      t.near(`${item.name} range`, d.range, s[n - 1]! - s[0]!);
      // jStat.mean and jStat.stdev(x, true) (n - 1), jstat 1.9.6.
      t.near(`${item.name} mean`, d.mean, jStat.mean(x));
      t.near(`${item.name} sd`, d.sd, jStat.stdev(x, true));
      // Hyndman-Fan type 7 from its published formula (support/independent.ts quantile7).
      const [q1, med, q3] = [0.25, 0.5, 0.75].map((p) => quantile7(s, p)) as [number, number, number];
      t.near(`${item.name} q1`, d.q1, q1);
      t.near(`${item.name} median`, d.median, med);
      t.near(`${item.name} q3`, d.q3, q3);
      t.near(`${item.name} iqr`, d.iqr, q3 - q1);
      // jStat.skewness is g1 = m3 / m2^1.5 and jStat.kurtosis g2 = m4 / m2^2 - 3 (population moments);
      // the adjusted G1 = g1 sqrt(n (n - 1)) / (n - 2) and G2 = ((n + 1) g2 + 6)(n - 1) / ((n - 2)(n - 3)) are the standard small-sample adjustments.
      const g1 = jStat.skewness(x);
      const g2 = jStat.kurtosis(x);
      t.near(`${item.name} skewness G1`, d.skewness, (g1 * Math.sqrt(n * (n - 1))) / (n - 2));
      t.near(`${item.name} kurtosis G2`, d.kurtosis, (((n + 1) * g2 + 6) * (n - 1)) / ((n - 2) * (n - 3)));
      // Tukey fences at 1.5 and 3 IQR beyond the quartiles (Tukey's definition); outliers between inner and outer fences, extremes beyond the outer.
      const iqr = q3 - q1;
      const f = { lower: q1 - 1.5 * iqr, upper: q3 + 1.5 * iqr, lowerExtreme: q1 - 3 * iqr, upperExtreme: q3 + 3 * iqr };
      t.near(`${item.name} fence lower`, d.fences?.lower, f.lower);
      t.near(`${item.name} fence upper`, d.fences?.upper, f.upper);
      t.near(`${item.name} fence lowerExtreme`, d.fences?.lowerExtreme, f.lowerExtreme);
      t.near(`${item.name} fence upperExtreme`, d.fences?.upperExtreme, f.upperExtreme);
      const extreme = (v: number) => v < f.lowerExtreme || v > f.upperExtreme;
      t.exact(`${item.name} outliers`, d.outliers, x.filter((v) => !extreme(v) && (v < f.lower || v > f.upper)).length);
      t.exact(`${item.name} extremes`, d.extremes, x.filter(extreme).length);
      if ((d.outliers ?? 0) + (d.extremes ?? 0) > 0) {
        t.exact(`${item.name} lowest values beyond the fences`, d.outlierValues?.low, s.filter((v) => v < f.lower).slice(0, 5));
        t.exact(`${item.name} highest values beyond the fences`, d.outlierValues?.high, s.filter((v) => v > f.upper).reverse().slice(0, 5));
      }
      // First principles: every value of the largest multiplicity, when some value repeats.
      const mult = new Map<number, number>();
      for (const v of x) mult.set(v, (mult.get(v) ?? 0) + 1);
      const most = Math.max(...mult.values());
      t.exact(`${item.name} mode`, d.mode, most > 1 ? ascending([...mult].filter(([, c]) => c === most).map(([v]) => v)) : undefined);
      // First principles: the histogram's counts recounted from its own edges (bins left-closed, the last closed) add up to n.
      const h = d.histogram;
      if (h) {
        const recount = h.counts.map((_, b) => x.filter((v) => v >= h.edges[b]! && (b === h.counts.length - 1 ? v <= h.edges[b + 1]! : v < h.edges[b + 1]!)).length);
        t.exact(`${item.name} histogram counts`, h.counts, recount);
      }
      t.exact(`${item.name} histogram present`, h !== undefined, true);
      if (item.level === 'ratio') {
        // cv = sd (n - 1) / mean (jStat.coeffvar uses the population sd, so it is built here from jStat.stdev(x, true)).
        t.near(`${item.name} cv`, d.cv, jStat.stdev(x, true) / jStat.mean(x));
        // jStat.geomean = exp(mean(ln x)); defined only when every value is > 0.
        if (s[0]! > 0) t.near(`${item.name} geometric mean`, d.geometricMean, jStat.geomean(x));
        else t.exact(`${item.name} geometric mean withheld (a value <= 0)`, [d.geometricMean, typeof d.withheld.geometricMean], [undefined, 'string']);
      } else {
        t.exact(`${item.name} cv and geometric mean withheld (interval)`, [d.cv, d.geometricMean], [undefined, undefined]);
      }
    }
    t.done(250);
  });

  it('gives weighted figures with the codebook weight item (sum w x / sum w)', () => {
    const t = new Tally();
    expect(weightItem).toBeDefined();
    for (const item of items) {
      const d = got.items[item.name]!;
      if (item.name === weightItem) {
        t.exact('the weight item is not weighted by itself', d.weighted, undefined);
        continue;
      }
      const w = d.weighted;
      if (categorical(item)) {
        const pos = positions(item);
        const codes = item.codes!;
        const wc = codes.map(() => 0);
        let used = 0;
        let excluded = 0;
        pos.forEach((p, r) => {
          if (p < 0) return;
          if (weights[r] === null) excluded++;
          else {
            wc[p]! += weights[r]!;
            used++;
          }
        });
        const total = wc.reduce((s, v) => s + v, 0);
        // First principles: weighted count = sum of the weights of the valid cells with the code.
        t.near(`${item.name} sum of weights`, w?.sumOfWeights, total);
        t.exact(`${item.name} weighted n`, w?.n, used);
        t.exact(`${item.name} weighted excluded`, w?.excluded, excluded);
        codes.forEach((c, k) => {
          t.near(`${item.name} weighted count of ${c.code}`, d.frequencies?.[k]?.weightedCount, wc[k]);
          t.near(`${item.name} weighted percent of ${c.code}`, d.frequencies?.[k]?.weightedPercent, (100 * wc[k]!) / total);
          t.near(`${item.name} weighted percent[${c.code}]`, w?.percent?.[String(c.code)], (100 * wc[k]!) / total);
        });
        if (item.level === 'ordinal') {
          // Weighted ECDF inverse on scale positions: the first category whose cumulative weight share reaches p.
          const ps = codes.map((_, k) => k);
          const [q1, med, q3] = [0.25, 0.5, 0.75].map((p) => weightedQuantile(ps, wc, p));
          t.exact(`${item.name} weighted q1Code`, w?.q1Code?.code, codes[q1!]!.code);
          t.exact(`${item.name} weighted medianCode`, w?.medianCode?.code, codes[med!]!.code);
          t.exact(`${item.name} weighted q3Code`, w?.q3Code?.code, codes[q3!]!.code);
        }
      } else {
        const v = numbers(item);
        const xs: number[] = [];
        const ws: number[] = [];
        let excluded = 0;
        v.forEach((x, r) => {
          if (x === null) return;
          if (weights[r] === null) excluded++;
          else {
            xs.push(x);
            ws.push(weights[r]!);
          }
        });
        const sw = ws.reduce((s, a) => s + a, 0);
        const mean = xs.reduce((s, x, i) => s + ws[i]! * x, 0) / sw;
        // First principles: weighted mean sum(w x) / sum(w); frequency-weight sd sqrt(sum(w (x - mean)^2) / (sum(w) - 1)).
        t.near(`${item.name} sum of weights`, w?.sumOfWeights, sw);
        t.exact(`${item.name} weighted n`, w?.n, xs.length);
        t.exact(`${item.name} weighted excluded`, w?.excluded, excluded);
        t.near(`${item.name} weighted mean`, w?.mean, mean);
        t.near(`${item.name} weighted sd`, w?.sd, Math.sqrt(xs.reduce((s, x, i) => s + ws[i]! * (x - mean) ** 2, 0) / (sw - 1)));
        t.exact(`${item.name} weighted q1`, w?.q1, weightedQuantile(xs, ws, 0.25));
        t.exact(`${item.name} weighted median`, w?.median, weightedQuantile(xs, ws, 0.5));
        t.exact(`${item.name} weighted q3`, w?.q3, weightedQuantile(xs, ws, 0.75));
      }
    }
    t.done(200);
  });

  it('describes every pair of items with a level (id and weight left out), in codebook order', () => {
    const paired = items.filter((item) => item.role !== 'weight');
    const want: string[] = [];
    for (let i = 0; i < paired.length; i++) {
      for (let j = i + 1; j < paired.length; j++) {
        const [a, b] = [paired[i]!, paired[j]!];
        // Mixed pairs put the categorical item first.
        want.push(categorical(a) === categorical(b) || categorical(a) ? `${a.name}:${b.name}` : `${b.name}:${a.name}`);
      }
    }
    // First principles: k (k - 1) / 2 pairs of k paired items.
    expect(want.length).toBe((paired.length * (paired.length - 1)) / 2);
    expect(got.pairs.map((p) => `${p.x}:${p.y}`)).toEqual(want);
  });

  it('gives every categorical pair its table, chi-square, df, p, Cramer\'s V, phi, and ordinal rho and gamma', () => {
    const t = new Tally();
    const pairs = got.pairs.filter((p): p is PairCategorical => p.kind === 'categorical-categorical');
    for (const p of pairs) {
      const [a, b] = [byName.get(p.x)!, byName.get(p.y)!];
      const [pa, pb] = [positions(a), positions(b)];
      const table = a.codes!.map(() => b.codes!.map(() => 0));
      pa.forEach((i, r) => {
        if (i >= 0 && pb[r]! >= 0) table[i]![pb[r]!]!++;
      });
      const name = `${p.x} x ${p.y}`;
      const c = chiSquare(table);
      // First principles: rows valid on both items (pairwise complete), and the cross-tabulated counts.
      t.exact(`${name} n`, p.n, c.n);
      t.exact(`${name} table`, p.table, table);
      for (let i = 0; i < table.length; i++) {
        for (let j = 0; j < table[0]!.length; j++) t.near(`${name} expected[${i}][${j}]`, p.expected[i]![j], c.expected[i]![j]);
      }
      // Pearson chi-square sum (O - E)^2 / E over rows and columns with non-zero margins, no continuity correction, df = (r' - 1)(c' - 1).
      t.near(`${name} chi-square`, p.chiSquare, c.statistic);
      t.exact(`${name} df`, p.df, c.df);
      // jStat.chisquare.cdf (jstat 1.9.6); 1 - cdf loses digits of tiny p, so p is compared absolutely.
      t.near(`${name} p`, p.p, c.statistic === null ? null : 1 - jStat.chisquare.cdf(c.statistic, c.df), 0, 1e-9);
      // Cramer's V = sqrt(X^2 / (n (min(r', c') - 1))) over the occupied rows and columns.
      const k = Math.min(c.rows.length, c.columns.length) - 1;
      t.near(`${name} Cramer's V`, p.cramersV, c.statistic === null || k < 1 ? null : Math.sqrt(c.statistic / (c.n * k)));
      // Signed phi (ad - bc) / sqrt(product of margins) of the occupied table when it is 2 x 2.
      if (c.rows.length === 2 && c.columns.length === 2) {
        const [[x11, x12], [x21, x22]] = c.rows.map((i) => c.columns.map((j) => table[i]![j]!)) as [[number, number], [number, number]];
        t.near(`${name} phi`, p.phi, (x11 * x22 - x12 * x21) / Math.sqrt((x11 + x12) * (x21 + x22) * (x11 + x21) * (x12 + x22)));
      } else t.exact(`${name} phi (not 2 x 2)`, p.phi, null);
      t.near(`${name} share of expected counts below 5`, p.lowExpectedPercent, c.lowExpected);
      // First principles: cell, row and column percents (0 to 100) of the counts.
      const rowSums = table.map((r) => r.reduce((s, v) => s + v, 0));
      const colSums = table[0]!.map((_, j) => table.reduce((s, r) => s + r[j]!, 0));
      for (const i of c.rows) {
        for (const j of c.columns) {
          t.near(`${name} cell percent[${i}][${j}]`, p.cellPercent[i]![j], (100 * table[i]![j]!) / c.n);
          t.near(`${name} row percent[${i}][${j}]`, p.rowPercent[i]![j], (100 * table[i]![j]!) / rowSums[i]!);
          t.near(`${name} column percent[${i}][${j}]`, p.columnPercent[i]![j], (100 * table[i]![j]!) / colSums[j]!);
        }
      }
      if (a.level === 'ordinal' && b.level === 'ordinal') {
        // jStat.spearmancoeff on the complete pairs' scale positions (Pearson's r of average ranks).
        const xs: number[] = [];
        const ys: number[] = [];
        pa.forEach((i, r) => {
          if (i >= 0 && pb[r]! >= 0) {
            xs.push(i);
            ys.push(pb[r]!);
          }
        });
        t.near(`${name} Spearman's rho`, p.spearman, jStat.spearmancoeff(xs, ys));
        // Goodman-Kruskal gamma (C - D) / (C + D) counted from the table (support/independent.ts gamma).
        t.near(`${name} gamma`, p.gamma, gamma(table));
      } else t.exact(`${name} no rho or gamma (not both ordinal)`, [p.spearman, p.gamma], [undefined, undefined]);
    }
    expect(pairs.length).toBeGreaterThan(0);
    t.done(pairs.length * 10);
  });

  it('gives every continuous pair its n, Pearson r, Spearman rho and bivariate outliers', () => {
    const t = new Tally();
    const pairs = got.pairs.filter((p): p is PairContinuous => p.kind === 'continuous-continuous');
    // Chi-square with 2 df has cdf 1 - exp(-x / 2), so its 0.999 point is -2 ln(0.001); also jStat.chisquare.inv.
    const cutoff = -2 * Math.log(0.001);
    t.near('chi-square(2) 0.999 point by jStat', jStat.chisquare.inv(0.999, 2), cutoff, 1e-6);
    for (const p of pairs) {
      const [va, vb] = [numbers(byName.get(p.x)!), numbers(byName.get(p.y)!)];
      const xs: number[] = [];
      const ys: number[] = [];
      const rows: number[] = [];
      va.forEach((x, r) => {
        if (x !== null && vb[r] !== null) {
          xs.push(x);
          ys.push(vb[r]!);
          rows.push(r + 1);
        }
      });
      const name = `${p.x} x ${p.y}`;
      t.exact(`${name} n`, p.n, xs.length);
      // jStat.corrcoeff and jStat.spearmancoeff (ties averaged), jstat 1.9.6.
      t.near(`${name} Pearson r`, p.pearson, jStat.corrcoeff(xs, ys));
      t.near(`${name} Spearman rho`, p.spearman, jStat.spearmancoeff(xs, ys));
      t.near(`${name} Mahalanobis cut-off`, p.mahalanobisCutoff, cutoff);
      // Squared Mahalanobis distances with the sample covariance, written out for two variables; rows strictly beyond the cut-off.
      const d2 = mahalanobis2(xs, ys);
      t.exact(`${name} bivariate outlier rows`, p.bivariateOutliers, rows.filter((_, i) => d2[i]! > cutoff));
      t.near(`${name} largest squared distance`, p.maxMahalanobis, Math.max(...d2));
    }
    expect(pairs.length).toBeGreaterThan(0);
    t.done(pairs.length * 6);
  });

  it('gives every categorical x continuous pair its groups and eta squared (SS between / SS total)', () => {
    const t = new Tally();
    const pairs = got.pairs.filter((p): p is PairMixed => p.kind === 'categorical-continuous');
    for (const p of pairs) {
      const a = byName.get(p.x)!;
      const pa = positions(a);
      const vb = numbers(byName.get(p.y)!);
      const groups = a.codes!.map(() => [] as number[]);
      pa.forEach((i, r) => {
        if (i >= 0 && vb[r] !== null) groups[i]!.push(vb[r]!);
      });
      const name = `${p.x} x ${p.y}`;
      const all = groups.flat();
      t.exact(`${name} n`, p.n, all.length);
      t.exact(`${name} group codes`, p.groups.map((g) => g.code), a.codes!.map((c) => c.code));
      groups.forEach((g, k) => {
        const s = ascending(g);
        const gd = p.groups[k];
        const at = `${name} group ${a.codes![k]!.code}`;
        t.exact(`${at} n`, gd?.n, g.length);
        if (g.length === 0) {
          t.exact(`${at} empty`, [gd?.mean, gd?.sd, gd?.median], [null, null, null]);
          return;
        }
        // jStat.mean and jStat.stdev(x, true) (n - 1); type 7 quartiles from the published formula.
        t.near(`${at} mean`, gd?.mean, jStat.mean(g));
        t.near(`${at} sd`, gd?.sd, g.length > 1 ? jStat.stdev(g, true) : null);
        const [q1, med, q3] = [0.25, 0.5, 0.75].map((q) => quantile7(s, q)) as [number, number, number];
        t.near(`${at} q1`, gd?.q1, q1);
        t.near(`${at} median`, gd?.median, med);
        t.near(`${at} q3`, gd?.q3, q3);
        // Tukey fences at 1.5 and 3 IQR: outliers between the fences, extremes beyond the outer ones.
        const iqr = q3 - q1;
        const [lo, hi, loX, hiX] = [q1 - 1.5 * iqr, q3 + 1.5 * iqr, q1 - 3 * iqr, q3 + 3 * iqr];
        t.exact(`${at} outliers`, gd?.outliers, g.filter((v) => v >= loX && v <= hiX && (v < lo || v > hi)).length);
        t.exact(`${at} extremes`, gd?.extremes, g.filter((v) => v < loX || v > hiX).length);
      });
      // First principles: SS between = sum n_g (mean_g - grand mean)^2 over the groups, SS total about the grand mean.
      const grand = all.reduce((s, v) => s + v, 0) / all.length;
      const between = groups.filter((g) => g.length > 0).reduce((s, g) => s + g.length * (g.reduce((a2, v) => a2 + v, 0) / g.length - grand) ** 2, 0);
      const total = sumOfSquares(all);
      t.near(`${name} eta squared`, p.etaSquared, total > 0 ? between / total : null);
    }
    expect(pairs.length).toBeGreaterThan(0);
    t.done(pairs.length * 20);
  });
});

/**
 * Grouped-data median L + ((n / 2 - F) / f) w from the textbook rule: class boundaries halfway
 * between one bin's upper limit and the next one's lower limit, the outer boundaries half the
 * neighbouring gap beyond the limits; the median class is the first whose cumulative count
 * reaches n / 2. An open top bin as the median class has no width: undefined then.
 */
function groupedMedian(codes: NonNullable<RawItem['codes']>, counts: number[]): number | undefined {
  const bins = codes.map((c, k) => ({ min: c.bin!.min, max: c.bin!.max, count: counts[k]! })).sort((x, y) => x.min - y.min);
  const gap = (k: number) => (bins[k]!.max === undefined ? 0 : bins[k + 1]!.min - bins[k]!.max!);
  const n = counts.reduce((s, v) => s + v, 0);
  let below = 0;
  for (let k = 0; k < bins.length; k++) {
    const b = bins[k]!;
    if (b.count > 0 && below + b.count >= n / 2) {
      if (b.max === undefined) return undefined;
      const lower = b.min - (k > 0 ? gap(k - 1) : gap(0)) / 2;
      const upper = b.max + (k + 1 < bins.length ? gap(k) : gap(k - 1)) / 2;
      return lower + ((n / 2 - below) / b.count) * (upper - lower);
    }
    below += b.count;
  }
  return undefined;
}

