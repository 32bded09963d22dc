/**
 * Disclosure control of a description (describe --min-cell, and the report's item cards and
 * pairs): every count from 1 to k - 1 is suppressed, with the cells that would give it away.
 * A suppressed count becomes NaN (written as null in JSON, "-" in text and the report).
 *
 * Each item's frequency table and histogram is one row whose total is the item's valid count
 * (itself suppressed when the missingness table suppresses it); a suppressed code's weighted
 * count and percent, and its design-based percent, standard error, design effect, effective n
 * and interval go with it (a percent and n give the count back); the weighted n and the records
 * left out of it add up to the valid count; the domains of `--by` are a row adding up to the
 * weighted n, and a suppressed domain loses its figures. Cross-tables of pairs are protected
 * with their row and column totals, groups of a categorical-continuous pair with fewer than k
 * cases lose their statistics, and scatter points (each one a record) are dropped.
 */
import { suppressCells, type CellState } from '@codeweir/stats';
import type { ItemDescription, PairDescription, DescribeResult, DesignFigures } from './types.ts';

/**
 * Suppresses a one-row table of counts whose total is shown elsewhere ('fixed'), or suppressed
 * elsewhere (`totalHidden`: then the row must not give the total away either).
 */
export function oneRow(counts: readonly number[], minCell: number, totalHidden: boolean): CellState[] {
  return suppressCells([counts], minCell, { rows: totalHidden ? 'shown' : 'fixed', columns: 'hidden' }, { rowTotals: [totalHidden] }).cells[0]!;
}

/** A frequency row's count and everything made from it, as suppressed. */
export function hideFrequency(f: NonNullable<ItemDescription['frequencies']>[number]): void {
  f.count = Number.NaN;
  f.percent = Number.NaN;
  if (f.weightedCount !== undefined) f.weightedCount = Number.NaN;
  if (f.weightedPercent !== undefined) f.weightedPercent = Number.NaN;
}

/** Hides the frequency rows whose state is nonzero and every cumulative percent from the first on; returns how many. */
export function hideFrequencies(freqs: NonNullable<ItemDescription['frequencies']>, states: readonly CellState[]): number {
  let first = -1;
  let n = 0;
  freqs.forEach((f, i) => {
    if (!states[i]) return;
    if (first === -1) first = i;
    n++;
    hideFrequency(f);
  });
  // A cumulative percent after a suppressed row would give its count away.
  if (first >= 0) for (let i = first; i < freqs.length; i++) if (freqs[i]!.cumulativePercent !== undefined) freqs[i]!.cumulativePercent = Number.NaN;
  return n;
}

export function suppressItem(d: ItemDescription, minCell: number, validHidden: boolean): number {
  let n = 0;
  if (validHidden) d.n = Number.NaN;
  if (d.frequencies && d.frequencies.length > 0) {
    const states = oneRow(d.frequencies.map((f) => f.count), minCell, validHidden);
    n += hideFrequencies(d.frequencies, states);
    if (d.weighted) d.frequencies.forEach((f, i) => states[i] && hideCodeFigures(d.weighted!, String(f.code)));
  }
  if (d.weighted) n += suppressWeighted(d, minCell, validHidden);
  if (d.histogram) {
    const states = oneRow(d.histogram.counts, minCell, validHidden);
    if (states.some((s) => s !== 0)) {
      n += states.filter((s) => s !== 0).length;
      delete d.histogram;
    }
  }
  return n;
}

export function suppressPair(p: PairDescription, minCell: number): { pair: PairDescription | null; n: number } {
  if (p.kind === 'continuous-continuous') {
    // Each point of a scatter plot is a record; only the coefficients are kept.
    const q = { ...p, bivariateOutliers: [] as number[] };
    delete q.sample;
    delete q.sampleRows;
    return { pair: q, n: 0 };
  }
  if (p.kind === 'categorical-categorical') {
    const s = suppressCells(p.table, minCell, { rows: 'shown', columns: 'shown', grand: 'fixed' });
    let n = 0;
    const hide = (m: number[][]): void => m.forEach((row, i) => row.forEach((_, j) => s.cells[i]![j] && (row[j] = Number.NaN)));
    s.cells.forEach((row) => row.forEach((c) => c && n++));
    if (n > 0) {
      hide(p.table);
      hide(p.expected);
      hide(p.rowPercent);
      hide(p.columnPercent);
      hide(p.cellPercent);
    }
    return { pair: p, n };
  }
  let n = 0;
  for (const g of p.groups) {
    if (g.n > 0 && g.n < minCell) {
      g.n = Number.NaN;
      g.mean = g.sd = g.median = g.q1 = g.q3 = null;
      delete g.fences;
      delete g.outliers;
      delete g.extremes;
      n++;
    }
  }
  return { pair: p, n };
}


