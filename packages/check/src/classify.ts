/**
 * The per-item cell classifier, compiled once from the codebook. For every item one closure is
 * chosen by type, codes, bins and bounds; the hot loop calls it with the raw field text and it
 * answers with an outcome number, writing the details into one shared scratch object (no
 * allocation per cell, no lookup by item name).
 */
import { MISSING_KINDS, type CompiledCodebook, type CompiledItem, type MissingTally } from '@codeweir/codebook';
import { rules, RULE_NUMBER } from './rules/index.ts';
import type { FindingRule } from './types.ts';
import type { CheckOptions } from './options.ts';
import { parseIsoDate, parseNumber } from './parse.ts';

/** Outcome of one cell. */
export const VALID = 0;
/** Valid, with a warning finding (implausible) in `out.rule`. */
export const VALID_WARN = 1;
/** Missing; the kind number is in `out.kind`. */
export const MISSING = 2;
/** Invalid; the rule number is in `out.rule` (and a suggestion in `out.suggestion` for unbinned values). */
export const INVALID = 3;

/** Missing kinds by number: 0 is an empty cell, then the declared kinds in contract order. */
export const KINDS: readonly MissingTally[] = ['blank', ...MISSING_KINDS];
const KIND_NUMBER = new Map<string, number>(KINDS.map((k, i) => [k, i]));
export const KIND_NOT_APPLICABLE = KIND_NUMBER.get('not-applicable')!;

/** Scratch written by a classifier; read right after the call. */
export interface CellOut {
  /** Parsed number (numeric and date items), code value for coded numeric items. */
  num: number;
  /** Code index (coded items). */
  code: number;
  /** Trimmed text (text items; also the value CEL sees for text codes). */
  text: string;
  kind: number;
  rule: number;
  suggestion: string;
  /** The cell had spaces or tabs around the value. */
  spaced: boolean;
  /** Values of a binned item that are raw quantities (unbinned-value). */
  unbinned: boolean;
}

/** How an item's valid values are retained after the pass. */
export type ItemShape = 'coded' | 'numeric' | 'text';

export interface ItemClassifier {
  item: CompiledItem;
  shape: ItemShape;
  /** Retained in the ColumnStore (coded items, and numeric items with a level or the weight role). */
  retained: boolean;
  /** Gets Tukey outlier and extreme findings (numeric interval and ratio items). */
  fenced: boolean;
  /** Classifies one raw field (untrimmed). */
  classify(cell: string): number;
  /** The finding message for a rule on a cell of this item. */
  message(rule: number, value: string, suggestion: string): string;
  /** Value CEL sees for a valid cell, from the scratch: number, code value or text. */
  celValue(out: CellOut): unknown;
}

export interface Classifiers {
  out: CellOut;
  items: ItemClassifier[];
}

const R = RULE_NUMBER;

function isSpace(c: number): boolean {
  return c === 32 || c === 9 || c === 160;
}

/** Length of the longest key of `m` (-1 when empty): no longer text can be a key. */
function longestKey(m: ReadonlyMap<string, unknown>): number {
  let n = -1;
  for (const k of m.keys()) if (k.length > n) n = k.length;
  return n;
}

/** Largest span of integer values put in a direct lookup table (entries, 4 bytes each). */
const MAX_TABLE_SPAN = 1 << 16;

function shapeOf(item: CompiledItem): ItemShape {
  if (item.codes.length > 0 && item.level !== 'interval' && item.level !== 'ratio') return 'coded';
  if (item.type === 'integer' || item.type === 'decimal' || item.type === 'date') return 'numeric';
  return 'text';
}

function numericMissing(item: CompiledItem, decimalComma: boolean): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  for (const m of item.missing) {
    const v = typeof m.code === 'number' ? m.code : parseNumber(m.text, decimalComma);
    if (!Number.isNaN(v)) out.push([v, KIND_NUMBER.get(m.kind)!]);
  }
  return out;
}

