#!/usr/bin/env node
// The `codeweir` binary: the bundled CLI beside this folder (built by the workspace's `build`).
const bundle = new URL('../dist/codeweir.mjs', import.meta.url);
try {
  await import(bundle.href);
} catch (e) {
  if (e?.code === 'ERR_MODULE_NOT_FOUND' && String(e.message).includes(bundle.pathname)) {
    process.stderr.write('codeweir: the CLI has not been built in this checkout; run `npx -y pnpm@12.4.2 build` first.\n');
    process.exit(2);
  }
  throw e;
}
