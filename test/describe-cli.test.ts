import { describe as suite, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { cli } from './support/cli.ts';
import type { DescribeResult } from '../packages/describe/src/index.ts';

interface RSample {
  x: number[];
  mean: number;
  sd: number;
  quantile: Record<string, number[]>;
}
const R = JSON.parse(await readFile(new URL('./reference/r-oracle.json', import.meta.url), 'utf8')) as { probs: number[]; samples: Record<string, RSample> };
// csv-parse is the parsing oracle; it is a dependency of the read package, so resolve it from there.
const { parse } = createRequire(new URL('../packages/read/package.json', import.meta.url))('csv-parse/sync') as {
  parse: (input: string, options: Record<string, unknown>) => string[][];
};

let dir = '';
const odd7 = R.samples.odd7!;

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-describe-'));
  const codebook = {
    codebook: 'describe-cli-test',
    version: '1',
    title: 'describe CLI test',
    items: [
      { name: 'id', label: 'Record', role: 'id', type: 'integer' },
      { name: 'dist', label: 'Distance', type: 'decimal', level: 'ratio', unit: 'km', missing: [{ code: -9, kind: 'refused' }] },
      { name: 'water', label: 'Water source', type: 'integer', level: 'nominal', codes: [{ code: 1, label: 'tap' }, { code: 2, label: 'well' }] },
      {
        name: 'trips',
        label: 'Market trips',
        type: 'integer',
        level: 'ordinal',
        codes: [
          { code: 1, label: 'none', bin: { min: 0, max: 0 } },
          { code: 2, label: '1 to 3', bin: { min: 1, max: 3 } },
          { code: 3, label: '4 or more', bin: { min: 4 } },
        ],
      },
    ],
  };
  // The R sample odd7 as distances, then one refused distance (-9) and one blank.
  const water = [1, 1, 2, 1, 2, 2, 1, 1, 2];
  const trips = [1, 2, 2, 2, 3, 3, 1, 2, 2];
  const dist = [...odd7.x.map(String), '-9', ''];
  const lines = ['id,dist,water,trips', ...dist.map((d, i) => `${i + 1},${d},${water[i]},${trips[i]}`)];
  await writeFile(join(dir, 'cb.json'), JSON.stringify(codebook));
  await writeFile(join(dir, 'data.csv'), lines.join('\n') + '\n');
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

suite('codeweir describe --json on a small delivery', () => {
  it('interval/ratio figures match R 4.2.2 on odd7, with the quantile type from --quantiles', async () => {
    const r = await cli(['describe', 'data.csv', '--codebook', 'cb.json', '--json', '--quantiles', '6', '--percentiles', '10,90'], dir);
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.out) as DescribeResult;
    expect(doc.quantileType).toBe(6);
    const d = doc.items.dist!;
    expect(d.n).toBe(7);
    expect(d.missing).toEqual({ refused: 1, blank: 1 }); // first principles: one -9, one empty cell
    expect(d.mean).toBeCloseTo(odd7.mean, 10); // R 4.2.2 mean(x)
    expect(d.sd).toBeCloseTo(odd7.sd, 10); // R 4.2.2 sd(x)
    expect(d.q1).toBeCloseTo(odd7.quantile.type6![2]!, 10); // R quantile(x, 0.25, type = 6)
    expect(d.q3).toBeCloseTo(odd7.quantile.type6![4]!, 10);
    expect(d.percentiles!['10']).toBeCloseTo(odd7.quantile.type6![1]!, 10);
    expect(d.unit).toBe('km');
    expect(doc.items.id).toBeUndefined();
  });

  it('nominal and binned items: counts by hand, grouped median by the textbook formula', async () => {
    const r = await cli(['describe', 'data.csv', '--codebook', 'cb.json', '--json'], dir);
    const doc = JSON.parse(r.out) as DescribeResult;
    const water = doc.items.water!;
    expect(water.frequencies!.map((f) => f.count)).toEqual([5, 4]);
    expect(water.mode).toEqual([1]);
    expect(water.withheld.mean).toMatch(/nominal/);
    const trips = doc.items.trips!;
    // Counts 2, 5, 2 (n = 9): boundaries -0.5, 0.5, 3.5, open; n/2 = 4.5 falls in "1 to 3":
    // 0.5 + (4.5 - 2) / 5 x 3 = 2.
    expect(trips.frequencies!.map((f) => f.count)).toEqual([2, 5, 2]);
    expect(trips.groupedMedian).toBeCloseTo(2, 12);
    expect(trips.medianCode!.code).toBe(2);
  });

  it('prints a readable summary with the conventions without --json', async () => {
    const r = await cli(['describe', 'data.csv', '--codebook', 'cb.json'], dir);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^dist \(ratio, km\): n 7, missing (refused 1, blank 1|blank 1, refused 1), invalid 0$/m);
    expect(r.out).toMatch(/sd: sample standard deviation with n - 1 denominator/);
  });

  it('usage errors: one sentence with the bad value, exit 2, nothing on stdout', async () => {
    const q = await cli(['describe', 'data.csv', '--codebook', 'cb.json', '--quantiles', '12'], dir);
    expect(q.code).toBe(2);
    expect(q.out).toBe('');
    expect(q.err).toBe('codeweir: --quantiles takes 1 to 9, got 12.\n');
    const w = await cli(['describe', 'data.csv', '--codebook', 'cb.json', '--weight', 'nope'], dir);
    expect(w.code).toBe(2);
    expect(w.err).toMatch(/--weight names "nope", which is not an item of the codebook/);
    const p = await cli(['describe', 'data.csv', '--codebook', 'cb.json', '--pairs', 'some'], dir);
    expect(p.code).toBe(2);
    expect(p.err).toMatch(/--pairs takes 'all'/);
    const f = await cli(['describe', 'absent.csv', '--codebook', 'cb.json'], dir);
    expect(f.code).toBe(2);
    expect(f.err).not.toMatch(/\n\s+at /);
  });
});

suite('codeweir describe on the demo delivery', () => {
  const examples = new URL('../examples/', import.meta.url).pathname;
  it('every cell of an item is valid, missing or invalid; pairs come through; weights from the codebook', async () => {
    const r = await cli(['describe', 'demo-delivery.csv', '--codebook', 'household.codebook.json', '--json', '--pair', 'sex:edu', '--pair', 'age:income'], examples);
    // The demo delivery carries planted faults at error severity: exit 1, summaries printed anyway.
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/^codeweir: the delivery has \d+ error findings; the summaries cover valid cells only/);
    const doc = JSON.parse(r.out) as DescribeResult;
    const rows = parse(await readFile(join(examples, 'demo-delivery.csv'), 'utf8'), { relax_column_count: true }).length - 1;
    expect(doc.rows).toBe(rows); // csv-parse as the row-count oracle
    for (const [name, d] of Object.entries(doc.items)) {
      const missing = Object.values(d.missing).reduce((a, b) => a + (b ?? 0), 0);
      expect(d.n + d.invalid + missing, name).toBe(rows);
    }
    expect(doc.pairs.map((p) => p.kind)).toEqual(['categorical-categorical', 'continuous-continuous']);
    expect(doc.weight).toBe('weight');
    expect(doc.items.age!.weighted!.n).toBeLessThanOrEqual(doc.items.age!.n);
  });
});
