import { describe, expect, it } from 'vitest';
import { readDeliveryText } from '../src/index.ts';
import { collect, oracle } from './helpers.ts';

// Every expectation below comes from csv-parse 7 (`import { parse } from 'csv-parse/sync'`,
// wrapped in helpers.ts) reading the same text, unless a test states its rule.
const CASES: Array<[string, string, string]> = [
  ['plain LF', ',', 'id,age\n1,34\n2,51\n'],
  ['no trailing newline', ',', 'id,age\n1,34\n2,51'],
  ['CRLF', ',', 'id,age\r\n1,34\r\n2,51\r\n'],
  ['mixed CRLF and LF', ',', 'id,age\r\n1,34\n2,51\r\n3,28\n'],
  ['quoted delimiter', ',', 'id,note\n1,"a, b"\n2,"c,d,e"\n'],
  ['doubled quotes', ',', 'id,note\n1,"she said ""yes"""\n2,""""\n3,""\n'],
  ['embedded LF', ',', 'id,note\n1,"two\nlines"\n2,"x"\r\n3,"\n\n"\n4,x\n'],
  ['empty fields', ',', 'a,b,c\n,,\n1,,\n,,3\n'],
  ['trailing delimiter', ',', 'a,b\n1,2,\n3,4,\n'],
  ['blank line in the middle', ',', 'a,b\n1,2\n\n3,4\n'],
  ['blank lines at the end', ',', 'a,b\n1,2\n\n\n\n'],
  ['CRLF blank lines at the end', ',', 'a,b\r\n1,2\r\n\r\n\r\n'],
  ['semicolon', ';', 'id;income\n1;1234,50\n2;"9;9"\n'],
  ['pipe', '|', 'id|name\n1|"Ama|Kofi"\n2|Esi\n'],
  ['tab', '\t', 'id\tname\n1\t"x\ty"\n2\tz\n'],
  ['unicode', ',', 'id,name\n1,Zoë\n2,"日本, 語"\n3,😀\n'],
  ['BOM', ',', '\ufeffid,age\n1,34\n'],
  ['ragged rows', ',', 'a,b,c\n1\n1,2,3,4\n'],
  ['quoted header', ',', '"id, key","a""b"\n1,2\n'],
  ['only a header', ',', 'a,b,c\n'],
  ['quote as last character', ',', 'a,b\n1,"x"'],
  ['single column', ',', 'name\nx\ny\n'],
  ['quote inside an unquoted field', ',', 'a,b\n5" pipe,2\n'],
];

describe('readDeliveryText against csv-parse', () => {
  for (const [name, delimiter, text] of CASES) {
    for (const blockSize of [1, 2, 3, 5, 8, 64, undefined]) {
      it(`${name} (blockSize ${blockSize ?? 'default'})`, async () => {
        const expected = oracle(text, delimiter);
        const d = readDeliveryText(text, { delimiter, blockSize, batchRows: 2 });
        const got = await collect(d);
        expect(d.header).toEqual(expected.header);
        expect(got.rows).toEqual(expected.rows);
        expect(got.lines).toEqual(expected.lines);
        expect(d.hadBom).toBe(text.startsWith('\ufeff'));
      });
    }
  }

  it('detects the delimiter when none is given', () => {
    for (const [, delimiter, text] of CASES.filter(([n]) => !['single column', 'only a header'].includes(n))) {
      expect(readDeliveryText(text).delimiter).toBe(delimiter);
    }
  });
});

