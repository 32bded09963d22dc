import type { CompiledCodebook, CompiledItem } from '@codeweir/codebook';
import type { CheckResult, ItemColumn } from '@codeweir/check';
import type { DescribeResult, ItemDescription } from './types.ts';
import { normalizeDescribeOptions, type DescribeOptions, type DescribeOptionsInput, type NormalizedDescribeOptions } from './options.ts';
import { conventionsFor, type ConventionKey } from './conventions.ts';
import { resolveWeight, weightsFor, type WeightColumn } from './weights.ts';
import { describeCategorical, type Category } from './categorical.ts';
import { describeContinuous } from './continuous.ts';
import { describePairs } from './pairs.ts';
import { addDesignEstimates, designActive, designWeightName } from './design.ts';

/**
 * Level-appropriate summaries of the valid cells of every described item of a checked
 * delivery (all items with a retained column except the id), plus the requested pairs.
 *
 * Conventions (also written into `conventions` on the result and on each item): percents of
 * valid cells; nominal items get counts, percents and all tied modes in code order; ordinal
 * items add cumulative percents and the median and quartiles as categories (Hyndman-Fan type 1
 * on scale positions, IQR in scale steps); binned items add the grouped-data median; interval
 * and ratio items get mean, sd (n - 1), quantiles of the chosen Hyndman-Fan type, G1 skewness,
 * G2 excess kurtosis, Tukey fences (1.5 and 3 x IQR) and a Freedman-Diaconis histogram; ratio
 * items add cv and geometric mean. Every statistic the level does not support is named in
 * `withheld` with the reason. With a weight item, weighted figures (frequency-weight sd,
 * weighted ECDF-inverse quantiles) sit beside the unweighted ones.
 *
 * Cost: O(rows x items) plus a sort of each numeric item's valid values. Throws CodeweirError
 * CW_USAGE for bad options (a quantile type outside 1 to 9, an unknown weight or pair item).
 * @example describe(checkResult, codebook, { quantileType: 6, percentiles: [10, 90] })
 */
export function describe(
  result: CheckResult,
  codebook: CompiledCodebook,
  options: DescribeOptions | DescribeOptionsInput | NormalizedDescribeOptions = {},
): DescribeResult {
  const opts = normalizeDescribeOptions(options as DescribeOptionsInput);
  const weight = resolveWeight(result.store, codebook, designWeightName(codebook, opts));
  // Pairs first: a bad pair name fails before any work on the items.
  const pairs = opts.pairs === 'all' || opts.pairs.length > 0 ? describePairs(result, codebook, opts) : [];
  return assembleDescription(result, codebook, opts, weight, pairs, (item, col, w) => describeItem(item, col, result, opts, w));
}

/** One item's description and the convention keys it used. */
export interface ItemPart {
  description: ItemDescription;
  conventions: ConventionKey[];
}

/**
 * The description of every described item (in codebook order), each from `describeOne`, with
 * the pairs and conventions around them: the one place that shapes a DescribeResult, for one
 * thread and several. Cost: that of describeOne per item. Throws what describeOne throws.
 */
export function assembleDescription(
  result: CheckResult,
  codebook: CompiledCodebook,
  opts: NormalizedDescribeOptions,
  weight: WeightColumn | undefined,
  pairs: DescribeResult['pairs'],
  describeOne: (item: CompiledItem, col: ItemColumn, weights: Float64Array | undefined) => ItemPart,
): DescribeResult {
  const store = result.store;
  const used = new Set<ConventionKey>(['percent', 'mode']);
  const items: Record<string, ItemDescription> = {};
  for (const item of codebook.items) {
    if (item.role === 'id') continue;
    const col = store.columns[item.name];
    if (!col) continue;
    const { description, conventions } = describeOne(item, col, weightsFor(weight, item.name));
    for (const c of conventions) used.add(c);
    items[item.name] = description;
  }
  if (opts.listwise) used.add('listwise');

  const out: DescribeResult = {
    quantileType: opts.quantileType,
    rows: store.rows,
    items,
    pairs,
    conventions: conventionsFor([...used], opts.quantileType),
  };
  // Pair conventions join the result's under the pair kind, since a key such as `spearman`
  // means a different computation for a table than for two numeric columns.
  for (const p of pairs) {
    for (const [k, v] of Object.entries(p.conventions ?? {})) out.conventions[`${p.kind} ${k}`] = v;
  }
  if (weight) out.weight = weight.item;
  if (opts.listwise) out.listwise = true;
  if (designActive(codebook, opts)) addDesignEstimates(out, result, codebook, opts, weight);
  return out;
}

