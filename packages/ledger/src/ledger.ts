/**
 * The ledger file: one embedded DuckDB database that remembers every delivery checked into it.
 * Each delivery is written in one transaction (an interrupted or failing run leaves the ledger
 * as it was); DuckDB lets one process at a time open the file, so a second run waits for the
 * first (a bounded wait) and otherwise stops with one sentence. A file whose content hash is
 * already in the ledger is recognised and not counted again.
 */
import { mkdir, open, stat } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { DuckDBInstance, listValue, type DuckDBConnection, type DuckDBValue } from '@duckdb/node-api';
import { CodeweirError } from '@codeweir/core';
import type { FindingRule } from '@codeweir/check';
import type { Level, MissingTally } from '@codeweir/codebook';
import { MIGRATIONS, SCHEMA_VERSION } from './schema.ts';
import { rowHash, type RecordSet } from './records.ts';
import type { DeliverySnapshot, FindingCount, GroupSnapshot, ItemSnapshot } from './snapshot.ts';

/** How long a run waits for another run to release the ledger, by default (ms). */
export const DEFAULT_LEDGER_WAIT_MS = 30_000;

export interface LedgerOptions {
  /** Wait at most this long (ms) for another process to release the file. Default {@link DEFAULT_LEDGER_WAIT_MS}. */
  waitMs?: number;
  /** Open for reading only: the file must exist, and is never changed (not even migrated). */
  readOnly?: boolean;
  /** Tests only: migrate a new or older ledger up to this schema version instead of the latest. */
  upTo?: number;
}

/** One delivery of the ledger, as listed by {@link Ledger.deliveries}. */
export interface DeliveryRow {
  id: number;
  file: string;
  hash: string;
  codebook: string;
  version: string;
  checkedAt: string;
  rows: number;
  verdict: string;
  errors: number;
  warnings: number;
}

export interface AppendResult {
  /** The delivery's number in the ledger (the earlier one when the file was already there). */
  delivery: number;
  /** True when a delivery with the same content hash was already in the ledger: nothing was written. */
  duplicate: boolean;
  /** The delivery recorded before this one (for a duplicate: before the earlier recording), if any. */
  previous?: DeliveryRow;
  existing?: DeliveryRow;
}

/** Separates a record's group codes in `records.group_codes` (ASCII unit separator). */
const UNIT = '\u001f';

const LOCK = /Could not set lock on file|Conflicting lock/i;

function sleep(ms: number): Promise<void> {
  return new Promise((r) => setTimeout(r, ms));
}

function num(v: unknown): number {
  return typeof v === 'bigint' ? Number(v) : (v as number);
}

function bytes(v: unknown): Uint8Array {
  if (v instanceof Uint8Array) return v;
  const b = v as { bytes?: Uint8Array };
  return b.bytes ?? new Uint8Array(0);
}

/** An aligned copy of a blob's bytes as a typed array (DuckDB's buffers need not be 8-byte aligned). */
function float64s(v: unknown): Float64Array {
  const b = bytes(v);
  const out = new Float64Array(b.byteLength / 8);
  new Uint8Array(out.buffer).set(b);
  return out;
}

function uint32s(v: unknown): Uint32Array {
  const b = bytes(v);
  const out = new Uint32Array(b.byteLength / 4);
  new Uint8Array(out.buffer).set(b);
  return out;
}

function asBytes(a: Float64Array | Uint32Array): Uint8Array {
  return new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
}

/** A DuckDB database file carries the magic bytes `DUCK` at offset 8 of its first block. */
async function looksLikeDuckDb(path: string): Promise<boolean> {
  const fh = await open(path, 'r').catch(() => null);
  if (fh === null) return true; // let DuckDB report why it cannot be opened
  try {
    const head = Buffer.alloc(12);
    const { bytesRead } = await fh.read(head, 0, 12, 0);
    return bytesRead === 0 || (bytesRead === 12 && head.toString('latin1', 8, 12) === 'DUCK');
  } finally {
    await fh.close();
  }
}

/**
 * An open ledger. Close it when done ({@link Ledger.close}): the file stays locked while open.
 */
export class Ledger {
  private constructor(
    readonly path: string,
    private readonly instance: DuckDBInstance,
    private readonly conn: DuckDBConnection,
    /** The schema version of the file (after migration when opened for writing). */
    readonly version: number,
  ) {}

