/**
 * What the report derives from the retained columns of the check pass: whisker ends, the
 * points beyond the fences, scatter points, per-group values. All of it reads typed arrays
 * once; none of it re-reads the delivery.
 */
import type { ColumnStore } from '@codeweir/check';
import type { Fences } from '@codeweir/describe';
import type { Box, BoxPoint } from './charts.ts';

/**
 * The values of a numeric column in row order (NaN for invalid cells), or undefined when the
 * column is not retained. The store's own array: read it, do not change it.
 */
export function columnValues(store: ColumnStore | undefined, item: string): Float64Array | undefined {
  const col = store?.columns[item];
  if (!col || col.kind !== 'numeric') return undefined;
  return col.values;
}

/** Most points beyond the fences drawn per side of one box; the most extreme are always kept. */
export const MAX_BOX_POINTS = 60;

/**
 * A box from the describe statistics and, when the values are known, whiskers at the most
 * extreme values inside the inner fences and one mark per distinct value beyond them
 * (outliers past the inner fences, extremes past the outer ones: Tukey fences as describe
 * computed them). The values may come in any order, NaN (an invalid cell) skipped, and give
 * what the sorted valid values would: of tied -0 and +0, the low whisker takes -0 and the high
 * one +0, as in ascending order with -0 first. Without values the whiskers are drawn to the
 * fences themselves, or to the minimum/maximum when no value lies beyond them; `exact` says
 * which.
 * Cost: O(n) plus a sort of the values beyond the fences, no copy of the rest. Throws nothing.
 */
export function boxFromValues(
  key: string,
  stats: { q1: number; median: number; q3: number; min?: number; max?: number; fences?: Fences | null; outliers?: number },
  values: Float64Array | undefined,
): { box: Box; points: BoxPoint[]; exact: boolean } {
  const f = stats.fences;
  const beyond = values && f ? splitAtFences(values, f.lower, f.upper) : undefined;
  if (!beyond || beyond.valid === 0 || !f) {
    const low = f && (stats.min === undefined || stats.min < f.lower) ? f.lower : (stats.min ?? stats.q1);
    const high = f && (stats.max === undefined || stats.max > f.upper) ? f.upper : (stats.max ?? stats.q3);
    const exact = !f || ((stats.outliers ?? 1) === 0 && stats.min !== undefined && stats.max !== undefined);
    return { box: { key, low, q1: stats.q1, median: stats.median, q3: stats.q3, high }, points: [], exact };
  }
  // In ascending order the values below the lower fence are a prefix and those above the upper
  // one a suffix; some value lies between (at or inside both fences) unless the two cover all.
  const between = beyond.below.length + beyond.above.length < beyond.valid;
  const low = between ? beyond.lowest : stats.q1;
  const high = between ? beyond.highest : stats.q3;
  const below = distinct(beyond.below.sort());
  const above = distinct(beyond.above.sort());
  const kind = (v: number): BoxPoint['kind'] => (v < f.lowerExtreme || v > f.upperExtreme ? 'extreme' : 'outlier');
  const points = [...capped(below, 'low'), ...capped(above, 'high')].map((value) => ({ key, value, kind: kind(value) }));
  return { box: { key, low, q1: stats.q1, median: stats.median, q3: stats.q3, high }, points, exact: true };
}

/**
 * One pass over `values`: how many are valid (not NaN), those below `lower` and those above
 * `upper` (unsorted), the smallest value not below `lower` (-0 preferred to +0) and the largest
 * not above `upper` (+0 preferred to -0); lowest/highest are NaN when there is none.
 */
function splitAtFences(values: Float64Array, lower: number, upper: number): { valid: number; below: Float64Array; above: Float64Array; lowest: number; highest: number } {
  const below: number[] = [];
  const above: number[] = [];
  let valid = 0;
  let lowest = Number.NaN;
  let highest = Number.NaN;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (Number.isNaN(v)) continue;
    valid++;
    if (v < lower) below.push(v);
    else if (!(v >= lowest) || (v === lowest && Object.is(v, -0))) lowest = v;
    if (v > upper) above.push(v);
    else if (!(v <= highest) || (v === highest && Object.is(highest, -0))) highest = v;
  }
  return { valid, below: Float64Array.from(below), above: Float64Array.from(above), lowest, highest };
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
 * Valid values of a numeric column for each code of a coded column (by code index), in row
 * order, over rows where both are valid.
 * Cost: O(rows). Throws nothing.
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
  return new Map([...buckets].map(([k, v]) => [k, Float64Array.from(v)]));
}
