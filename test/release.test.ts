/**
 * What a user installs is what works: `pnpm release` packs one tarball per package, plain npm
 * installs them into an empty folder outside the checkout (no workspace, no pnpm, no tsx), and
 * there the installed `codeweir check` on the demo delivery gives exit 1, one JSON document and
 * the same `findings.byRule` as the workspace's CLI run from source (the oracle), the README's
 * library example runs and prints the library's own results, and no transpiler is in the tree.
 *
 * npm fetches the libraries' runtime dependencies (zod, ajv, yargs' and vega's trees...) from
 * the registry, as a user's install does; with no registry in reach and nothing in npm's cache
 * the test cannot install and says so as its skip reason.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { execFile } from 'node:child_process';
import { copyFile, mkdtemp, readFile, readdir, rm, writeFile } from 'node:fs/promises';
import { existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { promisify } from 'node:util';
import { release } from '../scripts/release.ts';
import { cli } from './support/cli.ts';
import { loadCodebookOrThrow } from '@codeweir/codebook';
import { checkFile } from '@codeweir/check';
import { describe as describeItems } from '@codeweir/describe';

const exec = promisify(execFile);
const REPO = resolve(import.meta.dirname, '..');
const CODEBOOK = join(REPO, 'examples/household.codebook.json');
const DELIVERY = join(REPO, 'examples/demo-delivery.csv');
const TRANSPILERS = ['tsx', 'typescript', 'esbuild', 'ts-node', '@swc/core', 'sucrase', '@esbuild-kit/esm-loader'];

let dir = '';
let project = '';
let tarballs: string[] = [];
let installError = '';

async function run(cmd: string, args: string[], cwd: string): Promise<{ code: number; out: string; err: string }> {
  try {
    const r = await exec(cmd, args, { cwd, maxBuffer: 64 * 2 ** 20, env: { ...process.env, npm_config_update_notifier: 'false' } });
    return { code: 0, out: r.stdout, err: r.stderr };
  } catch (e) {
    const x = e as { code: number; stdout: string; stderr: string };
    return { code: typeof x.code === 'number' ? x.code : 2, out: x.stdout ?? '', err: x.stderr ?? String(e) };
  }
}

/** Every package folder name under node_modules, scoped ones as `@scope/name`, nested trees included. */
async function installedNames(nodeModules: string, into = new Set<string>()): Promise<Set<string>> {
  for (const e of await readdir(nodeModules, { withFileTypes: true }).catch(() => [])) {
    if (!e.isDirectory() || e.name.startsWith('.')) continue;
    if (e.name.startsWith('@')) {
      for (const s of await readdir(join(nodeModules, e.name), { withFileTypes: true })) {
        into.add(`${e.name}/${s.name}`);
        await installedNames(join(nodeModules, e.name, s.name, 'node_modules'), into);
      }
    } else {
      into.add(e.name);
      await installedNames(join(nodeModules, e.name, 'node_modules'), into);
    }
  }
  return into;
}

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-release-'));
  tarballs = await release(join(dir, 'release'));
  project = join(dir, 'project');
  await rm(project, { recursive: true, force: true });
  await exec('mkdir', ['-p', project]);
  await writeFile(join(project, 'package.json'), JSON.stringify({ name: 'release-check', private: true, type: 'module' }));
  await copyFile(CODEBOOK, join(project, 'household.codebook.json'));
  await copyFile(DELIVERY, join(project, 'demo-delivery.csv'));
  const r = await run('npm', ['install', '--no-audit', '--no-fund', '--prefer-offline', '--loglevel=error', ...tarballs], project);
  if (r.code !== 0) installError = r.err.trim().split('\n').slice(-3).join(' ');
}, 600_000);

afterAll(async () => {
  if (dir) await rm(dir, { recursive: true, force: true });
});

