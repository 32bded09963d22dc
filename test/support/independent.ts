/**
 * An independent reading of a delivery against a codebook, for tests that recompute what
 * codeweir reports. It shares no code with packages/**: the CSV is parsed by csv-parse (an
 * outside parser), the codebook JSON is read as plain data, every cell is classified by a
 * deliberately plain implementation of the rules in the codebook format contract, and the
 * statistics are first-principles arithmetic or jStat (an outside reference library).
 * Slow and simple on purpose: arrays of objects, no typed arrays, no shared sort orders.
 */
import { createRequire } from 'node:module';

// csv-parse is a dependency of the read package (the parsing oracle of the repository); resolve it from there.
const { parse } = createRequire(new URL('../../packages/read/package.json', import.meta.url))('csv-parse/sync') as {
  parse: (input: string, options: Record<string, unknown>) => string[][];
};

/** The jStat functions these tests use (jstat ships no types). */
export interface JStatSubset {
  mean(a: number[]): number;
  stdev(a: number[], sample?: boolean): number;
  skewness(a: number[]): number;
  kurtosis(a: number[]): number;
  geomean(a: number[]): number;
  corrcoeff(a: number[], b: number[]): number;
  spearmancoeff(a: number[], b: number[]): number;
  chisquare: { cdf(x: number, df: number): number; inv(p: number, df: number): number };
}
export const jStat = (createRequire(import.meta.url)('jstat') as { jStat: JStatSubset }).jStat;

// ---------------------------------------------------------------------------------------------
// The codebook as plain JSON.

export interface RawCode {
  code: number | string;
  label: string;
  bin?: { min: number; max?: number };
}
export interface RawMissing {
  code: number | string;
  kind: string;
}
export interface RawItem {
  name: string;
  label: string;
  role?: 'item' | 'id' | 'group' | 'weight';
  type: 'integer' | 'decimal' | 'text' | 'date';
  level?: 'nominal' | 'ordinal' | 'interval' | 'ratio';
  codes?: RawCode[];
  range?: { min?: number; max?: number };
  missing?: string | RawMissing[];
  askedWhen?: string;
  pattern?: string;
}
export interface RawCodebook {
  missingSets?: Record<string, RawMissing[]>;
  items: RawItem[];
}

/** The declared missing codes of an item, with a named missing set looked up. */
export function missingCodes(codebook: RawCodebook, item: RawItem): RawMissing[] {
  if (item.missing === undefined) return [];
  if (typeof item.missing === 'string') {
    const set = codebook.missingSets?.[item.missing];
    if (set === undefined) throw new Error(`${item.name}: no missing set ${item.missing}`);
    return set;
  }
  return item.missing;
}

// ---------------------------------------------------------------------------------------------
// Cells.

/** One classified cell: valid with its value, missing with its kind, or invalid. */
export type Cell =
  | { state: 'valid'; value: number | string }
  | { state: 'missing'; kind: string }
  | { state: 'invalid' };

const INVALID: Cell = { state: 'invalid' };

/** Plain decimal notation: sign, digits, one full stop, exponent. Nothing else is a number. */
const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

function toNumber(text: string): number | null {
  if (!NUMBER.test(text)) return null;
  const v = Number(text);
  return Number.isFinite(v) ? v : null;
}

/** Days since 1970-01-01 of a real calendar date written YYYY-MM-DD, else null. */
export function isoDays(text: string): number | null {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text);
  if (m === null) return null;
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  const date = new Date(Date.UTC(y, mo - 1, d));
  // A day that rolls over into the next month (2026-02-30) is no date.
  if (date.getUTCFullYear() !== y || date.getUTCMonth() !== mo - 1 || date.getUTCDate() !== d) return null;
  return date.getTime() / 86_400_000;
}

/**
 * Classifies one cell by the contract: trim; blank is missing (kind blank); a declared missing
 * code is missing of its kind; numbers in plain decimal notation; a coded item's value is valid
 * only if it is one of its codes; an integer item takes whole numbers only; a value outside
 * `range` is invalid; dates are YYYY-MM-DD; text must match `pattern` as a whole.
 */
