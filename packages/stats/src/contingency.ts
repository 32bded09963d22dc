/**
 * Contingency tables of two coded columns: counts, margins, expected counts and percentages.
 * Codes follow the column store: 1 + index into the item's codes, 0 for a cell that is not valid.
 */
import { CodeweirError } from '@codeweir/core';

export type Table = ReadonlyArray<ReadonlyArray<number>>;

export interface Margins {
  rowSums: number[];
  columnSums: number[];
  n: number;
}

/**
 * Counts table of two coded columns: cell [i][j] counts the rows where `x` holds code index i
 * and `y` code index j. Rows where either code is 0 (not valid) are skipped, so the total is the
 * pairwise-complete n; with `include`, only rows where include[row] is 1 are counted (listwise).
 *
 * Convention: rows and columns in code order (the item's declared order, the scale order for
 * ordinal items); every code gets its row or column, empty or not.
 * Cost: one linear scan over the two typed arrays, O(n + r c); no per-row allocation.
 * Throws CodeweirError (CW_USAGE) when the columns differ in length or a code exceeds `rows` or
 * `columns` (a store that does not belong to these items).
 *
 * @example crossTabulate(Uint16Array.of(1, 2, 2, 0), Uint16Array.of(1, 1, 2, 1), 2, 2) // [[1, 0], [1, 1]]
 */
export function crossTabulate(
  x: Uint16Array,
  y: Uint16Array,
  rows: number,
  columns: number,
  include?: Uint8Array,
): number[][] {
  const len = x.length;
  if (y.length !== len || (include !== undefined && include.length !== len)) {
    throw new CodeweirError('CW_USAGE', `Coded columns must have the same length, got ${len} and ${y.length}.`);
  }
  // Whole-number counters: an integer increment is cheaper than a floating-point one.
  const counts = new Uint32Array(rows * columns);
  let outOfRange = 0;
  for (let r = 0; r < len; r++) {
    const a = x[r];
    const b = y[r];
    if (a === 0 || b === 0 || (include !== undefined && include[r] === 0)) continue;
    if (a > rows || b > columns) {
      outOfRange++;
      continue;
    }
    counts[(a - 1) * columns + (b - 1)]++;
  }
  if (outOfRange > 0) {
    throw new CodeweirError(
      'CW_USAGE',
      `${outOfRange} coded cells hold a code index beyond the ${rows} x ${columns} table they are counted in.`,
    );
  }
  const table: number[][] = [];
  for (let i = 0; i < rows; i++) table.push(Array.from(counts.subarray(i * columns, (i + 1) * columns)));
  return table;
}

/**
 * Row sums, column sums and total of a table.
 * Cost: O(r c). Throws nothing.
 *
 * @example margins([[1, 2], [3, 4]]) // { rowSums: [3, 7], columnSums: [4, 6], n: 10 }
 */
export function margins(table: Table): Margins {
  const c = table.length === 0 ? 0 : table[0].length;
  const rowSums = new Array<number>(table.length).fill(0);
  const columnSums = new Array<number>(c).fill(0);
  let n = 0;
  for (let i = 0; i < table.length; i++) {
    for (let j = 0; j < c; j++) {
      const v = table[i][j];
      rowSums[i] += v;
      columnSums[j] += v;
      n += v;
    }
  }
  return { rowSums, columnSums, n };
}

/**
 * Expected counts under independence: rowSum_i columnSum_j / n. An empty row or column has
 * expected counts of 0; a table with n = 0 has all zeros.
 * Cost: O(r c). Throws nothing.
 *
 * @example expectedCounts([[30, 10], [15, 45]]) // [[18, 22], [27, 33]]
 */
export function expectedCounts(table: Table): number[][] {
  const { rowSums, columnSums, n } = margins(table);
  return rowSums.map((rs) => columnSums.map((cs) => (n > 0 ? (rs * cs) / n : 0)));
}

/** Cell, row and column percentages (0 to 100) of a table. */
export interface TablePercents {
  cell: number[][];
  row: number[][];
  column: number[][];
}

/**
 * Percentages of a counts table: of the total (cell), of each row's total (row) and of each
 * column's total (column), 0 to 100. A row or column whose total is 0 gets 0 throughout rather
 * than NaN, so it can be displayed.
 * Cost: O(r c). Throws nothing.
 *
 * @example tablePercents([[1, 3]]).row // [[25, 75]]
 */
export function tablePercents(table: Table): TablePercents {
  const { rowSums, columnSums, n } = margins(table);
  const pct = (v: number, total: number): number => (total > 0 ? (100 * v) / total : 0);
  return {
    cell: table.map((row) => row.map((v) => pct(v, n))),
    row: table.map((row, i) => row.map((v) => pct(v, rowSums[i]))),
    column: table.map((row) => row.map((v, j) => pct(v, columnSums[j]))),
  };
}
