/**
 * `pnpm build`: bundles the CLI into one ESM file, `dist/codeweir.mjs`, and the parallel check
 * worker into `dist/check-worker.mjs`, with esbuild. From source every start pays for the
 * TypeScript loader (tsx) compiling the workspace, several times a bare `node` start; the bundle
 * is plain JavaScript and starts close to bare node. `node dist/codeweir.mjs <command>` is the
 * same CLI as `pnpm codeweir <command>`.
 */
import { build, type Plugin } from 'esbuild';
import { copyFileSync, existsSync, mkdirSync, readFileSync, statSync, readdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = resolve(fileURLToPath(new URL('..', import.meta.url)));
/** Path of the bundled CLI. */
export const BUNDLE = join(ROOT, 'dist/codeweir.mjs');
/** Path of the bundled parallel check worker (next to the CLI, where parallel.ts looks for it). */
export const WORKER_BUNDLE = join(ROOT, 'dist/check-worker.mjs');

function newestSource(dir: string): number {
  let newest = 0;
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    if (e.name === 'node_modules' || e.name === 'test') continue;
    const p = join(dir, e.name);
    if (e.isDirectory()) newest = Math.max(newest, newestSource(p));
    else if (e.name.endsWith('.ts') || e.name.endsWith('.json')) newest = Math.max(newest, statSync(p).mtimeMs);
  }
  return newest;
}

/**
 * The codebook package reads its shipped JSON Schema next to its source folder; in the bundle
 * the schema file sits next to the bundle instead.
 */
const schemaBesideBundle: Plugin = {
  name: 'schema-beside-bundle',
  setup(b) {
    b.onLoad({ filter: /codebook[\\/]src[\\/]json-schema\.ts$/ }, (args) => {
      const text = readFileSync(args.path, 'utf8');
      const moved = text.replace("new URL('../codebook.schema.json', import.meta.url)", "new URL('./codebook.schema.json', import.meta.url)");
      if (moved === text) throw new Error('bench/build.ts: the schema location in packages/codebook/src/json-schema.ts changed; update the build.');
      return { contents: moved, loader: 'ts' };
    });
  },
};

/**
 * Builds both bundles unless they are newer than every source file under packages/.
 * Cost: about a second. Throws esbuild's error when a source file does not compile.
 */
export async function buildBundle(force = false): Promise<void> {
  const stale = (f: string): boolean => force || !existsSync(f) || statSync(f).mtimeMs < newestSource(join(ROOT, 'packages'));
  if (!stale(BUNDLE) && !stale(WORKER_BUNDLE)) return;
  const common = {
    bundle: true,
    platform: 'node' as const,
    format: 'esm' as const,
    target: 'node20',
    sourcemap: true,
    minify: true,
    logLevel: 'warning' as const,
    plugins: [schemaBesideBundle],
    // CommonJS dependencies bundled into ESM call require() for Node's built-ins.
    banner: { js: "import { createRequire as __cwRequire } from 'node:module'; const require = __cwRequire(import.meta.url);" },
  };
  mkdirSync(join(ROOT, 'dist'), { recursive: true });
  copyFileSync(join(ROOT, 'packages/codebook/codebook.schema.json'), join(ROOT, 'dist/codebook.schema.json'));
  await build({ ...common, entryPoints: [join(ROOT, 'packages/cli/src/bin.ts')], outfile: BUNDLE });
  await build({ ...common, entryPoints: [join(ROOT, 'packages/check/src/parallel.ts')], outfile: WORKER_BUNDLE });
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  await buildBundle(true);
  process.stdout.write(`built ${BUNDLE}\n`);
}
