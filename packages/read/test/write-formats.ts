/**
 * Writes a CSV delivery in the other input formats for tests: gzip with node:zlib, an xlsx
 * workbook with exceljs (numbers as numbers, a date item's days as dates, everything else as
 * text), and Parquet with DuckDB's own writer (COPY ... TO, typed columns where every cell of a
 * column is a plain number or a calendar day). The CSV is read with csv-parse, an outside parser.
 */
import { readFile, rm, writeFile } from 'node:fs/promises';
import { gzipSync } from 'node:zlib';
import { parse } from 'csv-parse/sync';

const PLAIN_NUMBER = /^-?(?:\d+(?:\.\d*)?|\.\d+)$/;
const PLAIN_INTEGER = /^-?\d{1,15}$/;
const ISO_DAY = /^\d{4}-\d{2}-\d{2}$/;

function realDay(s: string): boolean {
  if (!ISO_DAY.test(s)) return false;
  const d = new Date(`${s}T00:00:00Z`);
  return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s && Number(s.slice(0, 4)) >= 100;
}

export async function readCsvRows(csvPath: string): Promise<{ header: string[]; rows: string[][] }> {
  const all = parse(await readFile(csvPath), { relax_column_count: true, bom: true }) as string[][];
  return { header: all[0]!, rows: all.slice(1) };
}

export async function writeGzip(csvPath: string, out: string): Promise<void> {
  await writeFile(out, gzipSync(await readFile(csvPath)));
}

/** Column types for the Parquet copy: BIGINT, DOUBLE or DATE where every non-blank cell is one, else VARCHAR. */
export function sqlTypes(header: string[], rows: string[][], dateColumns: ReadonlySet<string>): string[] {
  return header.map((h, c) => {
    const cells = rows.map((r) => r[c] ?? '').filter((v) => v !== '');
    if (cells.length === 0) return 'VARCHAR';
    if (dateColumns.has(h) && cells.every(realDay)) return 'DATE';
    if (cells.every((v) => PLAIN_INTEGER.test(v))) return 'BIGINT';
    if (cells.every((v) => PLAIN_NUMBER.test(v))) return 'DOUBLE';
    return 'VARCHAR';
  });
}

/** The delivery as a table would hold it: every row cut or padded to the header's width. */
export async function writeRectangular(csvPath: string, out: string): Promise<void> {
  const { header, rows } = await readCsvRows(csvPath);
  await writeFile(out, rectangularCsv(header, rows));
}

export async function writeXlsx(csvPath: string, out: string, dateColumns: ReadonlySet<string>, sheet = 'delivery'): Promise<void> {
  const { default: ExcelJS } = await import('exceljs');
  const { header, rows } = await readCsvRows(csvPath);
  const wb = new ExcelJS.Workbook();
  wb.addWorksheet('notes').addRow(['This sheet is not the data']);
  const ws = wb.addWorksheet(sheet);
  ws.addRow(header);
  for (const r of rows) {
    ws.addRow(
      r.map((v, c) => {
        if (v === '') return null;
        if (dateColumns.has(header[c]!) && realDay(v)) return new Date(`${v}T00:00:00Z`);
        return PLAIN_NUMBER.test(v) ? Number(v) : v;
      }),
    );
  }
  await wb.xlsx.writeFile(out);
}

/** CSV text of rows cut or padded to the header's width (a table has no ragged rows). */
export function rectangularCsv(header: string[], rows: string[][]): string {
  const quote = (f: string) => (/[",\r\n]/.test(f) ? `"${f.replace(/"/g, '""')}"` : f);
  const width = header.length;
  return [header, ...rows.map((r) => Array.from({ length: width }, (_, c) => r[c] ?? ''))].map((r) => r.map(quote).join(',')).join('\n') + '\n';
}

export async function writeParquet(csvPath: string, out: string, dateColumns: ReadonlySet<string>): Promise<void> {
  const { DuckDBInstance } = await import('@duckdb/node-api');
  const { header, rows } = await readCsvRows(csvPath);
  const types = sqlTypes(header, rows, dateColumns);
  const rect = `${out}.rect.csv`;
  await writeFile(rect, rectangularCsv(header, rows));
  const db = await DuckDBInstance.create(':memory:');
  const con = await db.connect();
  try {
    const q = (s: string) => `'${s.replace(/'/g, "''")}'`;
    const id = (s: string) => `"${s.replace(/"/g, '""')}"`;
    const cols = header.map((_h, c) => `${q(`c${c}`)}: 'VARCHAR'`).join(', ');
    // Every cell read as text (an empty field stays '' rather than NULL), then cast per column.
    const select = header.map((h, c) => (types[c] === 'VARCHAR' ? `c${c} AS ${id(h)}` : `CAST(NULLIF(c${c}, '') AS ${types[c]}) AS ${id(h)}`)).join(', ');
    await con.run(
      `COPY (SELECT ${select} FROM read_csv(${q(rect)}, columns={${cols}}, header=false, skip=1, delim=',', quote='"', escape='"', nullstr='\u0001', auto_detect=false)) TO ${q(out)} (FORMAT parquet)`,
    );
  } finally {
    con.closeSync();
    await rm(rect, { force: true });
  }
}
