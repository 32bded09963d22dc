import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openDelivery, openDeliveryRange, splitDelivery } from '../src/index.ts';
import { GUESS_ROWS, GUESS_WINDOW } from '../src/split.ts';
import { seededRandom } from '@codeweir/core';
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

/**
 * Guessed cuts (`guess: true`): a cut is placed by looking only near its target, and the claim
 * to check is the one the option documents: either every range reads and the ranges together
 * give exactly the rows of the whole file (csv-parse 7, the oracle, agreeing with the whole
 * read), or the guess fell inside a quoted field and reading the range before that cut fails
 * with CW_CSV_UNCLOSED_QUOTE. First principles: a newline outside quotes always ends a row.
 */
describe('splitDelivery with guessed cuts', () => {
  /** Reads every range; the rows in order, or the error code of the first range that fails. */
  async function readAll(path: string, ranges: Array<{ start: number; end: number }>, options: { blockSize?: number; encoding?: 'windows-1252' } = {}) {
    const rows: string[][] = [];
    for (const range of ranges) {
      try {
        rows.push(...(await collect(await openDeliveryRange(path, range, options))).rows);
      } catch (e) {
        return { error: (e as { code?: string }).code };
      }
    }
    return { rows };
  }

  /** Fields that trap a splitter: line breaks (LF and CRLF) and delimiters in quotes, doubled quotes, stray quotes, multi-byte text. */
  const FIELDS = ['plain', '"two\nlines"', '"a,b"', '"say ""hi"",\r\nthen"', '5" pipe', 'Zoë 😀 日本', '"\n"', '""', ''];

  function randomFile(seed: number, rows: number, cols: number, eol: string): string {
    const rand = seededRandom(seed);
    let out = Array.from({ length: cols }, (_, i) => `c${i}`).join(',') + eol;
    for (let r = 0; r < rows; r++) out += Array.from({ length: cols }, () => FIELDS[Math.floor(rand() * FIELDS.length)]).join(',') + eol;
    return out;
  }

  it('either reads to exactly the whole file or fails on the range before a wrong cut (seeded files, LF and CRLF, many block sizes)', async () => {
    let readCleanly = 0;
    for (let seed = 1; seed <= 24; seed++) {
      const eol = seed % 2 ? '\n' : '\r\n';
      // Two fields or more, so no row is a blank line (which csv-parse cannot tell from `""`).
      const text = randomFile(seed, 400, 2 + (seed % 4), eol);
      const p = join(dir, `guess-${seed}.csv`);
      writeFileSync(p, text);
      const whole = await collect(await openDelivery(p));
      expect(whole.rows).toEqual(oracle(text, ',').rows);
      for (const [parts, blockSize] of [[3, 7], [8, 64], [20, undefined]] as const) {
        const ranges = await splitDelivery(p, parts, { blockSize }, { numbered: false, guess: true });
        for (let k = 1; k < ranges.length; k++) expect(ranges[k]!.start).toBe(ranges[k - 1]!.end);
        const got = await readAll(p, ranges, { blockSize });
        if (got.rows) {
          readCleanly++;
          expect(got.rows).toEqual(whole.rows);
        } else expect(got.error).toBe('CW_CSV_UNCLOSED_QUOTE');
      }
    }
    // Nearly every split of such files reads cleanly (a wrong guess costs a rerun on one thread,
    // so the option is worth having only if wrong guesses are rare); 72 splits were made.
    expect(readCleanly).toBeGreaterThanOrEqual(66);
  });

  it('falls for rows pasted into a quoted field, and the range before that cut then fails', async () => {
    // A quoted note holds more than GUESS_ROWS lines that look like rows of the file (3 fields):
    // the guess takes the first of them, which is inside the quote.
    const pasted = Array.from({ length: GUESS_ROWS + 2 }, (_, i) => `${i},x,y`).join('\n');
    const rows = Array.from({ length: 200 }, (_, i) => `${i},a,b`);
    rows[100] = `100,"${pasted}",b`;
    const text = 'id,note,n\n' + rows.join('\n') + '\n';
    const p = join(dir, 'pasted.csv');
    writeFileSync(p, text);
    const target = text.indexOf(pasted) + 2;
    const share = (target - 10) / (text.length - 10);
    const ranges = await splitDelivery(p, [share, 1 - share], {}, { numbered: false, guess: true });
    expect(ranges).toHaveLength(2);
    expect(ranges[1]!.start).toBeGreaterThan(text.indexOf(pasted));
    expect(ranges[1]!.start).toBeLessThan(text.indexOf(pasted) + pasted.length);
    await expect(collect(await openDeliveryRange(p, ranges[0]!))).rejects.toMatchObject({ code: 'CW_CSV_UNCLOSED_QUOTE' });
    // The full scan puts the cut after the quoted field instead.
    const exact = await splitDelivery(p, [share, 1 - share], {}, { numbered: false });
    expect((await readAll(p, exact)).rows).toEqual((await collect(await openDelivery(p))).rows);
  });

  it('falls back to the full scan when no row near a target has the header\'s field count', async () => {
    // Every data row has 2 fields under a 3-field header: no candidate passes, so the cuts are the full scan's.
    const text = 'a,b,c\n' + Array.from({ length: 3000 }, (_, i) => `${i},"q\n${i}"`).join('\n') + '\n';
    const p = join(dir, 'ragged-all.csv');
    writeFileSync(p, text);
    const guessed = await splitDelivery(p, 5, {}, { numbered: false, guess: true });
    const exact = await splitDelivery(p, 5, {}, { numbered: false });
    expect(guessed).toEqual(exact);
  });

  it('finds row boundaries in CR files, windows-1252 bytes and rows longer than the search window', async () => {
    // CR alone ends rows; a CR inside quotes is data. windows-1252 bytes 0x80-0x9F and 0xE9 never hold a newline.
    const cr = 'id,t\r' + Array.from({ length: 500 }, (_, i) => `${i},"l\r${i}"`).join('\r') + '\r';
    const pc = join(dir, 'cr.csv');
    writeFileSync(pc, cr);
    const crRanges = await splitDelivery(pc, 6, {}, { numbered: false, guess: true });
    expect(crRanges.length).toBe(6);
    expect((await readAll(pc, crRanges)).rows).toEqual((await collect(await openDelivery(pc))).rows);

    const w = Buffer.concat([Buffer.from('id,t\n'), ...Array.from({ length: 800 }, (_, i) => Buffer.concat([Buffer.from(`${i},"caf`), Buffer.from([0xe9, 0x80, 0x0a, 0x93]), Buffer.from('x"\n')]))]);
    const pw = join(dir, 'cp1252.csv');
    writeFileSync(pw, w);
    const wRanges = await splitDelivery(pw, 4, { encoding: 'windows-1252' }, { numbered: false, guess: true });
    expect(wRanges.length).toBe(4);
    expect((await readAll(pw, wRanges, { encoding: 'windows-1252' })).rows).toEqual((await collect(await openDelivery(pw, { encoding: 'windows-1252' }))).rows);

    // Rows of 100 KiB: at most two fit in the window, so no candidate has GUESS_ROWS rows after it; the full scan decides.
    const long = 'a,b\n' + Array.from({ length: 12 }, (_, i) => `${i},"${'z'.repeat(GUESS_WINDOW / 2.5)}"`).join('\n') + '\n';
    const pl = join(dir, 'long.csv');
    writeFileSync(pl, long);
    expect(await splitDelivery(pl, 3, {}, { numbered: false, guess: true })).toEqual(await splitDelivery(pl, 3, {}, { numbered: false }));
  });
});
