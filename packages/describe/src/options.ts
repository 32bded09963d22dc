import { CodeweirError } from '@codeweir/core';
import type { QuantileType } from '@codeweir/stats';

/** Options of `describe`, as a library caller or the CLI gives them. */
export interface DescribeOptions {
  /** Hyndman-Fan type for quartiles and percentiles of interval and ratio items (1 to 9, default 7). */
  quantileType?: QuantileType;
  /** Name of the weight item; defaults to the codebook's `role: "weight"` item when there is one. */
  weight?: string;
  /** Pairs to summarise: [x, y] item names (or "x:y" text), or 'all' for every pair of described items. */
  pairs?: Array<[string, string]> | 'all';
  /** Pairs use only rows where every item of every requested pair is valid (default: pairwise complete). */
  listwise?: boolean;
  /** Extra percentiles (0 to 100), e.g. [10, 90]. */
  percentiles?: number[];
  /** Sample design items (override the codebook's `design`): any of them asks for design-based standard errors. */
  strata?: string;
  cluster?: string;
  fpc?: string;
  /** Group item whose codes are the domains of design-based estimates. */
  by?: string;
}

/** Options after {@link normalizeDescribeOptions}: defaults filled, values checked. */
export interface NormalizedDescribeOptions {
  quantileType: QuantileType;
  weight?: string;
  pairs: Array<[string, string]> | 'all';
  listwise: boolean;
  percentiles: number[];
  /** Present only when a design option was given (so the options of a run without one are unchanged). */
  strata?: string;
  cluster?: string;
  fpc?: string;
  by?: string;
}

export type DescribeOptionsInput = Partial<Record<keyof DescribeOptions, unknown>>;

function bad(message: string): never {
  throw new CodeweirError('CW_USAGE', message);
}

function pairFrom(v: unknown): [string, string] {
  if (Array.isArray(v) && v.length === 2 && v.every((s) => typeof s === 'string' && s !== '')) {
    return [v[0] as string, v[1] as string];
  }
  if (typeof v === 'string') {
    const parts = v.split(':');
    if (parts.length === 2 && parts[0] !== '' && parts[1] !== '') return [parts[0]!, parts[1]!];
  }
  return bad(`--pair takes two item names as x:y, got ${JSON.stringify(v)}.`);
}

/**
 * Normalises raw describe options (from the CLI or a library caller), one block per option,
 * failing on the first bad value with the value in the message. Item names are checked
 * against the codebook later, by `describe`.
 * Cost: O(number of pairs and percentiles). Throws CodeweirError CW_USAGE (exit code 2), e.g.
 * "--quantiles takes 1 to 9, got 12."
 * @example normalizeDescribeOptions({ quantileType: '6', percentiles: '10,90' })
 */
export function normalizeDescribeOptions(raw: DescribeOptionsInput = {}): NormalizedDescribeOptions {
  let quantileType: QuantileType = 7;
  if (raw.quantileType !== undefined) {
    const q = typeof raw.quantileType === 'string' && raw.quantileType.trim() !== '' ? Number(raw.quantileType) : raw.quantileType;
    if (typeof q !== 'number' || !Number.isInteger(q) || q < 1 || q > 9) bad(`--quantiles takes 1 to 9, got ${String(raw.quantileType)}.`);
    quantileType = q as QuantileType;
  }

  let weight: string | undefined;
  if (raw.weight !== undefined) {
    if (typeof raw.weight !== 'string' || raw.weight.trim() === '') bad(`--weight takes an item name, got ${JSON.stringify(raw.weight)}.`);
    weight = raw.weight;
  }

  let pairs: Array<[string, string]> | 'all' = [];
  if (raw.pairs !== undefined) {
    if (raw.pairs === 'all') pairs = 'all';
    else if (Array.isArray(raw.pairs)) pairs = raw.pairs.map(pairFrom);
    else if (typeof raw.pairs === 'string') pairs = [pairFrom(raw.pairs)];
    else bad(`--pairs takes 'all' or a list of x:y pairs, got ${JSON.stringify(raw.pairs)}.`);
  }

  let listwise = false;
  if (raw.listwise !== undefined) {
    if (typeof raw.listwise !== 'boolean') bad(`--listwise is a switch (true or false), got ${String(raw.listwise)}.`);
    listwise = raw.listwise;
  }

  let percentiles: number[] = [];
  if (raw.percentiles !== undefined) {
    const list = typeof raw.percentiles === 'string' ? raw.percentiles.split(',') : raw.percentiles;
    if (!Array.isArray(list)) bad(`--percentiles takes numbers from 0 to 100 separated by commas, got ${JSON.stringify(raw.percentiles)}.`);
    for (const entry of list) {
      const p = typeof entry === 'string' && entry.trim() !== '' ? Number(entry) : entry;
      if (typeof p !== 'number' || !(p >= 0 && p <= 100)) bad(`--percentiles takes numbers from 0 to 100, got ${JSON.stringify(entry)}.`);
      if (!percentiles.includes(p)) percentiles.push(p);
    }
    percentiles = percentiles.sort((a, b) => a - b);
  }

  const out: NormalizedDescribeOptions = { quantileType, weight, pairs, listwise, percentiles };
  for (const key of ['strata', 'cluster', 'fpc', 'by'] as const) {
    const v = raw[key];
    if (v === undefined) continue;
    if (typeof v !== 'string' || v.trim() === '') bad(`--${key} takes an item name, got ${JSON.stringify(v)}.`);
    out[key] = v;
  }
  return out;
}
