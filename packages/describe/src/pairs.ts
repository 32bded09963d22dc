/**
 * Bivariate summaries chosen by the two items' levels of measurement: a contingency table for
 * two categorical items, correlations for two continuous ones, and per-group summaries of a
 * continuous item by a categorical one. Each pair is a few linear scans over two typed columns of
 * the check pass's store into reused buffers; no per-row objects are made. A plan (planPairs)
 * holds what the pairs read, so that threads can share them out (see pairs-parallel.ts).
 */
import { CodeweirError } from '@codeweir/core';
import type { CompiledCodebook, CompiledItem } from '@codeweir/codebook';
import type { CheckResult, ItemColumn } from '@codeweir/check';
import {
  Moments,
  bivariateOutliers,
  coMoments,
  cramersV,
  crossTabulate,
  etaSquared,
  goodmanKruskalGamma,
  mahalanobisCutoff,
  pearsonChiSquare,
  pearsonFromMoments,
  phi,
  quantileSorted,
  sortColumn,
  spearmanFromTable,
  tablePercents,
  tukeyFences,
  type QuantileType,
} from '@codeweir/stats';
import { ranksAmong, type OrderedColumn } from './pairs-kernels.ts';
import type { GroupSummary, OrdinalPosition, PairCategorical, PairContinuous, PairDescription, PairMixed } from './types.ts';

export interface PairOptions {
  /** Hyndman-Fan type of the group medians and quartiles. */
  quantileType: QuantileType;
  /** Pairs to describe as [x, y] item names, or 'all'; none when absent. */
  pairs?: Array<[string, string]> | 'all';
  /** Use only rows valid on every item of the requested pairs (default: pairwise complete). */
  listwise?: boolean;
}

/** |Pearson - Spearman| above which a pair gets a note (a rule of thumb, common practice). */
export const CORRELATION_GAP = 0.1;
/** Most points in a scatter-plot sample. */
export const SCATTER_SAMPLE_MAX = 2000;
/** Share (percent) of expected counts below 5 above which the chi-square test is flagged (Cochran's rule, common practice). */
export const LOW_EXPECTED_LIMIT = 20;
/** Probability of the chi-square(2) quantile that flags bivariate outliers. */
export const MAHALANOBIS_PROBABILITY = 0.999;

type Side = { item: CompiledItem; column: ItemColumn };
type Coded = { item: CompiledItem; codes: Uint16Array };
type Numeric = { item: CompiledItem; column: OrderedColumn };

/** One column as a planned pair job holds it: a coded item's codes, or a continuous item's values with their sort order. */
export type PairColumn = { kind: 'coded'; codes: Uint16Array } | ({ kind: 'numeric' } & OrderedColumn);

/**
 * Everything the requested pairs read, by item name, with no reference to the check result: a
 * thread that holds the plan (its typed arrays may live in SharedArrayBuffers) and the compiled
 * codebook can describe any pair of it.
 */
export interface PairPlan {
  rows: number;
  /** The requested pairs as [x, y] item names, in output order. */
  pairs: Array<[string, string]>;
  columns: Record<string, PairColumn>;
  /** 1 where a row counts (listwise), absent for pairwise complete. */
  include?: Uint8Array;
  quantileType: QuantileType;
}

/**
 * Reusable row-length buffers of one thread: a pair's ranks, its complete values copied out
 * and its groups go here instead of arrays of their own. Made on first use, 39 bytes per row.
 */
export class PairScratch {
  private made?: { complete: Uint8Array; rowOf: Uint32Array; groupAt: Uint16Array; f64: Float64Array[] };
  constructor(readonly rows: number) {}
  get buffers() {
    const rows = this.rows;
    this.made ??= { complete: new Uint8Array(rows), rowOf: new Uint32Array(rows), groupAt: new Uint16Array(rows), f64: Array.from({ length: 4 }, () => new Float64Array(rows)) };
    return this.made;
  }
}

