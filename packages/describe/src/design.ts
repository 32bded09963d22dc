/**
 * Design-based estimates for describe: with a sample design (the codebook's `design`, or any of
 * the strata, cluster, fpc and by options), every described item's weighted mean (interval,
 * ratio) or percent of each code (nominal, ordinal, binned) gets its Taylor-linearised
 * standard error, design effect, effective sample size and 95% interval, overall and, with
 * `by`, in each domain of the by item (estimated as domains: the whole design kept).
 * Conventions: see @codeweir/stats taylor-variance.ts, design-effect.ts, design-interval.ts.
 */
import { CodeweirError } from '@codeweir/core';
import type { CompiledCodebook, CompiledItem } from '@codeweir/codebook';
import type { CheckResult, ColumnStore } from '@codeweir/check';
import { designMean, designProportions, resolveSampleDesign, type DesignBase, type DesignEstimate, type Domain, type SampleDesign, type ConfidenceInterval } from '@codeweir/stats';
import type { NormalizedDescribeOptions } from './options.ts';
import type { DescribeResult, DesignFigures, DesignSummary, DomainEstimate, Interval, ItemDescription } from './types.ts';
import type { WeightColumn } from './weights.ts';
import { categoriesOf, numbersOf } from './describe.ts';

type Part = 'strata' | 'cluster' | 'fpc' | 'by';

/** Whether a run is design-based: the codebook gives a design or a design option was given. Cost: O(1). */
export function designActive(codebook: CompiledCodebook, opts: NormalizedDescribeOptions): boolean {
  return codebook.design !== undefined || opts.strata !== undefined || opts.cluster !== undefined || opts.fpc !== undefined || opts.by !== undefined;
}

/** The weight item a run uses by name: the option, else (design-based) the design's weight, else undefined (the codebook's weight item). */
export function designWeightName(codebook: CompiledCodebook, opts: NormalizedDescribeOptions): string | undefined {
  return opts.weight ?? (designActive(codebook, opts) ? codebook.design?.weight : undefined);
}

/** Per-row keys (0-based, -1 where not valid) and the code text of each key, of a coded, numeric or group item. */
interface RowKeys {
  keys: Int32Array;
  texts: string[];
  labels: string[];
}

function rowKeysOf(store: ColumnStore, item: CompiledItem, part: Part): RowKeys {
  const col = store.columns[item.name];
  if (col?.kind === 'coded') {
    const keys = new Int32Array(col.codes.length);
    for (let r = 0; r < keys.length; r++) keys[r] = col.codes[r]! - 1;
    return { keys, texts: item.codes.map((c) => c.text), labels: item.codes.map((c) => c.label) };
  }
  if (col?.kind === 'numeric') {
    const at = new Map<number, number>();
    const keys = new Int32Array(col.values.length);
    for (let r = 0; r < keys.length; r++) {
      const v = col.values[r]!;
      if (Number.isNaN(v)) keys[r] = -1;
      else {
        let k = at.get(v);
        if (k === undefined) at.set(v, (k = at.size));
        keys[r] = k;
      }
    }
    const texts = [...at.keys()].map(String);
    return { keys, texts, labels: texts };
  }
  const g = store.groupKeys?.[item.name];
  if (g) {
    const valid = g.keys.map((k) => k !== '(missing)' && k !== '(invalid)');
    const renumber = new Int32Array(g.keys.length).fill(-1);
    const texts: string[] = [];
    g.keys.forEach((k, i) => {
      if (valid[i]) {
        renumber[i] = texts.length;
        texts.push(k);
      }
    });
    const keys = new Int32Array(g.rowKeys.length);
    for (let r = 0; r < keys.length; r++) keys[r] = renumber[g.rowKeys[r]!]!;
    return { keys, texts, labels: texts };
  }
  throw new CodeweirError('CW_USAGE', `--${part} names ${JSON.stringify(item.name)}, whose values are not kept per record (give it codes or role "group").`);
}

function designItem(codebook: CompiledCodebook, store: ColumnStore, name: string, part: Part): CompiledItem {
  const item = codebook.byName.get(name);
  if (!item) throw new CodeweirError('CW_USAGE', `--${part} names ${JSON.stringify(name)}, which is not an item of the codebook.`);
  if (!store.columns[name] && !store.groupKeys?.[name]) {
    throw new CodeweirError('CW_USAGE', `--${part} names ${JSON.stringify(name)}, which has no column in the delivery (or whose values are not kept per record: give it codes or role "group").`);
  }
  return item;
}

