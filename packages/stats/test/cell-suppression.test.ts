import { describe, it, expect } from 'vitest';
import { seededRandom } from '@codeweir/core';
import { eliminated, feasibleBounds, type Equation } from './lp-attacker.ts';
import { suppressCells, tableTotals, type MarginShown, type Suppression, type SuppressionMargins } from '../src/cell-suppression.ts';

// The attacker (lp-attacker.ts): HiGHS, a linear programming solver from outside the project,
// bounds every suppressed cell by the linear constraints the shown table gives (cells >= 0,
// every row and column adding up to its total, the totals to the grand total), and a plain
// elimination fills any row or column with a single unknown, again and again.

type Known = Array<Array<number | null>>;

/** The extended table as the reader sees it: inner cells, row totals (last column), column totals (last row), grand total; null where suppressed or hidden. */
function shownTable(table: number[][], s: Suppression): Known {
  const t = tableTotals(table);
  const rows: Known = table.map((row, i) => [...row.map((v, j) => (s.cells[i]![j] ? null : v)), s.rowTotals[i] ? null : t.rows[i]!]);
  rows.push([...t.columns.map((v, j) => (s.columnTotals[j] ? null : v)), s.grandTotal ? null : t.grand]);
  return rows;
}

/** Rows and columns of the extended table sum to 0 with margins negated (cells - total = 0), as equations over the unknown cells "i,j". */
function equations(k: Known): Equation[] {
  const m = k.length - 1;
  const n = k[0]!.length - 1;
  const lines: Array<Array<[number, number]>> = [];
  for (let i = 0; i <= m; i++) lines.push(Array.from({ length: n + 1 }, (_, j) => [i, j] as [number, number]));
  for (let j = 0; j <= n; j++) lines.push(Array.from({ length: m + 1 }, (_, i) => [i, j] as [number, number]));
  const sign = (i: number, j: number): number => ((i < m) === (j < n) ? 1 : -1);
  return lines
    .map((line) => ({
      terms: line.filter(([i, j]) => k[i]![j] === null).map(([i, j]): [string, number] => [`${i},${j}`, sign(i, j)]),
      rhs: -line.reduce((s, [i, j]) => (k[i]![j] === null ? s : s + sign(i, j) * k[i]![j]!), 0),
    }))
    .filter((e) => e.terms.length > 0);
}

function randomTable(rand: () => number, m: number, n: number): number[][] {
  // Mixed counts: zeros, small counts and large ones, as in a missingness table by team.
  return Array.from({ length: m }, () =>
    Array.from({ length: n }, () => {
      const u = rand();
      return u < 0.2 ? 0 : u < 0.5 ? 1 + Math.floor(rand() * 4) : 5 + Math.floor(rand() * 200);
    }),
  );
}

function audit(table: number[][], k: number, margins: SuppressionMargins = {}): Suppression {
  const s = suppressCells(table, k, margins);
  const shown = shownTable(table, s);
  const t = tableTotals(table);
  // No count from 1 to k - 1 is shown, margins included (unless published elsewhere).
  shown.forEach((row, i) =>
    row.forEach((v, j) => {
      const rowFixed = (r: number): boolean => (Array.isArray(margins.rows) ? margins.rows[r] === 'fixed' : margins.rows === 'fixed');
      const fixed = (i < table.length && j === row.length - 1 && rowFixed(i)) || (i === table.length && margins.columns === 'fixed');
      if (v !== null && !fixed) expect(v === 0 || v >= k, `cell ${i},${j} = ${v}`).toBe(true);
    }),
  );
  // Margins the table never shows may well follow from it; only cells it suppressed must not.
  const m = table.length;
  const n = table[0]!.length;
  const hidden = (i: number, j: number): boolean =>
    (i < m && j === n && margins.rows === 'hidden') || (i === m && j < n && margins.columns === 'hidden') || (i === m && j === n && (margins.grand ?? (margins.rows === 'hidden' && margins.columns === 'hidden' ? 'hidden' : '')) === 'hidden');
  const eqs = equations(shown);
  expect([...eliminated(eqs)].filter((key) => !hidden(...(key.split(',').map(Number) as [number, number])))).toEqual([]);
  for (const [key, [lo, hi]] of feasibleBounds(eqs)) {
    const [i, j] = key.split(',').map(Number) as [number, number];
    if (hidden(i, j)) continue;
    const truth = i < table.length && j < table[0]!.length ? table[i]![j]! : i < table.length ? t.rows[i]! : j < table[0]!.length ? t.columns[j]! : t.grand;
    expect(lo).toBeLessThanOrEqual(truth + 1e-7);
    expect(hi).toBeGreaterThanOrEqual(truth - 1e-7);
    // Not recoverable: the constraints leave the cell a range, not a point.
    expect(hi - lo, `cell ${key} bounded to [${lo}, ${hi}]`).toBeGreaterThanOrEqual(1);
  }
  return s;
}