  /**
   * Opens (and, unless read-only, creates and migrates) the ledger at `path`. When another
   * process holds the file, retries for up to `waitMs`.
   * Cost: one file open, and the migrations the file lacks. Throws CodeweirError:
   * CW_WRITE_FAILED when the file stays locked by another run or cannot be created, CW_FILE_IS_DIRECTORY
 * for a folder,
   * CW_FILE_NOT_FOUND for a read-only open of a missing file, CW_FILE_UNREADABLE when the file is
   * not a DuckDB database, is not a ledger, or was written by a newer codeweir.
   */
  static async open(path: string, options: LedgerOptions = {}): Promise<Ledger> {
    const waitMs = options.waitMs ?? DEFAULT_LEDGER_WAIT_MS;
    const kind = await stat(path).then((s) => (s.isFile() ? 'file' : 'other'), () => 'none');
    if (kind === 'other') throw new CodeweirError('CW_FILE_IS_DIRECTORY', `${path} is a folder, not a ledger file; name a file such as ${join(path, 'season.duckdb')}.`, { file: path });
    const exists = kind === 'file';
    if (options.readOnly && !exists) throw new CodeweirError('CW_FILE_NOT_FOUND', `there is no ledger at ${path}; check a delivery with --ledger ${path} to start one.`, { file: path });
    if (!exists) await mkdir(dirname(path), { recursive: true }).catch(() => undefined);
    else if (!(await looksLikeDuckDb(path))) throw new CodeweirError('CW_FILE_UNREADABLE', `${path} is not a codeweir ledger (not a DuckDB database file).`, { file: path });
    const started = Date.now();
    let instance: DuckDBInstance | undefined;
    for (let attempt = 0; instance === undefined; attempt++) {
      try {
        instance = await DuckDBInstance.create(path, options.readOnly ? { access_mode: 'READ_ONLY' } : {});
      } catch (e) {
        const m = e instanceof Error ? e.message : String(e);
        if (LOCK.test(m)) {
          if (Date.now() - started >= waitMs) {
            throw new CodeweirError('CW_WRITE_FAILED', `the ledger ${path} is in use by another codeweir run and was not released within ${Math.round(waitMs / 1000)} s; try again when that run has finished (or raise --ledger-wait).`, { file: path, cause: e });
          }
          await sleep(Math.min(250, 20 * 2 ** Math.min(attempt, 4)));
          continue;
        }
        if (/not a valid DuckDB database|Unable to open database|file is not a|database file/i.test(m)) {
          throw new CodeweirError('CW_FILE_UNREADABLE', `${path} is not a codeweir ledger (not a DuckDB database file).`, { file: path, cause: e });
        }
        throw new CodeweirError(exists ? 'CW_FILE_UNREADABLE' : 'CW_WRITE_FAILED', `cannot open the ledger ${path}: ${m.split('\n')[0]}.`, { file: path, cause: e });
      }
    }
    const conn = await instance.connect();
    try {
      const version = await Ledger.migrate(conn, path, options.readOnly === true, options.upTo ?? SCHEMA_VERSION);
      return new Ledger(path, instance, conn, version);
    } catch (e) {
      conn.closeSync();
      instance.closeSync();
      throw e;
    }
  }

