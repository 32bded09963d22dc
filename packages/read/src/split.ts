/**
 * Cutting a delivery into byte ranges at row boundaries, so that workers can read parts of one
 * file side by side.
 *
 * Soundness: a newline byte ends a row only outside a quoted field. Which newlines those are is
 * decided by one forward scan from the header's end that jumps from quote to quote with
 * `indexOf` and follows the tokenizer's own rules, so a boundary is placed only where the
 * tokenizer itself would end a row: a quote opens a field only right after a delimiter or a row
 * terminator, inside a quoted field a doubled quote stays inside and a single one closes it,
 * and a stray quote in an unquoted field changes nothing. (For RFC 4180 files this is the same
 * as "the count of quote characters since the file start is even".) The delimiter, quote and newline are ASCII and never occur inside a UTF-8
 * multi-byte sequence, so the scan runs on raw bytes and a boundary never splits a character.
 */
import { CodeweirError } from '@codeweir/core';
import { openForRead, readLayout, type Layout } from './file.ts';
import { normalizeReadOptions } from './options.ts';
import type { ByteRange, ReadOptions } from './types.ts';

const QUOTE = 34;
const LF = 10;
const CR = 13;

/** A range from {@link splitDelivery}: carries its first row and line numbers unless `numbered: false`. */
export interface SplitRange extends ByteRange {
  firstRow: number;
  firstLine: number;
}

/** How {@link splitDelivery} cuts. */
export interface SplitOptions {
  /**
   * Count rows and lines so that each range carries its whole-file `firstRow` and `firstLine`
   * (default true). With false the scan visits only quotes and one newline per cut (several
   * times faster on a file without quotes); the ranges then carry `firstRow`/`firstLine` 0,
   * meaning "unknown", and their rows are numbered from 1 by whoever reads them.
   */
  numbered?: boolean;
  /**
   * Place each cut by looking only near it (default false), instead of scanning the file from
   * the header on: the cut goes after the first newline at or past the target from which the
   * next {@link GUESS_ROWS} rows read as complete rows of exactly the header's field count,
   * quoted strictly as RFC 4180 has it, within {@link GUESS_WINDOW} bytes. Only with
   * `numbered: false`. Such a cut is a guess that a newline lies outside any quoted field, and
   * the guess is checked by reading: if it is wrong, the newline lies inside a quoted field that
   * opens in the range before the cut and does not close before the range's end, so reading that
   * range (which starts at a true row boundary, the first one at the header's end) fails with
   * CW_CSV_UNCLOSED_QUOTE. A caller that passes `guess` must therefore read every range and,
   * when any range fails, redo the work without these ranges (one thread from the start);
   * when every range reads, every cut was a true row boundary. When some target has no
   * candidate the whole split falls back to the full scan, whose cuts are sound as they stand.
   */
  guess?: boolean;
}

/** Rows that must read cleanly after a guessed cut (see {@link SplitOptions.guess}). */
export const GUESS_ROWS = 4;
/** Bytes after a target searched for a guessed cut. */
export const GUESS_WINDOW = 256 * 1024;

