/**
 * `pnpm build` (also run by `pnpm install` through the root `prepare` script): every package under
 * packages/ to ESM JavaScript with `.d.ts` types in its own `dist/`, then the CLI bundle.
 *
 * One TypeScript program compiles all packages at once (`tsconfig.build.json`, into `.build/`),
 * rewriting the source's `./x.ts` imports to `./x.js`; each package's share is then moved into
 * its `dist/`. The CLI package ships the esbuild bundle as its JavaScript (scripts/bundle.ts) and
 * only the declarations from the compiler. Cost: about 5 to 15 s on two cores. Type errors
 * fail the build only with `strict` (the release does; `pnpm test` type-checks on its own), so
 * an install in a checkout with a type error in progress still links and builds.
 */
import { spawnSync } from 'node:child_process';
import { cpSync, existsSync, mkdirSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildBundle, BUNDLE_DIR, newestSource } from './bundle.ts';

const ROOT = resolve(fileURLToPath(new URL('..', import.meta.url)));
const OUT = join(ROOT, '.build');

/** Relative `.ts` specifiers left in declaration files become `.js`, as the JavaScript has them. */
function fixDeclarations(dir: string): void {
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    if (e.isDirectory()) fixDeclarations(p);
    else if (e.name.endsWith('.d.ts')) {
      const text = readFileSync(p, 'utf8');
      const fixed = text.replace(/((?:from|import)\s*\(?\s*)(['"])(\.{1,2}\/[^'"]+?)\.ts\2/g, '$1$2$3.js$2');
      if (fixed !== text) writeFileSync(p, fixed);
    }
  }
}

/** Removes what is not a declaration (the CLI keeps only its types from the compiler). */
function keepDeclarations(dir: string): void {
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    if (e.isDirectory()) keepDeclarations(p);
    else if (!e.name.endsWith('.d.ts')) rmSync(p);
  }
}

/**
 * Compiles the libraries and writes every package's dist/, then the CLI bundle. Throws when
 * the compiler emitted nothing, or reported errors and `strict` is set.
 */
export async function buildAll(strict = false): Promise<void> {
  rmSync(OUT, { recursive: true, force: true });
  const tsc = createRequire(join(ROOT, 'package.json')).resolve('typescript/bin/tsc');
  const r = spawnSync(process.execPath, [tsc, '-p', join(ROOT, 'tsconfig.build.json')], { cwd: ROOT, stdio: 'inherit' });
  if (r.status !== 0 && (strict || !existsSync(OUT))) throw new Error('build: the TypeScript compiler reported errors (above); no package was rebuilt.');
  if (r.status !== 0) process.stderr.write('build: the TypeScript compiler reported type errors (above); the packages were built anyway.\n');
  for (const name of readdirSync(join(ROOT, 'packages'))) {
    const built = join(OUT, name, 'src');
    if (!existsSync(built)) continue;
    fixDeclarations(built);
    const isCli = name === 'cli';
    const dist = join(ROOT, 'packages', name, 'dist');
    rmSync(dist, { recursive: true, force: true });
    if (isCli) keepDeclarations(built);
    mkdirSync(dist, { recursive: true });
    cpSync(built, isCli ? join(dist, 'types') : dist, { recursive: true });
  }
  rmSync(OUT, { recursive: true, force: true });
  await buildBundle(true, BUNDLE_DIR);
}

/** Whether a package has no dist/ yet or a source file is newer than the CLI bundle (built last). */
export function buildIsStale(): boolean {
  const bundle = join(BUNDLE_DIR, 'codeweir.mjs');
  if (!existsSync(bundle)) return true;
  for (const name of readdirSync(join(ROOT, 'packages')))
    if (existsSync(join(ROOT, 'packages', name, 'src')) && !existsSync(join(ROOT, 'packages', name, 'dist'))) return true;
  return newestSource(join(ROOT, 'packages')) > statSync(bundle).mtimeMs;
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const started = Date.now();
  // `--if-stale` (the demo): build only when a source file changed since the last build.
  if (process.argv.includes('--if-stale') && !buildIsStale()) process.exit(0);
  await buildAll();
  process.stdout.write(`built every package's dist/ and the CLI bundle in ${((Date.now() - started) / 1000).toFixed(1)} s\n`);
}
