/**
 * The SQL engines: the compiled checks run in embedded DuckDB (on a CSV or Parquet file) or in
 * a PostgreSQL server (on a table), and their answers are turned into the same CheckResult as
 * the built-in check: the tallies, routing, rules and finding counts become a partial result
 * that the built-in `finalize` completes (header and item-level findings, sorting, caps,
 * summary), and the fence quartiles computed by the engine fill `summary.fences`.
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { CodeweirError } from '@codeweir/core';
import type { CompiledCodebook } from '@codeweir/codebook';
import { finalize, KINDS, normalizeCheckOptions, RULE_NUMBER, RULE_ORDER, rules, SLOTS, type CheckOptionsInput, type CheckResult, type Finding, type FindingRule, type FindingSeverity, type PartialResult } from '@codeweir/check';
import { formatOf, openAnyDelivery, typeNotes, type DeliveredType } from '@codeweir/read';
import { tukeyFences } from '@codeweir/stats';
import { compileCheckSql, type CompiledSql, type SqlSource } from './compile.ts';
import { ident, lit } from './dialect.ts';

/** One row of a query answer, column name -> value (numbers may arrive as bigint or numeric text). */
export type SqlRow = Record<string, unknown>;

/** Runs one query and returns its rows. */
export type RunQuery = (sql: string) => Promise<SqlRow[]>;

export interface EngineOptions {
  engine: 'duckdb' | 'postgres';
  /** postgres: the server, as a postgresql:// URL. */
  connection?: string;
  /** postgres: the column that numbers the rows (1-based); default the order the server returns rows in. */
  rowColumn?: string;
  /** duckdb: csv, csv.gz or parquet (default from the file name). */
  format?: string;
}

const NR = RULE_ORDER.length;
const SEVERITIES: readonly FindingSeverity[] = ['error', 'warning', 'info'];
const n = (v: unknown): number => (v === null || v === undefined ? 0 : Number(v));
const s = (v: unknown): string => (v === null || v === undefined ? '' : String(v));

/** Shortest decimal text of a fence, rounded to 12 significant digits (as the built-in check prints it). */
function fenceText(v: number): string {
  return String(Number(v.toPrecision(12)));
}

function slotOf(cls: string): number {
  if (cls === 'ok' || cls.startsWith('w:')) return 0;
  if (cls.startsWith('x:')) return 1;
  return 2 + KINDS.indexOf(cls.slice(2) as (typeof KINDS)[number]);
}

/**
 * Runs compiled checks with `query` and builds the CheckResult the built-in check gives for
 * the same cells. Convention: as {@link compileCheckSql}; fences from the engine's type 7
 * quartiles with Tukey's 1.5 and 3 x IQR. Cost: the three queries' cost on the engine plus
 * O(items + groups + logged findings) here. Throws what `query` throws.
 */
