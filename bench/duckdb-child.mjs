// The SQL peer's runner, plain JavaScript so that its child process starts as a bare `node`
// with no TypeScript loader: the peer is timed the way a DuckDB user would run it.
import { readFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import { DuckDBInstance } from '@duckdb/node-api';

/**
 * Runs `spec.setup` statements in order, then each named query of `spec.queries`, and returns
 * name -> rows (objects; BIGINT as number, lists as arrays).
 */
export async function runQueries(spec) {
  const instance = await DuckDBInstance.create(':memory:');
  const conn = await instance.connect();
  try {
    for (const s of spec.setup) await conn.run(s);
    const out = {};
    for (const [name, sql] of Object.entries(spec.queries)) {
      const reader = await conn.runAndReadAll(sql);
      out[name] = reader.getRowObjectsJS().map((row) =>
        Object.fromEntries(Object.entries(row).map(([k, v]) => [k, typeof v === 'bigint' ? Number(v) : v])),
      );
    }
    return out;
  } finally {
    conn.closeSync();
    instance.closeSync();
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const spec = JSON.parse(readFileSync(process.argv[2], 'utf8'));
  const out = await runQueries(spec);
  process.stdout.write(JSON.stringify(out) + '\n');
}