export function classifyCell(codebook: RawCodebook, item: RawItem, raw: string): Cell {
  const text = raw.trim();
  if (text === '') return { state: 'missing', kind: 'blank' };
  const missing = missingCodes(codebook, item);
  const numeric = item.type === 'integer' || item.type === 'decimal';
  const byText = missing.find((m) => String(m.code) === text);
  if (!numeric) {
    if (byText) return { state: 'missing', kind: byText.kind };
    if (item.codes && item.codes.length > 0) {
      return item.codes.some((c) => String(c.code) === text) ? { state: 'valid', value: text } : INVALID;
    }
    if (item.type === 'date') {
      if (item.range) throw new Error(`${item.name}: a range on a date item is outside this recomputation`);
      const days = isoDays(text);
      return days === null ? INVALID : { state: 'valid', value: days };
    }
    if (item.pattern !== undefined && !new RegExp(`^(?:${item.pattern})$`).test(text)) return INVALID;
    return { state: 'valid', value: text };
  }
  const v = toNumber(text);
  if (v === null) return byText ? { state: 'missing', kind: byText.kind } : INVALID;
  const byValue = missing.find((m) => Number(m.code) === v);
  if (item.codes && item.codes.length > 0) {
    if (item.codes.some((c) => Number(c.code) === v)) return { state: 'valid', value: v };
    return byValue ? { state: 'missing', kind: byValue.kind } : INVALID;
  }
  if (byValue) return { state: 'missing', kind: byValue.kind };
  if (item.type === 'integer' && !Number.isInteger(v)) return INVALID;
  if (item.range?.min !== undefined && v < item.range.min) return INVALID;
  if (item.range?.max !== undefined && v > item.range.max) return INVALID;
  return { state: 'valid', value: v };
}

/** A routing condition of the one shape the demo uses: `<item> <comparison> <number>`. */
function routing(expression: string): { item: string; test: (v: number) => boolean } {
  const m = /^\s*([A-Za-z_][A-Za-z0-9_]*)\s*(==|!=|>=|<=|>|<)\s*(-?\d+(?:\.\d+)?)\s*$/.exec(expression);
  if (m === null) throw new Error(`routing condition ${JSON.stringify(expression)} is outside this recomputation`);
  const k = Number(m[3]);
  const tests: Record<string, (v: number) => boolean> = {
    '==': (v) => v === k,
    '!=': (v) => v !== k,
    '>=': (v) => v >= k,
    '<=': (v) => v <= k,
    '>': (v) => v > k,
    '<': (v) => v < k,
  };
  return { item: m[1]!, test: tests[m[2]!]! };
}

/** The delivery read and classified: header, rows, and one cell per row for every codebook item. */
export interface Classified {
  header: string[];
  rows: number;
  /** By item name: one cell per data row. */
  cells: Record<string, Cell[]>;
}

/**
 * Parses the CSV text with csv-parse and classifies every cell of every codebook item whose
 * column is in the header (columns found by name). A row shorter than the header has no cell
 * for the columns past its end: those count as invalid (the row is ragged). Routing: where an
 * item's `askedWhen` condition can be decided (its item is valid on the row) and is false, a
 * valid answer breaks the routing and is invalid; the condition reads the cell-level values.
 */
export function readAndClassify(codebook: RawCodebook, csv: string): Classified {
  const records = parse(csv, { relax_column_count: true, bom: true, skip_empty_lines: true });
  const header = records[0]!;
  const data = records.slice(1);
  const cells: Record<string, Cell[]> = {};
  for (const item of codebook.items) {
    const at = header.indexOf(item.name);
    if (at < 0) continue;
    cells[item.name] = data.map((row) => (at < row.length ? classifyCell(codebook, item, row[at]!) : INVALID));
  }
  for (const item of codebook.items) {
    if (item.askedWhen === undefined || cells[item.name] === undefined) continue;
    const rule = routing(item.askedWhen);
    const on = cells[rule.item];
    if (on === undefined) continue;
    const own = cells[item.name]!;
    cells[item.name] = own.map((cell, r) => {
      const cond = on[r]!;
      if (cond.state !== 'valid' || cell.state !== 'valid') return cell;
      return rule.test(cond.value as number) ? cell : INVALID;
    });
  }
  return { header, rows: data.length, cells };
}

// ---------------------------------------------------------------------------------------------
// First-principles statistics.

/** Ascending copy. */
export function ascending(values: readonly number[]): number[] {
  return [...values].sort((a, b) => a - b);
}

/**
 * Hyndman-Fan type 7 sample quantile from its published definition: h = (n - 1) p (0-based),
 * Q = x[floor h] + (h - floor h)(x[floor h + 1] - x[floor h]) on the sorted values.
 */
export function quantile7(sorted: readonly number[], p: number): number {
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, sorted.length - 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}

/**
 * Hyndman-Fan type 1 (inverse of the empirical distribution function) from its published
 * definition: with j = floor(n p) and g = n p - j, Q = x[j] when g = 0, else x[j + 1] (1-based);
 * that is the 0-based x[ceil(n p) - 1] for p > 0.
 */
