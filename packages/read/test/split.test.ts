import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openDelivery, openDeliveryRange, splitDelivery } from '../src/index.ts';
import { collect, oracle } from './helpers.ts';

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'cw-split-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/**
 * A delivery whose rows are full of traps for a splitter: quoted fields with several newlines
 * (some CRLF), doubled quotes, delimiters inside quotes, multi-byte characters, blank lines,
 * stray quotes inside unquoted fields, and a closing quote followed by a newline.
 */
function trickyText(rows: number, eol: string): string {
  const notes = ['plain', '"two\nlines"', '"with ""quotes"",\n and more\n\n"', '"a,b"', 'Zoë 😀 日本', '5" pipe', '"end"', '"\n"'];
  let out = `id,note,n${eol}`;
  for (let i = 0; i < rows; i++) {
    out += `${i},${notes[i % notes.length]},${i % 7}${eol}`;
    if (i % 97 === 50) out += eol;
  }
  return out;
}

async function rowsOfRanges(path: string, parts: number, blockSize?: number) {
  const ranges = await splitDelivery(path, parts, { blockSize });
  const rows: string[][] = [];
  const lines: number[] = [];
  const firstRows: number[] = [];
  for (const range of ranges) {
    const got = await collect(await openDeliveryRange(path, range, { blockSize }));
    rows.push(...got.rows);
    lines.push(...got.lines);
    firstRows.push(...got.firstRows);
  }
  return { ranges, rows, lines, firstRows };
}

describe('splitDelivery', () => {
  for (const eol of ['\n', '\r\n']) {
    for (const [parts, blockSize] of [
      [2, undefined],
      [3, 7],
      [7, 64],
      [40, 13],
    ] as const) {
      it(`concatenated ranges equal the whole file (${JSON.stringify(eol)}, ${parts} parts, blockSize ${blockSize ?? 'default'})`, async () => {
        const text = trickyText(300, eol);
        const p = join(dir, `tricky-${eol.length}-${parts}.csv`);
        writeFileSync(p, text);
        const whole = await collect(await openDelivery(p));
        // The whole-file read itself agrees with csv-parse 7 (the oracle in helpers.ts).
        const expected = oracle(text, ',');
        expect(whole.rows).toEqual(expected.rows);
        expect(whole.lines).toEqual(expected.lines);

        const split = await rowsOfRanges(p, parts, blockSize);
        expect(split.ranges.length).toBeGreaterThan(1);
        expect(split.ranges.length).toBeLessThanOrEqual(parts);
        expect(split.rows).toEqual(whole.rows);
        expect(split.lines).toEqual(whole.lines);
        // Ranges tile the data: contiguous, each boundary right after a newline byte.
        const bytes = readFileSync(p);
        for (let k = 1; k < split.ranges.length; k++) {
          const r = split.ranges[k]!;
          expect(r.start).toBe(split.ranges[k - 1]!.end);
          expect(bytes[r.start - 1]).toBe(10);
        }
        expect(split.ranges.at(-1)!.end).toBe(bytes.length);
      });
    }
  }

  it('never cuts inside a quoted field that spans a target', async () => {
    // One huge multi-line quoted field sits on the midpoint: the only sound cut is after it.
    const big = '"' + 'line\n'.repeat(500) + '"';
    const text = `a,b\n1,x\n2,${big}\n3,y\n4,z\n`;
    const p = join(dir, 'span.csv');
    writeFileSync(p, text);
    const ranges = await splitDelivery(p, 2, { blockSize: 16 });
    expect(ranges).toHaveLength(2);
    const second = await collect(await openDeliveryRange(p, ranges[1]!));
    expect(second.rows).toEqual([
      ['3', 'y'],
      ['4', 'z'],
    ]);
    // Rows 3 and 4 start on lines 504 and 505: header 1, row 1 line 2, row 2 lines 3-503.
    expect(second.lines).toEqual([504, 505]);
    expect(second.firstRows).toEqual([3]);
  });

  it('numbers rows from 1 within a range given without its first row and line', async () => {
    const p = join(dir, 'plain.csv');
    writeFileSync(p, 'a\n' + Array.from({ length: 100 }, (_, i) => `${i}\n`).join(''));
    const [, second] = await splitDelivery(p, 2);
    const got = await collect(await openDeliveryRange(p, { start: second!.start, end: second!.end }));
    expect(got.firstRows[0]).toBe(1);
    expect(got.lines[0]).toBe(1);
    expect(got.rows[0]).toEqual([String(second!.firstRow - 1)]);
  });

  it('gives one range for one part, a header-only file, or UTF-16', async () => {
    const p = join(dir, 'one.csv');
    writeFileSync(p, 'a,b\n1,2\n');
    expect(await splitDelivery(p, 1)).toEqual([{ start: 4, end: 8, firstRow: 1, firstLine: 2 }]);
    const h = join(dir, 'header-only.csv');
    writeFileSync(h, 'a,b\n');
    expect(await splitDelivery(h, 4)).toEqual([{ start: 4, end: 4, firstRow: 1, firstLine: 2 }]);
    const u = join(dir, 'u16.csv');
    writeFileSync(u, Buffer.from('\ufeffa,b\n1,2\n3,4\n', 'utf16le'));
    expect(await splitDelivery(u, 3)).toHaveLength(1);
    await expect(splitDelivery(p, 0)).rejects.toMatchObject({ code: 'CW_USAGE' });
  });

  it('cuts at the same row boundaries without numbering rows, for every part count and block size', async () => {
    // The unnumbered scan skips newlines between cuts; the boundaries must not move.
    for (const eol of ['\n', '\r\n']) {
      const text = trickyText(300, eol);
      const p = join(dir, `unnumbered-${eol.length}.csv`);
      writeFileSync(p, text);
      for (const [parts, blockSize] of [[2, undefined], [3, 7], [7, 64], [40, 13]] as const) {
        const numbered = await splitDelivery(p, parts, { blockSize });
        const bare = await splitDelivery(p, parts, { blockSize }, { numbered: false });
        expect(bare.map((r) => [r.start, r.end])).toEqual(numbered.map((r) => [r.start, r.end]));
        expect(bare.slice(1).every((r) => r.firstRow === 0 && r.firstLine === 0)).toBe(true);
      }
    }
  });

  it('cuts in the relative sizes given, at row boundaries', async () => {
    // 1,000 rows of 4 bytes ("NNN\n"): shares 3:1 put the cut at the first boundary at or after
    // 3/4 of the data bytes, i.e. after row 750 (first principles: equal-length rows).
    const p = join(dir, 'shares.csv');
    writeFileSync(p, 'a\n' + Array.from({ length: 1000 }, (_, i) => `${String(i % 1000).padStart(3, '0')}\n`).join(''));
    const ranges = await splitDelivery(p, [3, 1]);
    expect(ranges).toHaveLength(2);
    expect(ranges[0]!.end - ranges[0]!.start).toBe(3000);
    expect(ranges[1]!.firstRow).toBe(751);
    await expect(splitDelivery(p, [1, 0])).rejects.toMatchObject({ code: 'CW_USAGE' });
  });
});
