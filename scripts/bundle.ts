/**
 * The shipped CLI: esbuild bundles it into `packages/cli/dist/codeweir.mjs` (the program behind
 * the `codeweir` binary), `packages/cli/dist/index.mjs` (its programmatic entry, `run`), and the
 * worker threads of the parallel check and describe into `check-worker.mjs` and
 * `describe-worker.mjs` beside them, with the codebook schema file. Shared code goes to
 * `chunk-*.mjs`. One bundle rather than the libraries' module trees because a command then loads
 * a few files instead of hundreds and validates codebooks with a validator compiled at build
 * time: `codeweir lint` starts in about twice a bare `node` start (see the README's performance
 * section). `scripts/build.ts` calls it after building the libraries.
 */
import { build, type Plugin } from 'esbuild';
import { copyFileSync, existsSync, mkdirSync, readFileSync, rmSync, statSync, readdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { createRequire } from 'node:module';

const ROOT = resolve(fileURLToPath(new URL('..', import.meta.url)));
/** Where the bundle is written: the CLI package's `dist/`, which its `bin` and `exports` point into. */
export const BUNDLE_DIR = join(ROOT, 'packages/cli/dist');
/** The file linked as the `codeweir` binary: it loads the bundled CLI. */
export const BIN = join(ROOT, 'packages/cli/bin/codeweir.mjs');
/** Path of the bundled CLI. */
export const BUNDLE = join(BUNDLE_DIR, 'codeweir.mjs');
/** Path of the bundled parallel check worker (next to the CLI, where parallel.ts looks for it). */
export const WORKER_BUNDLE = join(BUNDLE_DIR, 'check-worker.mjs');
/**
 * Packages left out of the bundle and installed beside it as the CLI package's dependencies:
 * native modules, whose binaries cannot be bundled. Each is loaded only by the commands that use it.
 */
export const BUNDLE_EXTERNAL: readonly string[] = ['@duckdb/node-api'];

/** Newest modification time of the TypeScript and JSON sources under `dir` (tests, node_modules and built dist/ aside). */
export function newestSource(dir: string): number {
  let newest = 0;
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    if (e.name === 'node_modules' || e.name === 'test' || e.name === 'dist') continue;
    const p = join(dir, e.name);
    if (e.isDirectory()) newest = Math.max(newest, newestSource(p));
    else if (e.name.endsWith('.ts') || e.name.endsWith('.json')) newest = Math.max(newest, statSync(p).mtimeMs);
  }
  return newest;
}

const AJV_IMPORT = "import { Ajv, type ErrorObject, type ValidateFunction } from 'ajv';";
const AJV_COMPILE = 'new Ajv({ allErrors: true, strict: false }).compile(schema)';
const PRECOMPILED = 'codeweir:precompiled-schema';

/**
 * The shipped schema's ajv validator as JavaScript source, generated now with the options the
 * codebook package compiles it with at run time. The bundle then validates every codebook with
 * the same ajv code without compiling the schema (and ajv's meta-schema) at each start, which
 * was most of the start-up of `codeweir lint`.
 */
function precompiledValidator(): string {
  const codebookDir = join(ROOT, 'packages/codebook');
  const fromCodebook = createRequire(join(codebookDir, 'package.json'));
  // ajv is the codebook package's dependency, so it is resolved from there.
  const { Ajv } = fromCodebook('ajv') as { Ajv: new (o: object) => { compile(s: object): unknown } };
  const standalone = (fromCodebook('ajv/dist/standalone') as { default: (ajv: unknown, v: unknown) => string }).default;
  const schema = JSON.parse(readFileSync(join(codebookDir, 'codebook.schema.json'), 'utf8')) as Record<string, unknown>;
  const ajv = new Ajv({ allErrors: true, strict: false, code: { source: true, esm: true } });
  return standalone(ajv, ajv.compile(schema));
}

/**
 * The codebook package reads its shipped JSON Schema next to its source folder; in the bundle
 * the schema file sits next to the bundle instead, and its validator is compiled at build time.
 */