/** The pattern as written in the codebook: the compiled form may wrap it as ^(?:...)$ to match the whole value. */
function displayPattern(source: string): string {
  const m = /^\^\(\?:([\s\S]*)\)\$$/.exec(source);
  return m ? m[1]! : source;
}

function binText(b: { min: number; max: number | null }): string {
  return b.max === null ? `${b.min} or more` : `${b.min} to ${b.max}`;
}

function codeList(item: CompiledItem): string {
  const texts = item.codes.map((c) => c.text);
  return texts.length > 12 ? `${texts.slice(0, 12).join(', ')}, ...` : texts.join(', ');
}

/**
 * Compiles one classifier per item of the codebook.
 *
 * Convention: a cell is trimmed of spaces and tabs first (counted in `out.spaced`); an empty
 * cell is missing of kind `blank`; a declared missing code is missing of its kind; numeric
 * cells are parsed once by {@link parseNumber}; coded integer items look codes and numeric
 * missing codes up in an Int32Array indexed by value (span up to 65,536), other values in
 * Maps. Binned items report a number that is no code but lies in a bin as `unbinned-value`
 * with the bin's code as suggestion. Range gives `impossible` (invalid), expect gives
 * `implausible` (valid, warning). Text patterns match the whole value; text longer than
 * `maxPatternLength` is a mismatch without running the expression. Dates are YYYY-MM-DD.
 * Cost: O(items + codes) once. Throws nothing.
 */
export function compileClassifiers(codebook: CompiledCodebook, options: CheckOptions): Classifiers {
  const out: CellOut = { num: 0, code: 0, text: '', kind: 0, rule: 0, suggestion: '', spaced: false, unbinned: false };
  const items = codebook.items.map((item) => compileItem(item, out, options));
  return { out, items };
}