async function scanBoundaries(layout: Layout, targets: number[], numbered: boolean): Promise<SplitRange[]> {
  const { fh } = await openForRead(layout.file);
  const delim = layout.delimiter.charCodeAt(0);
  const nl = layout.newline === 'cr' ? CR : LF;
  const crMode = nl === CR;
  const ranges: SplitRange[] = [{ start: layout.dataStart, end: layout.size, firstRow: 1, firstLine: layout.dataLine }];
  const buf = new Uint8Array(Math.min(layout.options.blockSize, Math.max(layout.size, 1)));
  let quoted = false;
  /** A quote inside a quoted field was the last byte of the previous block. */
  let quoteAtSeam = false;
  // The bytes before the data start end the header row, so the first byte starts a field.
  let prev = nl;
  let prev2 = crMode ? 0 : CR;
  let rows = 0;
  let lines = 0;
  let k = 0;
  /** Index in this block before which no newline can end the range that the next cut closes. */
  const nearCut = (base: number): number => (targets[k] as number) - base - (crMode ? 2 : 1);
  const fieldStarts = (before: number, before2: number): boolean =>
    before === delim || before === nl || (crMode && before === LF && before2 === CR);
  try {
    for (let base = layout.dataStart; base < layout.size && k < targets.length; ) {
      const { bytesRead: n } = await fh.read(buf, 0, Math.min(buf.length, layout.size - base), base);
      if (n === 0) break;
      let i = 0;
      if (quoteAtSeam) {
        quoteAtSeam = false;
        if (buf[0] === QUOTE) i = 1;
        else quoted = false;
      }
      while (i < n && k < targets.length) {
        let q = buf.indexOf(QUOTE, i);
        if (q >= n) q = -1;
        const stop = q === -1 ? n : q;
        // Between here and the next quote every newline ends a row unless a field is quoted.
        // Unnumbered, only newlines at or after the next cut matter: jump to the first of them.
        const from = numbered || quoted ? i : Math.max(i, nearCut(base));
        for (let j = from < stop ? buf.indexOf(nl, from) : -1; j !== -1 && j < stop; j = buf.indexOf(nl, j + 1)) {
          lines++;
          if (quoted) continue;
          rows++;
          let after = base + j + 1;
          if (crMode) {
            if (j + 1 >= n) continue;
            if (buf[j + 1] === LF) after++;
          }
          if (after >= (targets[k] as number) && after < layout.size) {
            (ranges.at(-1) as SplitRange).end = after;
            ranges.push(numbered ? { start: after, end: layout.size, firstRow: rows + 1, firstLine: layout.dataLine + lines } : { start: after, end: layout.size, firstRow: 0, firstLine: 0 });
            while (k < targets.length && after >= (targets[k] as number)) k++;
            if (k >= targets.length) break;
            if (!numbered) {
              const jump = nearCut(base);
              if (jump > j + 1) j = Math.min(jump, stop) - 1;
            }
          }
        }
        if (q === -1 || k >= targets.length) break;
        if (quoted) {
          if (q + 1 >= n) {
            quoteAtSeam = true;
          } else if (buf[q + 1] === QUOTE) {
            q++;
          } else {
            quoted = false;
          }
        } else {
          // A quote opens a field only at the field's start, as in the tokenizer.
          const before = q > 0 ? (buf[q - 1] as number) : prev;
          const before2 = q > 1 ? (buf[q - 2] as number) : q === 1 ? prev : prev2;
          quoted = fieldStarts(before, before2);
        }
        i = q + 1;
      }
      prev2 = n > 1 ? (buf[n - 2] as number) : prev;
      prev = buf[n - 1] as number;
      base += n;
    }
  } finally {
    await fh.close();
  }
  return ranges;
}

/**
 * Whether the bytes from `at` read as `rows` whole rows of exactly `fields` fields each (or as
 * whole rows of that count up to the end of the file, when `eof` and the buffer ends there),
 * quoted strictly as RFC 4180 has it: a field that starts with a quote runs to its closing
 * quote (a doubled quote stays inside), which a delimiter or row end must follow, and no other
 * field holds a quote; a row ends at a newline outside quotes. Read from a newline that is in
 * fact inside a quoted field, the closing quote of that field shows up in the wrong place (or
 * the field counts come out wrong), which is what makes the guess a good one.
 */
function readsAsRows(buf: Uint8Array, n: number, at: number, rows: number, fields: number, delim: number, nl: number, eof: boolean): boolean {
  let i = at;
  for (let r = 0; r < rows; r++) {
    if (i >= n) return eof && r > 0;
    let count = 1;
    for (;;) {
      if (buf[i] === QUOTE) {
        // Quoted: to the closing quote, past doubled ones.
        for (i++; ; i += 2) {
          const q = buf.indexOf(QUOTE, i);
          if (q === -1 || q >= n) return false;
          i = q;
          if (q + 1 >= n || buf[q + 1] !== QUOTE) break;
        }
        i++;
        // RFC 4180: the closing quote ends the field.
        if (i < n && buf[i] !== delim && buf[i] !== nl && !(nl === LF && buf[i] === CR && i + 1 < n && buf[i + 1] === LF)) return false;
      }
      // The rest of the field, up to a delimiter or a row end; RFC 4180 has no quote in it.
      for (; i < n && buf[i] !== delim && buf[i] !== nl; i++) if (buf[i] === QUOTE) return false;
      if (i >= n) {
        if (!eof) return false;
        return count === fields;
      }
      if (buf[i] === delim) {
        count++;
        i++;
        continue;
      }
      i++;
      if (nl === CR && buf[i] === LF) i++;
      break;
    }
    if (count !== fields) return false;
  }
  return true;
}

