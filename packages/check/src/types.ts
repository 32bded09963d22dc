/**
 * The contract between `check` and its consumers (describe, report, cli). The summary shape
 * is the `check --json` document of the interface contract; extend, do not rename.
 */
import type { MissingTally } from '@codeweir/codebook';

export type FindingRule =
  | 'missing-column'
  | 'unexpected-column'
  | 'duplicate-column'
  | 'column-order'
  | 'ragged-row'
  | 'not-a-number'
  | 'not-an-integer'
  | 'not-a-date'
  | 'not-a-code'
  | 'unbinned-value'
  | 'unbinned-column'
  | 'impossible'
  | 'implausible'
  | 'pattern-mismatch'
  | 'duplicate-id'
  | 'answered-when-skipped'
  | 'blank-when-asked'
  | 'missing-code-when-skipped'
  | 'rule-failed'
  | 'outlier'
  | 'extreme'
  | 'surrounding-space'
  | 'no-rows'
  | 'weight-not-positive'
  | 'lone-cluster-stratum'
  | 'cluster-across-strata';

export type FindingSeverity = 'error' | 'warning' | 'info';

/** One line of the findings log. `row` is the 1-based data row (header not counted); 0 for file- or item-level findings. */
export interface Finding {
  row: number;
  id: string;
  item: string;
  value: string;
  rule: FindingRule;
  severity: FindingSeverity;
  message: string;
  suggestion?: string;
  /**
   * Group item name -> group code text of the finding's row (`(missing)` / `(invalid)` when the
   * row's group cell is not valid), so a findings log can be split by field team. Absent on
   * file- and item-level findings (row 0).
   */
  groups?: Record<string, string>;
}

export interface ItemTally {
  valid: number;
  invalid: number;
  /** Counts by missing kind (`blank` and each declared kind that occurred). */
  missing: Partial<Record<MissingTally, number>>;
  /** Counts of findings by rule for this item. */
  findings: Partial<Record<FindingRule, number>>;
  /** True when the item has no column in the delivery: then valid, invalid and missing are all 0. */
  absent?: boolean;
  /** Cells that had spaces around the value (trimmed before checking). */
  trimmed?: number;
  /**
   * Routing outcome on the item's rows (items with `askedWhen` only): asked (condition true),
   * skipped (false), undetermined (a variable of the condition was missing or invalid).
   */
  routing?: { asked: number; skipped: number; undetermined: number };
}

export interface GroupItemTally {
  valid: number;
  invalid: number;
  missing: Partial<Record<MissingTally, number>>;
}

/** The `check --json` document. */
export interface CheckSummary {
  codebook: { codebook: string; version: string };
  file?: string;
  rows: number;
  header: {
    missing: string[];
    unexpected: string[];
    duplicate: string[];
    outOfOrder?: boolean;
    /**
     * Typed formats (xlsx, Parquet): columns whose delivered type disagrees with the item's type
     * (cells are judged by their value all the same). Absent when there is none.
     */
    typeNotes?: Array<{ column: string; delivered: string; expected: string; message: string }>;
  };
  findings: {
    total: number;
    byRule: Partial<Record<FindingRule, number>>;
    bySeverity: Partial<Record<FindingSeverity, number>>;
    /** Findings kept in the log (capped per rule by --max-findings-per-rule); counts above stay exact. */
    logged?: number;
  };
  items: Record<string, ItemTally>;
  /** group item name -> group code text -> item name -> tally */
  groups: Record<string, Record<string, Record<string, GroupItemTally>>>;
  rules: Record<string, { passed: number; failed: number; undetermined: number; skipped?: number }>;
  /** records[k] = number of records with exactly k items missing (any kind). */
  recordMissing?: number[];
  accepted?: boolean;
  /** Hyndman-Fan type of the quartiles behind the outlier and extreme fences. */
  quantileType?: number;
  /** Tukey fences per interval or ratio item with at least one valid value. */
  fences?: Record<string, { q1: number; q3: number; lower: number; upper: number; lowerExtreme: number; upperExtreme: number }>;
}

/**
 * Per-row retained state of one item after the pass, for describe and the report.
 * Row r (0-based) of the delivery is index r in every column.
 */
export type ItemColumn =
  | {
      kind: 'coded';
      item: string;
      /** 1 + index into the item's `codes` for valid cells; 0 where the cell is not valid. */
      codes: Uint16Array;
    }
  | {
      kind: 'numeric';
      item: string;
      /** The parsed valid value; NaN where the cell is not valid (missing or invalid). */
      values: Float64Array;
    };

export interface ColumnStore {
  rows: number;
  /** Keyed by item name; text items without codes are not retained. */
  columns: Record<string, ItemColumn>;
  /**
   * Group items' cell text per row: `keys[rowKeys[r]]` is row r's group key (`(missing)` /
   * `(invalid)` where the cell is not valid). The same arrays the group tallies use, no copy.
   */
  groupKeys?: Record<string, { keys: readonly string[]; rowKeys: Uint32Array }>;
}

export interface CheckResult {
  summary: CheckSummary;
  /** The findings log, in row order, capped per rule. */
  findings: Finding[];
  store: ColumnStore;
}
