import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { openDelivery, tokenizeFile } from '../src/index.ts';
import { fsError } from '../src/file.ts';
import { collect, oracle } from './helpers.ts';

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'cw-read-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function file(name: string, content: string | Uint8Array): string {
  const p = join(dir, name);
  writeFileSync(p, content);
  return p;
}

/** A seeded 32-bit generator (multiply-with-xorshift), so the "random" bytes are the same on every run. */
function bytesFrom(seed: number, n: number): Uint8Array {
  const out = new Uint8Array(n);
  let a = seed >>> 0;
  for (let i = 0; i < n; i++) {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), a | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    out[i] = (t ^ (t >>> 14)) & 0xff;
  }
  return out;
}

describe('openDelivery against csv-parse', () => {
  const text = 'id;name;note\r\n1;Jürgen;"two\nlines"\r\n2;Zoë;"a;b"\r\n3;😀;""""\r\n\r\n4;日本;x\r\n';

  for (const blockSize of [1, 2, 3, 4, 5, 7, 13, undefined]) {
    it(`reads UTF-8 with multi-byte characters across block seams (blockSize ${blockSize ?? 'default'})`, async () => {
      // Oracle: csv-parse 7 over the same text.
      const expected = oracle(text, ';');
      const d = await openDelivery(file(`u8-${blockSize}.csv`, text), { blockSize, batchRows: 2 });
      expect(d.delimiter).toBe(';');
      expect(d.encoding).toBe('utf-8');
      expect(d.header).toEqual(expected.header);
      const got = await collect(d);
      expect(got.rows).toEqual(expected.rows);
      expect(got.lines).toEqual(expected.lines);
    });
  }

  it('removes a UTF-8 byte-order mark and says so', async () => {
    const d = await openDelivery(file('bom.csv', '\ufeffid,age\n1,30\n'));
    expect(d.hadBom).toBe(true);
    expect(d.header).toEqual(oracle('\ufeffid,age\n1,30\n', ',').header);
    expect((await collect(d)).rows).toEqual([['1', '30']]);
  });

  it('decodes windows-1252 and latin1 when asked', async () => {
    // Bytes 0xE9, 0x80 and 0x9C. windows-1252 per Unicode's published table CP1252.TXT (recalled
    // from memory): 0xE9 -> U+00E9, 0x80 -> U+20AC EURO SIGN, 0x9C -> U+0153 LATIN SMALL LIGATURE OE.
    // For ISO-8859-1 every byte is the code point of the same value (the standard's definition).
    const bytes = Uint8Array.from([...Buffer.from('id,name\n1,Jos'), 0xe9, ...Buffer.from('\n2,'), 0x80, 0x9c, 0x0a]);
    const p = file('cp1252.csv', bytes);
    const d1252 = await openDelivery(p, { encoding: 'windows-1252' });
    expect((await collect(d1252)).rows).toEqual(oracle('id,name\n1,Jos\u00e9\n2,\u20ac\u0153\n', ',').rows);
    const dLatin = await openDelivery(p, { encoding: 'latin1', blockSize: 3 });
    expect((await collect(dLatin)).rows).toEqual([
      ['1', 'Jos\u00e9'],
      ['2', '\u0080\u009c'],
    ]);
  });

  it('decodes UTF-16 LE and BE from their byte-order marks, and LE without one', async () => {
    const t = 'id,name\r\n1,"Zoë, A"\r\n2,😀\r\n';
    const expected = oracle(t, ',');
    const le = Buffer.from('\ufeff' + t, 'utf16le');
    const be = Buffer.from(le).swap16();
    for (const [name, bytes, enc] of [
      ['le.csv', le, 'utf-16le'],
      ['be.csv', be, 'utf-16be'],
      ['le-nobom.csv', Buffer.from(t, 'utf16le'), 'utf-16le'],
    ] as const) {
      for (const blockSize of [3, 8, undefined]) {
        const d = await openDelivery(file(name, bytes), { blockSize });
        expect(d.encoding).toBe(enc);
        expect(d.hadBom).toBe(name !== 'le-nobom.csv');
        expect(d.header).toEqual(expected.header);
        const got = await collect(d);
        expect(got.rows).toEqual(expected.rows);
        expect(got.lines).toEqual(expected.lines);
      }
    }
  });

  it('keeps NUL bytes inside otherwise normal text', async () => {
    const t = 'a,b\n1,x\u0000y\n2,z\n';
    const d = await openDelivery(file('nul.csv', t));
    // Oracle: csv-parse keeps the NUL as a character of the field.
    expect((await collect(d)).rows).toEqual(oracle(t, ',').rows);
  });

  it('reads a 5 MB field with the default limit', async () => {
    const big = 'ab\n'.repeat(5 * 1024 * 1024 / 3 + 1);
    const p = file('big-field.csv', `id,text\n1,"${big}"\n2,x\n`);
    const got = await collect(await openDelivery(p, { blockSize: 1024 * 1024 }));
    expect(got.rows[0]?.[1]).toBe(big);
    expect(got.rows[1]).toEqual(['2', 'x']);
    // Row 2 starts after the header line, row 1's first line and one line per embedded newline.
    expect(got.lines).toEqual([2, 3 + big.split('\n').length - 1]);
  });

  it('streams batches no larger than batchRows, numbered contiguously', async () => {
    const t = 'n,sq\n' + Array.from({ length: 1000 }, (_, i) => `${i},${i * i}\n`).join('');
    const d = await openDelivery(file('many.csv', t), { batchRows: 64, blockSize: 100 });
    let next = 1;
    for await (const b of d.batches()) {
      expect(b.count).toBeLessThanOrEqual(64);
      expect(b.firstRow).toBe(next);
      next += b.count;
    }
    expect(next - 1).toBe(parse(t).length - 1);
    expect(await tokenizeFile(join(dir, 'many.csv'))).toEqual({ rows: 1000, fields: 2000 });
  });

  it('reads a CR-only file', async () => {
    const t = 'a,b\r1,"x\ry"\r3,4';
    const d = await openDelivery(file('cr.csv', t), { blockSize: 2 });
    expect(d.newline).toBe('cr');
    const got = await collect(d);
    const expected = oracle(t, ',', 'cr');
    expect(got.rows).toEqual(expected.rows);
    expect(got.lines).toEqual(expected.lines);
  });
});

