/**
 * Runs the seeded adversarial corpus (test/adversarial/corpus.ts) through the CLI, in-process,
 * and asserts for every case: the exit code the contract gives, one clear sentence on stderr
 * (no stack trace), valid JSON on stdout with --json when the file was read, no partial or
 * temporary output files, and the input's bytes unchanged.
 */
import { describe, it, expect, beforeAll } from 'vitest';
import { mkdtemp, mkdir, writeFile, readFile, readdir } from 'node:fs/promises';
import { createHash } from 'node:crypto';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { run } from '@codeweir/cli';
import { makeCorpus, corpusCodebook, type CorpusCase } from './adversarial/corpus.ts';

const sha = (b: Buffer) => createHash('sha256').update(b).digest('hex');

async function invoke(argv: string[]) {
  let stdout = '';
  let stderr = '';
  const exit = await run(argv, { stdout: (t) => void (stdout += t), stderr: (t) => void (stderr += t), isTTY: false });
  return { exit, stdout, stderr };
}

let root: string;
beforeAll(async () => {
  root = await mkdtemp(join(tmpdir(), 'codeweir-corpus-'));
});

const cases = makeCorpus();

describe('adversarial corpus', () => {
  it('is made by a seeded script: the same bytes every time', () => {
    const again = makeCorpus();
    expect(again.map((c) => (c.data ? sha(c.data.bytes) : c.codebook ?? c.path))).toEqual(cases.map((c) => (c.data ? sha(c.data.bytes) : c.codebook ?? c.path)));
  });

  for (const c of cases) {
    it(c.name, async () => {
      const dir = join(root, c.name.replace(/[^a-z0-9]+/gi, '-'));
      await mkdir(dir, { recursive: true });
      const codebookPath = join(dir, 'codebook.json');
      await writeFile(codebookPath, c.codebook ?? JSON.stringify(corpusCodebook, null, 2));
      let dataPath: string | undefined;
      if (c.data) {
        dataPath = join(dir, c.data.file);
        await writeFile(dataPath, c.data.bytes);
      } else if (c.path === 'missing') {
        dataPath = join(dir, 'does-not-exist.csv');
      } else if (c.path === 'directory') {
        dataPath = join(dir, 'a-folder');
        await mkdir(dataPath);
      }
      const outDir = join(dir, 'out');
      const argv =
        c.command === 'lint'
          ? ['lint', codebookPath, '--json']
          : ['check', dataPath!, '--codebook', codebookPath, '--json', '--out', outDir, ...(c.extraArgs ?? [])];
      const before = c.data ? sha(await readFile(dataPath!)) : undefined;
      const before2 = sha(await readFile(codebookPath));
      const r = await invoke(argv);

      expect(r.exit, `exit code; stderr: ${r.stderr}`).toBe(c.expect.exit);
      // No stack trace, ever; at most one sentence-line of error text.
      expect(r.stderr).not.toMatch(/^\s+at /m);
      for (const re of c.expect.stderr ?? []) expect(r.stderr).toMatch(re);
      if (c.expect.exit === 2 || (c.expect.stderr && c.expect.stderr.length > 0)) {
        expect(r.stderr.trim().split('\n').length, r.stderr).toBe(1);
      }
      // --json: stdout is one JSON document when the input was read; empty otherwise.
      if (r.stdout.trim() !== '') {
        const doc = JSON.parse(r.stdout);
        c.expect.summary?.(doc);
      } else {
        expect(c.expect.summary, 'a summary was expected on stdout').toBeUndefined();
      }
      // The inputs are unchanged.
      if (before) expect(sha(await readFile(dataPath!))).toBe(before);
      expect(sha(await readFile(codebookPath))).toBe(before2);
      // Outputs: complete when the file was read, absent otherwise; never a temporary file.
      const left = await readdir(outDir).catch(() => [] as string[]);
      expect(left.filter((f) => f.endsWith('.tmp'))).toEqual([]);
      if (c.command === 'check') {
        if (c.expect.outputs) expect(left).toEqual(expect.arrayContaining(['findings.csv', 'findings.jsonl', 'missingness.csv']));
        if (c.expect.exit === 2) expect(left).toEqual([]);
      }
    });
  }
});
