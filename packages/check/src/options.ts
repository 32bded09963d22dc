import { CodeweirError } from '@codeweir/core';
import type { QuantileType } from '@codeweir/stats';
import type { Encoding } from '@codeweir/read';

/** Options of a check, after {@link normalizeCheckOptions}. */
export interface CheckOptions {
  /** Findings kept in memory and in the log per rule, first in row order; counts stay exact. Default 1000. */
  maxFindingsPerRule: number;
  /** Hyndman-Fan type of the quartiles behind the Tukey fences. Default 7. */
  quantileType: QuantileType;
  /** Decimal items use `,` as the decimal mark (and a `.` makes a cell not a number). Default false. */
  decimalComma: boolean;
  /** Text longer than this is a pattern mismatch without running the regular expression. Default 10,000. */
  maxPatternLength: number;
  /**
   * Keep coded items' per-row values (2 bytes a row each) in the result's store, for describe
   * and the report. Default true; `codeweir check` alone passes false, so coded items then add
   * no memory per row (their counts are tallied as the rows pass).
   */
  retainCoded: boolean;
  /** Share of an item's answered cells that are raw quantities above which the column counts as delivered unbinned. Default 0.5. */
  unbinnedColumnShare: number;
  /** Passed to the reader by checkFile. */
  delimiter?: string;
  encoding?: Encoding;
  /** Passed to the reader by checkFile: the largest field in bytes. */
  maxFieldBytes?: number;
  /** Rows per batch for array and record input. Default 4096. */
  batchRows: number;
}

export type CheckOptionsInput = Partial<Record<keyof CheckOptions, unknown>>;

const ENCODINGS: readonly Encoding[] = ['utf-8', 'windows-1252', 'latin1', 'utf-16le', 'utf-16be'];

function bad(message: string): never {
  throw new CodeweirError('CW_USAGE', message);
}

function positiveInteger(name: string, v: unknown, dflt: number): number {
  if (v === undefined) return dflt;
  const n = typeof v === 'string' && v.trim() !== '' ? Number(v) : v;
  if (typeof n !== 'number' || !Number.isInteger(n) || n < 1) bad(`${name} takes a whole number of at least 1, got ${String(v)}.`);
  return n;
}

/**
 * Normalises raw check options (from the CLI or a library caller) into {@link CheckOptions},
 * one block per option, failing on the first bad value with the value in the message.
 * Cost: O(1). Throws CodeweirError CW_USAGE (exit code 2), e.g. "--quantiles takes 1 to 9, got 12."
 * @example normalizeCheckOptions({ quantileType: '6' }).quantileType // 6
 */
export function normalizeCheckOptions(raw: CheckOptionsInput = {}): CheckOptions {
  const maxFindingsPerRule = positiveInteger('--max-findings-per-rule', raw.maxFindingsPerRule, 1000);

  let quantileType: QuantileType = 7;
  if (raw.quantileType !== undefined) {
    const q = Number(raw.quantileType);
    if (!Number.isInteger(q) || q < 1 || q > 9) bad(`--quantiles takes 1 to 9, got ${String(raw.quantileType)}.`);
    quantileType = q as QuantileType;
  }

  let decimalComma = false;
  if (raw.decimalComma !== undefined) {
    if (typeof raw.decimalComma !== 'boolean') bad(`--decimal-comma is a switch (true or false), got ${String(raw.decimalComma)}.`);
    decimalComma = raw.decimalComma;
  }

  const maxPatternLength = positiveInteger('maxPatternLength', raw.maxPatternLength, 10_000);

  let unbinnedColumnShare = 0.5;
  if (raw.unbinnedColumnShare !== undefined) {
    const s = raw.unbinnedColumnShare;
    if (typeof s !== 'number' || !(s >= 0 && s < 1)) bad(`unbinnedColumnShare takes a share from 0 up to (not including) 1, got ${String(s)}.`);
    unbinnedColumnShare = s;
  }

  let delimiter: string | undefined;
  if (raw.delimiter !== undefined) {
    let d = String(raw.delimiter);
    if (d === '\\t' || d === 'tab') d = '\t';
    if ([...d].length !== 1 || d === '"' || d === '\n' || d === '\r') bad(`--delimiter takes one character other than a quote or line break, got ${JSON.stringify(String(raw.delimiter))}.`);
    delimiter = d;
  }

  let encoding: Encoding | undefined;
  if (raw.encoding !== undefined) {
    const e = String(raw.encoding).toLowerCase();
    const canonical = e === 'utf8' ? 'utf-8' : e === 'cp1252' ? 'windows-1252' : e === 'latin-1' || e === 'iso-8859-1' ? 'latin1' : e;
    if (!ENCODINGS.includes(canonical as Encoding)) bad(`--encoding takes one of ${ENCODINGS.join(', ')}, got ${String(raw.encoding)}.`);
    encoding = canonical as Encoding;
  }

  const maxFieldBytes = raw.maxFieldBytes === undefined ? undefined : positiveInteger('--max-field-bytes', raw.maxFieldBytes, 0);

  const batchRows = positiveInteger('batchRows', raw.batchRows, 4096);

  let retainCoded = true;
  if (raw.retainCoded !== undefined) {
    if (typeof raw.retainCoded !== 'boolean') bad(`retainCoded is true or false, got ${String(raw.retainCoded)}.`);
    retainCoded = raw.retainCoded;
  }

  return { maxFindingsPerRule, quantileType, decimalComma, maxPatternLength, retainCoded, unbinnedColumnShare, delimiter, encoding, maxFieldBytes, batchRows };
}
