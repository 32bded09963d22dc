import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createRequire } from 'node:module';
import { execFile } from 'node:child_process';
import { promisify } from 'node:util';
import { invalidOf, type GeneratedDelivery } from '../bench/generate.ts';
import { generateShape, parseShapes, SHAPES, celToSql, variablesOf, type Shape } from '../bench/shapes.ts';
import { buildPeer, shapePeer, type PeerResult } from '../bench/duckdb-peer.ts';
import { runQueries } from '../bench/duckdb-child.mjs';
import { agreement } from '../bench/agreement.ts';
import { parseCodebook } from '../packages/codebook/src/index.ts';
import { checkFile, type CheckResult } from '../packages/check/src/index.ts';

// csv-parse is the parsing oracle; it is a dependency of the read package, so resolve it from there.
const { parse } = createRequire(new URL('../packages/read/package.json', import.meta.url))('csv-parse/sync') as {
  parse: (input: string, options: Record<string, unknown>) => string[][];
};

const ROWS = 2000;
let dir = '';
const runs = new Map<Shape, { g: GeneratedDelivery; peer: PeerResult; result: CheckResult; problems: Array<{ severity: string }> }>();

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-bench-'));
  for (const shape of SHAPES) {
    const g = generateShape(shape, { rows: ROWS, dir, seed: 7, name: shape });
    const text = await readFile(g.codebookPath, 'utf8');
    const loaded = parseCodebook(text, g.codebookPath);
    if (!loaded.ok) throw new Error(`generated ${shape} codebook is invalid: ${JSON.stringify(loaded.problems)}`);
    const peer = shapePeer(await runQueries(buildPeer(JSON.parse(text), g.csvPath, g.sql)));
    const result = await checkFile(g.csvPath, loaded.codebook);
    runs.set(shape, { g, peer, result, problems: loaded.problems });
  }
}, 60_000);
afterAll(async () => {
  if (dir) await rm(dir, { recursive: true, force: true });
});

