/**
 * The delimited-text tokenizer: the pure core of the row source. It works on large decoded
 * string chunks, finds row and field ends with `indexOf`, and writes fields into a flat batch
 * (one `string[]` plus offsets), so no object is made per row. It has no Node dependency; the
 * file, range and in-memory readers wrap it.
 *
 * Grammar (RFC 4180 with the common relaxations):
 * - A row ends at LF, CRLF, or (in CR mode, for files that use CR alone) CR. A CR elsewhere in
 *   an unquoted field of an LF file is data.
 * - A field that starts with `"` is quoted: it may hold delimiters, newlines and doubled quotes
 *   (`""` reads as one `"`). Characters after the closing quote up to the next delimiter or row
 *   end are kept as they stand (`"ab"c` reads as `abc`), so nothing is dropped.
 * - A quote inside an unquoted field is an ordinary character.
 * - A blank line is a row with one empty field (so a check can flag it as a ragged row);
 *   blank lines at the very end of the input are dropped.
 * - A trailing newline, or none, ends the last row the same way.
 */
import { CodeweirError } from '@codeweir/core';
import type { RowBatch } from './types.ts';

const QUOTE = 34;
const CR = 13;
const LF = 10;

export interface TokenizerOptions {
  delimiter: string;
  /** Row terminator: LF (CRLF accepted) or CR alone. */
  newline: 'lf' | 'cr';
  maxFieldBytes: number;
  /** File name for error messages. */
  file: string;
  /** 1-based physical line of the first row. */
  firstLine: number;
  /** Drop blank lines at the end of the input (true for a whole file or the last range). */
  dropTrailingBlank: boolean;
}

/** Growable flat batch under construction. */
export class BatchBuilder {
  fields: string[] = [];
  offsets: Uint32Array;
  lines: Uint32Array;
  count = 0;

  constructor(
    readonly firstRow: number,
    capacity: number,
  ) {
    this.offsets = new Uint32Array(capacity + 1);
    this.lines = new Uint32Array(Math.max(1, capacity));
  }

  /** Closes the row whose fields were just pushed. */
  endRow(line: number): void {
    if (this.count + 1 >= this.offsets.length) this.grow();
    this.lines[this.count] = line;
    this.count++;
    this.offsets[this.count] = this.fields.length;
  }

  private grow(): void {
    const offsets = new Uint32Array(this.offsets.length * 2);
    offsets.set(this.offsets);
    const lines = new Uint32Array(this.lines.length * 2);
    lines.set(this.lines);
    this.offsets = offsets;
    this.lines = lines;
  }

  finish(): RowBatch {
    return {
      count: this.count,
      firstRow: this.firstRow,
      fields: this.fields,
      offsets: this.offsets.subarray(0, this.count + 1),
      lines: this.lines.subarray(0, this.count),
    };
  }
}

/** What {@link Tokenizer.fill} stopped on. */
export type FillStatus = 'full' | 'more' | 'done';

const ROW = 0;
const BLANK = 1;
const INCOMPLETE = 2;
type RowStatus = typeof ROW | typeof BLANK | typeof INCOMPLETE;

/** Interned one- and two-character ASCII strings: survey cells are mostly short codes. */
const ONE: string[] = Array.from({ length: 128 }, (_, i) => String.fromCharCode(i));
const TWO: Array<string | undefined> = new Array<string | undefined>(128 * 128).fill(undefined);

/**
 * `s.slice(a, b)`, but a short ASCII value comes from a table instead of a new string: fewer
 * allocations in the hot loop, and no small string keeps the whole decoded block alive.
 */
function cut(s: string, a: number, b: number): string {
  const len = b - a;
  if (len === 0) return '';
  if (len === 1) {
    const c = s.charCodeAt(a);
    if (c < 128) return ONE[c] as string;
  } else if (len === 2) {
    const c = s.charCodeAt(a);
    const c2 = s.charCodeAt(a + 1);
    if ((c | c2) < 128) {
      const key = (c << 7) | c2;
      return TWO[key] ?? (TWO[key] = s.slice(a, b));
    }
  }
  return s.slice(a, b);
}

/** Number of UTF-8 bytes of `s` (for the field-size limit; runs only on very long fields). */
export function utf8Length(s: string): number {
  let n = 0;
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c < 0x80) n += 1;
    else if (c < 0x800) n += 2;
    else if (c >= 0xd800 && c <= 0xdbff && i + 1 < s.length) {
      n += 4;
      i++;
    } else n += 3;
  }
  return n;
}

/**
 * A resumable tokenizer. Feed decoded text with {@link push}; call {@link fill} to move up to
 * `maxRows` rows into a batch. A row cut by the end of a chunk is kept (from its first
 * character) and read again once the next chunk arrives, so a chunk boundary can never split a
 * field, a doubled quote or a CRLF. Cost: one pass over the text plus one re-scan of the row
 * that straddles each chunk boundary.
 */