const schemaBesideBundle: Plugin = {
  name: 'schema-beside-bundle',
  setup(b) {
    b.onLoad({ filter: /codebook[\\/]src[\\/]json-schema\.ts$/ }, (args) => {
      const text = readFileSync(args.path, 'utf8');
      const moved = text
        .replace("new URL('../codebook.schema.json', import.meta.url)", "new URL('./codebook.schema.json', import.meta.url)")
        .replace(AJV_IMPORT, `import type { ErrorObject, ValidateFunction } from 'ajv';\nimport precompiledValidator from '${PRECOMPILED}';`)
        .replace(AJV_COMPILE, '(precompiledValidator as unknown as ValidateFunction)');
      const expected = text.includes("new URL('../codebook.schema.json', import.meta.url)") && text.includes(AJV_IMPORT) && text.includes(AJV_COMPILE);
      if (!expected) throw new Error('scripts/bundle.ts: the schema location or the ajv options in packages/codebook/src/json-schema.ts changed; update the build.');
      return { contents: moved, loader: 'ts' };
    });
    b.onResolve({ filter: new RegExp(`^${PRECOMPILED}$`) }, () => ({ path: PRECOMPILED, namespace: 'codeweir' }));
    b.onLoad({ filter: /.*/, namespace: 'codeweir' }, () => ({ contents: precompiledValidator(), loader: 'js', resolveDir: join(ROOT, 'packages/codebook') }));
  },
};

const STRUCTURE_IMPORT = "import { structureProblems } from './schema-problems.ts';";
/** The zod side of loading a codebook, bundled on its own (CommonJS, so it can be required). */
const ZOD_SIDE = 'codebook-zod.cjs';

/**
 * zod (with its locales) and the codebook's zod schema took a quarter of the start-up of a
 * command reading a codebook, though a valid codebook needs only the shipped JSON Schema's
 * validator (`packages/codebook/src/structure.ts`). In the bundle, every import of the codebook
 * package resolves to its entry without the zod schema (`runtime.ts`; a bundled module importing
 * a zod value from the package then fails the build), and the zod side of the structural stage
 * (`schema-problems.ts`, zod itself) is a file of its own beside the bundle, required on first
 * use: a command reading a valid codebook neither parses nor evaluates it. Library consumers
 * import the package's own index and are unaffected.
 */
const zodOnlyWhenInvalid: Plugin = {
  name: 'zod-only-when-invalid',
  setup(b) {
    b.onResolve({ filter: /^@codeweir\/codebook$/ }, () => ({ path: join(ROOT, 'packages/codebook/src/runtime.ts') }));
    b.onLoad({ filter: /codebook[\\/]src[\\/]structure\.ts$/ }, (args) => {
      const text = readFileSync(args.path, 'utf8');
      if (!text.includes(STRUCTURE_IMPORT)) throw new Error('scripts/bundle.ts: the import of structureProblems in packages/codebook/src/structure.ts changed; update the build.');
      const lazy =
        "import { createRequire as zodSideRequire } from 'node:module';\n" +
        "import type { structureProblems as StructureProblems } from './schema-problems.ts';\n" +
        'let zodSide: { structureProblems: typeof StructureProblems } | undefined;\n' +
        `const structureProblems: typeof StructureProblems = (data, errors) => (zodSide ??= zodSideRequire(import.meta.url)('./${ZOD_SIDE}')).structureProblems(data, errors);`;
      return { contents: text.replace(STRUCTURE_IMPORT, lazy), loader: 'ts' };
    });
  },
};

/**
 * The CLI's argument parser measures every line of a command's help text after each command
 * it runs, with string-width, whose per-string Unicode segmentation made up much of a short
 * command's start-up. A string of printable ASCII only is one column per character in
 * string-width too, so that case is answered at once and every other string still goes to
 * string-width: the widths, and so the help text, are unchanged.
 */
