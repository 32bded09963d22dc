/**
 * The readers of csv.gz, xlsx and Parquet deliveries: the format from the name or --format, the
 * text form of typed cells, the same rows as the CSV reader for a compressed file (csv-parse,
 * an outside parser, reads the same text), and one clear error for a damaged file.
 */
import { describe, it, expect, beforeAll } from 'vitest';
import { mkdtemp, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { parse } from 'csv-parse/sync';
import { cellText, formatOf, openAnyDelivery, typeNotes, type Delivery } from '../src/index.ts';

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'cw-read-formats-'));
});

async function rowsOf(d: Delivery): Promise<string[][]> {
  const out: string[][] = [];
  for await (const b of d.batches()) for (let r = 0; r < b.count; r++) out.push(b.fields.slice(b.offsets[r]!, b.offsets[r + 1]!));
  return out;
}

async function errorOf(p: Promise<unknown>): Promise<{ code: string; message: string }> {
  try {
    await p;
  } catch (e) {
    return e as { code: string; message: string };
  }
  throw new Error('expected an error');
}

describe('formatOf', () => {
  it('takes the format from the name, or from --format', () => {
    expect(formatOf('a/wave2.CSV.GZ')).toBe('csv.gz');
    expect(formatOf('wave2.xlsx')).toBe('xlsx');
    expect(formatOf('wave2.parquet')).toBe('parquet');
    expect(formatOf('wave2.tsv')).toBe('csv');
    expect(formatOf('wave2.dat', 'parquet')).toBe('parquet');
    expect(formatOf('wave2.dat', 'gz')).toBe('csv.gz');
    expect(() => formatOf('x', 'sav')).toThrow(/--format takes one of csv, csv.gz, xlsx, parquet, got "sav"/);
  });
});

describe('cellText', () => {
  it('writes a typed value as the text the classifiers judge', () => {
    expect(cellText(2)).toBe('2');
    expect(cellText(2.5)).toBe('2.5');
    expect(cellText(-0)).toBe('0');
    expect(cellText(12345678901234567890n)).toBe('12345678901234567890');
    expect(cellText(null)).toBe('');
    expect(cellText(true)).toBe('true');
    expect(cellText(new Date(Date.UTC(2026, 2, 2)))).toBe('2026-03-02');
    expect(cellText(new Date(Date.UTC(2026, 2, 2, 10, 30)))).toBe('2026-03-02 10:30:00');
  });
});