export class Tokenizer {
  private text = '';
  private pos = 0;
  private final = false;
  /** Cached index of the next quote at or after some position <= pos (-1: none to the end). */
  private nq = -1;
  private nqFrom = Number.MAX_SAFE_INTEGER;
  /** Cached index of the next delimiter, same scheme. */
  private nd = -1;
  private ndFrom = Number.MAX_SAFE_INTEGER;
  /** Cached index of the next row terminator character, same scheme (quoted rows ask for it at every field). */
  private nn = -1;
  private nnFrom = Number.MAX_SAFE_INTEGER;
  private readonly delim: string;
  private readonly delimCode: number;
  private readonly nl: string;
  private readonly nlCode: number;
  /** Longest field (in UTF-16 units) that is certainly within maxFieldBytes. */
  private readonly safeChars: number;
  /** Lines of blank rows not yet emitted (they are emitted only when a later row follows). */
  private pendingBlank: number[] = [];
  /** 1-based physical line the next row starts on. */
  line: number;

  constructor(private readonly opts: TokenizerOptions) {
    if (opts.delimiter.length !== 1) {
      throw new CodeweirError('CW_USAGE', `The delimiter must be one character, got ${JSON.stringify(opts.delimiter)}.`);
    }
    this.delim = opts.delimiter;
    this.delimCode = opts.delimiter.charCodeAt(0);
    this.nl = opts.newline === 'cr' ? '\r' : '\n';
    this.nlCode = opts.newline === 'cr' ? CR : LF;
    this.safeChars = Math.floor(opts.maxFieldBytes / 3);
    this.line = opts.firstLine;
  }

  /** Appends a chunk; `final` marks the end of the input. */
  push(chunk: string, final: boolean): void {
    let text = this.pos < this.text.length ? this.text.slice(this.pos) + chunk : chunk;
    // A CR that ends an LF file can only be a row terminator (a quoted CR would be followed by
    // the closing quote), so it is dropped rather than kept as data of the last field.
    if (final && this.nlCode === LF && text.charCodeAt(text.length - 1) === CR) text = text.slice(0, -1);
    this.text = text;
    this.pos = 0;
    this.final = final;
    this.nqFrom = Number.MAX_SAFE_INTEGER;
    this.ndFrom = Number.MAX_SAFE_INTEGER;
    this.nnFrom = Number.MAX_SAFE_INTEGER;
  }

  /** Characters held but not yet consumed (the start of an unfinished row). */
  get pending(): number {
    return this.text.length - this.pos;
  }

  /** Position just after the last consumed row, in characters of the text pushed so far. */
  get consumed(): number {
    return this.pos;
  }

  /**
   * Moves rows into `out` until it holds `maxRows` rows ('full'), the text runs out before the
   * end of input ('more': push the next chunk), or the input is finished ('done').
   * Throws CodeweirError CW_CSV_UNCLOSED_QUOTE or CW_CSV_FIELD_TOO_LARGE.
   */
  fill(out: BatchBuilder, maxRows: number): FillStatus {
    const fields = out.fields;
    while (out.count < maxRows) {
      if (this.pos >= this.text.length) {
        if (!this.final) return 'more';
        if (!this.opts.dropTrailingBlank) this.flushBlank(out);
        this.pendingBlank = [];
        return 'done';
      }
      const start = this.pos;
      const line = this.line;
      const f0 = fields.length;
      const status = this.row(fields);
      if (status === INCOMPLETE) {
        fields.length = f0;
        this.pos = start;
        this.line = line;
        if (this.text.length - start > 4 * this.opts.maxFieldBytes) this.rowTooLarge(line);
        return 'more';
      }
      if (status === BLANK) {
        this.pendingBlank.push(line);
        continue;
      }
      if (this.pendingBlank.length > 0) this.insertBlank(out, f0);
      out.endRow(line);
    }
    return 'full';
  }

  private flushBlank(out: BatchBuilder): void {
    for (const l of this.pendingBlank) {
      out.fields.push('');
      out.endRow(l);
    }
    this.pendingBlank = [];
  }

  /** Emits held blank rows ahead of the row whose fields start at `f0`. */
  private insertBlank(out: BatchBuilder, f0: number): void {
    const rowFields = out.fields.splice(f0);
    this.flushBlank(out);
    for (const f of rowFields) out.fields.push(f);
  }

  private nextQuote(p: number): number {
    if (p < this.nqFrom || (this.nq !== -1 && this.nq < p)) {
      this.nq = this.text.indexOf('"', p);
      this.nqFrom = p;
    }
    return this.nq;
  }

