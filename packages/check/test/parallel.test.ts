/**
 * Checking a file on several threads must give byte for byte what one thread gives: the same
 * summary JSON, the same findings log and the same retained columns. The expectation is the
 * single-thread checkFile itself; csv-parse (the parsing oracle) confirms the row count. Every
 * row carries a quoted field with a line break, a comma and doubled quotes, so every split point
 * of the file sits next to quoted newlines.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openDeliveryRange, splitDelivery } from '@codeweir/read';
import { isCodeweirError } from '@codeweir/core';
import { checkFile, checkFileParallel, type CheckResult } from '../src/index.ts';
import { codebook } from './helpers.ts';

const { parse } = createRequire(new URL('../../read/package.json', import.meta.url))('csv-parse/sync') as {
  parse: (input: string, options: Record<string, unknown>) => string[][];
};

const cb = codebook(
  [
    { name: 'id', label: 'Record', role: 'id', type: 'integer' },
    { name: 'team', label: 'Team', role: 'group', type: 'integer', level: 'nominal', codes: [1, 2, 3].map((c) => ({ code: c, label: `Team ${c}` })) },
    {
      name: 'employed',
      label: 'Worked',
      type: 'integer',
      level: 'nominal',
      codes: [
        { code: 1, label: 'Yes' },
        { code: 2, label: 'No' },
      ],
      missing: [{ code: -9, kind: 'refused' }],
    },
    { name: 'hours', label: 'Hours', type: 'integer', level: 'ratio', range: { min: 0, max: 168 }, expect: { max: 80 }, askedWhen: 'employed == 1', missing: [{ code: -7, kind: 'not-applicable' }] },
    {
      name: 'trips',
      label: 'Trips',
      type: 'integer',
      level: 'ordinal',
      codes: [
        { code: 1, label: 'None', bin: { min: 0, max: 0 } },
        { code: 2, label: '1 to 5', bin: { min: 1, max: 5 } },
        { code: 3, label: '6 or more', bin: { min: 6 } },
      ],
    },
    { name: 'note', label: 'Remark', type: 'text' },
    { name: 'phone', label: 'Phone', type: 'text', unique: true },
    { name: 'w', label: 'Weight', role: 'weight', type: 'decimal', level: 'ratio', range: { min: 0 } },
  ],
  { rules: [{ id: 'hours-if-working', when: 'employed == 1', test: 'hours > 0', severity: 'warning', message: 'Working but no hours.' }] },
);

/** Deterministic rows with every kind of finding, duplicates far apart, and a quoted line break in each row. */
function csvText(n: number): string {
  const lines = ['id,team,employed,hours,trips,note,phone,w'];
  for (let i = 0; i < n; i++) {
    const emp = i % 7 === 0 ? '-9' : i % 3 === 0 ? '2' : '1';
    const hours = emp === '1' ? String((i * 13) % 95) : i % 11 === 0 ? '12' : '-7';
    const id = i % 17 === 5 ? String(i - 5 * 97) : String(i); // repeats an id from about 500 rows earlier
    const phone = i % 19 === 3 ? `p${i % 4}` : `p${i}`;
    const team = i % 23 === 0 ? '9' : String((i % 3) + 1);
    const trips = i % 13 === 0 ? '9' : String((i % 3) + 1); // 9 is a raw count: unbinned
    const note = `"line ${i}\nsecond, ""quoted"" part${i % 5 === 0 ? '\r\nthird' : ''}"`;
    // Weights lie in 100 to 200; 5000 is far beyond the upper Tukey fence (q3 + 3 IQR is below 500).
    const w = i % 31 === 0 ? 'x' : i % 97 === 0 ? '5000' : String(100 + ((i * 37) % 400) / 4);
    lines.push([id, team, emp, i % 41 === 0 ? '4.5' : hours, trips, note, phone, i % 53 === 0 ? '-1' : w].join(','));
  }
  return lines.join('\n') + '\n';
}

let dir = '';
let file = '';
let text = '';
let single: CheckResult;

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-parallel-'));
  file = join(dir, 'wave.csv');
  text = csvText(3000);
  await writeFile(file, text);
  single = await checkFile(file, cb);
});
afterAll(async () => {
  if (dir) await rm(dir, { recursive: true, force: true });
});

function same(a: CheckResult, b: CheckResult): void {
  expect(JSON.stringify(a.summary)).toBe(JSON.stringify(b.summary));
  expect(JSON.stringify(a.findings)).toBe(JSON.stringify(b.findings));
  expect(Object.keys(a.store.columns)).toEqual(Object.keys(b.store.columns));
  for (const [name, col] of Object.entries(a.store.columns)) {
    const other = b.store.columns[name]!;
    const x = col.kind === 'coded' ? col.codes : col.values;
    const y = other.kind === 'coded' ? other.codes : other.values;
    expect(Buffer.from(x.buffer, x.byteOffset, x.byteLength).equals(Buffer.from(y.buffer, y.byteOffset, y.byteLength)), name).toBe(true);
  }
}

