import { readFileSync } from 'node:fs';
import { describe, it, expect } from 'vitest';
import { resolveSampleDesign, designMean, designProportions, designEffect, logitInterval, meanInterval, type SampleDesign } from '../src/index.ts';
import { referenceFile, surveyReference, type SurveyCase } from '../../../test/reference/survey-design.ts';

// Oracle: R's survey package (svydesign, svymean with deff = TRUE, confint with df = degf,
// svyciprop method = "logit", svyby), on the school samples apistrat and apiclus1 and the nhanes
// sample that package ships; values made by test/reference/survey-design.R.
const here = referenceFile;
const reference = surveyReference;

/** The CSV files R wrote: no embedded commas or quotes, strings quoted, NA as empty. */
function readCsv(file: string): Record<string, string[]> {
  const lines = readFileSync(here(file), 'utf8').trim().split('\n');
  const unq = (s: string): string => (s.startsWith('"') ? s.slice(1, -1) : s);
  const head = lines[0]!.split(',').map(unq);
  const cols: Record<string, string[]> = Object.fromEntries(head.map((h) => [h, []]));
  for (const line of lines.slice(1)) line.split(',').forEach((v, i) => cols[head[i]!]!.push(unq(v)));
  return cols;
}
const numbers = (col: string[]): Float64Array => Float64Array.from(col, (v) => (v === '' ? Number.NaN : Number(v)));
/** Keys of a column as integers (first-seen order), -1 for empty. */
function keys(col: string[]): Int32Array {
  const at = new Map<string, number>();
  return Int32Array.from(col, (v) => {
    if (v === '') return -1;
    if (!at.has(v)) at.set(v, at.size);
    return at.get(v)!;
  });
}
const distinctSorted = (col: string[]): string[] => {
  const vals = [...new Set(col.filter((v) => v !== ''))];
  return vals.every((v) => !Number.isNaN(Number(v))) ? vals.sort((a, b) => Number(a) - Number(b)) : vals.sort();
};

function designOf(c: SurveyCase, data: Record<string, string[]>): SampleDesign {
  const d = c.design;
  return resolveSampleDesign({
    weights: numbers(data[d.weight]!),
    ...(d.strata ? { strata: keys(data[d.strata]!) } : {}),
    ...(d.cluster ? { clusters: keys(data[d.cluster]!) } : {}),
    ...(d.fpc ? { fpc: numbers(data[d.fpc]!) } : {}),
  });
}

const close = (actual: number, expected: number, rel = 1e-9): void => {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(rel * Math.max(1, Math.abs(expected)));
};

describe('design-based means and proportions against R survey', () => {
  for (const c of reference.cases) {
    const data = readCsv(c.file);
    const design = designOf(c, data);
    it(`${c.name}: ${c.estimates.length} estimates`, () => {
      for (const e of c.estimates) {
        const domain = e.by !== undefined ? { of: Int32Array.from(data[e.by]!, (v) => (v === String(e.domain) ? 1 : 0)), code: 1 } : undefined;
        let got;
        let n: number;
        let df: number;
        if (e.kind === 'mean') {
          const m = designMean(design, numbers(data[e.item]!), domain)!;
          got = m;
          n = m.n;
          df = m.df;
        } else {
          const codes = distinctSorted(data[e.item]!);
          const cats = Int32Array.from(data[e.item]!, (v) => codes.indexOf(v));
          const p = designProportions(design, cats, codes.length, domain)!;
          got = p.categories[codes.indexOf(String(e.code))]!;
          n = p.n;
          df = p.df;
        }
        expect(n).toBe(e.n);
        expect(df).toBe(e.df);
        close(got.estimate, e.estimate);
        close(got.se, e.se);
        if (typeof e.deff === 'number') {
          close(got.deff, e.deff);
          close(got.nEffective, e.n / e.deff);
          expect(got.deffBasis).toBe('without-replacement');
        } else {
          // R's deff is NaN where every case has the same value (no variance to compare with).
          expect(got.deff).toBeNaN();
        }
        // R's logit interval of a proportion of 0 or 1 is the point itself to about 1e-11.
        close(got.ci!.low, e.ciLow, 1e-8);
        close(got.ci!.high, e.ciHigh, 1e-8);
      }
    });
  }

  it('flags the single-cluster stratum and counts no excluded rows', () => {
    const c = reference.cases.find((x) => x.design.singleCluster === 'adjust')!;
    const design = designOf(c, readCsv(c.file));
    expect(design.singleClusterStrata.map((s) => design.strataKeys[s])).toHaveLength(1);
    expect(design.excludedRows).toBe(0);
  });

  it('weights scaled to the sample size: deff against sampling with replacement (R deff = "replace")', () => {
    const data = readCsv('survey-apistrat.csv');
    const pw = numbers(data.pw!);
    const total = pw.reduce((a, b) => a + b, 0);
    const design = resolveSampleDesign({ weights: pw.map((w) => (w * pw.length) / total), strata: keys(data.stype!) });
    const m = designMean(design, numbers(data.api00!))!;
    close(m.estimate, reference.replace.estimate);
    close(m.se, reference.replace.se);
    close(m.deff, reference.replace.deff);
    expect(m.deffBasis).toBe('with-replacement');
  });
});