/** A code's design-based figures, as suppressed (its unweighted count is). */
function hideCodeFigures(w: NonNullable<ItemDescription['weighted']> | DesignFigures & { percent?: Record<string, number> }, code: string): void {
  if (w.percent?.[code] !== undefined) w.percent[code] = Number.NaN;
  if (w.percentSe?.[code] !== undefined) w.percentSe[code] = Number.NaN;
  for (const key of ['deff', 'nEffective', 'ci'] as const) {
    const v = w[key];
    if (v !== null && typeof v === 'object' && !('low' in v) && code in v) (v as Record<string, unknown>)[code] = key === 'ci' ? null : Number.NaN;
  }
}

/**
 * The weighted n and the records left out of it (adding up to the valid count), and the
 * domains' n (adding up to the weighted n); a suppressed domain loses its figures.
 */
function suppressWeighted(d: ItemDescription, minCell: number, validHidden: boolean): number {
  const w = d.weighted!;
  let n = 0;
  const st = oneRow([w.n, w.excluded], minCell, validHidden);
  if (st[0]) (w.n = Number.NaN), n++;
  if (st[1]) (w.excluded = Number.NaN), n++;
  const domains = Object.values(d.domains ?? {});
  if (domains.length > 0) {
    const ds = oneRow(domains.map((x) => x.n), minCell, Number.isNaN(w.n));
    domains.forEach((x, i) => {
      if (!ds[i]) return;
      n++;
      x.n = Number.NaN;
      for (const key of ['mean', 'se', 'deff', 'nEffective', 'ci', 'percent', 'percentSe', 'sumOfWeights'] as const) if (x[key] !== undefined) (x as unknown as Record<string, unknown>)[key] = key === 'sumOfWeights' ? Number.NaN : null;
    });
  }
  return n;
}

/**
 * A description with every count from 1 to k - 1 suppressed (see the file comment), each
 * item's valid count, invalid count and missing kinds as `lines` has them (the missingness
 * suppression of the same check), and the JSON paths written as null. The argument is not
 * changed. Cost: a copy of the description and one suppression per item and pair. Throws nothing.
 */
export function suppressDescription(result: DescribeResult, minCell: number, lines: (item: string) => { valid: boolean; invalid: boolean; missing: Record<string, boolean> } | undefined): { result: DescribeResult; suppressed: string[] } {
  const out = structuredClone(result);
  for (const [name, d] of Object.entries(out.items)) {
    const l = lines(name);
    if (l?.invalid) d.invalid = Number.NaN;
    for (const k of Object.keys(d.missing)) if (l?.missing[k]) (d.missing as Record<string, number>)[k] = Number.NaN;
    suppressItem(d, minCell, l?.valid === true);
  }
  out.pairs = out.pairs.map((p) => suppressPair(p, minCell).pair!).filter(Boolean);
  const suppressed: string[] = [];
  const walk = (x: unknown, path: string): void => {
    if (typeof x === 'number' && Number.isNaN(x)) suppressed.push(path);
    else if (x === null && /\.(ci|mean|se|deff|nEffective|percent|percentSe)(\.|$)/.test(path) && !walk.original(path)) suppressed.push(path);
    else if (x !== null && typeof x === 'object') for (const [k, v] of Object.entries(x)) walk(v, `${path}.${k}`);
  };
  walk.original = (path: string): boolean => {
    let x: unknown = result;
    for (const k of path.split('.').slice(1)) x = x !== null && typeof x === 'object' ? (x as Record<string, unknown>)[k] : undefined;
    return x === null;
  };
  walk(out, '$');
  return { result: out, suppressed: suppressed.map((p) => p.slice(2)) };
}