  private nextDelim(p: number): number {
    if (p < this.ndFrom || (this.nd !== -1 && this.nd < p)) {
      this.nd = this.text.indexOf(this.delim, p);
      this.ndFrom = p;
    }
    return this.nd;
  }

  /** Reads one row at `pos`, pushing its fields. */
  private row(fields: string[]): RowStatus {
    const s = this.text;
    const n = s.length;
    let p = this.pos;
    let nl = s.indexOf(this.nl, p);
    if (nl === -1) {
      if (!this.final) return INCOMPLETE;
      nl = n;
    } else if (this.nlCode === CR && nl === n - 1 && !this.final) {
      // A CR as the last character could be the first half of a CRLF.
      return INCOMPLETE;
    }
    const q = this.nextQuote(p);
    if (q === -1 || q >= nl) {
      let end = nl;
      if (end > p && s.charCodeAt(end - 1) === CR) end--;
      const next = nl === n ? n : this.skipTerminator(nl);
      if (end === p) {
        this.pos = next;
        this.line++;
        return BLANK;
      }
      const rowStart = p;
      const f0 = fields.length;
      const delim = this.delim;
      let d = p < this.ndFrom || (this.nd !== -1 && this.nd < p) ? s.indexOf(delim, p) : this.nd;
      while (d !== -1 && d < end) {
        fields.push(cut(s, p, d));
        p = d + 1;
        d = s.indexOf(delim, p);
      }
      this.nd = d;
      this.ndFrom = p;
      fields.push(cut(s, p, end));
      if (end - rowStart > this.safeChars) this.checkRowFields(fields, f0, rowStart);
      this.pos = next;
      this.line++;
      return ROW;
    }
    return this.quotedRow(fields);
  }

  /** Position after the terminator at `nl` (CRLF in CR mode counts as one). */
  private skipTerminator(nl: number): number {
    if (this.nlCode === CR && this.text.charCodeAt(nl + 1) === LF) return nl + 2;
    return nl + 1;
  }

  /** The slow path: a row that holds at least one quote. */
  private quotedRow(fields: string[]): RowStatus {
    const s = this.text;
    const n = s.length;
    const final = this.final;
    let p = this.pos;
    let line = this.line;
    for (;;) {
      if (s.charCodeAt(p) === QUOTE) {
        const fieldStart = p;
        const fieldLine = line;
        let value = '';
        let a = p + 1;
        for (;;) {
          const qi = s.indexOf('"', a);
          if (qi === -1 || (qi === n - 1 && !final)) {
            if (!final) {
              if (n - fieldStart > this.opts.maxFieldBytes) this.openFieldTooLarge(fieldStart, fieldLine);
              return INCOMPLETE;
            }
            throw this.unclosed(fieldStart, fieldLine);
          }
          line += this.countNewlines(a, qi);
          if (s.charCodeAt(qi + 1) === QUOTE) {
            value += s.slice(a, qi + 1);
            a = qi + 2;
            continue;
          }
          value += s.slice(a, qi);
          p = qi + 1;
          break;
        }
        // After the closing quote: delimiter, row end, end of input, or stray characters kept.
        const c = s.charCodeAt(p);
        if (p < n && c !== this.delimCode && c !== this.nlCode && !(c === CR && s.charCodeAt(p + 1) === LF)) {
          let e = this.fieldEnd(p);
          if (e === -1) {
            if (!final) return INCOMPLETE;
            e = n;
          }
          let tailEnd = e;
          if (s.charCodeAt(e) === this.nlCode && this.nlCode === LF && s.charCodeAt(e - 1) === CR) tailEnd--;
          value += s.slice(p, tailEnd);
          p = tailEnd;
        }
        if (value.length > this.safeChars) this.checkField(value, fieldStart, fieldLine);
        fields.push(value);
      } else {
        const e = this.fieldEnd(p);
        if (e === -1) {
          if (!final) return INCOMPLETE;
          this.pushUnquoted(fields, p, n, line);
          p = n;
        } else if (s.charCodeAt(e) === this.delimCode) {
          this.pushUnquoted(fields, p, e, line);
          p = e;
        } else {
          const end = this.nlCode === LF && e > p && s.charCodeAt(e - 1) === CR ? e - 1 : e;
          this.pushUnquoted(fields, p, end, line);
          p = end;
        }
      }
      // p is at a delimiter, a row terminator, or the end of input.
      if (p >= n) {
        if (!final) return INCOMPLETE;
        this.pos = n;
        this.line = line + 1;
        return ROW;
      }
      const c = s.charCodeAt(p);
      if (c === this.delimCode) {
        p++;
        if (p >= n && !final) return INCOMPLETE;
        continue;
      }
      if (c === CR && this.nlCode === LF) {
        if (p + 1 >= n && !final) return INCOMPLETE;
        p++;
      }
      if (this.nlCode === CR && p === n - 1 && !final) return INCOMPLETE;
      this.pos = this.skipTerminator(p);
      this.line = line + 1;
      return ROW;
    }
  }