describe('design structure', () => {
  it('fractions and counts read the same (apistrat fpc and fpcf give the same SE; R agrees, see above)', () => {
    const data = readCsv('survey-apistrat.csv');
    const base = { weights: numbers(data.pw!), strata: keys(data.stype!) };
    const a = designMean(resolveSampleDesign({ ...base, fpc: numbers(data.fpc!) }), numbers(data.api00!))!;
    const b = designMean(resolveSampleDesign({ ...base, fpc: numbers(data.fpcf!) }), numbers(data.api00!))!;
    close(a.se, b.se, 1e-12);
  });

  it('rejects fpc values that change within a stratum or mix fractions and counts', () => {
    expect(() => resolveSampleDesign({ weights: [1, 1], strata: [0, 0], fpc: [10, 11] })).toThrow(/differs within stratum 0/);
    expect(() => resolveSampleDesign({ weights: [1, 1], strata: [0, 1], fpc: [0.5, 11] })).toThrow(/mix sampling fractions/);
    expect(() => resolveSampleDesign({ weights: [1, 1, 1], strata: [0, 0, 0], fpc: [2, 2, 2] })).toThrow(/3 sampled clusters/);
  });

  it('leaves out rows with a non-positive or missing weight, or an unknown stratum or cluster', () => {
    const d = resolveSampleDesign({ weights: [1, 0, -1, Number.NaN, 2, 2], strata: [0, 0, 0, 0, -1, 0], clusters: [0, 0, 0, 0, 0, -1] });
    expect(d.excludedRows).toBe(5);
    expect(Array.from(d.clusterOfRow)).toEqual([0, -1, -1, -1, -1, -1]);
  });
});

describe('intervals and design effect from first principles', () => {
  it('logit interval stays inside 0 to 1 and is symmetric on the logit scale', () => {
    const ci = logitInterval(0.02, 0.03, 30)!;
    expect(ci.low).toBeGreaterThan(0);
    const logit = (p: number): number => Math.log(p / (1 - p));
    close(logit(ci.high) - logit(0.02), logit(0.02) - logit(ci.low), 1e-12);
    expect(logitInterval(0.5, 0.1, 0)).toBeNull();
  });
  it('mean interval uses the t quantile (t(0.975, 10) = 2.228139, printed tables)', () => {
    close(meanInterval(0, 1, 10)!.high, 2.228139, 1e-6);
  });
  it('deff of 1 when the design variance equals the simple-random-sampling variance', () => {
    // s2 = 11/10 x 10 = 11; without replacement from N = 1000: 11 x 989 / (1000 x 11).
    const e = designEffect((11 * 989) / (1000 * 11), 10, 11, 1000);
    close(e.deff, 1, 1e-12);
    close(e.nEffective, 11, 1e-12);
  });
});