describe('openDelivery errors', () => {
  it('reports a missing file, a folder and an empty file (exit code 2)', async () => {
    const missing = join(dir, 'nope.csv');
    await expect(openDelivery(missing)).rejects.toMatchObject({
      code: 'CW_FILE_NOT_FOUND',
      exitCode: 2,
      message: `The data file ${missing} does not exist.`,
    });
    await expect(openDelivery(dir)).rejects.toMatchObject({ code: 'CW_FILE_IS_DIRECTORY', exitCode: 2, message: `${dir} is a folder, not a data file.` });
    const empty = file('empty.csv', '');
    await expect(openDelivery(empty)).rejects.toMatchObject({ code: 'CW_FILE_EMPTY', exitCode: 2, message: `The data file ${empty} is empty (0 bytes).` });
    await expect(openDelivery(file('blank.csv', '\n\r\n'))).rejects.toMatchObject({ code: 'CW_FILE_EMPTY' });
  });

  it('maps a permission error to CW_FILE_UNREADABLE', () => {
    // The tests may run as root, where a chmod does not stop reads, so the errno is given directly.
    const e = fsError(Object.assign(new Error('EACCES: permission denied'), { code: 'EACCES' }), 'w.csv');
    expect(e).toMatchObject({ code: 'CW_FILE_UNREADABLE', exitCode: 2, file: 'w.csv', message: 'The data file w.csv cannot be read (permission denied).' });
  });

  it('rejects binary content', async () => {
    await expect(openDelivery(file('random.bin', bytesFrom(7, 4096)))).rejects.toMatchObject({ code: 'CW_CSV_BINARY', exitCode: 2 });
    const zeros = new Uint8Array(2000);
    zeros.set(Buffer.from('PK'), 0);
    await expect(openDelivery(file('zeros.bin', zeros))).rejects.toMatchObject({ code: 'CW_CSV_BINARY' });
  });

  it('names line and column of invalid UTF-8 and suggests an encoding', async () => {
    // 0xE9 alone is not UTF-8 (RFC 3629: a lead byte 0xE0-0xEF needs two continuation bytes).
    const bytes = Uint8Array.from([...Buffer.from('a,b\n1,2\n3,caf'), 0xe9, ...Buffer.from('\n')]);
    const p = file('latin-as-utf8.csv', bytes);
    await expect(openDelivery(p)).rejects.toMatchObject({ code: 'CW_ENCODING', line: 3, column: 6, exitCode: 2 });
    await expect(openDelivery(p)).rejects.toThrow('--encoding windows-1252');
    const d = await openDelivery(p, { encoding: 'windows-1252' });
    expect((await collect(d)).rows).toEqual([
      ['1', '2'],
      ['3', 'café'],
    ]);
  });

  it('finds invalid UTF-8 beyond the first block while streaming', async () => {
    const head = 'n,v\n' + '1,2\n'.repeat(20000);
    const bytes = Uint8Array.from([...Buffer.from(head + 'x,ab'), 0xff, ...Buffer.from('c\n')]);
    const d = await openDelivery(file('late-bad.csv', bytes), { blockSize: 4096 });
    // Header line 1, 20000 rows on lines 2..20001, the bad byte on line 20002 after "x,ab".
    await expect(collect(d)).rejects.toMatchObject({ code: 'CW_ENCODING', line: 20002, column: 5 });
  });

  it('names file, line and column of an unclosed quote and of a too-large field', async () => {
    const p = file('unclosed.csv', 'a,b\n1,2\n3,"open\n4,5\n');
    await expect(collect(await openDelivery(p, { blockSize: 5 }))).rejects.toMatchObject({
      code: 'CW_CSV_UNCLOSED_QUOTE',
      file: p,
      line: 3,
      column: 3,
      message: `${p}: line 3, column 3: a quoted field opens here and is never closed; add the closing quote.`,
    });
    const q = file('large.csv', 'a,b\n1,2\n3,0123456789abc\n');
    await expect(collect(await openDelivery(q, { maxFieldBytes: 12 }))).rejects.toMatchObject({ code: 'CW_CSV_FIELD_TOO_LARGE', file: q, line: 3, column: 3 });
  });

  it('rejects an unknown encoding with the bad value', async () => {
    await expect(openDelivery(file('x.csv', 'a\n1\n'), { encoding: 'ebcdic' as never })).rejects.toThrow(
      '--encoding takes one of utf-8, windows-1252, latin1, utf-16le, utf-16be, got "ebcdic".',
    );
  });
});
