/**
 * Quartiles and Tukey fences behind the outlier / extreme findings, against R 4.2.2:
 * quantile(x, c(0.25, 0.75), type = 7) (and type = 6) from test/reference/r-oracle.json.
 * Fences are q1 - 1.5 IQR, q3 + 1.5 IQR (outliers) and q1 - 3 IQR, q3 + 3 IQR (extremes),
 * IQR = q3 - q1 (Tukey's definition), computed here from R's quartiles.
 */
import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { codebook, run, idItem } from './helpers.ts';
import { createPass, finalize } from '../src/index.ts';
import { fenceQuartiles } from '../src/finalize.ts';

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

describe('fenceQuartiles: the quartiles of a column, as finalize or a worker computes them', () => {
  it('matches R type 7 and type 6 on each sample with not-valid (NaN) cells, with or without a scratch buffer', () => {
    for (const [name, sample] of Object.entries(oracle.samples)) {
      // A not-valid cell (NaN) before every 4th value: the valid values stay R's sample.
      const col = Float64Array.from(sample.x.flatMap((v, i) => (i % 4 === 0 ? [Number.NaN, v] : [v])));
      for (const type of ['type7', 'type6'] as const) {
        const q = type === 'type7' ? 7 : 6;
        // R 4.2.2 quantile(x, c(0.25, 0.75), type = 7 / 6), from test/reference/r-oracle.json.
        const [q1, q3] = fenceQuartiles(col, q)!;
        expect(q1, `${name} ${type}`).toBeCloseTo(sample.quantile[type]![P25]!, 10);
        expect(q3, `${name} ${type}`).toBeCloseTo(sample.quantile[type]![P75]!, 10);
        // The same bits with a scratch buffer, which it may overwrite.
        expect(fenceQuartiles(col, q, new Float64Array(col.length).fill(7))).toEqual([q1, q3]);
      }
    }
    expect(fenceQuartiles(Float64Array.of(Number.NaN), 7)).toBeNull();
  });

  it('finalize uses quartiles it is given and computes the rest itself, to the same result', () => {
    const s = oracle.samples.normal1000!;
    const rows = s.x.map((v, i) => [String(i + 1), String(v)]);
    const part = () => {
      const p = createPass(cb, ['id', 'x'], {});
      p.push({ count: rows.length, firstRow: 1, fields: rows.flat(), offsets: Uint32Array.from({ length: rows.length + 1 }, (_, k) => 2 * k), lines: new Uint32Array(rows.length) });
      return p.finish();
    };
    const plain = finalize(part());
    const x = cb.byName.get('x')!.index;
    const given = finalize(part(), { quartiles: new Map([[x, fenceQuartiles(Float64Array.from(s.x), 7)]]) });
    expect(JSON.stringify(given.summary)).toBe(JSON.stringify(plain.summary));
    expect(JSON.stringify(given.findings)).toBe(JSON.stringify(plain.findings));
    // A wrong quartile pair given would show: the fences follow what is given.
    const moved = finalize(part(), { quartiles: new Map([[x, [0, 0] as [number, number]]]) });
    expect(moved.summary.fences!.x!.q1).toBe(0);
  });
});