/**
 * Whether an item is summarised from its numeric values with a sort (interval and ratio items
 * that are not binned, with a numeric column): the items worth a thread of their own.
 */
export function isContinuous(item: CompiledItem, col: ItemColumn | undefined): col is Extract<ItemColumn, { kind: 'numeric' }> {
  return col !== undefined && col.kind === 'numeric' && (item.level === 'interval' || item.level === 'ratio') && !item.binned && item.role !== 'id';
}

/** Categories and per-row category of a column summarised as nominal or ordinal. */
export function categoriesOf(item: CompiledItem, col: ItemColumn): { categories: Category[]; rowCategory: Int32Array } {
  if (col.kind === 'coded') {
    const rowCategory = new Int32Array(col.codes.length);
    for (let r = 0; r < rowCategory.length; r++) rowCategory[r] = col.codes[r]! - 1;
    return { categories: codeCategories(item), rowCategory };
  }
  // A numeric column summarised as categories: its distinct valid values, ascending.
  const distinct = [...new Set(Array.from(col.values).filter((v) => !Number.isNaN(v)))].sort((a, b) => a - b);
  const at = new Map(distinct.map((v, i) => [v, i]));
  const rowCategory = new Int32Array(col.values.length);
  for (let r = 0; r < rowCategory.length; r++) rowCategory[r] = at.get(col.values[r]!) ?? -1;
  return { categories: distinct.map((v) => ({ code: v, label: String(v) })), rowCategory };
}

/** The categories of a coded item: its codes in codebook order. */
function codeCategories(item: CompiledItem): Category[] {
  return item.codes.map((c): Category => (c.bin ? { code: c.code, label: c.label, bin: c.bin } : { code: c.code, label: c.label }));
}

/** Numeric values of a column summarised as interval or ratio (codes read as numbers). */
export function numbersOf(item: CompiledItem, col: ItemColumn): Float64Array | undefined {
  if (col.kind === 'numeric') return col.values;
  const asNumber = item.codes.map((c) => (typeof c.code === 'number' ? c.code : Number(c.code)));
  if (asNumber.some((v) => !Number.isFinite(v))) return undefined;
  const out = new Float64Array(col.codes.length);
  for (let r = 0; r < out.length; r++) {
    const c = col.codes[r]!;
    out[r] = c === 0 ? Number.NaN : asNumber[c - 1]!;
  }
  return out;
}

/** One item's description from its column (see describe). `result` gives the item's tallies. */
export function describeItem(
  item: CompiledItem,
  col: ItemColumn,
  result: CheckResult,
  opts: NormalizedDescribeOptions,
  weights: Float64Array | undefined,
): { description: ItemDescription; conventions: ConventionKey[] } {
  const tally = result.summary.items[item.name];
  const d: ItemDescription = {
    level: item.level ?? 'text',
    label: item.label,
    n: 0,
    missing: { ...(tally?.missing ?? {}) },
    invalid: tally?.invalid ?? 0,
    withheld: {},
  };
  if (item.unit !== undefined) d.unit = item.unit;
  if (item.binned) d.binned = true;
  let conventions: ConventionKey[];
  const level = item.level;
  const numbers = level === 'interval' || level === 'ratio' ? numbersOf(item, col) : undefined;
  if (numbers && !item.binned) {
    conventions = describeContinuous(d, numbers, level === 'ratio', opts, weights);
  } else {
    // Binned items are ordinal whatever the codebook says; interval or ratio codes that are not
    // numbers keep their declared order, so they are summarised as an ordinal scale.
    const ordinal = level === 'ordinal' || item.binned || level === 'interval' || level === 'ratio';
    // A coded column's codes are read as they are stored, without a per-row copy.
    const { categories, rowCategory } = col.kind === 'coded' ? { categories: codeCategories(item), rowCategory: { codes: col.codes } } : categoriesOf(item, col);
    conventions = describeCategorical(d, { categories, rowCategory, level: ordinal ? 'ordinal' : 'nominal', binned: item.binned, weights }, opts);
  }
  d.conventions = conventionsFor(conventions, opts.quantileType);
  return { description: d, conventions };
}
