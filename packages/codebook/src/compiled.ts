/**
 * The compiled codebook: what `loadCodebook` returns when a codebook is valid. Everything the
 * hot path needs is resolved here once (missing sets, code tables, bin table, ordinal order,
 * compiled CEL), so checking and describing never look anything up by name per cell.
 *
 * This file is the contract between `codebook` and its consumers (check, describe, report,
 * draft). Extend it; do not rename fields.
 */

export type Level = 'nominal' | 'ordinal' | 'interval' | 'ratio';
export type ItemType = 'integer' | 'decimal' | 'text' | 'date';
export type Role = 'item' | 'id' | 'group' | 'weight';
export type MissingKind =
  | 'dont-know'
  | 'refused'
  | 'not-applicable'
  | 'not-administered'
  | 'not-reached'
  | 'invalid'
  | 'omitted';
/** Kinds of missingness counted in tables: every declared kind plus an empty cell. */
export type MissingTally = MissingKind | 'blank';
// The enumerations of the format, here rather than beside the zod schema so that code which
// only reads compiled codebooks does not load zod.
export const ITEM_TYPES = ['integer', 'decimal', 'text', 'date'] as const satisfies readonly ItemType[];
export const LEVELS = ['nominal', 'ordinal', 'interval', 'ratio'] as const satisfies readonly Level[];
export const ROLES = ['item', 'id', 'group', 'weight'] as const satisfies readonly Role[];
export const RULE_SEVERITIES = ['error', 'warning'] as const;
export const MISSING_KINDS: readonly MissingKind[] = [
  'dont-know',
  'refused',
  'not-applicable',
  'not-administered',
  'not-reached',
  'invalid',
  'omitted',
];

export interface CompiledCode {
  /** Position in the item's `codes` array: the scale order for ordinal items. */
  index: number;
  code: number | string;
  /** The code as it appears in a delivery cell (String(code)). */
  text: string;
  label: string;
  /** Present on binned (grouped-count) items: the range of the underlying quantity. */
  bin?: { min: number; max: number | null };
}

export interface CompiledMissingCode {
  code: number | string;
  text: string;
  kind: MissingKind;
  label?: string;
}

/** A compiled CEL expression. `evaluate` returns true/false, or undefined when undetermined. */
export interface CompiledExpression {
  source: string;
  /** Item names the expression reads, in first-use order. */
  variables: readonly string[];
  /** Item indices (into CompiledCodebook.items) of `variables`, same order. */
  variableIndices: readonly number[];
  /**
   * Evaluates against a variables object mapping item names to parsed valid values as
   * plain JS values (numbers for integer and decimal items, strings for text, numbers of
   * days since 1970-01-01 for dates); the expression converts each to its CEL type (`int`
   * for integer items, `double` for decimals) itself. Callers evaluate only when every
   * variable is valid on the row; otherwise the result is undetermined and not evaluated.
   * A non-boolean result or an evaluation error counts as false.
   */
  evaluate(vars: Record<string, unknown>): boolean;
}

export interface CompiledItem {
  /** Position in `items` (the expected column order). */
  index: number;
  name: string;
  label: string;
  text?: string;
  role: Role;
  type: ItemType;
  /** Undefined only for `text` and `id` items without a level. */
  level?: Level;
  unit?: string;
  /** Codes in declared order (scale order for ordinal items); empty when the item has none. */
  codes: readonly CompiledCode[];
  /** Cell text -> index into `codes`. Keys are String(code); numeric codes also by canonical number text. */
  codeByText: ReadonlyMap<string, number>;
  /** True when codes carry `bin`. */
  binned: boolean;
  /** Bins sorted by min (binned items only): code index and bounds. */
  bins: ReadonlyArray<{ index: number; min: number; max: number | null }>;
  /** Declared missing codes, resolved from a `missingSets` name or inline list. */
  missing: readonly CompiledMissingCode[];
  /** Cell text -> missing code. Numeric codes also keyed by canonical number text ("-9", "99"). */
  missingByText: ReadonlyMap<string, CompiledMissingCode>;
  range?: { min?: number; max?: number };
  expect?: { min?: number; max?: number };
  pattern?: RegExp;
  /** Routing: the item is asked only where this is true. */
  askedWhen?: CompiledExpression;
  unique: boolean;
  /** The codebook marks the item `confidential: true`: its values stay out of reports and exports. */
  confidential?: true;
}

export interface CompiledRule {
  id: string;
  test: CompiledExpression;
  when?: CompiledExpression;
  severity: 'error' | 'warning';
  message: string;
}

export interface CompiledCodebook {
  /** The codebook as parsed (validated against the zod schema). */
  source: unknown;
  /** The `codebook` identifier. */
  id: string;
  version: string;
  title: string;
  /** File the codebook was loaded from, when it came from a file. */
  file?: string;
  items: readonly CompiledItem[];
  byName: ReadonlyMap<string, CompiledItem>;
  idItem?: CompiledItem;
  groupItems: readonly CompiledItem[];
  weightItem?: CompiledItem;
  rules: readonly CompiledRule[];
  /** The sample design as the codebook gives it (item names), when it does. */
  design?: CompiledDesign;
  /** Disclosure control: counts below this are suppressed in reports and exports (codebook `disclosure.minCell`). */
  minCell?: number;
  /** Languages of the labels (declared, or found in label objects); absent when every label is one string. */
  languages?: readonly string[];
  /** The language the labels were resolved to (present with `languages`). */
  language?: string;
}

/** The sample design: item names of the weight, strata, cluster and finite population correction. */
export interface CompiledDesign {
  weight?: string;
  strata?: string;
  cluster?: string;
  fpc?: string;
}

export type Severity = 'error' | 'warning';

/** One lint problem: stable `code`, JSON pointer `path`, formatted `message`. */
export interface Problem {
  path: string;
  code: string;
  severity: Severity;
  message: string;
  line?: number;
  column?: number;
  /** The item the problem is about (its name), or the rule id for a problem inside a rule. */
  item?: string;
}

export type LoadResult =
  | { ok: true; codebook: CompiledCodebook; problems: Problem[] }
  | { ok: false; problems: Problem[] };