describe('checkFileParallel', () => {
  it('reads as many rows as csv-parse (the parsing oracle) finds, with findings of many rules', () => {
    const records = parse(text, { columns: false });
    expect(single.summary.rows).toBe(records.length - 1);
    // The data plant these rules (see csvText); each must have fired for the comparison to mean something.
    for (const rule of ['not-a-code', 'unbinned-value', 'not-an-integer', 'not-a-number', 'impossible', 'implausible', 'duplicate-id', 'answered-when-skipped', 'rule-failed', 'extreme']) {
      expect(single.summary.findings.byRule[rule as 'not-a-code'] ?? 0, rule).toBeGreaterThan(0);
    }
  });

  it('splits this file next to quoted line breaks: every range starts a row, as csv-parse reads the rows', async () => {
    const ranges = await splitDelivery(file, 12);
    expect(ranges.length).toBe(12);
    const bytes = Buffer.from(text);
    const records = parse(text, { columns: false });
    for (const r of ranges.slice(1)) {
      // The range's first row, parsed on its own, is the csv-parse record of the same number.
      const rowText = bytes.subarray(r.start, r.end).toString('utf8');
      const first = parse(rowText, { columns: false })[0]!;
      expect(first).toEqual(records[r.firstRow]);
    }
  });

  it('gives the single-thread result byte for byte on 1, 2 and 3 threads', async () => {
    const opts = { minParallelBytes: 0, rangesPerThread: 5 };
    same(await checkFileParallel(file, cb, { ...opts, threads: 1 }), single);
    same(await checkFileParallel(file, cb, { ...opts, threads: 2 }), single);
    same(await checkFileParallel(file, cb, { ...opts, threads: 3 }), single);
  });

  it('gives the same result when the worker threads do every range (partials cross threads, arrays transferred)', async () => {
    same(await checkFileParallel(file, cb, { minParallelBytes: 0, rangesPerThread: 4, threads: 2, useCallingThread: false }), single);
  });

  it('reports a malformed file with the same error (code, line, column) as one thread', async () => {
    const bad = join(dir, 'bad.csv');
    // An unclosed quote in the last row: the error must name that row's line, not a line within a range.
    await writeFile(bad, text + '999999,1,1,3,1,"never closed,p-last,1\n');
    const caught = async (p: Promise<unknown>) => p.then(() => undefined, (e: unknown) => e);
    const one = await caught(checkFile(bad, cb));
    const many = await caught(checkFileParallel(bad, cb, { threads: 3, minParallelBytes: 0 }));
    expect(isCodeweirError(one)).toBe(true);
    expect(isCodeweirError(many)).toBe(true);
    if (isCodeweirError(one) && isCodeweirError(many)) {
      expect([many.code, many.line, many.column, many.message]).toEqual([one.code, one.line, one.column, one.message]);
    }
  });

  it('gives the single-thread result when the guessed cuts fall inside quoted fields (the check is redone on one thread)', async () => {
    // Every note pastes whole rows of the file inside its quotes, so the cut guessed near a
    // target (splitDelivery's guess option) lands inside a quoted field; the range before it
    // must fail to read, and the result must still be the single-thread one.
    const lines = ['id,team,employed,hours,trips,note,phone,w'];
    for (let i = 0; i < 2000; i++) {
      const pasted = Array.from({ length: 6 }, (_, k) => `${i * 10 + k},1,1,10,1,x,q${k},100`).join('\n');
      lines.push(`${i},${(i % 3) + 1},1,${i % 90},2,"pasted:\n${pasted}",p${i % 1500},150`);
    }
    const pasted = join(dir, 'pasted.csv');
    await writeFile(pasted, lines.join('\n') + '\n');
    const guessed = await splitDelivery(pasted, 8, {}, { numbered: false, guess: true });
    const failures = await Promise.all(
      guessed.map(async (r) => {
        try {
          for await (const _ of (await openDeliveryRange(pasted, r)).batches());
          return undefined;
        } catch (e) {
          return (e as { code?: string }).code;
        }
      }),
    );
    expect(failures).toContain('CW_CSV_UNCLOSED_QUOTE');
    const one = await checkFile(pasted, cb);
    expect(one.summary.rows).toBe(2000);
    same(await checkFileParallel(pasted, cb, { threads: 2, minParallelBytes: 0, rangesPerThread: 4 }), one);
  });

  it('rejects a thread count that is not a whole number of at least 1', async () => {
    await expect(checkFileParallel(file, cb, { threads: 0 })).rejects.toThrow('--threads takes a whole number of at least 1, got 0.');
  });
});

describe('rangeShares', () => {
  it('puts three quarters of the file in equal ranges and the last quarter in half-size ones', async () => {
    const { rangeShares } = await import('../src/parallel.ts');
    // First principles: 12 ranges = 6 of 3/24 (= 3/4 in all) then 6 of 1/24 (= 1/4 in all).
    const s = rangeShares(12);
    expect(s).toHaveLength(12);
    expect(s.slice(0, 6).every((x) => Math.abs(x - 3 / 24) < 1e-15)).toBe(true);
    expect(s.slice(6).every((x) => Math.abs(x - 1 / 24) < 1e-15)).toBe(true);
    expect(s.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
    // Fewer than four ranges stay equal.
    expect(rangeShares(3)).toEqual([1, 1, 1]);
  });
});