/** How a plan's arrays are made: in SharedArrayBuffers for worker threads, and which continuous values are already shared. */
export interface PlanMemory {
  shared?: boolean;
  /** Values to use instead of the store's (the same numbers, e.g. an existing shared copy). */
  values?: (name: string) => Float64Array | undefined;
}

const CATEGORICAL_CONVENTIONS: Record<string, string> = {
  chiSquare: 'Pearson chi-square without continuity correction; codes with no valid pair are dropped from the test (df over occupied rows and columns) and kept in the table',
  cramersV: "Cramer's V = sqrt(chi-square / (n (min(r, c) - 1))) over the occupied rows and columns, no bias correction",
  phi: 'signed phi (ad - bc) / sqrt(product of margins), only when the occupied table is 2 x 2',
  lowExpected: 'warning when more than 20% of expected counts are below 5 (Cochran, common practice)',
};
const ORDINAL_CONVENTIONS: Record<string, string> = {
  spearman: "Spearman's rho from the table, ties averaged (every category is one tie)",
  gamma: 'Goodman-Kruskal gamma, pairs tied on either item left out',
};
const CONTINUOUS_CONVENTIONS: Record<string, string> = {
  pearson: "Pearson's r from two-pass centred co-moments",
  spearman: "Spearman's rho: Pearson's r of ranks, ties averaged",
  mahalanobis: 'squared Mahalanobis distance with the sample covariance (n - 1); outliers beyond the chi-square(2) 0.999 quantile',
  correlationGap: 'note when |r - rho| > 0.1 (a rule of thumb, common practice)',
  sample: `scatter sample of at most ${SCATTER_SAMPLE_MAX} points, evenly strided in row order, bivariate outliers always included`,
};

/**
 * Describes pairs of items by their levels: categorical x categorical (nominal, ordinal and
 * binned items, group items included), continuous x continuous (interval and ratio), and
 * categorical x continuous in either order (normalised so `x` is the categorical item, with
 * `swapped: true` when the request named the continuous item first).
 *
 * Conventions: every pair's n counts rows where both cells are valid (pairwise complete); with
 * `listwise` only rows valid on every item of the requested pairs count, and each pair says
 * `listwise: true`. Categorical tables follow code order (the scale order of ordinal items),
 * with Pearson chi-square without continuity correction, empty rows and columns dropped from
 * the test and kept in the table, Cramer's V, signed phi for 2 x 2, and for ordinal x ordinal
 * Spearman's rho (ties averaged) and Goodman-Kruskal gamma. Continuous pairs give Pearson's r,
 * Spearman's rho, squared Mahalanobis distances (sample covariance, n - 1) beyond the
 * chi-square(2) 0.999 point as 1-based data rows, a note when |r - rho| > 0.1 (common
 * practice) and a scatter sample. Group summaries use `quantileType` for medians and
 * quartiles, sd with n - 1, Tukey fences at 1.5 and 3 IQR (an outlier lies beyond the inner
 * fences but not the outer ones, an extreme beyond the outer ones) and eta squared.
 * `pairs: 'all'` takes every pair of describable items (items with a level and retained
 * values, roles item and group; id, weight and free-text items are left out) in codebook order.
 *
 * Cost: one O(n) radix sort of each continuous item in a pair (see planPairs), then per pair
 * a few linear scans of two typed columns (ranks and group quartiles walk the sorted order),
 * into row-length buffers made once, not per pair; 'all' over k items is k (k - 1) / 2 pairs.
 * Throws CodeweirError CW_USAGE (exit code 2) when a requested pair names an unknown item, an
 * item that cannot be paired (id, weight, free text, no retained values) or the same item twice.
 *
 * @example describePairs(result, codebook, { quantileType: 7, pairs: [['district', 'age']] })
 */
export function describePairs(result: CheckResult, codebook: CompiledCodebook, options: PairOptions): PairDescription[] {
  const plan = planPairs(result, codebook, options);
  const scratch = new PairScratch(plan.rows);
  return plan.pairs.map((_, k) => describePlannedPair(plan, k, codebook, scratch));
}

