/**
 * What the report derives from the retained columns of the check pass: whisker ends, the
 * points beyond the fences, scatter points, per-group values. All of it reads typed arrays
 * once; none of it re-reads the delivery.
 */
import type { ColumnStore } from '@codeweir/check';
import type { Fences } from '@codeweir/describe';
import type { Box, BoxPoint } from './charts.ts';

/** Sorted valid values of a numeric column, or undefined when the column is not retained. */
export function sortedValues(store: ColumnStore | undefined, item: string): Float64Array | undefined {
  const col = store?.columns[item];
  if (!col || col.kind !== 'numeric') return undefined;
  return validSorted(col.values);
}

function validSorted(values: ArrayLike<number>): Float64Array {
  let n = 0;
  for (let i = 0; i < values.length; i++) if (!Number.isNaN(values[i]!)) n++;
  const out = new Float64Array(n);
  let k = 0;
  for (let i = 0; i < values.length; i++) if (!Number.isNaN(values[i]!)) out[k++] = values[i]!;
  return out.sort();
}

/** Most points beyond the fences drawn per side of one box; the most extreme are always kept. */
export const MAX_BOX_POINTS = 60;

/**
 * A box from the describe statistics and, when the sorted values are known, whiskers at the
 * most extreme values inside the inner fences and one mark per distinct value beyond them
 * (outliers past the inner fences, extremes past the outer ones: Tukey fences as describe
 * computed them). Without values the whiskers are drawn to the fences themselves, or to the
 * minimum/maximum when no value lies beyond them; `exact` says which.
 * Cost: O(n) over the sorted values. Throws nothing.
 */
export function boxFromValues(
  key: string,
  stats: { q1: number; median: number; q3: number; min?: number; max?: number; fences?: Fences | null; outliers?: number },
  sorted: Float64Array | undefined,
): { box: Box; points: BoxPoint[]; exact: boolean } {
  const f = stats.fences;
  if (!sorted || sorted.length === 0 || !f) {
    const low = f && (stats.min === undefined || stats.min < f.lower) ? f.lower : (stats.min ?? stats.q1);
    const high = f && (stats.max === undefined || stats.max > f.upper) ? f.upper : (stats.max ?? stats.q3);
    const exact = !f || ((stats.outliers ?? 1) === 0 && stats.min !== undefined && stats.max !== undefined);
    return { box: { key, low, q1: stats.q1, median: stats.median, q3: stats.q3, high }, points: [], exact };
  }
  let lo = 0;
  while (lo < sorted.length && sorted[lo]! < f.lower) lo++;
  let hi = sorted.length - 1;
  while (hi >= 0 && sorted[hi]! > f.upper) hi--;
  const low = lo <= hi ? sorted[lo]! : stats.q1;
  const high = lo <= hi ? sorted[hi]! : stats.q3;
  const below = distinct(sorted.subarray(0, lo));
  const above = distinct(sorted.subarray(hi + 1));
  const kind = (v: number): BoxPoint['kind'] => (v < f.lowerExtreme || v > f.upperExtreme ? 'extreme' : 'outlier');
  const points = [...capped(below, 'low'), ...capped(above, 'high')].map((value) => ({ key, value, kind: kind(value) }));
  return { box: { key, low, q1: stats.q1, median: stats.median, q3: stats.q3, high }, points, exact: true };
}

function distinct(sorted: Float64Array): number[] {
  const out: number[] = [];
  for (const v of sorted) if (out.length === 0 || out[out.length - 1] !== v) out.push(v);
  return out;
}

/** Keeps the values farthest from the box when there are too many to draw. */
function capped(values: number[], side: 'low' | 'high'): number[] {
  if (values.length <= MAX_BOX_POINTS) return values;
  return side === 'low' ? values.slice(0, MAX_BOX_POINTS) : values.slice(-MAX_BOX_POINTS);
}

/** Most points drawn in a scatter plot; a larger sample is thinned by an even stride. */
export const MAX_SCATTER_POINTS = 800;

/**
 * Pairwise complete (x, y) points of two numeric columns, thinned to at most `cap` by taking
 * every k-th complete row (deterministic, so the same delivery draws the same picture).
 * Cost: O(rows). Throws nothing.
 */
export function pairPoints(store: ColumnStore | undefined, x: string, y: string, cap = MAX_SCATTER_POINTS): Array<[number, number]> | undefined {
  const cx = store?.columns[x];
  const cy = store?.columns[y];
  if (!cx || !cy || cx.kind !== 'numeric' || cy.kind !== 'numeric') return undefined;
  const all: Array<[number, number]> = [];
  for (let i = 0; i < cx.values.length; i++) {
    const a = cx.values[i]!;
    const b = cy.values[i]!;
    if (!Number.isNaN(a) && !Number.isNaN(b)) all.push([a, b]);
  }
  return thin(all, cap);
}

/** Every k-th element so that at most `cap` remain (all when there are fewer). */
export function thin<T>(values: readonly T[], cap = MAX_SCATTER_POINTS): T[] {
  if (values.length <= cap) return [...values];
  const step = values.length / cap;
  return Array.from({ length: cap }, (_, i) => values[Math.floor(i * step)]!);
}

/** The (x, y) values at 1-based data rows, for marking flagged rows. */
export function pointsAtRows(store: ColumnStore | undefined, x: string, y: string, rows: readonly number[]): Array<[number, number]> {
  const cx = store?.columns[x];
  const cy = store?.columns[y];
  if (!cx || !cy || cx.kind !== 'numeric' || cy.kind !== 'numeric') return [];
  return rows.map((r) => [cx.values[r - 1]!, cy.values[r - 1]!] as [number, number]).filter(([a, b]) => !Number.isNaN(a) && !Number.isNaN(b));
}

/**
 * Sorted valid values of a numeric column for each code of a coded column (by code index),
 * over rows where both are valid.
 * Cost: O(rows) plus sorting. Throws nothing.
 */
export function valuesByCode(store: ColumnStore | undefined, coded: string, numeric: string): Map<number, Float64Array> | undefined {
  const cc = store?.columns[coded];
  const cn = store?.columns[numeric];
  if (!cc || !cn || cc.kind !== 'coded' || cn.kind !== 'numeric') return undefined;
  const buckets = new Map<number, number[]>();
  for (let i = 0; i < cc.codes.length; i++) {
    const c = cc.codes[i]!;
    const v = cn.values[i]!;
    if (c === 0 || Number.isNaN(v)) continue;
    let b = buckets.get(c - 1);
    if (!b) buckets.set(c - 1, (b = []));
    b.push(v);
  }
  return new Map([...buckets].map(([k, v]) => [k, Float64Array.from(v).sort()]));
}
