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
}

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
  return scanBoundaries(layout, targets, split.numbered ?? true);
}
