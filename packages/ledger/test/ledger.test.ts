import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { DuckDBInstance } from '@duckdb/node-api';
import { Ledger, MIGRATIONS, SCHEMA_VERSION } from '../src/index.ts';
import type { DeliverySnapshot } from '../src/index.ts';

let dir = '';
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-ledger-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

/** A small snapshot made by hand: two records, one coded and one ratio item, two teams. */
function snapshot(hash: string, file = `${hash}.csv`): DeliverySnapshot {
  return {
    file,
    hash,
    codebook: { codebook: 'cb', version: '1' },
    checkedAt: '2026-12-02T10:00:00.000Z',
    rows: 2,
    verdict: 'accepted',
    errors: 0,
    warnings: 1,
    items: {
      hh: { valid: 2, invalid: 0, missing: {} },
      team: { level: 'nominal', valid: 2, invalid: 0, missing: {}, codes: { '1': 1, '2': 1 } },
      income: { level: 'ratio', valid: 1, invalid: 0, missing: { refused: 1 }, values: Float64Array.from([120.5]) },
    },
    groups: { team: { '1': { rows: 1, cells: 3, missingCells: 0, invalidCells: 0, missing: {} }, '2': { rows: 1, cells: 3, missingCells: 1, invalidCells: 0, missing: { income: { refused: 1 } } } } },
    findings: [
      { rule: 'implausible', item: 'income', groupItem: '', group: '', n: 1 },
      { rule: 'implausible', item: 'income', groupItem: 'team', group: '1', n: 1 },
    ],
    records: { idItem: 'hh', items: ['team', 'income'], ids: ['a', 'b'], cells: Uint32Array.from([1, 2, 3, 4]), groupItems: ['team'], groups: [['1', '2']], duplicates: 0, unidentified: 0 },
  };
}

describe('Ledger', () => {
  it('appends a delivery and reads back the same snapshot', async () => {
    const path = join(dir, 'roundtrip.duckdb');
    const l = await Ledger.open(path);
    const s = snapshot('aaa');
    expect(await l.append(s)).toEqual({ delivery: 1, duplicate: false });
    expect(await l.snapshot(1)).toEqual(s);
    l.close();
  });

  it('recognises a content hash it has seen and writes nothing', async () => {
    const path = join(dir, 'dup.duckdb');
    const l = await Ledger.open(path);
    await l.append(snapshot('h1'));
    await l.append(snapshot('h2'));
    const again = await l.append(snapshot('h2', 'renamed.csv'));
    expect(again.duplicate).toBe(true);
    expect(again.delivery).toBe(2);
    expect(again.previous?.id).toBe(1);
    expect((await l.deliveries()).map((d) => d.file)).toEqual(['h1.csv', 'h2.csv']);
    l.close();
  });

  it('a failing write leaves the ledger as it was (one transaction)', async () => {
    const path = join(dir, 'rollback.duckdb');
    const l = await Ledger.open(path);
    await l.append(snapshot('ok'));
    // A record without an id makes the records appender fail after the delivery's counts are written.
    const broken = snapshot('broken');
    broken.records = { ...broken.records!, ids: ['a', undefined as unknown as string] };
    await expect(l.append(broken)).rejects.toMatchObject({ code: 'CW_WRITE_FAILED' });
    expect((await l.deliveries()).map((d) => d.hash)).toEqual(['ok']);
    for (const t of ['item_counts', 'missing_counts', 'code_counts', 'item_values', 'records', 'record_sets']) {
      const rows = await l.rows(`SELECT count(*) AS n FROM ${t} WHERE delivery <> 1`);
      expect(Number(rows[0]!.n), t).toBe(0);
    }
    l.close();
  });

  it('migrates a schema-1 ledger forward and keeps its deliveries', async () => {
    const path = join(dir, 'v1.duckdb');
    // A ledger as the first schema left it: made with migration 1 only, one delivery recorded.
    const old = await Ledger.open(path, { upTo: 1 });
    expect(old.version).toBe(1);
    old.close();
    const inst = await DuckDBInstance.create(path);
    const c = await inst.connect();
    await c.run(`INSERT INTO deliveries VALUES (1, 'week1.csv', 'abc', 'cb', '1', '2026-11-01T08:00:00.000Z', 10, 'accepted', 0, 0)`);
    await c.run(`INSERT INTO item_counts VALUES (1, 'income', 'ratio', false, 9, 0)`);
    await c.run(`INSERT INTO missing_counts VALUES (1, 'income', 'refused', '', '', 1)`);
    c.closeSync();
    inst.closeSync();

    const l = await Ledger.open(path);
    expect(l.version).toBe(SCHEMA_VERSION);
    const v = await l.rows('SELECT version FROM schema_version ORDER BY version');
    expect(v.map((r) => Number(r.version))).toEqual(MIGRATIONS.map((_, i) => i + 1));
    const s = await l.snapshot(1);
    expect(s.items.income).toEqual({ level: 'ratio', valid: 9, invalid: 0, missing: { refused: 1 }, values: null });
    expect(s.records).toBeNull();
    // New deliveries go in with everything schema 2 holds.
    await l.append(snapshot('new'));
    expect((await l.snapshot(2)).records?.ids).toEqual(['a', 'b']);
    l.close();
  });

  it('refuses a ledger from a newer codeweir, a database that is not a ledger, and a file that is not a database', async () => {
    const newer = join(dir, 'newer.duckdb');
    (await Ledger.open(newer)).close();
    const inst = await DuckDBInstance.create(newer);
    const c = await inst.connect();
    await c.run(`INSERT INTO schema_version VALUES (${SCHEMA_VERSION + 1}, 'later')`);
    c.closeSync();
    inst.closeSync();
    await expect(Ledger.open(newer)).rejects.toThrow(/schema version 3, written by a newer codeweir/);

    const other = join(dir, 'other.duckdb');
    const i2 = await DuckDBInstance.create(other);
    const c2 = await i2.connect();
    await c2.run('CREATE TABLE people (name VARCHAR)');
    c2.closeSync();
    i2.closeSync();
    await expect(Ledger.open(other)).rejects.toThrow(/a DuckDB database but not a codeweir ledger/);

    const text = join(dir, 'text.duckdb');
    await writeFile(text, 'hh,team\n1,2\n');
    await expect(Ledger.open(text)).rejects.toThrow(/is not a codeweir ledger \(not a DuckDB database file\)/);
    await expect(Ledger.open(join(dir, 'absent.duckdb'), { readOnly: true })).rejects.toMatchObject({ code: 'CW_FILE_NOT_FOUND' });
    await expect(Ledger.open(dir)).rejects.toMatchObject({ code: 'CW_FILE_IS_DIRECTORY' });
  });
});
