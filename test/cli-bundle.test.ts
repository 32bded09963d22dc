/**
 * The bundled CLI (`pnpm build`, scripts/bundle.ts) is the same program as the CLI run from source:
 * the build compiles the shipped schema's ajv validator ahead of time, measures ASCII help text
 * without string-width and splits every command's packages into chunks of their own, and none
 * of that may change a byte of what a command prints. The in-process run from source is the
 * oracle. The bundle's worker thread (check-worker.mjs beside the chunks) must start and
 * give the one-thread result.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { execFile } from 'node:child_process';
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { buildBundle } from '../scripts/bundle.ts';
import { generateDelivery, type GeneratedDelivery } from '../bench/generate.ts';
import { run } from '../packages/cli/src/cli.ts';

const exec = promisify(execFile);
const EXAMPLE = new URL('../examples/household.codebook.json', import.meta.url).pathname;

async function source(argv: string[], cwd: string): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await run(argv, { stdout: (t) => void (out += t), stderr: (t) => void (err += t), isTTY: false, cwd });
  return { code, out, err };
}

async function bundled(argv: string[], cwd: string, nodeArgs: string[] = []): Promise<{ code: number; out: string; err: string }> {
  try {
    const r = await exec(process.execPath, [...nodeArgs, join(dist, 'codeweir.mjs'), ...argv], { cwd, maxBuffer: 64 * 2 ** 20 });
    return { code: 0, out: r.stdout, err: r.stderr };
  } catch (e) {
    const x = e as { code: number; stdout: string; stderr: string };
    return { code: x.code, out: x.stdout, err: x.stderr };
  }
}

let dir = '';
let dist = '';
let gen: GeneratedDelivery;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-cli-bundle-'));
  dist = join(dir, 'dist');
  await buildBundle(true, dist);
  // Loaded before the CLI: says on stderr when the main thread starts a worker thread.
  await writeFile(join(dir, 'watch.mjs'), "import { isMainThread } from 'node:worker_threads';\nif (isMainThread) process.on('worker', () => process.stderr.write('worker started\\n'));\n");
  // A structural error (ajv and zod both see it) and an unknown field with a near miss.
  await writeFile(join(dir, 'bad.json'), JSON.stringify({ codebook: 'x', version: 3, title: 'T', items: [{ name: 'a', label: 'A', type: 'integr', lable: 'x' }] }));
  // About 98 bytes a row: 90,000 rows pass the 8 MiB below which a check stays on one thread.
  gen = generateDelivery({ rows: 90_000, dir, name: 'wave' });
}, 120_000);
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('the bundled CLI', () => {
  it('keeps the chart libraries out of what every command loads at start', async () => {
    const text = async (f: string): Promise<string> => readFile(join(dist, f), 'utf8');
    // The files loaded at start: the entry and the chunks it imports statically, transitively.
    const atStart = new Set<string>(['codeweir.mjs']);
    for (const f of atStart) {
      for (const m of (await text(f)).matchAll(/(?:from|import)\s*"\.\/(chunk-[A-Z0-9]+\.mjs)"/g)) atStart.add(m[1]!);
    }
    const chunks = (await readdir(dist)).filter((f) => /^chunk-[A-Z0-9]+\.mjs$/.test(f));
    const charts: string[] = [];
    for (const f of chunks) if ((await text(f)).includes('vega')) charts.push(f);
    // The report package draws with vega-lite: its chunk exists, loaded by a dynamic import only.
    expect(charts.length).toBeGreaterThan(0);
    for (const f of charts) expect(atStart.has(f), f).toBe(false);
  });

  for (const argv of [['lint', EXAMPLE], ['lint', 'bad.json'], ['lint', 'bad.json', '--json'], ['check', '--help'], ['report', '--help'], ['lint', 'absent.json']]) {
    it(`prints what the source prints for ${argv.join(' ')}`, async () => {
      const want = await source(argv, dir);
      const got = await bundled(argv, dir);
      expect(got).toEqual(want);
    });
  }

  it('checks on two threads (a worker from the bundle) with the one-thread output', async () => {
    const argv = ['check', 'wave.csv', '--codebook', 'wave.codebook.json', '--json'];
    const watch = ['--import', join(dir, 'watch.mjs')];
    const one = await bundled([...argv, '--threads', '1', '--out', 'b1'], dir, watch);
    const two = await bundled([...argv, '--threads', '2', '--out', 'b2'], dir, watch);
    expect(one.err).toBe('');
    expect(two.err).toBe('worker started\n');
    expect(two.code).toBe(one.code);
    expect(two.out).toBe(one.out);
    // Counted by the generator while writing the file.
    expect(JSON.parse(one.out).rows).toBe(gen.rows);
    for (const f of ['findings.csv', 'summary.json', 'missingness.csv']) {
      expect((await readFile(join(dir, 'b2', f))).equals(await readFile(join(dir, 'b1', f))), f).toBe(true);
    }
  }, 120_000);
});
