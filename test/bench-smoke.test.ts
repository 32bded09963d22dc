import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createRequire } from 'node:module';
import { generateDelivery, type GeneratedDelivery } from '../bench/generate.ts';
import { buildPeer, shapePeer, type PeerResult } from '../bench/duckdb-peer.ts';
import { runQueries } from '../bench/duckdb-child.mjs';
import { parseCodebook } from '../packages/codebook/src/index.ts';
import { checkFile, type CheckResult } from '../packages/check/src/index.ts';

// csv-parse is the parsing oracle; it is a dependency of the read package, so resolve it from there.
const { parse } = createRequire(new URL('../packages/read/package.json', import.meta.url))('csv-parse/sync') as {
  parse: (input: string, options: Record<string, unknown>) => string[][];
};

let dir = '';
let g: GeneratedDelivery;
let peer: PeerResult;
let result: CheckResult;

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-bench-'));
  g = generateDelivery({ rows: 2000, dir, seed: 7 });
  const text = await readFile(g.codebookPath, 'utf8');
  const loaded = parseCodebook(text, g.codebookPath);
  if (!loaded.ok) throw new Error(`generated codebook is invalid: ${JSON.stringify(loaded.problems)}`);
  peer = shapePeer(await runQueries(buildPeer(JSON.parse(text), g.csvPath, g.sql)));
  result = await checkFile(g.csvPath, loaded.codebook);
});
afterAll(async () => {
  if (dir) await rm(dir, { recursive: true, force: true });
});

describe('bench generator and SQL peer', () => {
  it('writes a codebook that parseCodebook accepts without errors', async () => {
    const r = parseCodebook(await readFile(g.codebookPath, 'utf8'), g.codebookPath);
    expect(r.ok).toBe(true);
    expect(r.problems.filter((p) => p.severity === 'error')).toEqual([]);
  });

  it('writes the asked number of rows, as csv-parse (the parsing oracle) counts them, quoted newlines included', async () => {
    const records = parse(await readFile(g.csvPath, 'utf8'), { columns: false, relax_column_count: true });
    expect(records.length - 1).toBe(2000);
    expect(records.every((r) => r.length === g.items.length)).toBe(true);
    expect(peer.rows).toBe(2000);
    expect(result.summary.rows).toBe(2000);
  });

  it('the SQL peer and codeweir count the same invalid codes per coded item, and both match what the generator injected', () => {
    let checked = 0;
    for (const name of g.items) {
      const truth = g.truth[name]!;
      const pf = peer.items[name]!.findings;
      const cf = result.summary.items[name]!.findings;
      // First principles: the generator counted every non-code it wrote into this column.
      expect(pf['not-a-code'] ?? 0, `${name} not-a-code (peer)`).toBe(truth.notACode);
      expect(cf['not-a-code'] ?? 0, `${name} not-a-code (codeweir)`).toBe(truth.notACode);
      expect(pf['unbinned-value'] ?? 0, `${name} unbinned (peer)`).toBe(truth.unbinned);
      expect(cf['unbinned-value'] ?? 0, `${name} unbinned (codeweir)`).toBe(truth.unbinned);
      checked += truth.notACode + truth.unbinned;
    }
    expect(checked).toBeGreaterThan(0);
  });

  it('the SQL peer and codeweir agree on every item\'s invalid count, routing and rule counts, and duplicate ids', () => {
    for (const name of g.items) {
      expect(result.summary.items[name]!.invalid, name).toBe(peer.items[name]!.invalid);
      expect(result.summary.items[name]!.valid, name).toBe(peer.items[name]!.valid);
    }
    expect(result.summary.items.hours_work!.findings['answered-when-skipped'] ?? 0).toBe(g.answeredWhenSkipped);
    expect(peer.items.hours_work!.findings['answered-when-skipped'] ?? 0).toBe(g.answeredWhenSkipped);
    const rule = result.summary.rules['young-worker']!;
    expect({ passed: rule.passed, failed: rule.failed, undetermined: rule.undetermined }).toEqual(peer.rules['young-worker']);
    expect(result.summary.items.resp_id!.findings['duplicate-id'] ?? 0).toBe(g.duplicateIds);
    expect(peer.duplicateIds).toBe(g.duplicateIds);
  });
});