/**
 * The requested pairs by name, checked: what {@link describePairs} describes, in its order.
 * Cost: O(items^2) for 'all'. Throws as describePairs does (CW_USAGE), before any work on the data.
 */
export function requestedPairs(result: CheckResult, codebook: CompiledCodebook, options: PairOptions): Array<[string, string]> {
  return resolvePairs(result, codebook, options.pairs ?? []).map(([x, y]) => [x.item.name, y.item.name]);
}

/**
 * The data the requested pairs read: the coded columns, each continuous column with its sort
 * order (sorted once, however many pairs it is in; ranks and group quartiles then walk that
 * order), and the listwise mask. With `memory.shared` every array is in a SharedArrayBuffer.
 * Cost: one O(n) radix sort per continuous item in a pair, and 5 bytes per row per such item
 * kept (the order and the tie-run starts); the listwise mask is one scan per requested item.
 * Throws as describePairs does.
 */
export function planPairs(result: CheckResult, codebook: CompiledCodebook, options: PairOptions, memory: PlanMemory = {}): PairPlan {
  const requested = resolvePairs(result, codebook, options.pairs ?? []);
  const rows = result.store.rows;
  const alloc = <T extends Uint8Array | Uint16Array | Uint32Array | Float64Array>(make: new (b: ArrayBufferLike) => T, bytes: number): T =>
    new make(memory.shared ? new SharedArrayBuffer(bytes) : new ArrayBuffer(bytes));
  const columns: Record<string, PairColumn> = {};
  for (const { item, column } of requested.flat()) {
    if (columns[item.name] !== undefined) continue;
    if (column.kind === 'coded') {
      let codes = column.codes;
      if (memory.shared && !(codes.buffer instanceof SharedArrayBuffer)) {
        codes = alloc(Uint16Array, codes.byteLength);
        codes.set(column.codes);
      }
      columns[item.name] = { kind: 'coded', codes };
    } else if (column.kind === 'numeric') {
      const values = memory.values?.(item.name) ?? column.values;
      const { order, sorted } = sortColumn(values);
      const m = order.length;
      const keptOrder = memory.shared ? alloc(Uint32Array, order.byteLength) : order;
      if (keptOrder !== order) keptOrder.set(order);
      // A tie run starts where the sorted value changes (equality by ===, so -0 equals 0).
      const runStarts = alloc(Uint8Array, m);
      for (let k = 0; k < m; k++) runStarts[k] = k === 0 || sorted[k] !== sorted[k - 1] ? 1 : 0;
      let shared = values;
      if (memory.shared && !(values.buffer instanceof SharedArrayBuffer)) {
        shared = alloc(Float64Array, values.byteLength);
        shared.set(values);
      }
      columns[item.name] = { kind: 'numeric', values: shared, order: keptOrder, runStarts };
    }
  }
  let include: Uint8Array | undefined;
  if (options.listwise) {
    include = alloc(Uint8Array, rows);
    include.set(listwiseMask(rows, requested));
  }
  return { rows, pairs: requested.map(([x, y]) => [x.item.name, y.item.name]), columns, include, quantileType: options.quantileType };
}

/**
 * Describes pair `k` of a plan, as describePairs does, with the thread's scratch buffers.
 * Cost: O(n) for the pair. Throws nothing for a plan made by planPairs.
 */
