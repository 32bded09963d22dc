/**
 * Quartiles and Tukey fences behind the outlier / extreme findings, against R 4.2.2:
 * quantile(x, c(0.25, 0.75), type = 7) (and type = 6) from test/reference/r-oracle.json.
 * Fences are q1 - 1.5 IQR, q3 + 1.5 IQR (outliers) and q1 - 3 IQR, q3 + 3 IQR (extremes),
 * IQR = q3 - q1 (Tukey's definition), computed here from R's quartiles.
 */
import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { codebook, run, idItem } from './helpers.ts';

interface Sample {
  x: number[];
  quantile: Record<string, number[]>;
}
const oracle = JSON.parse(readFileSync(new URL('../../../test/reference/r-oracle.json', import.meta.url), 'utf8')) as { probs: number[]; samples: Record<string, Sample> };
const P25 = oracle.probs.indexOf(0.25);
const P75 = oracle.probs.indexOf(0.75);

const cb = codebook([
  idItem,
  { name: 'x', label: 'Quantity', type: 'decimal', level: 'ratio', missing: [{ code: -99999, kind: 'refused' }] },
]);

function expected(sample: Sample, type: string) {
  const q1 = sample.quantile[type]![P25]!;
  const q3 = sample.quantile[type]![P75]!;
  const iqr = q3 - q1;
  return { q1, q3, lower: q1 - 1.5 * iqr, upper: q3 + 1.5 * iqr, lowerExtreme: q1 - 3 * iqr, upperExtreme: q3 + 3 * iqr };
}

describe('Tukey fences from the retained values', () => {
  for (const name of ['ties10', 'odd7', 'normal1000', 'skewed500']) {
    it(`${name}: quartiles match R type 7, outliers and extremes are the values beyond the fences`, async () => {
      const s = oracle.samples[name]!;
      // Missing codes and blanks among the values must not enter the quartiles.
      const rows = [...s.x.map((v, i) => [String(i + 1), String(v)]), ['0', '-99999'], ['0', '']];
      const r = await run(cb, rows, { maxFindingsPerRule: 100_000 });
      const f = r.summary.fences!.x!;
      const e = expected(s, 'type7');
      // R prints 15 significant digits; compare to 1e-9 relative.
      for (const k of ['q1', 'q3', 'lower', 'upper', 'lowerExtreme', 'upperExtreme'] as const) expect(f[k]).toBeCloseTo(e[k], 9);
      const ext = s.x.map((v, i) => [i + 1, v] as const).filter(([, v]) => v < e.lowerExtreme || v > e.upperExtreme);
      const out = s.x.map((v, i) => [i + 1, v] as const).filter(([, v]) => (v < e.lower || v > e.upper) && !(v < e.lowerExtreme || v > e.upperExtreme));
      expect(r.findings.filter((x) => x.rule === 'extreme').map((x) => x.row)).toEqual(ext.map(([row]) => row));
      expect(r.findings.filter((x) => x.rule === 'outlier').map((x) => x.row)).toEqual(out.map(([row]) => row));
      expect(r.findings.filter((x) => x.rule === 'outlier').every((x) => x.severity === 'info')).toBe(true);
    });
  }

  it('uses the configured Hyndman-Fan type (R type = 6)', async () => {
    const s = oracle.samples.skewed500!;
    const r = await run(cb, s.x.map((v, i) => [String(i + 1), String(v)]), { quantileType: 6 });
    const e = expected(s, 'type6');
    expect(r.summary.quantileType).toBe(6);
    expect(r.summary.fences!.x!.q1).toBeCloseTo(e.q1, 9);
    expect(r.summary.fences!.x!.q3).toBeCloseTo(e.q3, 9);
  });

  it('counts every outlier exactly while the log keeps the first N in row order', async () => {
    const s = oracle.samples.skewed500!;
    const all = await run(cb, s.x.map((v, i) => [String(i + 1), String(v)]), { maxFindingsPerRule: 100_000 });
    const capped = await run(cb, s.x.map((v, i) => [String(i + 1), String(v)]), { maxFindingsPerRule: 3 });
    const rows = all.findings.filter((x) => x.rule === 'outlier').map((x) => x.row);
    expect(rows.length).toBeGreaterThan(3);
    expect(capped.summary.findings.byRule.outlier).toBe(rows.length);
    expect(capped.findings.filter((x) => x.rule === 'outlier').map((x) => x.row)).toEqual(rows.slice(0, 3));
  });
});