function compileItem(item: CompiledItem, out: CellOut, options: CheckOptions): ItemClassifier {
  const shape = shapeOf(item);
  const dc = options.decimalComma;
  const missingByText = item.missingByText;
  const isInteger = item.type === 'integer';
  const name = item.name;

  /** Trims, records spacing, and answers blank. Returns the trimmed text or null for blank. */
  const trim = (cell: string): string | null => {
    const n = cell.length;
    out.spaced = false;
    out.unbinned = false;
    if (n === 0) return null;
    if (isSpace(cell.charCodeAt(0)) || isSpace(cell.charCodeAt(n - 1))) {
      out.spaced = true;
      const t = cell.replace(/^[ \t\u00a0]+|[ \t\u00a0]+$/g, '');
      return t.length === 0 ? null : t;
    }
    return cell;
  };

  // A text longer than every missing code cannot be one: the Map lookup (which hashes the whole
  // text) is skipped, which matters for free text, where almost no cell is a missing code.
  const missLen = longestKey(missingByText);
  const textMissing = (t: string): boolean => {
    if (t.length > missLen) return false;
    const m = missingByText.get(t);
    if (m === undefined) return false;
    out.kind = KIND_NUMBER.get(m.kind)!;
    return true;
  };

  /** Trimmed text of a cell; null when it is blank or a declared missing code (kind in `out.kind`). */
  const answered = (cell: string): string | null => {
    const t = trim(cell);
    if (t === null) {
      out.kind = 0;
      return null;
    }
    return textMissing(t) ? null : t;
  };

  /** Outcome of {@link parseCell} when it returns NaN. */
  let pre = MISSING;
  /** Trims, answers blank, parses once; NaN with the outcome in `pre` when not a number. */
  const parseCell = (cell: string): number => {
    // A single digit, the commonest cell of a coded item: nothing to trim, its value at once.
    if (cell.length === 1) {
      const d = cell.charCodeAt(0) - 48;
      if (d >= 0 && d <= 9) {
        out.spaced = false;
        out.unbinned = false;
        return d;
      }
    }
    const t = trim(cell);
    if (t === null) {
      out.kind = 0;
      pre = MISSING;
      return Number.NaN;
    }
    const v = parseNumber(t, dc);
    if (Number.isNaN(v)) {
      if (textMissing(t)) pre = MISSING;
      else {
        out.rule = R['not-a-number'];
        pre = INVALID;
      }
    }
    return v;
  };

  let classify: (cell: string) => number;
  let celValue: (o: CellOut) => unknown = (o) => o.num;

  if (shape === 'coded' && item.type !== 'text' && item.type !== 'date') {
    // Numeric codes: one direct table for small integers, Maps for the rest.
    const entries: Array<[number, number]> = [];
    for (const c of item.codes) {
      const v = typeof c.code === 'number' ? c.code : parseNumber(c.text, dc);
      if (!Number.isNaN(v)) entries.push([v, c.index + 1]);
    }
    for (const [v, k] of numericMissing(item, dc)) entries.push([v, -(k + 1)]);
    const ints = entries.filter(([v]) => Number.isInteger(v));
    let lo = 0;
    let hi = -1;
    if (ints.length > 0) {
      lo = Math.min(...ints.map(([v]) => v));
      hi = Math.max(...ints.map(([v]) => v));
      if (hi - lo + 1 > MAX_TABLE_SPAN) {
        const codeInts = ints.filter(([, e]) => e > 0);
        lo = codeInts.length ? Math.min(...codeInts.map(([v]) => v)) : 0;
        hi = codeInts.length ? Math.max(...codeInts.map(([v]) => v)) : -1;
        if (hi - lo + 1 > MAX_TABLE_SPAN) hi = lo - 1;
      }
    }
    const table = new Int32Array(Math.max(0, hi - lo + 1));
    const rest = new Map<number, number>();
    for (const [v, e] of entries) {
      if (Number.isInteger(v) && v >= lo && v <= hi) table[v - lo] = e;
      else rest.set(v, e);
    }
    const codeValues = item.codes.map((c) => (typeof c.code === 'number' ? c.code : parseNumber(c.text, dc)));
    const bins = item.binned ? item.bins : [];
    const binLo = Float64Array.from(bins, (b) => b.min);
    const binHi = Float64Array.from(bins, (b) => (b.max === null ? Number.POSITIVE_INFINITY : b.max));
    const binCode = bins.map((b) => item.codes[b.index]!.text);
    const nBins = bins.length;
    classify = (cell) => {
      const v = parseCell(cell);
      if (v !== v) return pre;
      const e = v >= lo && v <= hi && (v | 0) === v ? table[v - lo]! : (rest.get(v) ?? 0);
      if (e > 0) {
        out.code = e - 1;
        out.num = codeValues[e - 1]!;
        return VALID;
      }
      if (e < 0) {
        out.kind = -e - 1;
        return MISSING;
      }
      if (isInteger && !Number.isInteger(v)) {
        out.rule = R['not-an-integer'];
        return INVALID;
      }
      for (let b = 0; b < nBins; b++) {
        if (v >= binLo[b]! && v <= binHi[b]!) {
          out.rule = R['unbinned-value'];
          out.suggestion = binCode[b]!;
          out.unbinned = true;
          return INVALID;
        }
      }
      out.rule = R['not-a-code'];
      return INVALID;
    };
  } else if (shape === 'coded') {
    // Text (or date-typed) codes: exact text of the code.
    const codeByText = item.codeByText;
    const codeLen = longestKey(codeByText);
    classify = (cell) => {
      const t = trim(cell);
      if (t === null) {
        out.kind = 0;
        return MISSING;
      }
      const idx = t.length > codeLen ? undefined : codeByText.get(t);
      if (idx !== undefined) {
        out.code = idx;
        out.text = t;
        return VALID;
      }
      if (textMissing(t)) return MISSING;
      out.rule = R['not-a-code'];
      return INVALID;
    };
    celValue = (o) => {
      const c = item.codes[o.code]!.code;
      return c;
    };
  } else if (shape === 'numeric' && item.type === 'date') {
    classify = (cell) => {
      const t = answered(cell);
      if (t === null) return MISSING;
      const v = parseIsoDate(t);
      if (Number.isNaN(v)) {
        out.rule = R['not-a-date'];
        return INVALID;
      }
      out.num = v;
      return VALID;
    };
  } else if (shape === 'numeric') {
    const miss = numericMissing(item, dc);
    const missV = Float64Array.from(miss, ([v]) => v);
    const missK = Int32Array.from(miss, ([, k]) => k);
    const nMiss = missV.length;
    const rMin = item.range?.min ?? Number.NEGATIVE_INFINITY;
    const rMax = item.range?.max ?? Number.POSITIVE_INFINITY;
    const eMin = item.expect?.min ?? Number.NEGATIVE_INFINITY;
    const eMax = item.expect?.max ?? Number.POSITIVE_INFINITY;
    classify = (cell) => {
      const v = parseCell(cell);
      if (v !== v) return pre;
      for (let m = 0; m < nMiss; m++) {
        if (missV[m] === v) {
          out.kind = missK[m]!;
          return MISSING;
        }
      }
      if (isInteger && !Number.isInteger(v)) {
        out.rule = R['not-an-integer'];
        return INVALID;
      }
      out.num = v;
      if (v < rMin || v > rMax) {
        out.rule = R.impossible;
        return INVALID;
      }
      if (v < eMin || v > eMax) {
        out.rule = R.implausible;
        return VALID_WARN;
      }
      return VALID;
    };
  } else {
    const maxLen = options.maxPatternLength;
    const re = item.pattern ? new RegExp(`^(?:${item.pattern.source})$`, item.pattern.flags.replace(/[gy]/g, '')) : undefined;
    classify = (cell) => {
      const t = answered(cell);
      if (t === null) return MISSING;
      out.text = t;
      if (re !== undefined) {
        if (t.length > maxLen || !re.test(t)) {
          out.rule = R['pattern-mismatch'];
          return INVALID;
        }
      }
      return VALID;
    };
    celValue = (o) => o.text;
  }

  const ruleCodes = Object.keys(R) as FindingRule[];
  const byNumber: FindingRule[] = [];
  for (const c of ruleCodes) byNumber[R[c]] = c;
  const pattern = displayPattern(item.pattern?.source ?? '');
  const message = (rule: number, value: string, suggestion: string): string => {
    const code = byNumber[rule]!;
    switch (code) {
      case 'not-a-code':
        return rules['not-a-code'].message({ item: name, value, codes: codeList(item) });
      case 'unbinned-value': {
        const bin = item.bins.find((b) => item.codes[b.index]!.text === suggestion);
        return rules['unbinned-value'].message({ item: name, value, code: suggestion, bin: bin ? binText(bin) : '' });
      }
      case 'impossible':
        return rules.impossible.message({ item: name, value, min: item.range?.min, max: item.range?.max });
      case 'implausible':
        return rules.implausible.message({ item: name, value, min: item.expect?.min, max: item.expect?.max });
      case 'pattern-mismatch':
        return rules['pattern-mismatch'].message({ item: name, value, pattern, tooLong: value.length > options.maxPatternLength ? options.maxPatternLength : undefined });
      case 'not-a-number':
      case 'not-an-integer':
      case 'not-a-date':
      case 'duplicate-id':
        return rules[code].message({ item: name, value });
      default:
        return `${name}: ${code}`;
    }
  };

  const retained = shape === 'coded' || (shape === 'numeric' && (item.level !== undefined || item.role === 'weight'));
  const fenced = shape === 'numeric' && (item.level === 'interval' || item.level === 'ratio');
  return { item, shape, retained, fenced, classify, message, celValue };
}