export async function resultFromSql(codebook: CompiledCodebook, compiled: CompiledSql, query: RunQuery, options: CheckOptionsInput, file?: string): Promise<CheckResult> {
  const opts = normalizeCheckOptions(options);
  const nItems = codebook.items.length;
  const [tallyRows, countRows, findingRows, fenceRows] = [await query(compiled.tallies), await query(compiled.counts), await query(compiled.findings), await query(compiled.fences)];

  const tallies = new Float64Array(nItems * SLOTS);
  const routing = new Float64Array(nItems * 3);
  const ruleCounts = new Float64Array(codebook.rules.length * 4);
  const trimmed = new Float64Array(nItems);
  const unbinned = new Float64Array(nItems);
  const recordMissing = new Float64Array(nItems + 1);
  const ruleIndex = new Map(codebook.rules.map((r, k) => [r.id, k]));
  const groupKeys = compiled.groupItems.map(() => new Map<string, { first: number; tallies: Float64Array }>());
  let rows = 0;
  for (const t of tallyRows) {
    const item = s(t.item);
    const cls = s(t.cls);
    const count = n(t.n);
    const by = compiled.groupItems.findIndex((_, k) => n(t[`cw_by${k}`]) === 0);
    if (by >= 0) {
      // A row of one group item's grouping set: that item's key, all else rolled up.
      const it = codebook.byName.get(item);
      if (!it || item.includes(':')) continue;
      const key = s(t[`g${by}`]);
      const keys = groupKeys[by]!;
      let entry = keys.get(key);
      if (!entry) keys.set(key, (entry = { first: n(t.first_row), tallies: new Float64Array(nItems * SLOTS) }));
      entry.first = Math.min(entry.first, n(t.first_row));
      entry.tallies[it.index * SLOTS + slotOf(cls)]! += count;
      continue;
    }
    if (item === 'record:missing') {
      recordMissing[Number(cls)]! += count;
      rows += count;
    } else if (item.startsWith('routing:')) {
      const it = codebook.byName.get(item.slice(8))!;
      routing[it.index * 3 + (cls === 'asked' ? 0 : cls === 'skipped' ? 1 : 2)]! += count;
    } else if (item.startsWith('rule:')) {
      const k = ruleIndex.get(item.slice(5))!;
      ruleCounts[k * 4 + ['passed', 'failed', 'undetermined', 'skipped'].indexOf(cls)]! += count;
    } else {
      const it = codebook.byName.get(item)!;
      tallies[it.index * SLOTS + slotOf(cls)]! += count;
      trimmed[it.index]! += n(t.spaced);
      if (cls === 'x:unbinned-value') unbinned[it.index]! += count;
    }
  }

  const findingCounts = new Float64Array(nItems * NR);
  const ruleTotals = new Float64Array(NR);
  const severityTotals = new Float64Array(SEVERITIES.length);
  for (const c of countRows) {
    const rule = s(c.rule) as FindingRule;
    const r = RULE_NUMBER[rule];
    const count = n(c.n);
    const it = rule === 'rule-failed' || rule === 'ragged-row' ? undefined : codebook.byName.get(s(c.item));
    if (it) findingCounts[it.index * NR + r]! += count;
    ruleTotals[r]! += count;
    severityTotals[SEVERITIES.indexOf(s(c.severity) as FindingSeverity)]! += count;
  }

  const fences: NonNullable<CheckResult['summary']['fences']> = {};
  const quartiles = new Map<string, { q1: number; q3: number }>();
  for (const f of fenceRows) if (n(f.n) > 0) quartiles.set(s(f.item), { q1: Number(f.q1), q3: Number(f.q3) });
  for (const item of codebook.items) {
    const q = quartiles.get(item.name);
    if (q) fences[item.name] = { q1: q.q1, q3: q.q3, ...tukeyFences(q.q1, q.q3) };
  }

  // Group keys in order of first appearance, as the built-in pass meets them.
  const groups = compiled.groupItems.map((name, k) => {
    const entries = [...groupKeys[k]!.entries()].sort((a, b) => a[1].first - b[1].first);
    return { item: name, keys: entries.map(([key]) => key), tallies: entries.map(([, e]) => e.tallies), rowKeys: new Uint32Array(rows), keyOf: new Map(entries.map(([key], j) => [key, j])) };
  });

  const findings: Finding[] = [];
  for (const f of findingRows) {
    const rule = s(f.rule) as FindingRule;
    const row = n(f.row);
    const item = s(f.item);
    let value = s(f.value);
    let message = s(f.message);
    const numeric = f.cw_number === null || f.cw_number === undefined ? undefined : Number(f.cw_number);
    if ((rule === 'outlier' || rule === 'extreme') && numeric !== undefined) {
      // The value and fences as the built-in check prints them (JavaScript number text).
      const fe = fences[item]!;
      value = String(numeric);
      const bounds = rule === 'outlier' ? { lower: fe.lower, upper: fe.upper } : { lower: fe.lowerExtreme, upper: fe.upperExtreme };
      message = rules[rule].message({ item, value, lower: Number(fenceText(bounds.lower)), upper: Number(fenceText(bounds.upper)) });
    } else if (rule === 'duplicate-id' && numeric !== undefined) {
      value = String(numeric + 0);
      message = rules['duplicate-id'].message({ item, value });
    }
    const finding: Finding = { row, id: s(f.id), item, value, rule, severity: s(f.severity) as FindingSeverity, message };
    if (rule === 'unbinned-value') finding.suggestion = s(f.suggestion);
    findings.push(finding);
    groups.forEach((g, k) => {
      if (row >= 1 && row <= rows) g.rowKeys[row - 1] = g.keyOf.get(s(f[`g${k}`])) ?? 0;
    });
  }

  const partial: PartialResult = {
    codebook,
    options: opts,
    header: compiled.header,
    ...(file !== undefined ? { file } : {}),
    rows,
    tallies,
    findingCounts,
    ruleTotals,
    severityTotals,
    routing,
    rules: ruleCounts,
    trimmed,
    unbinned,
    recordMissing,
    groups: groups.map(({ item, keys, tallies: t, rowKeys }) => ({ item, keys, tallies: t, rowKeys })),
    columns: codebook.items.map(() => null),
    ids: null,
    unique: codebook.items.map(() => null),
    findings,
  };
  const result = finalize(partial);
  result.summary.fences = fences;
  return result;
}

