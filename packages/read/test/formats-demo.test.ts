/**
 * One delivery, four formats: the demo delivery written as CSV, csv.gz (node:zlib), xlsx
 * (exceljs) and Parquet (DuckDB's writer) is checked and described through the CLI, and the
 * findings by rule, the missingness by item and group, the rules and the describe document are
 * the same in every format (xlsx and Parquet compared with the same rows as a rectangular CSV,
 * since a table cannot hold the demo's ragged rows). The outside references are the writers: each format is made by a
 * library other than the reader that reads it back (zlib aside, which both sides share).
 */
import { describe, it, expect, beforeAll } from 'vitest';
import { mkdtemp, readFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { cli } from '../../../test/support/cli.ts';
import { writeGzip, writeParquet, writeRectangular, writeXlsx } from './write-formats.ts';

const ex = (f: string): string => fileURLToPath(new URL(`../../../examples/${f}`, import.meta.url));
const CODEBOOK = ex('household.codebook.json');
const DATES = new Set(['int_date']);

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'cw-formats-'));
  await writeGzip(ex('demo-delivery.csv'), join(dir, 'demo.csv.gz'));
  await writeRectangular(ex('demo-delivery.csv'), join(dir, 'demo-table.csv'));
  await writeXlsx(ex('demo-delivery.csv'), join(dir, 'demo.xlsx'), DATES);
  await writeParquet(ex('demo-delivery.csv'), join(dir, 'demo.parquet'), DATES);
});

async function checkJson(file: string, extra: string[] = []): Promise<any> {
  const r = await cli(['check', file, '--codebook', CODEBOOK, '--json', '--threads', '1', ...extra], dir);
  expect(r.err).toBe('');
  expect(r.code).toBe(1);
  return JSON.parse(r.out);
}

/** The parts of a check summary that depend on the cells only, not on how they were written. */
function cellView(s: any): unknown {
  const items: Record<string, unknown> = {};
  for (const [name, t] of Object.entries<any>(s.items)) items[name] = { valid: t.valid, invalid: t.invalid, missing: t.missing, findings: t.findings, routing: t.routing };
  return { rows: s.rows, byRule: s.findings.byRule, bySeverity: s.findings.bySeverity, items, groups: s.groups, rules: s.rules, recordMissing: s.recordMissing, fences: s.fences };
}

describe('the demo delivery in every input format', () => {
  it('gives the same findings, missingness and rules as CSV from csv.gz, xlsx (--sheet) and Parquet', async () => {
    const csv = await checkJson(ex('demo-delivery.csv'));
    const gz = await checkJson(join(dir, 'demo.csv.gz'));
    const xlsx = await checkJson(join(dir, 'demo.xlsx'), ['--sheet', 'delivery']);
    const parquet = await checkJson(join(dir, 'demo.parquet'));
    expect(csv.rows).toBe(4000);
    expect({ ...gz, file: csv.file }).toEqual(csv);
    // A workbook or a Parquet table has no ragged rows: the writers cut or pad the demo's planted
    // ragged rows to the header's width, so both are compared with that same table as CSV.
    const table = await checkJson(join(dir, 'demo-table.csv'));
    expect(table.findings.byRule['ragged-row']).toBeUndefined();
    expect(cellView(xlsx)).toEqual(cellView(table));
    expect(cellView(parquet)).toEqual(cellView(table));
  });

  it('notes where a typed column disagrees with the codebook type, and judges the cells by value', async () => {
    const { DuckDBInstance } = await import('@duckdb/node-api');
    const db = await DuckDBInstance.create(':memory:');
    const con = await db.connect();
    const file = join(dir, 'typed.parquet');
    // hh_size is an integer item delivered as DOUBLE (2.0, 3.0); age as BIGINT (agrees);
    // remarks is a text item delivered as DATE.
    await con.run(`COPY (SELECT * FROM (VALUES ('D1-00001', 2.0::DOUBLE, 40::BIGINT, DATE '2026-03-01'), ('D1-00002', 3.0::DOUBLE, 51::BIGINT, NULL)) t(hh_id, hh_size, age, remarks)) TO '${file}' (FORMAT parquet)`);
    con.closeSync();
    const s = await checkJson(file);
    const notes = Object.fromEntries((s.header.typeNotes as any[]).map((n) => [n.column, n]));
    expect(Object.keys(notes).sort()).toEqual(['hh_size', 'remarks']);
    expect(notes.hh_size).toMatchObject({ delivered: 'decimal', expected: 'integer' });
    expect(notes.remarks).toMatchObject({ delivered: 'date', expected: 'text' });
    // 2.0 and 3.0 are the whole numbers 2 and 3: valid household sizes, no not-an-integer.
    expect(s.items.hh_size).toMatchObject({ valid: 2, invalid: 0 });
    expect(s.items.age).toMatchObject({ valid: 2, invalid: 0 });
    expect(s.items.remarks).toMatchObject({ valid: 1, missing: { blank: 1 } });
    const human = await cli(['check', file, '--codebook', CODEBOOK, '--threads', '1'], dir);
    expect(human.out).toMatch(/Note: hh_size was delivered as decimal cells/);
  });

  it('describes the same values from every format', async () => {
    const run = async (file: string, extra: string[] = []) => {
      const r = await cli(['describe', file, '--codebook', CODEBOOK, '--json', '--threads', '1', ...extra], dir);
      expect(r.code).toBe(1);
      return JSON.parse(r.out);
    };
    const csv = await run(ex('demo-delivery.csv'));
    expect(await run(join(dir, 'demo.csv.gz'))).toEqual(csv);
    const table = await run(join(dir, 'demo-table.csv'));
    expect(await run(join(dir, 'demo.xlsx'), ['--sheet', 'delivery'])).toEqual(table);
    expect(await run(join(dir, 'demo.parquet'))).toEqual(table);
  });

  it('refuses a sheet the workbook lacks, naming the sheets it has (exit 2)', async () => {
    const r = await cli(['check', join(dir, 'demo.xlsx'), '--codebook', CODEBOOK, '--sheet', 'wave3'], dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/no sheet "wave3".*"notes", "delivery"/);
  });

  it('reads the first sheet when --sheet is absent', async () => {
    const r = await cli(['check', join(dir, 'demo.xlsx'), '--codebook', CODEBOOK, '--json', '--threads', '1'], dir);
    const s = JSON.parse(r.out);
    // The first sheet holds one line of notes, not the delivery: every item's column is missing.
    expect(s.header.missing.length).toBe(29);
  });

  it('keeps the compressed file unchanged and never writes it out inflated', async () => {
    const before = await readFile(join(dir, 'demo.csv.gz'));
    await checkJson(join(dir, 'demo.csv.gz'));
    expect(Buffer.compare(before, await readFile(join(dir, 'demo.csv.gz')))).toBe(0);
  });
});
