/**
 * The three SQL dialects the checks compile to. Everything that differs between engines is
 * here; the compiler writes the rest in the common core of SQL:2003 (CASE, COALESCE, CTEs,
 * window functions, GROUPING SETS), which DuckDB, PostgreSQL, Spark SQL and Trino all read.
 */
import { CodeweirError } from '@codeweir/core';

export type DialectName = 'duckdb' | 'postgres' | 'ansi';
export const DIALECTS: readonly DialectName[] = ['duckdb', 'postgres', 'ansi'];

export interface Dialect {
  name: DialectName;
  /** The text type for casts. */
  text: string;
  /** The double-precision type for casts. */
  double: string;
  /** True when `s` matches the whole of the (already anchored) regular expression `re`. */
  regex(s: string, re: string): string;
  /** `s` with spaces, tabs and no-break spaces removed from both ends. */
  trim(s: string): string;
  /**
   * The continuous quantile at `p` of `x` over the group: Hyndman-Fan type 7 (linear
   * interpolation between order statistics at (n - 1) p), which is what DuckDB's quantile_cont
   * and the standard's percentile_cont compute.
   */
  quantile(x: string, p: number): string;
  /**
   * Written after `AS` in each step of the chain of common table expressions: PostgreSQL inlines
   * a step used once, which repeats each cell's classification wherever a later step reads it.
   */
  materialize: string;
  /** Ordering comparison of two strings by code point, or undefined when the dialect cannot promise that order. */
  stringOrder?(l: string, op: string, r: string): string;
}

/** The characters the classifiers trim: space, tab, no-break space. */
const TRIM_SET = `' ' || CHR(9) || CHR(160)`;

const DUCKDB: Dialect = {
  name: 'duckdb',
  text: 'VARCHAR',
  double: 'DOUBLE',
  regex: (s, re) => `regexp_full_match(${s}, ${re})`,
  trim: (s) => `trim(${s}, ${TRIM_SET})`,
  quantile: (x, p) => `quantile_cont(${x}, ${p})`,
  materialize: '',
  // DuckDB compares VARCHAR by its UTF-8 bytes, whose order is the code point order.
  stringOrder: (l, op, r) => `(${l} ${op} ${r})`,
};

const POSTGRES: Dialect = {
  name: 'postgres',
  text: 'TEXT',
  double: 'DOUBLE PRECISION',
  regex: (s, re) => `(${s} ~ ${re})`,
  trim: (s) => `btrim(${s}, ${TRIM_SET})`,
  quantile: (x, p) => `percentile_cont(${p}) WITHIN GROUP (ORDER BY ${x})`,
  materialize: 'MATERIALIZED ',
  // The "C" collation orders by bytes; in a UTF-8 database that is the code point order.
  stringOrder: (l, op, r) => `(${l} COLLATE "C" ${op} ${r} COLLATE "C")`,
};

const ANSI: Dialect = {
  name: 'ansi',
  text: 'VARCHAR',
  double: 'DOUBLE',
  regex: (s, re) => `REGEXP_LIKE(${s}, ${re})`,
  trim: (s) => `TRIM(BOTH ${TRIM_SET} FROM ${s})`,
  quantile: (x, p) => `percentile_cont(${p}) WITHIN GROUP (ORDER BY ${x})`,
  materialize: '',
};

/**
 * The dialect named `name`. Cost: O(1). Throws CodeweirError CW_USAGE for another name.
 * @example dialectOf('duckdb').quantile('x', 0.25) // 'quantile_cont(x, 0.25)'
 */
export function dialectOf(name: unknown): Dialect {
  switch (name) {
    case 'duckdb':
      return DUCKDB;
    case 'postgres':
      return POSTGRES;
    case 'ansi':
      return ANSI;
    default:
      throw new CodeweirError('CW_USAGE', `--dialect takes one of ${DIALECTS.join(', ')}, got ${JSON.stringify(name)}.`);
  }
}

/** A string literal: single quotes doubled (standard SQL; no backslash escapes). */
export function lit(s: string): string {
  return `'${s.replace(/'/g, "''")}'`;
}

/** A quoted identifier: double quotes doubled. */
export function ident(s: string): string {
  return `"${s.replace(/"/g, '""')}"`;
}

/** A numeric literal that every dialect reads as the same double (no exponent-less huge forms lost). */
export function num(v: number): string {
  if (!Number.isFinite(v)) throw new CodeweirError('CW_USAGE', `The number ${v} has no SQL literal.`);
  const s = String(v);
  return v < 0 ? `(${s})` : s;
}
