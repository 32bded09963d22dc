/**
 * The API reference in docs/api is generated from the packages' doc comments by TypeDoc
 * (`pnpm docs`, typedoc.json) and committed; it may not go stale. The test generates it afresh
 * into a temporary folder and compares every page with the committed one.
 */
import { describe, it, expect } from 'vitest';
import { execFile } from 'node:child_process';
import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, relative, resolve } from 'node:path';
import { promisify } from 'node:util';

const exec = promisify(execFile);
const REPO = resolve(import.meta.dirname, '..');

async function pages(dir: string, root = dir, out = new Map<string, string>()): Promise<Map<string, string>> {
  for (const e of await readdir(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    if (e.isDirectory()) await pages(p, root, out);
    else out.set(relative(root, p), await readFile(p, 'utf8'));
  }
  return out;
}

describe('API reference', () => {
  it('docs/api is what TypeDoc writes from the current doc comments (regenerate with pnpm docs)', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'codeweir-api-'));
    try {
      await exec(join(REPO, 'node_modules/.bin/typedoc'), ['--out', dir], { cwd: REPO, maxBuffer: 16 * 2 ** 20 });
      const fresh = await pages(dir);
      const committed = await pages(join(REPO, 'docs/api'));
      expect([...committed.keys()].sort()).toEqual([...fresh.keys()].sort());
      for (const [name, text] of fresh) expect(committed.get(name), `docs/api/${name} is stale; run pnpm docs`).toBe(text);
      expect(fresh.get('README.md')).toMatch(/@codeweir\/check/);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  }, 180_000);
});
