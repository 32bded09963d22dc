/**
 * A draft is a codebook a person can start from: it must pass the codebook's own lint (schema
 * and meaning checks) with nothing at error severity, and the CLI must print or write it
 * without ever replacing the data or an existing file.
 */
import { describe, it, expect } from 'vitest';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { draftDelivery, formatJson } from '../packages/draft/src/index.ts';
import { openDelivery } from '../packages/read/src/index.ts';
import { parseCodebook } from '../packages/codebook/src/index.ts';
import { run } from '../packages/cli/src/index.ts';

const examples = fileURLToPath(new URL('../examples/', import.meta.url));
const demo = join(examples, 'demo-delivery.csv');
const semicolon = join(examples, 'demo-delivery-semicolon.csv');

function capture(cwd: string) {
  const out = { stdout: '', stderr: '' };
  return { out, io: { stdout: (t: string) => void (out.stdout += t), stderr: (t: string) => void (out.stderr += t), isTTY: false, cwd } };
}

describe('draft lints clean', () => {
  it('drafts the demo delivery into a codebook with no error-severity lint problem', async () => {
    const r = await draftDelivery(await openDelivery(demo));
    const lint = parseCodebook(formatJson(r.codebook));
    expect(lint.problems.filter((p) => p.severity === 'error')).toEqual([]);
    expect(lint.ok).toBe(true);
    expect(r.rows).toBe(4000);
    // The header has 29 columns (the demo codebook's items); each becomes an item.
    expect(r.codebook.items).toHaveLength(29);
  });

  it('drafts the semicolon, decimal-comma, windows-1252 demo with no error-severity lint problem', async () => {
    const r = await draftDelivery(await openDelivery(semicolon, { encoding: 'windows-1252' }), { decimalComma: true });
    const lint = parseCodebook(formatJson(r.codebook));
    expect(lint.problems.filter((p) => p.severity === 'error')).toEqual([]);
    // With the decimal comma read, the weight column ("162,32") is a decimal.
    expect(r.codebook.items.find((i) => i.name === 'weight')?.type).toBe('decimal');
  });
});

describe('codeweir draft', () => {
  it('prints the draft on stdout, or writes the same text with -o, and refuses to replace files', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'codeweir-draft-'));
    try {
      const a = capture(dir);
      expect(await run(['draft', demo], a.io)).toBe(0);
      expect(parseCodebook(a.out.stdout).ok).toBe(true);
      expect(a.out.stderr).toMatch(/drafted 29 items from 4000 rows/);

      const b = capture(dir);
      expect(await run(['draft', demo, '-o', 'demo.codebook.json', '--quiet'], b.io)).toBe(0);
      expect(await readFile(join(dir, 'demo.codebook.json'), 'utf8')).toBe(a.out.stdout);
      expect(b.out.stdout).toBe('');
      expect(b.out.stderr).toBe('');

      // An existing file (a person's edits) is kept unless --force.
      await writeFile(join(dir, 'mine.json'), 'edited by hand');
      const c = capture(dir);
      expect(await run(['draft', demo, '-o', 'mine.json'], c.io)).toBe(2);
      expect(c.out.stderr).toMatch(/already exists; pass --force/);
      expect(await readFile(join(dir, 'mine.json'), 'utf8')).toBe('edited by hand');
      expect(await run(['draft', demo, '-o', 'mine.json', '--force', '--quiet'], capture(dir).io)).toBe(0);
      expect(parseCodebook(await readFile(join(dir, 'mine.json'), 'utf8')).ok).toBe(true);

      // The data file itself is never the output.
      const d = capture(dir);
      await writeFile(join(dir, 'data.csv'), 'a,b\n1,2\n');
      expect(await run(['draft', 'data.csv', '-o', 'data.csv', '--force'], d.io)).toBe(2);
      expect(await readFile(join(dir, 'data.csv'), 'utf8')).toBe('a,b\n1,2\n');
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });

  it('answers a missing file and a bad option with one sentence and exit 2', async () => {
    const a = capture(examples);
    expect(await run(['draft', 'no-such-file.csv'], a.io)).toBe(2);
    expect(a.out.stderr.trim().split('\n')).toHaveLength(1);
    expect(a.out.stderr).toMatch(/no-such-file\.csv/);
    const b = capture(examples);
    expect(await run(['draft', demo, '--max-codes', 'many'], b.io)).toBe(2);
    expect(b.out.stderr).toBe('codeweir: --max-codes takes a whole number from 1 to 1000, got "many".\n');
  });

  it('prints codebook, guesses and row counts with --json', async () => {
    const a = capture(examples);
    expect(await run(['draft', semicolon, '--encoding', 'windows-1252', '--decimal-comma', '--json', '--quiet'], a.io)).toBe(0);
    const doc = JSON.parse(a.out.stdout) as { rows: number; raggedRows: number; guesses: unknown[]; codebook: { items: unknown[] } };
    expect(doc.rows).toBe(300);
    expect(doc.raggedRows).toBe(0);
    expect(doc.codebook.items).toHaveLength(29);
    expect(doc.guesses.length).toBeGreaterThanOrEqual(29);
  });
});
