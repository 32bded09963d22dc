/**
 * A one-pass summary of a column, enough to guess its codebook entry: how many cells of each
 * shape (whole number, decimal, date, other text), the distinct values while they are few,
 * the smallest and largest distinct numbers with their counts (for missing-code guesses),
 * and whether the values repeat.
 */
import { parseIsoDate, parseNumber } from '@codeweir/check';

/** Distinct values remembered per column; past this a column is "many-valued". */
export const MAX_DISTINCT = 1000;
/** Distinct numbers remembered at each end of a column. */
export const EDGE_VALUES = 8;
/** Values remembered for the uniqueness test; past this a column is treated as unique so far. */
export const MAX_UNIQUE_TRACKED = 1_000_000;
const MAX_SHAPES = 20;
const WHOLE = /^[+-]?\d+$/;

/** Distinct numbers at one end of a column, nearest the end first, with their counts. */
export type Edge = Array<[value: number, count: number]>;

function addToEdge(edge: Edge, v: number, lowEnd: boolean): void {
  for (const e of edge) {
    if (e[0] === v) {
      e[1]++;
      return;
    }
  }
  const beyond = (a: number, b: number): boolean => (lowEnd ? a < b : a > b);
  if (edge.length === EDGE_VALUES && !beyond(v, edge[EDGE_VALUES - 1][0])) return;
  let i = edge.length;
  while (i > 0 && beyond(v, edge[i - 1][0])) i--;
  edge.splice(i, 0, [v, 1]);
  if (edge.length > EDGE_VALUES) edge.pop();
}

/** The character-class outline of a text: letters become A or a, digits 9, the rest stays. */
export function shapeOf(text: string): string {
  let out = '';
  for (const ch of text) {
    if (ch >= '0' && ch <= '9') out += '9';
    else if (ch >= 'A' && ch <= 'Z') out += 'A';
    else if (ch >= 'a' && ch <= 'z') out += 'a';
    else out += ch;
  }
  return out;
}

export class ColumnProfile {
  readonly name: string;
  readonly decimalComma: boolean;
  /** Cells seen, blanks included. */
  cells = 0;
  blank = 0;
  /** Cells with spaces around the value (profiled trimmed, as a check reads them). */
  spaced = 0;
  /** Non-blank cells written as whole numbers ("12", "-9"). */
  wholeNumbers = 0;
  /** Non-blank cells that are numbers written with a decimal mark or exponent ("12.5", "3,0"). */
  fractional = 0;
  /** Non-blank cells that are YYYY-MM-DD calendar dates. */
  dates = 0;
  /** Non-blank cells that are neither numbers nor dates. */
  otherText = 0;
  /** Trimmed non-blank cell -> count, while there are at most MAX_DISTINCT distinct values. */
  distinct: Map<string, number> | undefined = new Map();
  /** Non-number, non-date cells -> count (first MAX_DISTINCT distinct). */
  texts = new Map<string, number>();
  low: Edge = [];
  high: Edge = [];
  /** Some number had a nonzero fraction (so the column cannot be integer-coded). */
  anyFraction = false;
  /** Numbers below 0. */
  negatives = 0;
  /** The first few numbers written with a decimal mark, as delivered (trimmed). */
  fractionExamples: string[] = [];
  /** Non-blank cells whose value occurred before in this column. */
  repeats = 0;
  /** Values seen so far, kept only for columns that may be the id (see `trackUnique`). */
  private seen: Set<string> | undefined;
  /** Shape of text cells -> count (first MAX_SHAPES shapes). */
  shapes = new Map<string, number>();

  /**
   * `trackUnique`: count repeated values (for the id guess). It costs memory for every distinct
   * value, so the draft asks it only of the columns that may become the id.
   */
  constructor(name: string, decimalComma: boolean, trackUnique = true) {
    this.name = name;
    this.decimalComma = decimalComma;
    if (trackUnique) this.seen = new Set();
  }

  /** True when repeats were counted over every cell (the column was tracked and stayed within the limit). */
  get repeatsKnown(): boolean {
    return this.seen !== undefined;
  }

  add(raw: string): void {
    this.cells++;
    const t = raw.trim();
    if (t.length === 0) {
      this.blank++;
      return;
    }
    if (t.length !== raw.length) this.spaced++;
    if (this.distinct) {
      this.distinct.set(t, (this.distinct.get(t) ?? 0) + 1);
      if (this.distinct.size > MAX_DISTINCT) this.distinct = undefined;
    }
    if (this.seen) {
      if (this.seen.has(t)) this.repeats++;
      else if (this.seen.size < MAX_UNIQUE_TRACKED) this.seen.add(t);
      else this.seen = undefined;
    }
    const v = parseNumber(t, this.decimalComma);
    if (!Number.isNaN(v)) {
      if (WHOLE.test(t)) this.wholeNumbers++;
      else {
        this.fractional++;
        if (this.fractionExamples.length < 3) this.fractionExamples.push(t);
      }
      if (!Number.isInteger(v)) this.anyFraction = true;
      if (v < 0) this.negatives++;
      addToEdge(this.low, v, true);
      addToEdge(this.high, v, false);
      return;
    }
    const shape = shapeOf(t);
    if (this.shapes.has(shape) || this.shapes.size < MAX_SHAPES) this.shapes.set(shape, (this.shapes.get(shape) ?? 0) + 1);
    if (!Number.isNaN(parseIsoDate(t))) {
      this.dates++;
      return;
    }
    this.otherText++;
    if (this.texts.has(t) || this.texts.size < MAX_DISTINCT) this.texts.set(t, (this.texts.get(t) ?? 0) + 1);
  }

  /** Non-blank cells. */
  get filled(): number {
    return this.cells - this.blank;
  }

  get numbers(): number {
    return this.wholeNumbers + this.fractional;
  }
}