  /** Brings the schema forward (each migration in its own transaction) and returns the version reached. */
  private static async migrate(conn: DuckDBConnection, path: string, readOnly: boolean, upTo: number): Promise<number> {
    const tables = (await conn.runAndReadAll(`SELECT table_name FROM information_schema.tables WHERE table_schema = 'main'`)).getRowObjectsJS().map((r) => String(r.table_name));
    let version = 0;
    if (tables.includes('schema_version')) {
      const rows = (await conn.runAndReadAll('SELECT max(version) AS v FROM schema_version')).getRowObjectsJS();
      version = num(rows[0]?.v ?? 0) || 0;
    } else if (tables.length > 0) {
      throw new CodeweirError('CW_FILE_UNREADABLE', `${path} is a DuckDB database but not a codeweir ledger (it has no schema_version table).`, { file: path });
    }
    if (version > SCHEMA_VERSION) {
      throw new CodeweirError('CW_FILE_UNREADABLE', `the ledger ${path} has schema version ${version}, written by a newer codeweir; this one reads up to version ${SCHEMA_VERSION}.`, { file: path });
    }
    if (readOnly) {
      if (version === 0) throw new CodeweirError('CW_FILE_UNREADABLE', `${path} is an empty DuckDB database, not a codeweir ledger.`, { file: path });
      return version;
    }
    for (let v = version + 1; v <= upTo; v++) {
      await conn.run('BEGIN TRANSACTION');
      try {
        if (v === 1) await conn.run('CREATE TABLE schema_version (version INTEGER NOT NULL, migrated_at VARCHAR NOT NULL)');
        for (const sql of MIGRATIONS[v - 1]!) await conn.run(sql);
        await conn.run('INSERT INTO schema_version VALUES ($1, $2)', [v, new Date().toISOString()]);
        await conn.run('COMMIT');
      } catch (e) {
        await conn.run('ROLLBACK').catch(() => undefined);
        throw new CodeweirError('CW_WRITE_FAILED', `cannot bring the ledger ${path} to schema version ${v}: ${(e as Error).message.split('\n')[0]}.`, { file: path, cause: e });
      }
      version = v;
    }
    return version;
  }

  /** Closes the file (and releases its lock). Throws nothing. */
  close(): void {
    this.conn.closeSync();
    this.instance.closeSync();
  }

  /** Runs a query and returns its rows as plain objects. */
  async rows(sql: string, params: DuckDBValue[] = []): Promise<Array<Record<string, unknown>>> {
    return (await this.conn.runAndReadAll(sql, params)).getRowObjectsJS() as Array<Record<string, unknown>>;
  }

  /** Every delivery, oldest first (by number). Cost: one query. Throws nothing beyond DuckDB's own errors. */
  async deliveries(): Promise<DeliveryRow[]> {
    const rows = await this.rows('SELECT * FROM deliveries ORDER BY id');
    return rows.map((r) => ({
      id: num(r.id),
      file: String(r.file),
      hash: String(r.hash),
      codebook: String(r.codebook),
      version: String(r.codebook_version),
      checkedAt: String(r.checked_at),
      rows: num(r.rows),
      verdict: String(r.verdict),
      errors: num(r.errors),
      warnings: num(r.warnings),
    }));
  }

  /**
   * Appends a delivery in one transaction: its row, its counts, its valid values and its
   * records. When a delivery with the same content hash is there already, nothing is written
   * and the earlier delivery is returned with `duplicate: true`.
   * Cost: O(records x items + values) written through DuckDB appenders. Throws CodeweirError
   * CW_WRITE_FAILED when the write fails (the transaction is rolled back).
   */
  async append(s: DeliverySnapshot): Promise<AppendResult> {
    if (this.version < SCHEMA_VERSION) throw new CodeweirError('CW_WRITE_FAILED', `the ledger ${this.path} is at schema version ${this.version}; open it for writing to migrate it first.`, { file: this.path });
    const c = this.conn;
    await c.run('BEGIN TRANSACTION');
    try {
      const all = await this.deliveries();
      const existing = all.find((d) => d.hash === s.hash);
      if (existing) {
        await c.run('ROLLBACK');
        const previous = all.filter((d) => d.id < existing.id).pop();
        return { delivery: existing.id, duplicate: true, existing, ...(previous ? { previous } : {}) };
      }
      const id = all.length ? all[all.length - 1]!.id + 1 : 1;
      await c.run('INSERT INTO deliveries VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10)', [
        id, s.file, s.hash, s.codebook.codebook, s.codebook.version, s.checkedAt, s.rows, s.verdict, s.errors, s.warnings,
      ]);
      await this.writeCounts(id, s);
      await this.writeRecords(id, s.records);
      await c.run('COMMIT');
      const previous = all[all.length - 1];
      return { delivery: id, duplicate: false, ...(previous ? { previous } : {}) };
    } catch (e) {
      await c.run('ROLLBACK').catch(() => undefined);
      if (e instanceof CodeweirError) throw e;
      throw new CodeweirError('CW_WRITE_FAILED', `cannot write to the ledger ${this.path}: ${(e as Error).message.split('\n')[0]}; the ledger is as it was.`, { file: this.path, cause: e });
    }
  }