// ---------------------------------------------------------------------------------------------
// DuckDB

/** DuckDB's memory cap for a check: beyond it, tables and intermediate results go to a temporary folder. */
const MEMORY_LIMIT = '1GB';

const DUCKDB_ENCODINGS: Record<string, string> = { 'utf-8': 'utf-8', latin1: 'latin-1', 'utf-16le': 'utf-16' };

function deliveredOf(duckType: string): DeliveredType {
  const t = duckType.toUpperCase();
  if (/^(TINYINT|SMALLINT|INTEGER|BIGINT|HUGEINT|UTINYINT|USMALLINT|UINTEGER|UBIGINT|UHUGEINT)$/.test(t)) return 'integer';
  if (/^(FLOAT|DOUBLE|REAL)$/.test(t) || t.startsWith('DECIMAL')) return 'decimal';
  if (t === 'VARCHAR') return 'text';
  if (t === 'DATE') return 'date';
  if (t.startsWith('TIMESTAMP')) return 'timestamp';
  if (t === 'BOOLEAN') return 'boolean';
  return 'mixed';
}

/**
 * Checks a CSV (or csv.gz) or Parquet file in embedded DuckDB (loaded only now, by dynamic
 * import). CSV: the header, delimiter and encoding are settled by the built-in reader's first
 * block, then DuckDB's reader loads the rows as text (empty fields as empty text, short rows
 * padded and counted as ragged); a blank line inside the data is skipped by DuckDB's reader
 * where the built-in one reads it as a ragged row. Parquet: typed columns are cast to text.
 * Cost: DuckDB's scan and the three queries, on all cores. Throws CodeweirError: the file
 * errors of the built-in reader (exit 2), CW_USAGE for xlsx or an encoding DuckDB cannot read,
 * CW_FILE_UNREADABLE when DuckDB cannot read the file.
 */