describe('the released packages, installed with plain npm', () => {
  it('one tarball per package, the CLI with the codeweir binary', async () => {
    const names = tarballs.map((t) => t.split('/').pop());
    for (const p of ['core', 'codebook', 'read', 'stats', 'check', 'describe', 'report', 'draft', 'cli'])
      expect(names.some((n) => n?.startsWith(`codeweir-${p}-`)), p).toBe(true);
    // Every package of the workspace is published: none is private, each has its tarball.
    const pkgs = (await readdir(join(REPO, 'packages'))).filter((p) => existsSync(join(REPO, 'packages', p, 'package.json')));
    expect(tarballs).toHaveLength(pkgs.length);
  });

  it('the installed codeweir check gives the workspace run\'s verdict and findings by rule', async (ctx) => {
    if (installError) ctx.skip(`npm could not install the tarballs' runtime dependencies (no registry in reach?): ${installError}`);
    const installed = await run(join(project, 'node_modules/.bin/codeweir'), ['check', 'demo-delivery.csv', '--codebook', 'household.codebook.json', '--json'], project);
    expect(installed.code, installed.err).toBe(1);
    const got = JSON.parse(installed.out) as { rows: number; findings: { byRule: Record<string, number> } };
    const oracle = await cli(['check', DELIVERY, '--codebook', CODEBOOK, '--json'], REPO);
    expect(oracle.code).toBe(1);
    const want = JSON.parse(oracle.out) as { rows: number; findings: { byRule: Record<string, number> } };
    expect(got.rows).toBe(want.rows);
    expect(got.findings.byRule).toEqual(want.findings.byRule);
  });

  it('a failing run prints codeweir\'s one sentence and nothing else', async (ctx) => {
    if (installError) ctx.skip(`npm could not install the tarballs' runtime dependencies: ${installError}`);
    const r = await run('npx', ['--no-install', 'codeweir', 'check', 'no-such.csv', '--codebook', 'household.codebook.json'], project);
    expect(r.code).toBe(2);
    expect(r.out).toBe('');
    expect(r.err.trim().split('\n')).toHaveLength(1);
    expect(r.err).toMatch(/^codeweir: .*no-such\.csv/);
  });

  it('the README\'s library example runs from the installed packages and prints the library\'s results', async (ctx) => {
    if (installError) ctx.skip(`npm could not install the tarballs' runtime dependencies: ${installError}`);
    const readme = await readFile(join(REPO, 'README.md'), 'utf8');
    const section = readme.slice(readme.indexOf('## Install it elsewhere'), readme.indexOf('## The codebook'));
    const code = /```js\n([\s\S]*?)```/.exec(section)?.[1];
    expect(code).toBeDefined();
    await writeFile(join(project, 'example.mjs'), code!);
    const r = await run(process.execPath, ['example.mjs'], project);
    expect(r.code, r.err).toBe(0);
    const printed = JSON.parse(r.out) as Record<string, unknown>;
    // The same three calls from the workspace's source are the oracle.
    const codebook = await loadCodebookOrThrow(CODEBOOK);
    const checked = await checkFile(DELIVERY, codebook);
    const described = describeItems(checked, codebook, { quantileType: 7 });
    expect(printed).toEqual(
      JSON.parse(JSON.stringify({ rows: checked.summary.rows, byRule: checked.summary.findings.byRule, ageMedian: described.items.age!.median, eduMedian: described.items.edu!.medianCode })),
    );
  });

  it('the installed library checks on worker threads started from its built files, with the one-thread result', async (ctx) => {
    if (installError) ctx.skip(`npm could not install the tarballs' runtime dependencies: ${installError}`);
    const script = [
      "import { loadCodebookOrThrow } from '@codeweir/codebook';",
      "import { checkFile } from '@codeweir/check';",
      "import { isMainThread } from 'node:worker_threads';",
      "let started = 0;",
      "process.on('worker', () => started++);",
      "const cb = await loadCodebookOrThrow('household.codebook.json');",
      "const one = await checkFile('demo-delivery.csv', cb, { threads: 1 });",
      "const two = await checkFile('demo-delivery.csv', cb, { threads: 2, minParallelBytes: 0 });",
      "console.log(JSON.stringify({ started, same: JSON.stringify(one.summary) === JSON.stringify(two.summary), main: isMainThread }));",
    ].join('\n');
    await writeFile(join(project, 'threads.mjs'), script);
    const r = await run(process.execPath, ['threads.mjs'], project);
    expect(r.code, r.err).toBe(0);
    expect(JSON.parse(r.out)).toEqual({ started: 1, same: true, main: true });
  });

  it('no transpiler is in the installed tree', async (ctx) => {
    if (installError) ctx.skip(`npm could not install the tarballs' runtime dependencies: ${installError}`);
    const names = await installedNames(join(project, 'node_modules'));
    expect(names.has('@codeweir/cli')).toBe(true);
    for (const t of TRANSPILERS) expect(names.has(t), t).toBe(false);
    expect([...names].filter((n) => n.startsWith('@esbuild/'))).toEqual([]);
  });
});
