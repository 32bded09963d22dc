/**
 * `pnpm bench`: generates a seeded synthetic delivery and its codebook under `.bench/`, then
 * times `codeweir check`, `describe --pairs all` and `report` against the same checks written as
 * SQL for DuckDB, alternating codeweir and DuckDB runs in the same session, and prints medians,
 * ratios to DuckDB, peak RSS (from the operating system), rows/s and MB/s, the tokenizer-only
 * floor, the startup cost of `codeweir lint` against a bare `node -e 0`, and optionally a
 * scaling run (10x the rows) and a 10M-row run for peak memory.
 *
 * Options: --rows N (default 1,000,000), --runs N (default 3), --threads N (passed to codeweir),
 * --scaling, --big (10,000,000 rows, check only, one run), --source (time the CLI from TypeScript
 * source through tsx instead of the bundle), --seed N, --only check,describe,report,duckdb,tokenize,lint.
 */
import { existsSync, mkdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { generateDelivery, type GeneratedDelivery } from './generate.ts';
import { buildPeer, shapePeer, type PeerResult } from './duckdb-peer.ts';
import { measureNode, median, rssSource, type Measurement } from './measure.ts';
import { buildBundle, BIN } from '../scripts/bundle.ts';

const ROOT = resolve(new URL('..', import.meta.url).pathname);
const DIR = join(ROOT, '.bench');

interface Args {
  rows: number;
  runs: number;
  threads?: number;
  scaling: boolean;
  big: boolean;
  source: boolean;
  seed: number;
  only?: Set<string>;
}

function parseArgs(argv: string[]): Args {
  const a: Args = { rows: 1_000_000, runs: 3, scaling: false, big: false, source: false, seed: 20261201 };
  for (let i = 0; i < argv.length; i++) {
    const k = argv[i];
    const next = (): number => {
      const v = Number(argv[++i]);
      if (!Number.isInteger(v) || v < 1) throw new Error(`${k} takes a positive whole number, got ${argv[i]}`);
      return v;
    };
    if (k === '--rows') a.rows = next();
    else if (k === '--runs') a.runs = next();
    else if (k === '--threads') a.threads = next();
    else if (k === '--seed') a.seed = next();
    else if (k === '--scaling') a.scaling = true;
    else if (k === '--big') a.big = true;
    else if (k === '--source') a.source = true;
    else if (k === '--only') a.only = new Set(argv[++i].split(','));
    else if (k !== '--') throw new Error(`unknown option ${k} (see the comment at the top of bench/run.ts)`);
  }
  return a;
}

/** Reuses a generated delivery when the same rows and seed were generated before. */
function delivery(rows: number, seed: number): GeneratedDelivery {
  const name = `delivery-${rows}-${seed}`;
  const meta = join(DIR, `${name}.meta.json`);
  const generator = statSync(new URL('./generate.ts', import.meta.url)).mtimeMs;
  if (existsSync(meta)) {
    const m = JSON.parse(readFileSync(meta, 'utf8')) as GeneratedDelivery & { generator: number };
    if (m.generator === generator && existsSync(m.csvPath)) return m;
  }
  process.stderr.write(`generating ${rows.toLocaleString('en')} rows...\n`);
  const g = generateDelivery({ rows, seed, dir: DIR, name });
  writeFileSync(meta, JSON.stringify({ ...g, generator }));
  return g;
}

const fmt = (s: number): string => (s < 10 ? s.toFixed(2) : s.toFixed(1));
const mib = (b: number): string => (Number.isFinite(b) ? `${Math.round(b / 2 ** 20)} MiB` : 'n/a');

interface Row {
  task: string;
  runs: Measurement[];
}

function table(rows: Row[], g: GeneratedDelivery, duck?: Row): string {
  const dMed = duck ? median(duck.runs.map((r) => r.seconds)) : NaN;
  const lines = [
    `| task | median s | min s | max s | / DuckDB | peak RSS | rows/s | MB/s |`,
    `|---|---:|---:|---:|---:|---:|---:|---:|`,
  ];
  for (const r of rows) {
    const t = r.runs.map((m) => m.seconds);
    const med = median(t);
    const peak = Math.max(...r.runs.map((m) => m.peakRss));
    const ratio = duck && r !== duck ? (med / dMed).toFixed(2) : duck ? '1.00' : '';
    lines.push(
      `| ${r.task} | ${fmt(med)} | ${fmt(Math.min(...t))} | ${fmt(Math.max(...t))} | ${ratio} | ${mib(peak)} | ` +
        `${Math.round(g.rows / med).toLocaleString('en')} | ${(g.bytes / 1e6 / med).toFixed(1)} |`,
    );
  }
  return lines.join('\n');
}

/** Compares codeweir's per-item counts with the SQL peer's, so a fast wrong answer shows. */
function agreement(summaryJson: string, peer: PeerResult): string[] {
  const out: string[] = [];
  let summary: { rows: number; items: Record<string, { valid: number; invalid: number }> };
  try {
    summary = JSON.parse(summaryJson);
  } catch {
    return ['codeweir check --json did not print one JSON document; agreement not compared.'];
  }
  if (summary.rows !== peer.rows) out.push(`rows: codeweir ${summary.rows}, DuckDB ${peer.rows}`);
  for (const [name, p] of Object.entries(peer.items)) {
    const c = summary.items?.[name];
    if (!c) out.push(`${name}: missing from codeweir's summary`);
    else if (c.invalid !== p.invalid) out.push(`${name}: invalid codeweir ${c.invalid}, DuckDB ${p.invalid}`);
  }
  return out;
}

async function main(): Promise<void> {
  const args = parseArgs(process.argv.slice(2));
  mkdirSync(DIR, { recursive: true });
  const want = (k: string): boolean => !args.only || args.only.has(k);
  let cli: string[];
  if (args.source) cli = ['--import', 'tsx', join(ROOT, 'packages/cli/src/bin.ts')];
  else {
    // The file npm and pnpm link as the `codeweir` binary, which loads the bundle beside it.
    await buildBundle();
    cli = [BIN];
  }
  const threads = args.threads ? ['--threads', String(args.threads)] : [];
  const rows = args.big ? 10_000_000 : args.rows;
  const g = delivery(rows, args.seed);
  const out = join(DIR, 'out');
  mkdirSync(out, { recursive: true });
  const specFile = join(DIR, `peer-${rows}.json`);
  const codebook = JSON.parse(readFileSync(g.codebookPath, 'utf8'));
  writeFileSync(specFile, JSON.stringify(buildPeer(codebook, g.csvPath, g.sql)));

  const tasks: Array<{ key: string; task: string; args: string[]; ok: number[] }> = [];
  const check = { key: 'check', task: 'codeweir check', args: [...cli, 'check', g.csvPath, '--codebook', g.codebookPath, '--out', out, '--json', ...threads], ok: [0, 1] };
  tasks.push(check);
  tasks.push({ key: 'duckdb', task: 'DuckDB SQL peer', args: [join(ROOT, 'bench/duckdb-child.mjs'), specFile], ok: [0] });
  if (!args.big) {
    tasks.push({ key: 'describe', task: 'codeweir describe --pairs all', args: [...cli, 'describe', g.csvPath, '--codebook', g.codebookPath, '--pairs', 'all', '--json', ...threads], ok: [0, 1] });
    tasks.push({ key: 'report', task: 'codeweir report', args: [...cli, 'report', g.csvPath, '--codebook', g.codebookPath, '-o', join(out, 'report.html'), ...threads], ok: [0, 1] });
    tasks.push({ key: 'tokenize', task: 'tokenizer only (floor)', args: ['--import', 'tsx', join(ROOT, 'bench/tokenize.ts'), g.csvPath], ok: [0] });
  }
  const runs = args.big ? 1 : args.runs;
  const results = new Map<string, Row>();
  const failed = new Map<string, string>();
  process.stderr.write(`${g.rows.toLocaleString('en')} rows x ${g.items.length} items, ${(g.bytes / 1e6).toFixed(1)} MB; ${runs} runs each, alternating\n`);
  for (let r = 0; r < runs; r++) {
    for (const t of tasks) {
      if (!want(t.key) || failed.has(t.key)) continue;
      try {
        const m = await measureNode(t.args, ROOT, t.ok);
        const row = results.get(t.key) ?? { task: t.task, runs: [] };
        row.runs.push(m);
        results.set(t.key, row);
        process.stderr.write(`  run ${r + 1} ${t.task}: ${fmt(m.seconds)} s, ${mib(m.peakRss)}\n`);
      } catch (e) {
        failed.set(t.key, (e as Error).message);
      }
    }
  }
  const report: string[] = [];
  report.push(`## codeweir bench: ${g.rows.toLocaleString('en')} rows x ${g.items.length} items (${(g.bytes / 1e6).toFixed(1)} MB)`);
  report.push(`Node ${process.version}; ${runs} alternating runs each; peak RSS from ${rssSource}; CLI: ${args.source ? 'tsx from source' : 'the codeweir binary (packages/cli/bin/codeweir.mjs, as installed)'}${args.threads ? `; --threads ${args.threads}` : ''}.`);
  report.push('');
  report.push(table([...results.values()], g, results.get('duckdb')));
  for (const [k, msg] of failed) report.push(`\n${k} did not complete: ${msg}`);
  const duck = results.get('duckdb');
  const ck = results.get('check');
  if (duck && ck) {
    const peer = shapePeer(JSON.parse(duck.runs[0].stdout));
    const diff = agreement(ck.runs[0].stdout, peer);
    report.push(diff.length ? `\nDisagreement with the SQL peer:\n- ${diff.join('\n- ')}` : '\ncodeweir and the SQL peer agree on rows and the invalid count of every item.');
  }
  const targets: string[] = [];
  const med = (k: string): number => median(results.get(k)?.runs.map((m) => m.seconds) ?? [NaN]);
  const peakOf = (k: string): number => Math.max(...(results.get(k)?.runs.map((m) => m.peakRss) ?? [NaN]));
  const verdict = (ok: boolean): string => (ok ? 'met' : 'NOT met');
  if (duck && ck) targets.push(`check / DuckDB = ${(med('check') / med('duckdb')).toFixed(2)} (target <= 1.0: ${verdict(med('check') <= med('duckdb'))})`);
  if (duck && results.has('report')) targets.push(`report / DuckDB = ${(med('report') / med('duckdb')).toFixed(2)} (target <= 2.0: ${verdict(med('report') <= 2 * med('duckdb'))})`);
  const limit = args.big ? 2 * 2 ** 30 : 2 ** 30;
  for (const k of ['check', 'describe', 'report']) {
    if (results.has(k)) targets.push(`${k} peak RSS ${mib(peakOf(k))} (target <= ${args.big ? '2 GiB' : '1 GiB'}: ${verdict(peakOf(k) <= limit)})`);
  }

  if (!args.big && args.scaling && want('check')) {
    const small = delivery(Math.max(1, Math.round(rows / 10)), args.seed);
    const smallArgs = [...cli, 'check', small.csvPath, '--codebook', small.codebookPath, '--out', join(out, 'small'), '--json', ...threads];
    const a: number[] = [];
    const b: number[] = [];
    for (let r = 0; r < runs; r++) {
      a.push((await measureNode(smallArgs, ROOT, [0, 1])).seconds);
      b.push((await measureNode(check.args, ROOT, [0, 1])).seconds);
    }
    const ratio = median(b) / median(a);
    targets.push(
      `scaling: check of ${small.rows.toLocaleString('en')} rows ${fmt(median(a))} s, of ${rows.toLocaleString('en')} rows ${fmt(median(b))} s: 10x rows = ${ratio.toFixed(2)}x time (target <= 11: ${verdict(ratio <= 11)})`,
    );
  }

  if (!args.big && want('lint')) {
    const bare: number[] = [];
    const lint: number[] = [];
    const lintSource: number[] = [];
    const lintArgs = ['lint', join(ROOT, 'examples/household.codebook.json')];
    for (let r = 0; r < Math.max(5, runs); r++) {
      bare.push((await measureNode(['-e', '0'], ROOT)).seconds);
      lint.push((await measureNode([...cli, ...lintArgs], ROOT, [0, 1])).seconds);
      if (!args.source) lintSource.push((await measureNode(['--import', 'tsx', join(ROOT, 'packages/cli/src/bin.ts'), ...lintArgs], ROOT, [0, 1])).seconds);
    }
    const ratio = median(lint) / median(bare);
    targets.push(`lint: ${fmt(median(lint))} s vs bare node ${fmt(median(bare))} s = ${ratio.toFixed(1)}x (target <= 3x: ${verdict(ratio <= 3)})`);
    if (lintSource.length) targets.push(`lint from TypeScript source through tsx: ${fmt(median(lintSource))} s = ${(median(lintSource) / median(bare)).toFixed(1)}x bare node`);
  }
  if (targets.length) report.push(`\nTargets:\n- ${targets.join('\n- ')}`);
  const text = report.join('\n') + '\n';
  process.stdout.write(text);
  writeFileSync(join(DIR, `results-${rows}.md`), text);
}

main().catch((e: unknown) => {
  process.stderr.write(`bench: ${(e as Error).message}\n`);
  process.exitCode = 2;
});