export async function checkWithDuckDb(path: string, codebook: CompiledCodebook, options: CheckOptionsInput, format?: string): Promise<CheckResult> {
  const opts = normalizeCheckOptions(options);
  const f = formatOf(path, format);
  if (f === 'xlsx') throw new CodeweirError('CW_USAGE', `--engine duckdb reads CSV, csv.gz and Parquet files; check the workbook ${path} with the built-in engine.`);
  const { DuckDBInstance } = await import('@duckdb/node-api');
  // Memory is capped; beyond the cap DuckDB moves the loaded rows and the classified cells to a
  // temporary folder (removed afterwards), so a large delivery does not take the machine's memory.
  const work = await mkdtemp(join(tmpdir(), 'codeweir-duckdb-'));
  const db = await DuckDBInstance.create(':memory:', { memory_limit: MEMORY_LIMIT, temp_directory: work });
  const con = await db.connect();
  const query: RunQuery = async (sql) => {
    try {
      return (await con.runAndReadAll(sql)).getRowObjectsJS() as SqlRow[];
    } catch (e) {
      throw new CodeweirError('CW_FILE_UNREADABLE', `DuckDB could not check ${path}: ${(e as Error).message.split('\n')[0]}`, { file: path, cause: e });
    }
  };
  try {
    let source: SqlSource;
    let notes: ReturnType<typeof typeNotes> = [];
    if (f === 'parquet') {
      await (await openAnyDelivery(path, { format: 'parquet' })).header;
      const desc = await query(`DESCRIBE SELECT * FROM read_parquet(${lit(path)})`);
      const header = desc.map((r) => s(r.column_name));
      notes = typeNotes(Object.fromEntries(desc.map((r) => [s(r.column_name), deliveredOf(s(r.column_type))])), codebook.items);
      source = { from: `read_parquet(${lit(path)}, file_row_number = true)`, row: 'file_row_number + 1', header, column: (_p, name) => `CAST(${ident(name)} AS VARCHAR)` };
    } else {
      const d = await openAnyDelivery(path, { format: f, delimiter: opts.delimiter, encoding: opts.encoding, maxFieldBytes: opts.maxFieldBytes });
      const encoding = DUCKDB_ENCODINGS[d.encoding];
      if (encoding === undefined) throw new CodeweirError('CW_USAGE', `--engine duckdb cannot read ${d.encoding} text; check ${path} with the built-in engine.`);
      const width = d.header.length;
      // Twice the header's width: a row with up to that many fields is counted exactly.
      const names = Array.from({ length: 2 * width }, (_, k) => `f${k}`);
      const columns = names.map((c) => `${lit(c)}: 'VARCHAR'`).join(', ');
      const maxLine = Math.max(opts.maxFieldBytes ?? 16 * 1024 * 1024, 2 * 1024 * 1024) * 2;
      const load = (parallel: boolean) =>
        con.run(
          `CREATE OR REPLACE TABLE cw_delivery AS SELECT * FROM read_csv(${lit(path)}, columns = {${columns}}, header = false, skip = ${(d.firstDataLine ?? 2) - 1}, delim = ${lit(d.delimiter)}, quote = '"', escape = '"', nullstr = '\u0001\u0002', null_padding = true, strict_mode = false, auto_detect = false, encoding = ${lit(encoding)}, max_line_size = ${maxLine}, parallel = ${parallel}${f === 'csv.gz' ? ", compression = 'gzip'" : ''})`,
        );
      const unreadable = (e: unknown) => new CodeweirError('CW_FILE_UNREADABLE', `DuckDB could not read ${path}: ${(e as Error).message.split('\n')[0]}`, { file: path, cause: e });
      try {
        await load(true);
      } catch (e) {
        // DuckDB's parallel CSV scanner cannot pad short rows of a file with line breaks inside
        // quoted fields; its one-thread scanner can.
        if (!/parallel\s*=\s*false/.test((e as Error).message)) throw unreadable(e);
        await load(false).catch((e2: unknown) => {
          throw unreadable(e2);
        });
      }
      source = {
        from: 'cw_delivery',
        row: 'rowid + 1',
        fields: `(${names.map((c) => `CASE WHEN ${c} IS NULL THEN 0 ELSE 1 END`).join(' + ')})`,
        header: d.header,
        column: (p) => `f${p}`,
        nullIsAbsent: true,
      };
    }
    // The cells are classified once into a temporary table that the four queries read: without it,
    // each branch of the queries' unions would classify every cell again.
    const once = compileCheckSql(codebook, { ...options, dialect: 'duckdb', source });
    await query(`CREATE TABLE cw_cells AS ${once.cells}`);
    await query('DROP TABLE IF EXISTS cw_delivery');
    const compiled = compileCheckSql(codebook, { ...options, dialect: 'duckdb', source, cellsTable: 'cw_cells' });
    const result = await resultFromSql(codebook, compiled, query, options, path);
    if (notes.length > 0) result.summary.header.typeNotes = notes;
    return result;
  } finally {
    con.closeSync();
    db.closeSync();
    await rm(work, { recursive: true, force: true });
  }
}

// ---------------------------------------------------------------------------------------------
// PostgreSQL

/** The connection URL without its password, for messages. */
function safeUrl(url: string): string {
  return url.replace(/\/\/([^:/@]+):[^@]*@/, '//$1:***@');
}