describe('readDeliveryText rules of our own', () => {
  it('numbers batches contiguously and honours batchRows', async () => {
    const text = 'n\n' + Array.from({ length: 25 }, (_, i) => `${i}\n`).join('');
    const got = await collect(readDeliveryText(text, { batchRows: 4, blockSize: 7 }));
    // 25 rows in batches of at most 4: first rows 1, 5, 9, ..., 25 (first principles).
    expect(got.firstRows).toEqual([1, 5, 9, 13, 17, 21, 25]);
    expect(got.rows.map((r) => r[0])).toEqual(Array.from({ length: 25 }, (_, i) => String(i)));
  });

  it('keeps characters after a closing quote as they stand', async () => {
    // Rule: `"ab"c` reads as `abc`; csv-parse rejects such a field, so no oracle here.
    const got = await collect(readDeliveryText('a,b\n"ab"c,2\n"x" ,3\n', { blockSize: 3 }));
    expect(got.rows).toEqual([
      ['abc', '2'],
      ['x ', '3'],
    ]);
  });

  it('counts a CRLF inside a quoted field as one line break', async () => {
    const text = 'id,note\n1,"crlf\r\ninside"\r\n2,"a\r\n\r\nb"\n3,x\n';
    const got = await collect(readDeliveryText(text, { blockSize: 3 }));
    // Rows from csv-parse; lines by hand (RFC 4180 section 2: a line break is CRLF, so CRLF is
    // one break): the header is line 1, row 1 spans lines 2-3, row 2 lines 4-6, row 3 line 7.
    expect(got.rows).toEqual(oracle(text, ',').rows);
    expect(got.lines).toEqual([2, 4, 7]);
  });

  it('skips blank lines before the header and counts them', async () => {
    const d = readDeliveryText('\n\nid,age\n1,2\n');
    expect(d.header).toEqual(['id', 'age']);
    expect((await collect(d)).lines).toEqual([4]);
  });

  it('reads a CR-only file', async () => {
    const text = 'a,b\r1,"x\ry"\r3,4\r';
    const d = readDeliveryText(text, { blockSize: 2 });
    expect(d.newline).toBe('cr');
    const expected = oracle(text, ',', 'cr');
    const got = await collect(d);
    expect(got.rows).toEqual(expected.rows);
    expect(got.lines).toEqual(expected.lines);
  });

  it('picks semicolon over comma when commas are decimal marks', () => {
    expect(readDeliveryText('id;w\n1;0,5\n2;1,25\n').delimiter).toBe(';');
  });

  it('accepts \\t spelled out as the delimiter', () => {
    expect(readDeliveryText('a\tb\n1\t2\n', { delimiter: '\\t' }).delimiter).toBe('\t');
  });
});

describe('readDeliveryText errors', () => {
  it('names line and column of an unclosed quote', async () => {
    const d = readDeliveryText('a,b\n1,2\n3,"abc\n4,5\n', { name: 'w1.csv', blockSize: 4 });
    await expect(collect(d)).rejects.toMatchObject({
      code: 'CW_CSV_UNCLOSED_QUOTE',
      file: 'w1.csv',
      line: 3,
      column: 3,
      exitCode: 2,
    });
    await expect(collect(d)).rejects.toThrow('w1.csv: line 3, column 3:');
  });

  it('names the line where a multi-line quoted field began', async () => {
    const d = readDeliveryText('a,b\n1,"ok\nfine"\n2,x\n"never\nclosed\n');
    await expect(collect(d)).rejects.toMatchObject({ code: 'CW_CSV_UNCLOSED_QUOTE', line: 5, column: 1 });
  });

  it('rejects a field larger than maxFieldBytes, counting UTF-8 bytes', async () => {
    // "é" is 2 bytes in UTF-8 (RFC 3629): 5 of them are 10 bytes, 6 are 12.
    const ok = readDeliveryText(`a,b\n1,${'é'.repeat(5)}\n`, { maxFieldBytes: 10 });
    expect((await collect(ok)).rows).toEqual([['1', 'ééééé']]);
    const tooBig = readDeliveryText(`a,b\n1,2\n1,${'é'.repeat(6)}\n`, { maxFieldBytes: 10, name: 'x.csv' });
    await expect(collect(tooBig)).rejects.toMatchObject({ code: 'CW_CSV_FIELD_TOO_LARGE', line: 3, column: 3 });
    const quoted = readDeliveryText(`a,b\n1,"${'x'.repeat(11)}"\n`, { maxFieldBytes: 10 });
    await expect(collect(quoted)).rejects.toMatchObject({ code: 'CW_CSV_FIELD_TOO_LARGE', line: 2, column: 3 });
  });

  it('stops a runaway quote at the field-size limit instead of holding the rest of the input', async () => {
    const text = `a,b\n1,"${'x,\n'.repeat(200)}`;
    const d = readDeliveryText(text, { maxFieldBytes: 100, blockSize: 16 });
    await expect(collect(d)).rejects.toMatchObject({ code: 'CW_CSV_FIELD_TOO_LARGE', line: 2, column: 3 });
  });

  it('rejects empty and blank-only text and bad options', () => {
    expect(() => readDeliveryText('')).toThrow(expect.objectContaining({ code: 'CW_FILE_EMPTY' }));
    expect(() => readDeliveryText('\n\r\n\n')).toThrow(expect.objectContaining({ code: 'CW_FILE_EMPTY' }));
    expect(() => readDeliveryText('a\n', { delimiter: '::' })).toThrow(expect.objectContaining({ code: 'CW_USAGE' }));
    expect(() => readDeliveryText('a\n', { batchRows: 0 })).toThrow('batchRows takes a positive whole number, got 0.');
  });
});
