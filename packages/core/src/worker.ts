/**
 * How a module that doubles as a worker thread's entry is started, from the bundle or from
 * TypeScript source.
 */
import { createRequire } from 'node:module';
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { pathToFileURL } from 'node:url';

/**
 * The file (or code) and `eval` flag for `new Worker` that runs the module at `moduleUrl`
 * (pass `import.meta.url`): in the CLI bundle, `bundled` (a file name next to the bundled code);
 * in a package's built `dist/`, the module itself; from TypeScript source (the workspace's
 * tests), code that registers the tsx loader first and then imports the module (a worker's
 * execArgv does not carry --import hooks on Node 20). Cost: one file-existence check. Throws
 * when run from source without tsx installed.
 * @example const { file, eval: e } = workerEntry(import.meta.url, 'check-worker.mjs');
 */
export function workerEntry(moduleUrl: string, bundled: string): { file: string | URL; eval: boolean } {
  if (!moduleUrl.endsWith('.ts')) {
    const beside = new URL(`./${bundled}`, moduleUrl);
    return { file: existsSync(beside) ? beside : new URL(moduleUrl), eval: false };
  }
  const require = createRequire(moduleUrl);
  const pkg = require.resolve('tsx/package.json');
  const api = JSON.parse(readFileSync(pkg, 'utf8')).exports['./esm/api'].import.default as string;
  const apiUrl = pathToFileURL(join(dirname(pkg), api)).href;
  const code = `import(${JSON.stringify(apiUrl)}).then((m) => { m.register(); return import(${JSON.stringify(moduleUrl)}); });`;
  return { file: code, eval: true };
}
