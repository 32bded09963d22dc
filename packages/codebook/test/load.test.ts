import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtemp, rm, symlink, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { CodeweirError } from '@codeweir/core';
import { loadCodebook, loadCodebookOrThrow } from '../src/index.ts';
import { household } from './fixtures.ts';

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-load-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

async function thrown(p: Promise<unknown>): Promise<CodeweirError> {
  try {
    await p;
  } catch (e) {
    expect(e).toBeInstanceOf(CodeweirError);
    return e as CodeweirError;
  }
  throw new Error('expected a CodeweirError');
}

describe('loadCodebook', () => {
  it('loads a valid file and records where it came from', async () => {
    const f = join(dir, 'hh.codebook.json');
    await writeFile(f, JSON.stringify(household(), null, 2));
    const r = await loadCodebook(f);
    expect(r.ok).toBe(true);
    expect(r.ok && r.codebook.file).toBe(f);
    expect((await loadCodebookOrThrow(f)).id).toBe('lowmarsh-hh');
  });

  it('returns problems for an invalid file rather than throwing', async () => {
    const f = join(dir, 'bad.codebook.json');
    await writeFile(f, '{ "codebook": "x" }');
    const r = await loadCodebook(f);
    expect(r.ok).toBe(false);
    expect(r.problems.map((p) => p.code)).toEqual(['missing-field', 'missing-field', 'missing-field']);
  });

  it.each([
    ['a missing file', 'nope.json', 'CW_FILE_NOT_FOUND'],
    ['a directory', '.', 'CW_FILE_IS_DIRECTORY'],
    ['a path through a file', 'hh.codebook.json/x', 'CW_FILE_NOT_FOUND'],
  ])('%s throws %s with exit code 2', async (_name, rel, code) => {
    const e = await thrown(loadCodebook(join(dir, rel)));
    expect(e.code).toBe(code);
    expect(e.exitCode).toBe(2);
    expect(e.file).toBe(join(dir, rel));
  });

  it('an unreadable file (a symlink loop) throws CW_FILE_UNREADABLE with exit code 2', async () => {
    const f = join(dir, 'loop.json');
    await symlink(f, f);
    const e = await thrown(loadCodebook(f));
    expect(e.code).toBe('CW_FILE_UNREADABLE');
    expect(e.exitCode).toBe(2);
  });

  it('loadCodebookOrThrow names the file, the pointer and the position of the first error', async () => {
    const cb = household();
    cb.items[3].range = { min: 5, max: 1 };
    const f = join(dir, 'range.codebook.json');
    await writeFile(f, JSON.stringify(cb, null, 2));
    const e = await thrown(loadCodebookOrThrow(f));
    expect(e.code).toBe('CW_CODEBOOK_INVALID');
    expect(e.exitCode).toBe(1);
    expect(e.path).toBe('/items/3/range');
    expect(e.line).toBeGreaterThan(1);
    expect(e.message).toBe(`Codebook ${f} is invalid at /items/3/range: range of "hh_size" has min 5 above max 1; run codeweir lint ${f} for every problem.`);
  });

  it('loadCodebookOrThrow reports a JSON syntax error with its line and column', async () => {
    const f = join(dir, 'syntax.codebook.json');
    await writeFile(f, '{\n  "codebook": "x",\n  "version" "1"\n}');
    const e = await thrown(loadCodebookOrThrow(f));
    expect(e.code).toBe('CW_CODEBOOK_INVALID');
    expect([e.line, e.column]).toEqual([3, 13]);
  });
});