  private pushUnquoted(fields: string[], from: number, to: number, line: number): void {
    const v = cut(this.text, from, to);
    if (v.length > this.safeChars) this.checkField(v, from, line);
    fields.push(v);
  }

  /** Index of the next delimiter or row terminator at or after `p`, or -1. */
  private fieldEnd(p: number): number {
    const d = this.nextDelim(p);
    if (p < this.nnFrom || (this.nn !== -1 && this.nn < p)) {
      this.nn = this.text.indexOf(this.nl, p);
      this.nnFrom = p;
    }
    const l = this.nn;
    if (d === -1) return l;
    if (l === -1) return d;
    return d < l ? d : l;
  }

  private countNewlines(from: number, to: number): number {
    let k = 0;
    let i = this.text.indexOf(this.nl, from);
    while (i !== -1 && i < to) {
      k++;
      i = this.text.indexOf(this.nl, i + 1);
    }
    return k;
  }

  /** 1-based character column of position `p` within its physical line. */
  private column(p: number): number {
    const lineStart = this.text.lastIndexOf(this.nl, p - 1) + 1;
    return p - lineStart + 1;
  }

  /** A long row of the fast path: fields are plain slices one delimiter apart. */
  private checkRowFields(fields: string[], f0: number, rowStart: number): void {
    let p = rowStart;
    for (let i = f0; i < fields.length; i++) {
      const v = fields[i] as string;
      if (v.length > this.safeChars) this.checkField(v, p, this.line);
      p += v.length + 1;
    }
  }

  private checkField(v: string, start: number, line: number): void {
    if (utf8Length(v) <= this.opts.maxFieldBytes) return;
    throw new CodeweirError(
      'CW_CSV_FIELD_TOO_LARGE',
      `${this.opts.file}: line ${line}, column ${this.column(start)}: a field is larger than ${formatBytes(this.opts.maxFieldBytes)}; raise the field-size limit if the file really holds such values.`,
      { file: this.opts.file, line, column: this.column(start) },
    );
  }

  private openFieldTooLarge(start: number, line: number): never {
    throw new CodeweirError(
      'CW_CSV_FIELD_TOO_LARGE',
      `${this.opts.file}: line ${line}, column ${this.column(start)}: a quoted field runs past ${formatBytes(this.opts.maxFieldBytes)} without closing; its closing quote is probably missing.`,
      { file: this.opts.file, line, column: this.column(start) },
    );
  }

  private rowTooLarge(line: number): never {
    throw new CodeweirError(
      'CW_CSV_FIELD_TOO_LARGE',
      `${this.opts.file}: line ${line}, column 1: a row runs past ${formatBytes(4 * this.opts.maxFieldBytes)} without a line break; the file is probably not delimited text.`,
      { file: this.opts.file, line, column: 1 },
    );
  }

  private unclosed(start: number, line: number): CodeweirError {
    const column = this.column(start);
    return new CodeweirError(
      'CW_CSV_UNCLOSED_QUOTE',
      `${this.opts.file}: line ${line}, column ${column}: a quoted field opens here and is never closed; add the closing quote.`,
      { file: this.opts.file, line, column },
    );
  }
}

/** "16 MiB", "300 bytes": the size limit as people read it. */
export function formatBytes(n: number): string {
  if (n >= 1024 * 1024 && n % (1024 * 1024) === 0) return `${n / (1024 * 1024)} MiB`;
  if (n >= 1024 && n % 1024 === 0) return `${n / 1024} KiB`;
  return `${n} bytes`;
}

/**
 * Turns the rows a {@link Tokenizer} has ready into RowBatch objects of at most `batchRows`
 * rows, numbered from `firstRow`: the one batching loop of the file and in-memory readers.
 */
export class BatchStream {
  private row: number;
  private out: BatchBuilder;

  constructor(
    firstRow: number,
    private readonly batchRows: number,
  ) {
    this.row = firstRow;
    this.out = new BatchBuilder(firstRow, batchRows);
  }

  /** Yields every batch the tokenizer can complete now; returns true once its input is exhausted. */
  *drain(tok: Tokenizer): Generator<RowBatch, boolean> {
    for (;;) {
      const status = tok.fill(this.out, this.batchRows);
      if (status === 'more') return false;
      if (this.out.count > 0) {
        this.row += this.out.count;
        yield this.out.finish();
        this.out = new BatchBuilder(this.row, this.batchRows);
      }
      if (status === 'done') return true;
    }
  }
}