  private async writeCounts(id: number, s: DeliverySnapshot): Promise<void> {
    const c = this.conn;
    const items = await c.createAppender('item_counts');
    const missing = await c.createAppender('missing_counts');
    const codes = await c.createAppender('code_counts');
    const values = await c.createAppender('item_values');
    const missingRow = (item: string, kind: string, g: string, code: string, n: number): void => {
      missing.appendInteger(id);
      missing.appendVarchar(item);
      missing.appendVarchar(kind);
      missing.appendVarchar(g);
      missing.appendVarchar(code);
      missing.appendBigInt(BigInt(n));
      missing.endRow();
    };
    for (const [name, it] of Object.entries(s.items)) {
      items.appendInteger(id);
      items.appendVarchar(name);
      if (it.level === undefined) items.appendNull();
      else items.appendVarchar(it.level);
      items.appendBoolean(it.absent === true);
      items.appendBigInt(BigInt(it.valid));
      items.appendBigInt(BigInt(it.invalid));
      items.endRow();
      for (const [kind, n] of Object.entries(it.missing)) if (n) missingRow(name, kind, '', '', n);
      if (it.codes) {
        let position = 0;
        for (const [code, n] of Object.entries(it.codes)) {
          codes.appendInteger(id);
          codes.appendVarchar(name);
          codes.appendInteger(position++);
          codes.appendVarchar(code);
          codes.appendBigInt(BigInt(n));
          codes.endRow();
        }
      }
      if (it.values) {
        values.appendInteger(id);
        values.appendVarchar(name);
        values.appendBigInt(BigInt(it.values.length));
        values.appendBlob(asBytes(it.values));
        values.endRow();
      }
    }
    const groups = await c.createAppender('group_counts');
    for (const [g, byCode] of Object.entries(s.groups)) {
      for (const [code, gs] of Object.entries(byCode)) {
        groups.appendInteger(id);
        groups.appendVarchar(g);
        groups.appendVarchar(code);
        for (const n of [gs.rows, gs.cells, gs.missingCells, gs.invalidCells]) groups.appendBigInt(BigInt(n));
        groups.endRow();
        for (const [item, kinds] of Object.entries(gs.missing)) for (const [kind, n] of Object.entries(kinds)) if (n) missingRow(item, kind, g, code, n);
      }
    }
    const findings = await c.createAppender('finding_counts');
    for (const f of s.findings) {
      findings.appendInteger(id);
      findings.appendVarchar(f.rule);
      findings.appendVarchar(f.item);
      findings.appendVarchar(f.groupItem);
      findings.appendVarchar(f.group);
      findings.appendBigInt(BigInt(f.n));
      findings.endRow();
    }
    for (const a of [items, missing, codes, values, groups, findings]) a.closeSync();
  }

  private async writeRecords(id: number, set: RecordSet | null): Promise<void> {
    if (set === null) return;
    const c = this.conn;
    await c.run('INSERT INTO record_sets VALUES ($1, $2, $3::VARCHAR[], $4::VARCHAR[], $5, $6)', [id, set.idItem, listValue(set.items), listValue(set.groupItems), set.duplicates, set.unidentified]);
    const a = await c.createAppender('records');
    const w = set.items.length;
    for (let r = 0; r < set.ids.length; r++) {
      a.appendInteger(id);
      a.appendVarchar(set.ids[r]!);
      a.appendVarchar(rowHash(set, r));
      a.appendBlob(asBytes(set.cells.subarray(r * w, (r + 1) * w)));
      a.appendVarchar(set.groups.map((g) => g[r]!).join(UNIT));
      a.endRow();
    }
    a.closeSync();
  }