export function quantile1(sorted: readonly number[], p: number): number {
  return sorted[Math.max(0, Math.ceil(sorted.length * p) - 1)]!;
}

/** Weighted ECDF inverse: the smallest value whose cumulative weight share is at least p (positive weights only). */
export function weightedQuantile(values: readonly number[], weights: readonly number[], p: number): number {
  const idx = values.map((_, i) => i).filter((i) => weights[i]! > 0);
  idx.sort((a, b) => values[a]! - values[b]!);
  const total = idx.reduce((s, i) => s + weights[i]!, 0);
  let cum = 0;
  for (const i of idx) {
    cum += weights[i]!;
    if (cum / total >= p) return values[i]!;
  }
  return values[idx[idx.length - 1]!]!;
}

/** Sum of squared deviations about the mean. */
export function sumOfSquares(values: readonly number[]): number {
  const m = values.reduce((s, v) => s + v, 0) / values.length;
  return values.reduce((s, v) => s + (v - m) ** 2, 0);
}

/** Pearson chi-square without continuity correction over the rows and columns with non-zero margins. */
export function chiSquare(table: number[][]): { statistic: number | null; df: number; n: number; rows: number[]; columns: number[]; expected: number[][]; lowExpected: number } {
  const rowSums = table.map((r) => r.reduce((s, v) => s + v, 0));
  const colSums = table[0]!.map((_, j) => table.reduce((s, r) => s + r[j]!, 0));
  const n = rowSums.reduce((s, v) => s + v, 0);
  const expected = table.map((r, i) => r.map((_, j) => (n > 0 ? (rowSums[i]! * colSums[j]!) / n : 0)));
  const rows = rowSums.map((v, i) => (v > 0 ? i : -1)).filter((i) => i >= 0);
  const columns = colSums.map((v, j) => (v > 0 ? j : -1)).filter((j) => j >= 0);
  let statistic = 0;
  let low = 0;
  for (const i of rows) {
    for (const j of columns) {
      const e = expected[i]![j]!;
      statistic += (table[i]![j]! - e) ** 2 / e;
      if (e < 5) low++;
    }
  }
  const cells = rows.length * columns.length;
  const lowExpected = cells > 0 ? (100 * low) / cells : 0;
  if (rows.length < 2 || columns.length < 2) return { statistic: null, df: 0, n, rows, columns, expected, lowExpected };
  return { statistic, df: (rows.length - 1) * (columns.length - 1), n, rows, columns, expected, lowExpected };
}

/**
 * Goodman-Kruskal gamma of a table in scale order: (C - D) / (C + D), with C the pairs of cases
 * ordered alike on both items and D the pairs ordered oppositely; pairs tied on either item are
 * left out. Null when C + D = 0.
 */
export function gamma(table: number[][]): number | null {
  let c = 0;
  let d = 0;
  const r = table.length;
  const k = table[0]!.length;
  for (let i = 0; i < r; i++) {
    for (let j = 0; j < k; j++) {
      const here = table[i]![j]!;
      if (here === 0) continue;
      for (let i2 = i + 1; i2 < r; i2++) {
        for (let j2 = 0; j2 < k; j2++) {
          if (j2 > j) c += here * table[i2]![j2]!;
          else if (j2 < j) d += here * table[i2]![j2]!;
        }
      }
    }
  }
  return c + d > 0 ? (c - d) / (c + d) : null;
}

/**
 * Squared Mahalanobis distance of each point with the sample covariance (n - 1), written out for
 * two variables: d2 = (zx^2 - 2 r zx zy + zy^2) / (1 - r^2), with z-scores by the n - 1 sd and r
 * Pearson's r.
 */
export function mahalanobis2(x: readonly number[], y: readonly number[]): number[] {
  const n = x.length;
  const mx = x.reduce((s, v) => s + v, 0) / n;
  const my = y.reduce((s, v) => s + v, 0) / n;
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (x[i]! - mx) ** 2;
    syy += (y[i]! - my) ** 2;
    sxy += (x[i]! - mx) * (y[i]! - my);
  }
  const sx = Math.sqrt(sxx / (n - 1));
  const sy = Math.sqrt(syy / (n - 1));
  const r = sxy / Math.sqrt(sxx * syy);
  return x.map((xi, i) => {
    const zx = (xi - mx) / sx;
    const zy = (y[i]! - my) / sy;
    return (zx * zx - 2 * r * zx * zy + zy * zy) / (1 - r * r);
  });
}
