/**
 * "No count below k survives in any output written with --min-cell k": the installed-style CLI
 * (the bundle `pnpm build` makes, run as its own process) on a delivery with small cells, for
 * check --split-by --min-cell, report --split-by --min-cell and describe --min-cell --json;
 * then every file written is scanned for a count from 1 to k - 1 in a count position (CSV count
 * columns, JSON count fields, HTML table columns and facts of counts, on the main page and every
 * team page). The oracle is the definition itself: a count there is 0, at least k, or suppressed.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { execFile } from 'node:child_process';
import { mkdtemp, readdir, readFile, rm, writeFile, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { buildBundle } from '../scripts/bundle.ts';

const exec = promisify(execFile);
const K = 5;
let dir = '';
let dist = '';

async function bundled(argv: string[]): Promise<{ code: number; out: string }> {
  try {
    const r = await exec(process.execPath, [join(dist, 'codeweir.mjs'), ...argv], { cwd: dir, maxBuffer: 64 * 2 ** 20 });
    return { code: 0, out: r.stdout };
  } catch (e) {
    const x = e as { code: number; stdout: string };
    return { code: x.code, out: x.stdout };
  }
}

async function filesUnder(p: string): Promise<string[]> {
  if (!(await stat(p)).isDirectory()) return [p];
  const out: string[] = [];
  for (const f of await readdir(p)) out.push(...(await filesUnder(join(p, f))));
  return out;
}

const small = (v: number): boolean => v >= 1 && v < K;
/** A table cell as a count: '-' or '[s]' (suppressed), or its number (digit grouping and a leading ≥ dropped). */
const countOf = (text: string): number | null => {
  const t = text.replace(/<[^>]+>/g, '').replace(/[≥,\s]/g, '');
  return t === '-' || t === '[s]' || t === '' || !/^\d+$/.test(t) ? null : Number(t);
};

/** Columns of counts in the report's tables (the others hold codes, labels, percents or statistics). */
const COUNT_HEADS = new Set(['count', 'records', 'rows', 'errors', 'warnings', 'findings', 'valid', 'invalid', 'passed', 'failed', 'undetermined', 'not applicable', 'outliers', 'extremes', 'missing', 'blank', 'refused', 'dont-know', 'not-applicable', 'omitted', 'valid-skip']);

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-disclosure-e2e-'));
  dist = join(dir, 'dist');
  await buildBundle(true, dist);
  // The invented demo delivery, its first 400 records: teams of 26 to 45 rows, rare codes, income confidential.
  const cb = JSON.parse(await readFile(new URL('../examples/household.codebook.json', import.meta.url), 'utf8')) as { $schema?: string; items: Array<Record<string, unknown>> };
  delete cb.$schema;
  for (const it of cb.items) if (it.name === 'income') it.confidential = true;
  await writeFile(join(dir, 'cb.json'), JSON.stringify(cb));
  const lines = (await readFile(new URL('../examples/demo-delivery.csv', import.meta.url), 'utf8')).split('\n').slice(0, 401);
  await writeFile(join(dir, 'd.csv'), lines.join('\n') + '\n');
}, 240_000);
afterAll(() => rm(dir, { recursive: true, force: true }));

describe('every output written with --min-cell k', () => {
  it('holds no count from 1 to k - 1 in a count position', async () => {
    expect((await bundled(['check', 'd.csv', '--codebook', 'cb.json', '--out', 'out', '--split-by', 'team', '--min-cell', String(K)])).code).toBe(1);
    expect((await bundled(['report', 'd.csv', '--codebook', 'cb.json', '-o', 'r.html', '--split-by', 'team', '--min-cell', String(K), '--quiet'])).code).toBe(1);
    const d = await bundled(['describe', 'd.csv', '--codebook', 'cb.json', '--min-cell', String(K), '--json']);
    await writeFile(join(dir, 'describe.json'), d.out);
    const left: string[] = [];
    let scanned = 0;
    // CSV: the missingness tables (the findings logs are record-level lists, not count tables).
    for (const f of (await filesUnder(join(dir, 'out'))).filter((x) => x.endsWith('.csv') && !x.endsWith('findings.csv') && !x.endsWith('changes.csv'))) {
      // The missingness tables hold item names, group codes and numbers: no quoted fields.
      const rows = (await readFile(f, 'utf8')).replace(/^\ufeff/, '').split('\r\n').filter(Boolean).map((l) => l.split(','));
      const head = rows[0]!;
      for (const row of rows.slice(1)) {
        row.forEach((cell, j) => {
          if (!COUNT_HEADS.has(head[j]!) && head[j] !== 'invalid') return;
          scanned++;
          const v = countOf(cell);
          if (v !== null && small(v)) left.push(`${f}: ${head[j]} ${cell}`);
        });
      }
    }
    // JSON: summary.json and describe's, every number in a count position.
    const COUNT_KEYS = /(^|\.)(valid|invalid|count|n|excluded|total|logged|passed|failed|undetermined|skipped|asked|trimmed|recordMissing\.\d+|missing\.[a-z-]+|byRule\.[a-z-]+|bySeverity\.[a-z]+|findings\.[a-z-]+|counts\.\d+)$/;
    const walk = (x: unknown, path: string, file: string): void => {
      if (typeof x === 'number') {
        if (COUNT_KEYS.test(path) && !/(^|\.)(fences|design|header|quantileType|disclosure)(\.|$)/.test(path)) {
          scanned++;
          if (small(x)) left.push(`${file}: ${path} = ${x}`);
        }
      } else if (x !== null && typeof x === 'object') for (const [k, v] of Object.entries(x)) walk(v, path ? `${path}.${k}` : k, file);
    };
    for (const f of ['out/summary.json', 'describe.json']) walk(JSON.parse(await readFile(join(dir, f), 'utf8')), '', f);
    // HTML: every table column of counts, and the verdict's facts, on every page.
    const pages = ['r.html', ...(await readdir(join(dir, 'r-team'))).map((f) => `r-team/${f}`)];
    for (const p of pages) {
      const html = await readFile(join(dir, p), 'utf8');
      for (const [, dt, dd] of html.matchAll(/<dt>(errors|warnings|info|rows)<\/dt><dd>(.*?)<\/dd>/g)) {
        scanned++;
        const v = countOf(dd!);
        if (v !== null && small(v)) left.push(`${p}: ${dt} ${dd}`);
      }
      for (const [, head, body] of html.matchAll(/<thead>(.*?)<\/thead><tbody>(.*?)<\/tbody>/gs)) {
        const heads = [...head!.matchAll(/<th[^>]*>(.*?)<\/th>/g)].map((m) => m[1]!.replace(/<[^>]+>/g, ''));
        for (const row of body!.split('</tr>').filter((x) => x.includes('<td'))) {
          [...row.matchAll(/<td[^>]*>(.*?)<\/td>/g)].forEach((m, j) => {
            if (!COUNT_HEADS.has(heads[j]!)) return;
            scanned++;
            const v = countOf(m[1]!);
            if (v !== null && small(v)) left.push(`${p}: ${heads.join('|')} col ${heads[j]} = ${m[1]}`);
          });
        }
      }
      expect(html, p).not.toContain('NaN');
    }
    expect(left).toEqual([]);
    expect(scanned).toBeGreaterThan(1000);
  }, 600_000);
});