/**
 * Cuts placed by looking only near each target ({@link SplitOptions.guess}); undefined when
 * some target has no candidate in its window.
 */
async function guessBoundaries(layout: Layout, targets: number[]): Promise<SplitRange[] | undefined> {
  const { fh } = await openForRead(layout.file);
  const delim = layout.delimiter.charCodeAt(0);
  const nl = layout.newline === 'cr' ? CR : LF;
  const fields = layout.header.length;
  const ranges: SplitRange[] = [{ start: layout.dataStart, end: layout.size, firstRow: 0, firstLine: 0 }];
  const buf = new Uint8Array(GUESS_WINDOW);
  try {
    for (const target of targets) {
      const from = Math.max(target - 1, (ranges.at(-1) as SplitRange).start);
      if (from >= layout.size) break;
      const { bytesRead: n } = await fh.read(buf, 0, Math.min(buf.length, layout.size - from), from);
      const eof = from + n >= layout.size;
      let cut = -1;
      for (let j = buf.indexOf(nl); j !== -1 && j < n; j = buf.indexOf(nl, j + 1)) {
        let after = j + 1;
        if (nl === CR && after < n && buf[after] === LF) after++;
        if (nl === CR && after >= n && !eof) break;
        if (from + after < target || from + after <= (ranges.at(-1) as SplitRange).start) continue;
        if (from + after >= layout.size) break;
        if (readsAsRows(buf, n, after, GUESS_ROWS, fields, delim, nl, eof)) {
          cut = from + after;
          break;
        }
      }
      if (cut === -1) return undefined;
      (ranges.at(-1) as SplitRange).end = cut;
      ranges.push({ start: cut, end: layout.size, firstRow: 0, firstLine: 0 });
    }
  } finally {
    await fh.close();
  }
  return ranges;
}

/**
 * Splits the data rows of a delivery (after the header) into at most `parts` byte ranges of
 * about equal size (or, when `parts` is a list of positive numbers, of about those relative
 * sizes, in order), each starting and ending at a row boundary (see the module comment for why
 * the boundaries are sound). Each range carries `firstRow` and `firstLine`, the whole-file
 * numbers of its first row, so {@link openDeliveryRange} numbers rows as a whole-file read would.
 * Reading the ranges one after another gives exactly the rows of {@link openDelivery}.
 * Fewer ranges come back when the file has fewer rows; UTF-16 files and non-ASCII delimiters
 * give one range. Cost: one sequential byte scan of the file (no decoding, no tokenizing).
 * Throws as openDelivery, and CW_USAGE when `parts` is not a positive whole number.
 */
export async function splitDelivery(path: string, parts: number | number[], options: ReadOptions = {}, split: SplitOptions = {}): Promise<SplitRange[]> {
  const shares = typeof parts === 'number' ? parts : parts.length;
  if (!Number.isInteger(shares) || shares < 1 || (Array.isArray(parts) && !parts.every((w) => typeof w === 'number' && w > 0 && Number.isFinite(w)))) {
    throw new CodeweirError('CW_USAGE', `The parts must be a positive whole number or a list of positive sizes, got ${String(parts)}.`);
  }
  const layout = await readLayout(path, normalizeReadOptions(options));
  const span = layout.size - layout.dataStart;
  const byteScannable = layout.encoding !== 'utf-16le' && layout.encoding !== 'utf-16be' && layout.delimiter.charCodeAt(0) < 128;
  if (shares === 1 || span <= 1 || !byteScannable) {
    return [{ start: layout.dataStart, end: layout.size, firstRow: 1, firstLine: layout.dataLine }];
  }
  const weights = typeof parts === 'number' ? new Array<number>(parts).fill(1) : parts;
  const total = weights.reduce((a, b) => a + b, 0);
  const targets: number[] = [];
  let acc = 0;
  for (let k = 0; k < weights.length - 1; k++) {
    acc += weights[k] as number;
    const t = layout.dataStart + Math.round((acc * span) / total);
    if (t > (targets.at(-1) ?? layout.dataStart)) targets.push(t);
  }
  const numbered = split.numbered ?? true;
  if (split.guess === true && !numbered) {
    const guessed = await guessBoundaries(layout, targets);
    if (guessed !== undefined) return guessed;
  }
  return scanBoundaries(layout, targets, numbered);
}
