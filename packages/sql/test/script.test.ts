/**
 * `codeweir sql`: the printed queries run as they are in DuckDB (duckdb dialect), in PostgreSQL
 * (postgres dialect, the whole script at once) and, in PostgreSQL 15, the ansi dialect (whose
 * REGEXP_LIKE, TRIM(BOTH ... FROM ...), percentile_cont WITHIN GROUP and GROUPING SETS
 * PostgreSQL 15 reads; only its double type is spelt DOUBLE PRECISION there). Each gives the
 * built-in check's finding counts by rule on the demo rows. A codebook with a construct that
 * has no SQL form is refused with exit 2 and the construct's codebook path.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtemp, readFile, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import pg from 'pg';
import { DuckDBInstance } from '@duckdb/node-api';
import { cli } from '../../../test/support/cli.ts';
import { readCsvRows, writeRectangular } from '../../read/test/write-formats.ts';
import { startPg, type PgServer } from './pg-server.ts';

const ex = (f: string): string => fileURLToPath(new URL(`../../../examples/${f}`, import.meta.url));
const CODEBOOK = ex('household.codebook.json');
/** Findings made from the header, the tallies or nothing at all (not rows), which the SQL leaves to codeweir. */
const NOT_ROW_LEVEL = new Set(['missing-column', 'unexpected-column', 'duplicate-column', 'column-order', 'no-rows', 'surrounding-space', 'unbinned-column']);

let dir: string;
let rect: string;
let builtin: Record<string, number>;
let server: PgServer;
let client: pg.Client | undefined;

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'cw-sql-'));
  rect = join(dir, 'demo-table.csv');
  await writeRectangular(ex('demo-delivery.csv'), rect);
  const r = await cli(['check', rect, '--codebook', CODEBOOK, '--json', '--threads', '1'], dir);
  builtin = Object.fromEntries(Object.entries<number>(JSON.parse(r.out).findings.byRule).filter(([rule]) => !NOT_ROW_LEVEL.has(rule)));
  server = startPg();
  if (server.url) {
    client = new pg.Client({ connectionString: server.url });
    await client.connect();
    // The rows as csv-parse reads them (an outside parser), empty cells as NULL: the checks read NULL as blank.
    const { header, rows } = await readCsvRows(rect);
    await client.query(`DROP TABLE IF EXISTS wave2; CREATE TABLE wave2 (cw_rowno INTEGER, ${header.map((h) => `"${h}" TEXT`).join(', ')})`);
    for (let start = 0; start < rows.length; start += 500) {
      const params: unknown[] = [];
      const tuples = rows.slice(start, start + 500).map((row, k) => `(${[start + k + 1, ...row.map((v) => (v === '' ? null : v))].map((v) => (params.push(v), `$${params.length}`)).join(', ')})`);
      await client.query(`INSERT INTO wave2 VALUES ${tuples.join(', ')}`, params);
    }
  }
}, 120_000);

afterAll(async () => {
  await client?.end();
  server?.stop();
});

const countsOf = (rows: Array<Record<string, unknown>>): Record<string, number> => {
  const out: Record<string, number> = {};
  for (const r of rows) out[String(r.rule)] = (out[String(r.rule)] ?? 0) + Number(r.n);
  return out;
};

describe('codeweir sql', () => {
  it('prints queries DuckDB runs to the built-in finding counts, the logged findings in log order', async () => {
    const r = await cli(['sql', CODEBOOK, '--dialect', 'duckdb', '--table', 'wave2', '--row-column', 'cw_rowno', '--json'], dir);
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.out);
    expect(doc.quantileType).toBe(7);
    expect(doc.queries.fences).toMatch(/quantile_cont\(/);
    const con = await (await DuckDBInstance.create(':memory:')).connect();
    await con.run(`CREATE TABLE wave2 AS SELECT *, row_number() OVER () AS cw_rowno FROM read_csv('${rect}', all_varchar = true)`);
    const counts = countsOf((await con.runAndReadAll(doc.queries.counts)).getRowObjectsJS());
    expect(counts).toEqual(builtin);
    const logged = (await con.runAndReadAll(doc.queries.findings)).getRowObjectsJS();
    expect(logged.length).toBeGreaterThan(0);
    const rows = logged.map((f) => Number(f.row));
    expect(rows).toEqual([...rows].sort((a, b) => a - b));
    con.closeSync();
  });

  it('prints a script PostgreSQL runs whole, and ansi SQL PostgreSQL 15 reads, with the same counts', async (ctx) => {
    if (!client) return ctx.skip(server.reason);
    const out = join(dir, 'postgres.sql');
    const r = await cli(['sql', CODEBOOK, '--dialect', 'postgres', '--table', 'wave2', '--row-column', 'cw_rowno', '-o', out], dir);
    expect(r.code).toBe(0);
    const script = await readFile(out, 'utf8');
    expect(script).toMatch(/Hyndman-Fan type 7/);
    const results = (await client.query(script)) as unknown as Array<{ rows: Array<Record<string, unknown>> }>;
    expect(results).toHaveLength(4);
    expect(countsOf(results[1]!.rows)).toEqual(builtin);
    // The ansi dialect: its counts query (the whole chain, not materialized, so one query is enough here).
    const a = await cli(['sql', CODEBOOK, '--dialect', 'ansi', '--table', 'wave2', '--row-column', 'cw_rowno', '--json'], dir);
    const queries = JSON.parse(a.out).queries as Record<string, string>;
    expect(/percentile_cont\(0\.25\) WITHIN GROUP/.test(queries.fences!)).toBe(true);
    // None of the DuckDB or PostgreSQL spellings the other dialects use.
    expect(/quantile_cont|btrim|regexp_full_match| ~ '/.test(Object.values(queries).join('\n'))).toBe(false);
    const counts = await client.query(queries.counts!.replace(/AS DOUBLE\)/g, 'AS DOUBLE PRECISION)'));
    expect(countsOf(counts.rows)).toEqual(builtin);
  });

  it('refuses a codebook construct with no SQL form, naming its path (exit 2), in sql and in check --engine', async () => {
    const cb = JSON.parse(await readFile(CODEBOOK, 'utf8'));
    cb.$schema = undefined;
    const remarks = cb.items.findIndex((i: { name: string }) => i.name === 'remarks');
    cb.items[remarks].askedWhen = 'water_src.matches("^T")';
    const file = join(dir, 'matches.codebook.json');
    await writeFile(file, JSON.stringify(cb));
    const sql = await cli(['sql', file, '--dialect', 'postgres', '--table', 'wave2'], dir);
    expect(sql.code).toBe(2);
    expect(sql.out).toBe('');
    expect(sql.err).toMatch(new RegExp(`/items/${remarks}/askedWhen: the method \\.matches\\(\\) at character 1 .*has no postgres SQL form`));
    const check = await cli(['check', ex('demo-delivery.csv'), '--codebook', file, '--engine', 'duckdb'], dir);
    expect(check.code).toBe(2);
    expect(check.err).toMatch(/askedWhen: the method \.matches\(\)/);
  });
});
