/**
 * checkFile's `threads` option: above one thread the file is checked in parallel, and the result
 * must be what one thread gives (first principles: counts and findings are properties of the
 * file, not of how it was cut); csv-parse (the parsing oracle) gives the row count. The reader's
 * options, the field-size limit among them, hold on every thread alike.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { isCodeweirError } from '@codeweir/core';
import { checkFile } from '../src/index.ts';
import { codebook, idItem, employedItem, countingWorkers } from './helpers.ts';

const { parse } = createRequire(new URL('../../read/package.json', import.meta.url))('csv-parse/sync') as {
  parse: (input: string, options: Record<string, unknown>) => string[][];
};

const cb = codebook([idItem, employedItem, { name: 'note', label: 'Remark', type: 'text' }]);

async function caught(p: Promise<unknown>): Promise<unknown> {
  try {
    await p;
  } catch (e) {
    return e;
  }
  throw new Error('expected a rejection');
}

let dir = '';
let file = '';
let wide = '';
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-check-file-'));
  const lines = ['id,employed,note'];
  // Every 50th id repeats an earlier one, every 11th answer is not a code, notes carry quoted line breaks.
  for (let i = 1; i <= 3000; i++) lines.push(`${i % 50 === 0 ? i - 25 : i},${i % 11 === 0 ? 4 : 1 + (i % 2)},"line ${i}\nnext, ""quoted"""`);
  file = join(dir, 'rows.csv');
  await writeFile(file, lines.join('\n') + '\n');
  wide = join(dir, 'wide.csv');
  await writeFile(wide, `id,employed,note\n1,1,${'x'.repeat(200)}\n`);
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('checkFile threads', () => {
  it('on two threads gives the one-thread result, with a worker started', async () => {
    const one = await countingWorkers(() => checkFile(file, cb, { threads: 1 }));
    expect(one.workers).toBe(0);
    expect(one.value.summary.rows).toBe(parse(await readFile(file, 'utf8'), { columns: false }).length - 1);
    // 3000 / 50 repeated ids and 272 ids i with i % 11 == 0 written as the non-code 4, by construction.
    expect(one.value.summary.findings.byRule['duplicate-id']).toBe(60);
    expect(one.value.summary.findings.byRule['not-a-code']).toBe(272);
    // minParallelBytes 0 lets this small file cross to the parallel path.
    const two = await countingWorkers(() => checkFile(file, cb, { threads: 2, minParallelBytes: 0 }));
    expect(two.workers).toBe(1);
    expect(JSON.stringify(two.value.summary)).toBe(JSON.stringify(one.value.summary));
    expect(JSON.stringify(two.value.findings)).toBe(JSON.stringify(one.value.findings));
  }, 60_000);

  it('stays on one thread for a file under the parallel minimum', async () => {
    const r = await countingWorkers(() => checkFile(file, cb, { threads: 2 }));
    expect(r.workers).toBe(0);
  });

  it('holds the field-size limit on two threads as on one', async () => {
    const one = await caught(checkFile(wide, cb, { threads: 1, maxFieldBytes: 50 }));
    const two = await caught(checkFile(wide, cb, { threads: 2, maxFieldBytes: 50, minParallelBytes: 0 }));
    expect(isCodeweirError(one)).toBe(true);
    expect((two as Error).message).toBe((one as Error).message);
  }, 60_000);

  for (const bad of [0, -2, 1.5, 'two', Number.NaN]) {
    it(`refuses threads ${String(bad)} with a usage error`, async () => {
      const e = await caught(checkFile(file, cb, { threads: bad as number }));
      expect(isCodeweirError(e) && e.code).toBe('CW_USAGE');
      expect((e as Error).message).toBe(`--threads takes a positive whole number, got ${String(bad)}.`);
    });
  }
});