export function describePlannedPair(plan: PairPlan, k: number, codebook: CompiledCodebook, scratch: PairScratch): PairDescription {
  const [xName, yName] = plan.pairs[k]!;
  const x = { item: codebook.byName.get(xName)!, column: plan.columns[xName]! };
  const y = { item: codebook.byName.get(yName)!, column: plan.columns[yName]! };
  const include = plan.include;
  let described: PairDescription;
  if (x.column.kind === 'coded' && y.column.kind === 'coded') {
    described = describeCategorical({ item: x.item, codes: x.column.codes }, { item: y.item, codes: y.column.codes }, include);
  } else if (x.column.kind === 'numeric' && y.column.kind === 'numeric') {
    described = describeContinuous({ item: x.item, column: x.column }, { item: y.item, column: y.column }, include, scratch);
  } else {
    const swapped = x.column.kind === 'numeric';
    const [c, v] = swapped ? [y, x] : [x, y];
    const mixed = describeMixed(
      { item: c.item, codes: (c.column as { codes: Uint16Array }).codes },
      { item: v.item, column: v.column as OrderedColumn },
      plan.quantileType,
      include,
      scratch,
    );
    if (swapped) mixed.swapped = true;
    described = mixed;
  }
  if (include !== undefined) described.listwise = true;
  return described;
}

/** Looks up and checks the requested pairs; 'all' expands to every describable pair in codebook order. */
function resolvePairs(result: CheckResult, codebook: CompiledCodebook, pairs: Array<[string, string]> | 'all'): Array<[Side, Side]> {
  if (pairs === 'all') {
    const sides = codebook.items.map((item) => describable(result, item)).filter((s): s is Side => s !== undefined);
    const out: Array<[Side, Side]> = [];
    for (let i = 0; i < sides.length; i++) for (let j = i + 1; j < sides.length; j++) out.push([sides[i], sides[j]]);
    return out;
  }
  const seen = new Set<string>();
  const out: Array<[Side, Side]> = [];
  for (const [a, b] of pairs) {
    if (a === b) throw new CodeweirError('CW_USAGE', `--pair ${a}:${b} names the same item twice; give two different items.`);
    // One pair per unordered couple: a:b and b:a describe the same relation.
    const key = a < b ? `${a}\u0000${b}` : `${b}\u0000${a}`;
    if (seen.has(key)) continue;
    seen.add(key);
    out.push([requireSide(result, codebook, a, `${a}:${b}`), requireSide(result, codebook, b, `${a}:${b}`)]);
  }
  return out;
}

function requireSide(result: CheckResult, codebook: CompiledCodebook, name: string, pair: string): Side {
  const item = codebook.byName.get(name);
  if (item === undefined) {
    throw new CodeweirError('CW_USAGE', `--pair ${pair} names "${name}", which is not an item of the codebook.`);
  }
  const side = describable(result, item);
  if (side === undefined) {
    const why =
      item.role === 'id' || item.role === 'weight'
        ? `it is the ${item.role} item`
        : item.level === undefined
          ? 'it has no level of measurement'
          : 'no values of it were retained';
    throw new CodeweirError('CW_USAGE', `--pair ${pair} cannot use "${name}": ${why}; pair items with a level (nominal, ordinal, interval or ratio).`);
  }
  return side;
}

/** The item's column when the item can take part in a pair: a level, a role other than id and weight, and a column of the kind its level needs. */
function describable(result: CheckResult, item: CompiledItem): Side | undefined {
  if (item.role === 'id' || item.role === 'weight' || item.level === undefined) return undefined;
  const column = result.store.columns[item.name];
  if (column === undefined) return undefined;
  const categorical = item.level === 'nominal' || item.level === 'ordinal';
  if (categorical !== (column.kind === 'coded')) return undefined;
  return { item, column };
}

/** 1 where a row is valid on every item of the requested pairs, 0 elsewhere. */
function listwiseMask(rows: number, pairs: Array<[Side, Side]>): Uint8Array {
  const mask = new Uint8Array(rows).fill(1);
  const done = new Set<string>();
  for (const side of pairs.flat()) {
    if (done.has(side.item.name)) continue;
    done.add(side.item.name);
    const column = side.column;
    if (column.kind === 'coded') {
      const codes = column.codes;
      for (let r = 0; r < rows; r++) if (codes[r] === 0) mask[r] = 0;
    } else {
      const values = column.values;
      for (let r = 0; r < rows; r++) if (Number.isNaN(values[r])) mask[r] = 0;
    }
  }
  return mask;
}