  /**
   * The snapshot of delivery `id` as it was recorded: counts, valid values and records (the
   * last two null for deliveries recorded under schema 1).
   * Cost: O(records x items + values) read. Throws CodeweirError CW_USAGE when there is no such delivery.
   */
  async snapshot(id: number): Promise<DeliverySnapshot> {
    const d = (await this.deliveries()).find((x) => x.id === id);
    if (d === undefined) throw new CodeweirError('CW_USAGE', `the ledger ${this.path} has no delivery ${id}.`, { file: this.path });
    const items: Record<string, ItemSnapshot> = {};
    for (const r of await this.rows('SELECT * FROM item_counts WHERE delivery = $1 ORDER BY rowid', [id])) {
      const it: ItemSnapshot = { valid: num(r.valid), invalid: num(r.invalid), missing: {} };
      if (r.level !== null) it.level = String(r.level) as Level;
      if (r.absent === true) it.absent = true;
      items[String(r.item)] = it;
    }
    const groups: Record<string, Record<string, GroupSnapshot>> = {};
    for (const r of await this.rows('SELECT * FROM group_counts WHERE delivery = $1 ORDER BY rowid', [id])) {
      (groups[String(r.group_item)] ??= {})[String(r.group_code)] = {
        rows: num(r.rows), cells: num(r.cells), missingCells: num(r.missing_cells), invalidCells: num(r.invalid_cells), missing: {},
      };
    }
    for (const r of await this.rows('SELECT * FROM missing_counts WHERE delivery = $1 ORDER BY rowid', [id])) {
      const item = String(r.item);
      const kind = String(r.kind) as MissingTally;
      if (r.group_item === '') {
        if (items[item]) items[item]!.missing[kind] = num(r.n);
      } else {
        const g = groups[String(r.group_item)]?.[String(r.group_code)];
        if (g) (g.missing[item] ??= {})[kind] = num(r.n);
      }
    }
    for (const r of await this.rows('SELECT * FROM code_counts WHERE delivery = $1 ORDER BY item, position', [id])) {
      const it = items[String(r.item)];
      if (it) (it.codes ??= {})[String(r.code)] = num(r.n);
    }
    if (this.version >= 2) {
      for (const r of await this.rows('SELECT item, sorted_values FROM item_values WHERE delivery = $1', [id])) {
        const it = items[String(r.item)];
        if (it) it.values = float64s(r.sorted_values);
      }
    }
    for (const it of Object.values(items)) if ((it.level === 'interval' || it.level === 'ratio') && it.values === undefined) it.values = null;
    const findings: FindingCount[] = (await this.rows('SELECT * FROM finding_counts WHERE delivery = $1 ORDER BY rowid', [id])).map((r) => ({
      rule: String(r.rule) as FindingRule, item: String(r.item), groupItem: String(r.group_item), group: String(r.group_code), n: num(r.n),
    }));
    return {
      file: d.file, hash: d.hash, codebook: { codebook: d.codebook, version: d.version }, checkedAt: d.checkedAt, rows: d.rows,
      verdict: d.verdict === 'accepted' ? 'accepted' : 'not accepted', errors: d.errors, warnings: d.warnings,
      items, groups, findings, records: this.version >= 2 ? await this.records(id) : null,
    };
  }

  /** The sorted valid values of an interval or ratio item in delivery `id`; null when not stored (schema 1, or not such an item). */
  async values(id: number, item: string): Promise<Float64Array | null> {
    if (this.version < 2) return null;
    const r = (await this.rows('SELECT sorted_values FROM item_values WHERE delivery = $1 AND item = $2', [id, item]))[0];
    return r === undefined ? null : float64s(r.sorted_values);
  }

  private async records(id: number): Promise<RecordSet | null> {
    const head = (await this.rows('SELECT * FROM record_sets WHERE delivery = $1', [id]))[0];
    if (head === undefined) return null;
    const items = (head.items as string[]).map(String);
    const groupItems = (head.group_items as string[]).map(String);
    const rows = await this.rows('SELECT record_id, cell_hashes, group_codes FROM records WHERE delivery = $1 ORDER BY rowid', [id]);
    const w = items.length;
    const cells = new Uint32Array(rows.length * w);
    const ids: string[] = [];
    const groups: string[][] = groupItems.map(() => []);
    rows.forEach((r, i) => {
      ids.push(String(r.record_id));
      cells.set(uint32s(r.cell_hashes), i * w);
      const g = String(r.group_codes).split(UNIT);
      for (let k = 0; k < groupItems.length; k++) groups[k]!.push(g[k] ?? '');
    });
    return { idItem: String(head.id_item), items, ids, cells, groupItems, groups, duplicates: num(head.duplicates), unidentified: num(head.unidentified) };
  }
}