const num = (v: number): number | null => (Number.isFinite(v) ? v : null);
const percentInterval = (ci: ConfidenceInterval | null): Interval | null => (ci ? { low: 100 * ci.low, high: 100 * ci.high, method: ci.method } : null);

/** The figures of a mean estimate. */
function meanFigures(e: DesignEstimate & DesignBase): DesignFigures {
  return { se: num(e.se), deff: num(e.deff), nEffective: num(e.nEffective), ci: e.ci, df: e.df };
}

/** The figures of the proportions of `codes`, in percent units. */
function percentFigures(p: DesignBase & { categories: DesignEstimate[] }, codes: string[]): DesignFigures & { percent: Record<string, number> } {
  const percent: Record<string, number> = {};
  const percentSe: Record<string, number | null> = {};
  const deff: Record<string, number | null> = {};
  const nEffective: Record<string, number | null> = {};
  const ci: Record<string, Interval | null> = {};
  p.categories.forEach((e, j) => {
    const code = codes[j]!;
    percent[code] = 100 * e.estimate;
    percentSe[code] = num(100 * e.se);
    deff[code] = num(e.deff);
    nEffective[code] = num(e.nEffective);
    ci[code] = percentInterval(e.ci);
  });
  return { percent, percentSe, deff, nEffective, ci, df: p.df };
}

/** What an item is estimated from: numbers (a mean) or categories (percents), or nothing. */
type Source = { kind: 'mean'; values: Float64Array } | { kind: 'percent'; rowCategory: Int32Array; codes: string[] };

function sourceOf(item: CompiledItem, d: ItemDescription, store: ColumnStore): Source | undefined {
  const col = store.columns[item.name];
  if (!col) return undefined;
  if (d.mean !== undefined) {
    const values = numbersOf(item, col);
    return values ? { kind: 'mean', values } : undefined;
  }
  if (d.frequencies) {
    const { categories, rowCategory } = categoriesOf(item, col);
    return { kind: 'percent', rowCategory, codes: categories.map((c) => String(c.code)) };
  }
  return undefined;
}

/** Design-based figures of one item overall or in one domain; null when no case is used. */
function estimate(design: SampleDesign, src: Source, domain?: Domain): (DesignFigures & { n: number; sumOfWeights: number; mean?: number; percent?: Record<string, number> }) | null {
  if (src.kind === 'mean') {
    const e = designMean(design, src.values, domain);
    return e && { n: e.n, sumOfWeights: e.sumOfWeights, mean: e.estimate, ...meanFigures(e) };
  }
  const p = designProportions(design, src.rowCategory, src.codes.length, domain);
  return p && { n: p.n, sumOfWeights: p.sumOfWeights, ...percentFigures(p, src.codes) };
}

/**
 * Adds the design-based figures to a description (see the file comment): `weighted.{se,
 * percentSe, deff, nEffective, ci, df}` on every item with a mean or frequencies, `domains` with
 * `by`, and the `design` summary. The design's own items (weight, strata, cluster, fpc) get no estimates.
 * Without a weight every row weighs 1. Cost: O(rows + clusters x codes) per item, times the
 * number of domains with `by`. Throws CodeweirError CW_USAGE when a design option names an
 * unknown item or one whose values are not kept per record, and for bad fpc values.
 */