describe('bench shapes, generator and SQL peer', () => {
  it.each(SHAPES)('%s: writes a codebook that lints without a problem', (shape) => {
    expect(runs.get(shape)!.problems).toEqual([]);
  });

  it.each(SHAPES)('%s: writes the asked number of rows, as csv-parse (the parsing oracle) counts them, quoted newlines included', async (shape) => {
    const { g, peer, result } = runs.get(shape)!;
    const records = parse(await readFile(g.csvPath, 'utf8'), { columns: false, relax_column_count: true });
    expect(records.length - 1).toBe(ROWS);
    expect(records.every((r) => r.length === g.items.length)).toBe(true);
    expect(peer.rows).toBe(ROWS);
    expect(result.summary.rows).toBe(ROWS);
  });

  it.each(SHAPES)('%s: codeweir and the SQL peer count every item\'s invalid cells as the generator wrote them', (shape) => {
    const { g, peer, result } = runs.get(shape)!;
    let injected = 0;
    for (const name of g.items) {
      // First principles: the generator counted every fault it wrote into this column.
      const written = invalidOf(g.truth[name]!);
      expect(result.summary.items[name]!.invalid, `${name} (codeweir)`).toBe(written);
      expect(peer.items[name]!.invalid, `${name} (DuckDB)`).toBe(written);
      expect(result.summary.items[name]!.valid, name).toBe(peer.items[name]!.valid);
      injected += written;
    }
    expect(injected).toBeGreaterThan(0);
    expect(result.summary.items[g.idItem]!.findings['duplicate-id'] ?? 0).toBe(g.duplicateIds);
    expect(peer.duplicateIds).toBe(g.duplicateIds);
    expect(g.duplicateIds).toBe(Math.floor((ROWS - 1) / 997));
  });

  it.each(SHAPES)('%s: the agreement check of pnpm bench finds nothing to report', (shape) => {
    const { g, peer, result } = runs.get(shape)!;
    expect(agreement(result.summary, peer, g)).toEqual([]);
  });

  it('each shape injects the faults it is for', () => {
    const sum = (shape: Shape, field: keyof GeneratedDelivery['truth'][string]): number =>
      Object.values(runs.get(shape)!.g.truth).reduce((s, t) => s + t[field], 0);
    expect(sum('coded', 'notACode')).toBeGreaterThan(0);
    expect(sum('coded', 'unbinned')).toBeGreaterThan(0);
    expect(sum('numeric', 'impossible')).toBeGreaterThan(0);
    expect(sum('numeric', 'notANumber')).toBeGreaterThan(0);
    expect(sum('numeric', 'notAnInteger')).toBeGreaterThan(0);
    expect(sum('text', 'patternMismatch')).toBeGreaterThan(0);
    expect(sum('rules', 'answeredWhenSkipped')).toBeGreaterThan(0);
  });

  it('each shape is made mostly of what it is named for', async () => {
    type Item = { type: string; codes?: unknown[]; pattern?: string; askedWhen?: string };
    const items = async (shape: Shape): Promise<Item[]> => JSON.parse(await readFile(runs.get(shape)!.g.codebookPath, 'utf8')).items;
    const coded = await items('coded');
    expect(coded.filter((i) => i.codes?.length).length).toBe(24); // of 30
    expect(coded.filter((i) => (i.codes as Array<{ bin?: unknown }> | undefined)?.some((c) => c.bin)).length).toBe(1);
    const numeric = await items('numeric');
    expect(numeric.filter((i) => (i.type === 'decimal' || i.type === 'integer') && !i.codes).length).toBeGreaterThanOrEqual(27);
    const text = await items('text');
    expect(text.filter((i) => i.type === 'text').length).toBeGreaterThanOrEqual(18);
    expect(text.filter((i) => i.pattern).length).toBeGreaterThanOrEqual(5);
    expect((await items('rules')).filter((i) => i.askedWhen).length).toBeGreaterThanOrEqual(10);
  });

  it('the rules shape counts every rule outcome as codeweir and the SQL peer do, skipped rows of a rule with when included', () => {
    const { g, peer, result } = runs.get('rules')!;
    expect(Object.keys(g.rules!).length).toBe(7);
    for (const [id, t] of Object.entries(g.rules!)) {
      const c = result.summary.rules[id]!;
      expect({ passed: c.passed, failed: c.failed, undetermined: c.undetermined, skipped: c.skipped ?? 0 }, id).toEqual(t);
      expect({ skipped: 0, ...peer.rules[id] }, id).toEqual(t);
      expect(t.passed + t.failed + t.undetermined + t.skipped).toBe(ROWS);
    }
    expect(Object.values(g.rules!).some((t) => t.skipped > 0 && t.failed > 0)).toBe(true);
    expect(Object.keys(g.sql.askedWhen).length).toBeGreaterThanOrEqual(10);
  });

  it('the agreement check reports a count that differs', () => {
    const { g, peer, result } = runs.get('coded')!;
    const changed = structuredClone(result.summary);
    changed.items.q05!.invalid += 1;
    expect(agreement(changed, peer, g)).toEqual([expect.stringContaining('q05: invalid written')]);
  });

  it('translates the routing and rule subset to SQL and names its variables', () => {
    // First principles: CEL's ==, !=, && and || are SQL's =, <>, AND and OR; precedence is the same.
    expect(celToSql('married == 2 || married != 3 && age - 4 >= 1.5')).toBe('married = 2 OR married <> 3 AND age - 4 >= 1.5');
    expect(variablesOf('spouse_age - age <= 30 && age - spouse_age <= 30')).toEqual(['spouse_age', 'age']);
    expect(() => celToSql('name == "x"')).toThrow(/CEL subset/);
  });

  it('parses --shapes', () => {
    expect(parseShapes('all')).toEqual([...SHAPES]);
    expect(parseShapes('text,coded,text')).toEqual(['text', 'coded']);
    expect(() => parseShapes('wide')).toThrow(/unknown shape wide/);
  });

  it('pnpm bench runs every shape through the CLI and writes figures and agreement as JSON', async () => {
    const work = join(dir, 'harness');
    const json = join(work, 'figures.json');
    const root = new URL('..', import.meta.url).pathname;
    // From source (--source), so the test needs no build; check and the peer only, one small run.
    await promisify(execFile)(
      process.execPath,
      ['--conditions=source', '--import', 'tsx', join(root, 'bench/run.ts'), '--rows', '1000', '--runs', '1', '--shapes', 'all', '--source', '--no-scaling', '--only', 'check,duckdb', '--json', json],
      { cwd: root, env: { ...process.env, CODEWEIR_BENCH_DIR: work }, maxBuffer: 1 << 24 },
    );
    const doc = JSON.parse(await readFile(json, 'utf8')) as {
      rows: number;
      shapes: Record<string, { rows: number; agreement: string[]; tasks: Record<string, { median: number; ratioToDuckdb?: number; peakRss: number }> }>;
      targets: Array<{ target: string; shape: string; met: boolean }>;
    };
    expect(doc.rows).toBe(1000);
    expect(Object.keys(doc.shapes)).toEqual([...SHAPES]);
    for (const [shape, f] of Object.entries(doc.shapes)) {
      expect(f.agreement, shape).toEqual([]);
      expect(f.tasks.check!.median, shape).toBeGreaterThan(0);
      expect(f.tasks.check!.ratioToDuckdb, shape).toBeCloseTo(f.tasks.check!.median / f.tasks.duckdb!.median, 10);
      expect(f.tasks.check!.peakRss, shape).toBeGreaterThan(0);
    }
    const agree = doc.targets.filter((t) => t.target.startsWith('agreement'));
    expect(agree.map((t) => [t.shape, t.met])).toEqual(SHAPES.map((s) => [s, true]));
  }, 120_000);
});