describe('csv.gz', () => {
  it('streams the same rows as csv-parse reads from the decompressed text, over many compressed blocks', async () => {
    // 30,000 rows (about 1 MB of text): many gunzip chunks, quoted fields with delimiters and line breaks.
    const lines = ['id;name;note'];
    for (let i = 1; i <= 30_000; i++) lines.push(`${i};"Sée, ${i}";${i % 7 === 0 ? '"two\nlines"' : i % 5 === 0 ? '' : 'x'}`);
    const text = `\ufeff${lines.join('\r\n')}\r\n`;
    const file = join(dir, 'rows.csv.gz');
    await writeFile(file, gzipSync(Buffer.from(text, 'utf8')));
    const d = await openAnyDelivery(file);
    expect(d.format).toBe('csv.gz');
    expect(d.delimiter).toBe(';');
    expect(d.hadBom).toBe(true);
    expect(d.header).toEqual(['id', 'name', 'note']);
    const want = (parse(text, { delimiter: ';', bom: true, relax_column_count: true }) as string[][]).slice(1);
    expect(await rowsOf(d)).toEqual(want);
  });

  it('reads latin1 with --encoding and names invalid UTF-8 without it', async () => {
    const file = join(dir, 'latin1.csv.gz');
    await writeFile(file, gzipSync(Buffer.from('place\nMühlental\n', 'latin1')));
    expect(await rowsOf(await openAnyDelivery(file, { encoding: 'latin1' }))).toEqual([['Mühlental']]);
    const e = await errorOf(openAnyDelivery(file).then(rowsOf));
    expect(e.code).toBe('CW_ENCODING');
    expect(e.message).toMatch(/latin1\.csv\.gz: near line 1 of the decompressed text, the bytes are not valid UTF-8/);
  });

  it('says a damaged gzip file cannot be read, in one sentence', async () => {
    const file = join(dir, 'broken.csv.gz');
    const good = gzipSync(Buffer.from('a,b\n1,2\n'.repeat(1000)));
    await writeFile(file, good.subarray(0, good.length >> 1));
    const e = await errorOf(openAnyDelivery(file).then(rowsOf));
    expect(e.code).toBe('CW_FILE_UNREADABLE');
    expect(e.message).toMatch(/broken\.csv\.gz cannot be read as gzip-compressed text \(/);
    const missing = await errorOf(openAnyDelivery(join(dir, 'none.csv.gz')));
    expect(missing.code).toBe('CW_FILE_NOT_FOUND');
  });
});

describe('xlsx and Parquet', () => {
  it('says a file that is not a workbook or not Parquet cannot be read', async () => {
    const x = join(dir, 'fake.xlsx');
    await writeFile(x, 'hh_id,age\nD1-00001,40\n');
    const ex = await errorOf(openAnyDelivery(x));
    expect(ex.code).toBe('CW_FILE_UNREADABLE');
    expect(ex.message).toMatch(/fake\.xlsx cannot be read as an xlsx workbook/);
    const p = join(dir, 'fake.parquet');
    await writeFile(p, 'not parquet at all, just text');
    const ep = await errorOf(openAnyDelivery(p));
    expect(ep.code).toBe('CW_FILE_UNREADABLE');
    expect(ep.message).toMatch(/fake\.parquet cannot be read as a Parquet file/);
  });

  it('refuses options that do not apply to the format', async () => {
    const x = join(dir, 'fake.xlsx');
    expect((await errorOf(openAnyDelivery(x, { delimiter: ';' }))).message).toMatch(/--delimiter and --encoding apply to delimited text only/);
    expect((await errorOf(openAnyDelivery(join(dir, 'rows.csv.gz'), { sheet: 'one' }))).message).toMatch(/--sheet applies to xlsx workbooks only/);
  });
});

describe('xlsx rows', () => {
  it('keeps empty rows inside the data as blank rows, drops trailing ones, and types the columns', async () => {
    const { default: ExcelJS } = await import('exceljs');
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('wave2');
    ws.addRow(['id', 'seen', 'remark']);
    ws.addRow([1, new Date(Date.UTC(2026, 2, 2)), 'ok']);
    ws.addRow([]);
    ws.addRow([3, new Date(Date.UTC(2026, 2, 4)), new Date(Date.UTC(2026, 2, 5))]);
    ws.getCell('A7').value = null;
    const file = join(dir, 'rows.xlsx');
    await wb.xlsx.writeFile(file);
    const d = await openAnyDelivery(file);
    expect(d.sheet).toBe('wave2');
    expect(d.header).toEqual(['id', 'seen', 'remark']);
    const rows: Array<{ line: number; fields: string[] }> = [];
    for await (const b of d.batches()) for (let r = 0; r < b.count; r++) rows.push({ line: b.lines[r]!, fields: b.fields.slice(b.offsets[r]!, b.offsets[r + 1]!) });
    expect(rows).toEqual([
      { line: 2, fields: ['1', '2026-03-02', 'ok'] },
      { line: 3, fields: ['', '', ''] },
      { line: 4, fields: ['3', '2026-03-04', '2026-03-05'] },
    ]);
    // The workbook's own cell types: whole numbers, dates, and a column of text and a date.
    expect(d.columnTypes).toEqual({ id: 'integer', seen: 'date', remark: 'text' });
  });
});

describe('typeNotes', () => {
  it('notes a delivered type the item type does not take as it is, and no other', () => {
    const items = [
      { name: 'age', type: 'integer' },
      { name: 'weight', type: 'decimal' },
      { name: 'visit_date', type: 'date' },
      { name: 'remarks', type: 'text' },
      { name: 'size', type: 'integer' },
    ];
    const notes = typeNotes({ age: 'decimal', weight: 'integer', visit_date: 'timestamp', remarks: 'date', size: 'integer' }, items);
    expect(notes.map((n) => [n.column, n.delivered, n.expected])).toEqual([
      ['age', 'decimal', 'integer'],
      ['visit_date', 'timestamp', 'date'],
      ['remarks', 'date', 'text'],
    ]);
    expect(typeNotes(undefined, items)).toEqual([]);
  });
});