export const asciiWidthFirst: Plugin = {
  name: 'ascii-width-first',
  setup(b) {
    b.onResolve({ filter: /^string-width$/ }, (args) =>
      args.namespace === 'ascii-width' ? undefined : { path: args.resolveDir, namespace: 'ascii-width' },
    );
    b.onLoad({ filter: /.*/, namespace: 'ascii-width' }, (args) => ({
      // Required, not imported: string-width's own start-up (a Unicode segmenter and large
      // property-class patterns, tens of milliseconds) is then paid only for non-ASCII text.
      contents:
        'let stringWidth;\n' +
        'export default function width(text, options) {\n' +
        '  if (typeof text === \'string\' && /^[\\x20-\\x7e]*$/.test(text)) return text.length;\n' +
        "  stringWidth ??= require('string-width').default;\n" +
        '  return stringWidth(text, options);\n' +
        '}\n',
      loader: 'js',
      resolveDir: args.path,
    }));
  },
};

/**
 * Builds the bundles into `outdir` (default packages/cli/dist) unless they are newer than every source
 * file under packages/. Cost: a few seconds. Throws esbuild's error when a file does not compile.
 */
export async function buildBundle(force = false, outdir = BUNDLE_DIR, minify = true): Promise<void> {
  const cli = join(outdir, 'codeweir.mjs');
  const workers = [join(outdir, 'index.mjs'), join(outdir, 'check-worker.mjs'), join(outdir, 'describe-worker.mjs'), join(outdir, ZOD_SIDE)];
  const stale = (f: string): boolean => force || !existsSync(f) || statSync(f).mtimeMs < newestSource(join(ROOT, 'packages'));
  if (!stale(cli) && !workers.some(stale)) return;
  mkdirSync(outdir, { recursive: true });
  // Chunk names are content hashes: the previous build's chunks would otherwise pile up.
  for (const f of readdirSync(outdir)) if (/^chunk-[A-Z0-9]+\.mjs(\.map)?$/.test(f)) rmSync(join(outdir, f));
  copyFileSync(join(ROOT, 'packages/codebook/codebook.schema.json'), join(outdir, 'codebook.schema.json'));
  await build({
    entryPoints: {
      codeweir: join(ROOT, 'packages/cli/src/bin.ts'),
      index: join(ROOT, 'packages/cli/src/index.ts'),
      'check-worker': join(ROOT, 'packages/check/src/parallel.ts'),
      'describe-worker': join(ROOT, 'packages/describe/src/parallel.ts'),
    },
    outdir,
    outExtension: { '.js': '.mjs' },
    // Code split at dynamic imports, so a command loads only what it uses; chunks sit beside
    // the entries because bundled code finds the worker and the schema next to itself.
    splitting: true,
    chunkNames: 'chunk-[hash]',
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    sourcemap: true,
    minify,
    logLevel: 'warning',
    external: [...BUNDLE_EXTERNAL],
    // The workspace packages are bundled from their TypeScript source (their `source` export).
    conditions: ['source'],
    plugins: [schemaBesideBundle, zodOnlyWhenInvalid, asciiWidthFirst],
    // CommonJS dependencies bundled into ESM call require() for Node's built-ins.
    banner: { js: "import { createRequire as __cwRequire } from 'node:module'; const require = __cwRequire(import.meta.url);" },
  });
  await build({
    entryPoints: [join(ROOT, 'packages/codebook/src/schema-problems.ts')],
    outfile: join(outdir, ZOD_SIDE),
    bundle: true,
    platform: 'node',
    format: 'cjs',
    target: 'node20',
    sourcemap: true,
    minify,
    logLevel: 'warning',
    conditions: ['source'],
  });
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  // `--readable DIR`: an unminified bundle in DIR, for reading CPU profiles by function name.
  const at = process.argv.indexOf('--readable');
  if (at > 0) {
    await buildBundle(true, resolve(process.argv[at + 1] ?? '.bench/readable'), false);
    process.stdout.write(`built an unminified bundle in ${process.argv[at + 1] ?? '.bench/readable'}\n`);
    process.exit(0);
  }
  await buildBundle(true);
  process.stdout.write(`built ${BUNDLE}\n`);
}