export function addDesignEstimates(out: DescribeResult, result: CheckResult, codebook: CompiledCodebook, opts: NormalizedDescribeOptions, weight: WeightColumn | undefined): void {
  const store = result.store;
  const names = {
    strata: opts.strata ?? codebook.design?.strata,
    cluster: opts.cluster ?? codebook.design?.cluster,
    fpc: opts.fpc ?? codebook.design?.fpc,
    by: opts.by,
  };
  const strata = names.strata === undefined ? undefined : rowKeysOf(store, designItem(codebook, store, names.strata, 'strata'), 'strata');
  const cluster = names.cluster === undefined ? undefined : rowKeysOf(store, designItem(codebook, store, names.cluster, 'cluster'), 'cluster');
  let fpc: Float64Array | undefined;
  if (names.fpc !== undefined) {
    const item = designItem(codebook, store, names.fpc, 'fpc');
    const col = store.columns[item.name];
    if (col?.kind !== 'numeric') throw new CodeweirError('CW_USAGE', `--fpc names ${JSON.stringify(item.name)}, which is not a number (a population count of clusters or a sampling fraction).`);
    fpc = col.values;
  }
  const by = names.by === undefined ? undefined : rowKeysOf(store, designItem(codebook, store, names.by, 'by'), 'by');
  const weights = weight?.weights ?? new Float64Array(store.rows).fill(1);
  const design = resolveSampleDesign({
    weights,
    ...(strata ? { strata: strata.keys } : {}),
    ...(cluster ? { clusters: cluster.keys } : {}),
    ...(fpc ? { fpc } : {}),
  });

  const skip = new Set([weight?.item, names.fpc, names.strata, names.cluster]);
  for (const item of codebook.items) {
    const d = out.items[item.name];
    if (!d || skip.has(item.name)) continue;
    const src = sourceOf(item, d, store);
    if (!src) continue;
    const all = estimate(design, src);
    if (!all) continue;
    const { n, sumOfWeights, mean, percent, ...figures } = all;
    if (!d.weighted) {
      d.weighted = { sumOfWeights, n, excluded: d.n - n };
      if (mean !== undefined) d.weighted.mean = mean;
      if (percent !== undefined) d.weighted.percent = percent;
    }
    Object.assign(d.weighted, figures);
    if (by) {
      const domains: Record<string, DomainEstimate> = {};
      by.texts.forEach((code, k) => {
        const e = estimate(design, src, { of: by.keys, code: k });
        domains[code] = e ? { label: by.labels[k]!, ...e } : { label: by.labels[k]!, n: 0, sumOfWeights: 0 };
      });
      d.domains = domains;
    }
  }

  const strataCodes = (s: number): string => (strata ? strata.texts[design.strataKeys[s]!]! : '(the whole sample)');
  const lone = design.singleClusterStrata.map(strataCodes);
  const summary: DesignSummary = {
    weight: weight?.item ?? null,
    strata: names.strata ?? null,
    cluster: names.cluster ?? null,
    fpc: names.fpc ?? null,
    strataCount: design.clustersInStratum.length,
    clusters: design.stratumOfCluster.length,
    df: Math.max(0, design.stratumOfCluster.length - design.clustersInStratum.length),
    excludedRows: design.excludedRows,
    singleCluster: { rule: 'adjust', strata: lone },
  };
  if (names.by !== undefined) summary.by = names.by;
  if (design.fpcAsFraction !== undefined) summary.fpcAs = design.fpcAsFraction ? 'sampling fraction' : 'population count';
  if (lone.length > 0) {
    summary.singleCluster.note = `${lone.length === 1 ? 'Stratum' : 'Strata'} ${lone.join(', ')} ${lone.length === 1 ? 'has' : 'have'} a single cluster: its deviation is taken from the mean cluster total of the whole sample, not of its stratum.`;
  }
  out.design = summary;
  Object.assign(out.conventions, DESIGN_CONVENTIONS);
  if (!weight) out.conventions.designWeight = 'no weight item: every record weighs 1';
}

/** The conventions of the design-based figures, as written into `conventions`. */
export const DESIGN_CONVENTIONS: Readonly<Record<string, string>> = {
  designVariance:
    'standard errors by Taylor linearisation of the ratio mean sum(w y) / sum(w), clusters sampled with replacement within strata (first-stage approximation), with the finite population correction (1 - f) when fpc is given (a population count of clusters above 1, else a sampling fraction); clusters are numbered within strata',
  singleCluster: "a stratum with a single cluster contributes (1 - f) (t - mean cluster total of the whole sample)^2, the 'adjust' rule",
  designEffect:
    'design effect: design variance over the variance of simple random sampling without replacement of the same number of cases from N = sum of weights, s2 (N - n) / (N n) with s2 = n / (n - 1) sum(w (y - mean)^2) / sum(w); with replacement, s2 / n, when the weights do not sum to more than n. Effective sample size n / deff',
  designInterval: '95% intervals on the t distribution with the design degrees of freedom (clusters minus strata among the cases used); percentages use the logit interval, which stays inside 0 to 100',
  domains: 'domain estimates keep the whole design: cases outside the domain count as zero in the linearised values, no cluster or stratum is dropped',
};