/**
 * Checks a table in a PostgreSQL server (client: the `pg` package, loaded only now). The
 * table's columns are matched to the items by name and read as text (CAST ... AS TEXT), so a
 * typed column is judged by its value; `rowColumn` numbers the rows, else the order the server
 * returns them in. `table` may be schema-qualified (`survey.wave2`).
 * Cost: the three queries on the server. Throws CodeweirError (exit 2): CW_FILE_UNREADABLE when
 * the server cannot be reached or a query fails, CW_FILE_NOT_FOUND when the table does not exist,
 * CW_USAGE without a connection.
 */
export async function checkWithPostgres(table: string, codebook: CompiledCodebook, options: CheckOptionsInput, connection: string | undefined, rowColumn?: string): Promise<CheckResult> {
  if (connection === undefined) throw new CodeweirError('CW_USAGE', '--engine postgres needs --connection postgresql://user@host:port/database.');
  const { default: pg } = await import('pg');
  const client = new pg.Client({ connectionString: connection });
  try {
    await client.connect();
  } catch (e) {
    throw new CodeweirError('CW_FILE_UNREADABLE', `Cannot connect to the PostgreSQL server at ${safeUrl(connection)} (${(e as Error).message}).`, { cause: e });
  }
  const query: RunQuery = async (sql) => {
    try {
      return (await client.query(sql)).rows as SqlRow[];
    } catch (e) {
      throw new CodeweirError('CW_FILE_UNREADABLE', `PostgreSQL could not check the table ${table}: ${(e as Error).message}.`, { cause: e });
    }
  };
  try {
    const parts = table.split('.');
    const [schema, name] = parts.length > 1 ? [parts.slice(0, -1).join('.'), parts[parts.length - 1]!] : [undefined, table];
    const cols = await client.query(
      `SELECT column_name FROM information_schema.columns WHERE table_name = $1 AND table_schema = ${schema === undefined ? 'ANY (current_schemas(false))' : '$2'} ORDER BY ordinal_position`,
      schema === undefined ? [name] : [name, schema],
    );
    if (cols.rows.length === 0) throw new CodeweirError('CW_FILE_NOT_FOUND', `The table ${table} does not exist on the PostgreSQL server at ${safeUrl(connection)} (or has no columns).`);
    let header = cols.rows.map((r: { column_name: string }) => r.column_name);
    if (rowColumn !== undefined) {
      if (!header.includes(rowColumn)) throw new CodeweirError('CW_USAGE', `--row-column: the table ${table} has no column ${rowColumn}.`);
      header = header.filter((h: string) => h !== rowColumn);
    }
    const from = parts.map(ident).join('.');
    const source: SqlSource = { from, header, row: rowColumn === undefined ? undefined : ident(rowColumn) };
    // The cells are classified once into a temporary table (the session's own, dropped when it
    // ends), and the four queries read that table: one pass over the delivery's table, not four.
    const once = compileCheckSql(codebook, { ...options, dialect: 'postgres', source });
    await query(`CREATE TEMPORARY TABLE cw_cells AS ${once.cells}`);
    const compiled = compileCheckSql(codebook, { ...options, dialect: 'postgres', source, cellsTable: 'cw_cells' });
    return await resultFromSql(codebook, compiled, query, options, table);
  } finally {
    await client.end().catch(() => undefined);
  }
}

/**
 * `check --engine duckdb|postgres`: the data argument is a file for duckdb and a table name for
 * postgres. Cost and throws: as {@link checkWithDuckDb} and {@link checkWithPostgres}.
 */
export async function checkWithEngine(data: string, codebook: CompiledCodebook, options: CheckOptionsInput, engine: EngineOptions): Promise<CheckResult> {
  if (engine.engine === 'duckdb') return checkWithDuckDb(data, codebook, options, engine.format);
  if (engine.format !== undefined) throw new CodeweirError('CW_USAGE', '--format applies to files; --engine postgres reads a table.');
  return checkWithPostgres(data, codebook, options, engine.connection, engine.rowColumn);
}
