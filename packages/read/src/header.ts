import { CodeweirError } from '@codeweir/core';
import { BatchBuilder, Tokenizer } from './tokenizer.ts';
import type { NormalizedOptions } from './options.ts';

export interface HeaderSettings {
  file: string;
  delimiter: string;
  newline: 'lf' | 'cr';
  options: NormalizedOptions;
}

export interface HeaderRow {
  header: string[];
  /** Characters of `text` taken by blank lines, the header and its terminator. */
  consumed: number;
  /** 1-based physical line of the row after the header. */
  nextLine: number;
}

/** A tokenizer for rows of a delivery with the given settings. */
export function tokenizerFor(s: HeaderSettings, firstLine: number, dropTrailingBlank: boolean): Tokenizer {
  return new Tokenizer({
    delimiter: s.delimiter,
    newline: s.newline,
    maxFieldBytes: s.options.maxFieldBytes,
    file: s.file,
    firstLine,
    dropTrailingBlank,
  });
}

/**
 * The header: the first non-blank row of `text` (blank lines before it are skipped but
 * counted). Returns undefined when `text` is only a prefix (`whole` false) that ends inside the
 * header row. Throws CW_FILE_EMPTY when the whole text is blank, and the tokenizer's errors.
 */
export function parseHeader(text: string, whole: boolean, s: HeaderSettings): HeaderRow | undefined {
  const tok = tokenizerFor(s, 1, true);
  tok.push(text, whole);
  const out = new BatchBuilder(1, 1);
  const status = tok.fill(out, 1);
  if (out.count === 0 && status === 'done') {
    throw new CodeweirError('CW_FILE_EMPTY', `The data file ${s.file} holds no header row, only blank lines.`, { file: s.file });
  }
  if (out.count === 0) return undefined;
  const last = out.count - 1;
  return { header: out.fields.slice(out.offsets[last], out.offsets[last + 1]), consumed: tok.consumed, nextLine: tok.line };
}
