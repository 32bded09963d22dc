/**
 * CEL compiled to SQL means what CEL means. Each expression is evaluated on a grid of rows by
 * the CEL library the codebook compiles with (@marcbachmann/cel-js, the outside reference for
 * CEL's semantics, through codeweir's compiled evaluator) and, compiled to SQL, by DuckDB and by
 * PostgreSQL; the three must agree on every row. Constructs with no SQL form are refused with
 * the expression's path and the construct named.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import pg from 'pg';
import { DuckDBInstance, type DuckDBConnection } from '@duckdb/node-api';
import { compileExpression, ExpressionContext } from '@codeweir/codebook';
import { celToSql, dialectOf, type DialectName } from '../src/index.ts';
import { startPg, type PgServer } from './pg-server.ts';

const ITEMS = [
  { index: 0, name: 'a', type: 'integer' as const },
  { index: 1, name: 'b', type: 'decimal' as const },
  { index: 2, name: 's', type: 'text' as const },
  { index: 3, name: 'dt', type: 'date' as const },
];
const ctx = new ExpressionContext(ITEMS);
const INTS = new Set(['a', 'dt']);
const vars = (name: string) => {
  const it = ITEMS.find((i) => i.name === name);
  return it ? { sql: `v_${name}`, kind: it.type === 'text' ? ('string' as const) : ('num' as const) } : undefined;
};

// Rows: every combination of these values (dt as days since 1970-01-01: 2024-10-04 and 2026-03-01).
const A = [-7, -3, 0, 2, 7];
const B = [-1.5, 0, 2.5, 10];
const S = ['', 'x', 'xy', 'Mühlental', 'yx'];
const DT = [20_000, 20_513];
const ROWS = A.flatMap((a) => B.flatMap((b) => S.flatMap((s) => DT.map((dt) => ({ a, b, s, dt })))));

const EXPRESSIONS = [
  'a > 0',
  'a >= 2 && b < 2.5',
  'a == 0 || s == "x"',
  '!(a in [0, 2, -3])',
  's in ["x", "Mühlental"]',
  'a + 3 * 2 > 5',
  'a - 10 < -8',
  'a / 2 == 1',
  'a / 2 == -1',
  'a % 2 == 0',
  'a % 2 == -1',
  'b / 0.5 > 4.0',
  '10 / a > 1',
  '10 / a > 1 || a == 0',
  'false && 10 / a > 1',
  'b * 2.0 >= 5.0 ? a > 0 : a < 0',
  'dt >= date("2026-01-01")',
  'dt - date("2024-09-01") == 33',
  'size(s) >= 2',
  's.startsWith("x")',
  's.endsWith("x")',
  's.contains("ühl")',
  'double(a) > b',
  's + "!" == "x!"',
  's < "xz"',
  '-a > 2',
];

/** Expressions that are the same on every row by design (a short circuit over an error). */
const CONSTANT = new Set(['false && 10 / a > 1']);

let duck: DuckDBConnection;
let server: PgServer;
let client: pg.Client | undefined;
beforeAll(async () => {
  duck = await (await DuckDBInstance.create(':memory:')).connect();
  server = startPg();
  if (server.url) {
    client = new pg.Client({ connectionString: server.url });
    await client.connect();
  }
});
afterAll(async () => {
  duck?.closeSync();
  await client?.end();
  server?.stop();
});

const q = (v: string) => `'${v.replace(/'/g, "''")}'`;
function valuesSql(dialect: DialectName): string {
  const dbl = dialectOf(dialect).double;
  const rows = ROWS.map((r, k) => `(${k}, CAST(${r.a} AS ${dbl}), CAST(${r.b} AS ${dbl}), ${q(r.s)}, CAST(${r.dt} AS ${dbl}))`);
  return `(VALUES ${rows.join(', ')}) AS t(k, v_a, v_b, v_s, v_dt)`;
}

async function viaSql(dialect: 'duckdb' | 'postgres', expression: string): Promise<boolean[]> {
  const cond = celToSql(ctx, { path: '/rules/0/test', source: expression }, vars, INTS, dialectOf(dialect));
  const sql = `SELECT k, CASE WHEN ${cond} THEN 1 ELSE 0 END AS ok FROM ${valuesSql(dialect)} ORDER BY k`;
  const rows = dialect === 'duckdb' ? ((await duck.runAndReadAll(sql)).getRowObjectsJS() as Array<{ ok: number }>) : (await client!.query(sql)).rows;
  return rows.map((r) => Number(r.ok) === 1);
}

describe('CEL to SQL', () => {
  it('agrees with the CEL library on every row, in DuckDB and in PostgreSQL', async () => {
    for (const e of EXPRESSIONS) {
      const compiled = compileExpression(ctx, e, '/rules/0/test');
      expect(compiled.problems, e).toEqual([]);
      const want = ROWS.map((r) => compiled.expression!.evaluate(r));
      // Each expression must separate the rows, or the comparison would prove little.
      expect(new Set(want).size, `${e} is true or false on every row`).toBe(CONSTANT.has(e) ? 1 : 2);
      expect(await viaSql('duckdb', e), `duckdb: ${e}`).toEqual(want);
      if (client) expect(await viaSql('postgres', e), `postgres: ${e}`).toEqual(want);
    }
  });

  it('refuses a construct with no SQL form, naming it, its character and the codebook path', () => {
    const refuse = (e: string, dialect: DialectName = 'duckdb') => () => celToSql(ctx, { path: '/items/4/askedWhen', source: e }, vars, INTS, dialectOf(dialect));
    expect(refuse('s.matches("^x")')).toThrow(/\/items\/4\/askedWhen: the method \.matches\(\) at character 1 in "s\.matches\(\\"\^x\\"\)" has no duckdb SQL form/);
    expect(refuse('[1, 2].exists(x, x == a)')).toThrow(/has no duckdb SQL form/);
    expect(refuse('a in [b]')).toThrow(/`in` over a list that is not literals/);
    // String order by code point: DuckDB and PostgreSQL (COLLATE "C") promise it, the ANSI dialect cannot.
    expect(refuse('s < "xz"', 'ansi')).toThrow(/< between strings \(code point order\) at character 1 .* has no ansi SQL form/);
    try {
      refuse('s.matches("^x")')();
    } catch (e) {
      expect((e as { code: string }).code).toBe('CW_USAGE');
    }
  });
});