describe('cell suppression', () => {
  it('a worked 3 x 3 example: one small cell needs three complements (first principles)', () => {
    // 2 is below 5; its row and column each need a second suppressed cell, and those a fourth.
    const s = audit([[2, 10, 30], [8, 40, 50], [20, 60, 70]], 5);
    expect(s.cells[0]![0]).toBe(1);
    expect(s.primary).toBe(1);
    expect(s.complementary).toBe(3);
    // The cheapest complements: 8 and 10, then 40 where they cross.
    expect(s.cells).toEqual([[1, 2, 0], [2, 2, 0], [0, 0, 0]]);
  });

  it('random tables with shown margins: nothing below k shown, nothing recoverable', () => {
    const rand = seededRandom(18);
    for (let t = 0; t < 25; t++) audit(randomTable(rand, 2 + Math.floor(rand() * 5), 2 + Math.floor(rand() * 6)), 5);
  });

  it('missingness-like tables: row totals published elsewhere, column totals shown', () => {
    const rand = seededRandom(1818);
    for (let t = 0; t < 15; t++) {
      const table = randomTable(rand, 3 + Math.floor(rand() * 6), 3 + Math.floor(rand() * 4));
      const s = audit(table, 5, { rows: 'fixed' });
      expect(s.rowTotals.every((x) => x === 0)).toBe(true);
    }
  });

  it('a frequency table (one row, total shown, no column totals): the smallest other count is the complement', () => {
    const s = audit([[3, 40, 12, 0]], 5, { columns: 'hidden' });
    expect(s.cells[0]).toEqual([1, 0, 2, 0]);
  });

  it('a table that cannot be protected says so and suppresses every nonzero cell', () => {
    // One nonzero cell, its row total published elsewhere: the total gives it away.
    const s = suppressCells([[3, 0]], 5, { rows: 'fixed', columns: 'hidden' });
    expect(s.protected).toBe(false);
    expect(s.cells[0]).toEqual([1, 0]);
  });

  it('k of 1 suppresses nothing; a table without small counts is left alone', () => {
    expect(suppressCells([[1, 2]], 1).primary).toBe(0);
    const s = suppressCells([[5, 6], [7, 0]], 5);
    expect(s.primary + s.complementary).toBe(0);
  });
});

describe('cell suppression with cells suppressed elsewhere and margins set one by one', () => {
  it('protects a preset cell as it protects a small one', () => {
    // 40 is suppressed by another table sharing it; here it must not follow from its row and column.
    const table = [[40, 10, 30], [8, 40, 50], [20, 60, 70]];
    const s = suppressCells(table, 5, {}, { cells: [[true, false, false], [false, false, false], [false, false, false]] });
    expect(s.cells[0]![0]).toBe(2);
    expect(s.primary).toBe(0);
    // The preset cell and the three that protect it.
    expect(s.complementary).toBe(4);
  });
  it('per-row margins: a fixed row total is never suppressed, a shown one may be', () => {
    const rand = seededRandom(77);
    for (let t = 0; t < 10; t++) {
      const table = randomTable(rand, 4, 4);
      const rows = table.map((_, i): MarginShown => (i % 2 === 0 ? 'fixed' : 'shown'));
      const s = audit(table, 5, { rows });
      rows.forEach((how, i) => how === 'fixed' && expect(s.rowTotals[i]).toBe(0));
    }
  });
});