function positions(item: CompiledItem): OrdinalPosition[] {
  return item.codes.map((c) => ({ code: c.code, label: c.label }));
}

function percentText(v: number): string {
  return `${Math.round(v * 10) / 10}%`;
}

function describeCategorical(x: Coded, y: Coded, include: Uint8Array | undefined): PairCategorical {
  const table = crossTabulate(x.codes, y.codes, x.item.codes.length, y.item.codes.length, include);
  const test = pearsonChiSquare(table);
  const percents = tablePercents(table);
  const tested = test.testedRows.map((i) => test.testedColumns.map((j) => table[i][j]));
  const warnings: string[] = [];
  if (test.n === 0) warnings.push(`No row has valid values on both ${x.item.name} and ${y.item.name}.`);
  else {
    warnings.push(...emptyCodeWarnings(x.item, test.testedRows), ...emptyCodeWarnings(y.item, test.testedColumns));
    if (test.statistic === null) {
      warnings.push(`Fewer than two codes of ${test.testedRows.length < 2 ? x.item.name : y.item.name} occur among the pairs, so there is no chi-square test.`);
    } else {
      if (test.lowExpectedPercent > LOW_EXPECTED_LIMIT) {
        warnings.push(
          `${percentText(test.lowExpectedPercent)} of expected counts are below 5 (more than ${LOW_EXPECTED_LIMIT}%, common practice): the chi-square p-value may be unreliable; consider merging sparse codes.`,
        );
      }
      if (test.expectedBelowOne > 0) {
        warnings.push(`${test.expectedBelowOne} expected count${test.expectedBelowOne === 1 ? ' is' : 's are'} below 1 (common practice: none should be): treat the chi-square p-value with caution.`);
      }
    }
  }
  const pair: PairCategorical = {
    x: x.item.name,
    y: y.item.name,
    kind: 'categorical-categorical',
    n: test.n,
    rows: positions(x.item),
    columns: positions(y.item),
    table,
    expected: test.expected,
    rowPercent: percents.row,
    columnPercent: percents.column,
    cellPercent: percents.cell,
    chiSquare: test.statistic,
    df: test.df,
    p: test.p,
    cramersV: cramersV(test.statistic, test.n, test.testedRows.length, test.testedColumns.length),
    phi: phi(tested),
    lowExpectedPercent: test.lowExpectedPercent,
    warnings,
    conventions: { ...CATEGORICAL_CONVENTIONS },
  };
  if (x.item.level === 'ordinal' && y.item.level === 'ordinal') {
    pair.spearman = spearmanFromTable(table);
    pair.gamma = goodmanKruskalGamma(table);
    Object.assign(pair.conventions!, ORDINAL_CONVENTIONS);
  }
  return pair;
}

/** One warning naming the codes of an item that no valid pair holds (left out of the test). */
function emptyCodeWarnings(item: CompiledItem, used: number[]): string[] {
  if (used.length === item.codes.length) return [];
  const usedSet = new Set(used);
  const empty = item.codes.filter((c) => !usedSet.has(c.index)).map((c) => `${c.code} "${c.label}"`);
  return [`Codes of ${item.name} with no valid pair (${empty.join(', ')}) are left out of the chi-square test and kept in the table.`];
}

function describeContinuous(x: Numeric, y: Numeric, include: Uint8Array | undefined, scratch: PairScratch): PairContinuous {
  const xv = x.column.values;
  const yv = y.column.values;
  const rows = xv.length;
  const { complete, rowOf, f64 } = scratch.buffers;
  const [xRanks, yRanks, xAll, yAll] = f64 as [Float64Array, Float64Array, Float64Array, Float64Array];
  // The complete pairs, in row order: rowOf[k] is the row of the k-th one, xAll[k] and yAll[k] its values.
  let n = 0;
  for (let r = 0; r < rows; r++) {
    const a = xv[r];
    const b = yv[r];
    if (!Number.isNaN(a) && !Number.isNaN(b) && (include === undefined || include[r] === 1)) {
      complete[r] = 1;
      xAll[n] = a;
      yAll[n] = b;
      rowOf[n++] = r;
    } else complete[r] = 0;
  }
  // Ranks among the complete pairs only, from each column's order: Spearman's rho is Pearson's
  // r of these ranks (ties averaged).
  ranksAmong(x.column, complete, xRanks);
  ranksAmong(y.column, complete, yRanks);
  const xs = xAll.subarray(0, n);
  const ys = yAll.subarray(0, n);
  // The ranks are copied out in place: rowOf[k] >= k, so no rank is overwritten before it is read.
  const rxs = xRanks.subarray(0, n);
  const rys = yRanks.subarray(0, n);
  for (let k = 0; k < n; k++) {
    const row = rowOf[k];
    rxs[k] = xRanks[row];
    rys[k] = yRanks[row];
  }
  const moments = coMoments(xs, ys);
  const r = pearsonFromMoments(moments);
  const rho = pearsonFromMoments(coMoments(rxs, rys));
  const outliers = bivariateOutliers(xs, ys, MAHALANOBIS_PROBABILITY, moments);
  const cutoff = outliers?.cutoff ?? mahalanobisCutoff(MAHALANOBIS_PROBABILITY, 2);
  const flagged = outliers?.indices ?? [];
  const notes: string[] = [];
  if (r !== null && rho !== null && Math.abs(r - rho) > CORRELATION_GAP) {
    notes.push(
      `Pearson's r (${r.toFixed(2)}) and Spearman's rho (${rho.toFixed(2)}) differ by more than ${CORRELATION_GAP} (a rule of thumb, common practice): the relation may be non-linear or carried by a few extreme values; look at the scatter plot.`,
    );
  }
  if (flagged.length > 0) {
    notes.push(
      `${flagged.length} row${flagged.length === 1 ? ' lies' : 's lie'} beyond the chi-square(2) 0.999 point (${cutoff.toFixed(2)}) of squared Mahalanobis distance; bivariate outliers can distort Pearson's r.`,
    );
  }
  if (outliers === null && n >= 3) notes.push('The two items are constant or exactly collinear among the pairs, so Mahalanobis distances are undefined.');
  const sampleIdx = scatterSample(n, flagged, outliers?.d2);
  return {
    x: x.item.name,
    y: y.item.name,
    kind: 'continuous-continuous',
    n,
    pearson: r,
    spearman: rho,
    bivariateOutliers: flagged.map((k) => rowOf[k] + 1),
    mahalanobisCutoff: cutoff,
    maxMahalanobis: outliers?.maxD2 ?? null,
    notes,
    sample: sampleIdx.map((k) => [xs[k], ys[k]]),
    sampleRows: sampleIdx.map((k) => rowOf[k] + 1),
    conventions: { ...CONTINUOUS_CONVENTIONS },
  };
}

/**
 * Indices (into the complete pairs, ascending) of at most SCATTER_SAMPLE_MAX points: all when
 * few, else every outlier plus an even stride through the rest. If the outliers alone exceed
 * the limit, the ones with the largest distance are kept.
 */
function scatterSample(n: number, flagged: number[], d2: Float64Array | undefined): number[] {
  if (n <= SCATTER_SAMPLE_MAX) return Array.from({ length: n }, (_, k) => k);
  let keep = flagged;
  if (keep.length > SCATTER_SAMPLE_MAX && d2 !== undefined) {
    keep = [...keep].sort((a, b) => d2[b] - d2[a]).slice(0, SCATTER_SAMPLE_MAX);
  }
  const chosen = new Set(keep);
  const stride = SCATTER_SAMPLE_MAX - chosen.size;
  // floor(i n / stride) spaces the points evenly over the rows, deterministically.
  for (let i = 0; i < stride; i++) chosen.add(Math.floor((i * n) / stride));
  return [...chosen].sort((a, b) => a - b).slice(0, SCATTER_SAMPLE_MAX);
}

function describeMixed(c: Coded, v: Numeric, quantileType: QuantileType, include: Uint8Array | undefined, scratch: PairScratch): PairMixed {
  const k = c.item.codes.length;
  const codes = c.codes;
  // Counting sort into one buffer: group g occupies [start[g], start[g + 1]). The order holds
  // the rows with a valid value only, so one walk along it finds each one's group (0 for none)
  // and counts the groups; a second walk places the values.
  const { order, values } = v.column;
  const { groupAt, f64 } = scratch.buffers;
  const m = order.length;
  const counts = new Uint32Array(k + 1);
  for (let i = 0; i < m; i++) {
    const r = order[i];
    const g = codes[r];
    if (g !== 0 && g <= k && (include === undefined || include[r] === 1)) {
      groupAt[i] = g;
      counts[g]++;
    } else groupAt[i] = 0;
  }
  const start = new Uint32Array(k + 1);
  for (let g = 1; g <= k; g++) start[g] = g === 1 ? 0 : start[g - 1] + counts[g - 1];
  const n = k === 0 ? 0 : start[k] + counts[k];
  const buffer = f64[0]!.subarray(0, n);
  const fill = start.slice();
  // Walking the continuous column in ascending order fills every group already sorted (adding
  // 0 stores -0 as 0, as the sort does).
  for (let i = 0; i < m; i++) {
    const g = groupAt[i];
    if (g !== 0) buffer[fill[g]++] = values[order[i]] + 0;
  }
  const segments: Float64Array[] = [];
  const groups: GroupSummary[] = c.item.codes.map((code, i) => {
    const seg = buffer.subarray(start[i + 1], start[i + 1] + counts[i + 1]);
    segments.push(seg);
    return groupSummary(code.code, code.label, seg, quantileType);
  });
  return {
    x: c.item.name,
    y: v.item.name,
    kind: 'categorical-continuous',
    n,
    groups,
    etaSquared: etaSquared(segments),
    conventions: {
      groups: `median and quartiles Hyndman-Fan type ${quantileType}; sd with n - 1; Tukey fences at 1.5 and 3 IQR (outliers beyond the inner fences only, extremes beyond the outer)`,
      etaSquared: 'eta squared = SS between / SS total (one-way layout), no bias correction',
    },
  };
}

/** Summary of one group's values, `seg` sorted ascending. */
function groupSummary(code: number | string, label: string, seg: Float64Array, quantileType: QuantileType): GroupSummary {
  if (seg.length === 0) {
    return { code, label, n: 0, mean: null, sd: null, median: null, q1: null, q3: null, fences: null, outliers: 0, extremes: 0 };
  }
  const m = Moments.of(seg);
  const q1 = quantileSorted(seg, 0.25, quantileType);
  const median = quantileSorted(seg, 0.5, quantileType);
  const q3 = quantileSorted(seg, 0.75, quantileType);
  const fences = tukeyFences(q1, q3);
  let outliers = 0;
  let extremes = 0;
  // In a sorted segment the values below the lower fence are a prefix and those above the
  // upper one a suffix, so only the two tails are walked.
  const beyond = (value: number) => {
    if (value < fences.lowerExtreme || value > fences.upperExtreme) extremes++;
    else outliers++;
  };
  let lo = 0;
  while (lo < seg.length && seg[lo] < fences.lower) beyond(seg[lo++]);
  for (let hi = seg.length - 1; hi >= lo && seg[hi] > fences.upper; hi--) beyond(seg[hi]);
  const sd = m.sd(1);
  return { code, label, n: seg.length, mean: m.mean, sd: Number.isNaN(sd) ? null : sd, median, q1, q3, fences, outliers, extremes };
}
