/**
 * Sniffing the first block of a delivery: byte-order mark, UTF-16 without a mark, binary
 * content, line terminator and delimiter. Pure functions over bytes or text.
 */
import { BatchBuilder, Tokenizer } from './tokenizer.ts';
import { DELIMITERS } from './options.ts';
import type { Encoding } from './types.ts';

export interface BomInfo {
  encoding: Encoding;
  length: number;
}

/** The byte-order mark at the start of `bytes`, if any (UTF-8, UTF-16 LE, UTF-16 BE). */
export function detectBom(bytes: Uint8Array): BomInfo | undefined {
  if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) return { encoding: 'utf-8', length: 3 };
  if (bytes[0] === 0xff && bytes[1] === 0xfe) return { encoding: 'utf-16le', length: 2 };
  if (bytes[0] === 0xfe && bytes[1] === 0xff) return { encoding: 'utf-16be', length: 2 };
  return undefined;
}

/**
 * UTF-16 text of the Latin range without a byte-order mark: most code units have a zero high
 * byte, so zeros sit on every odd (LE) or every even (BE) byte. Returns the guess or undefined.
 */
export function sniffUtf16(bytes: Uint8Array): Encoding | undefined {
  const n = Math.min(bytes.length, 4096) & ~1;
  if (n < 4) return undefined;
  let evenZero = 0;
  let oddZero = 0;
  for (let i = 0; i < n; i += 2) {
    if (bytes[i] === 0) evenZero++;
    if (bytes[i + 1] === 0) oddZero++;
  }
  const pairs = n / 2;
  // Our own threshold: nine in ten code units zero on one side and almost none on the other.
  if (oddZero >= 0.9 * pairs && evenZero <= 0.05 * pairs) return 'utf-16le';
  if (evenZero >= 0.9 * pairs && oddZero <= 0.05 * pairs) return 'utf-16be';
  return undefined;
}

/** Control characters that never occur in delimited text (tab, LF, FF, CR are allowed). */
function isStrayControl(c: number): boolean {
  return c < 0x20 && c !== 9 && c !== 10 && c !== 12 && c !== 13;
}

/**
 * True when the sample looks like binary rather than text: more than 8 and more than 5 % of its
 * characters are NUL or other C0 controls (our own threshold: random bytes give about 11 %,
 * text nearly 0 %). A few NUL bytes inside otherwise normal text do not trip it; those are kept
 * as U+0000 in their fields.
 */
export function looksBinary(sample: string): boolean {
  if (sample.length === 0) return false;
  let stray = 0;
  for (let i = 0; i < sample.length; i++) if (isStrayControl(sample.charCodeAt(i))) stray++;
  return stray > 8 && stray > 0.05 * sample.length;
}

/** The row terminator: CR alone only when the sample has CRs and no LF at all. */
export function detectNewline(sample: string): 'lf' | 'cr' {
  if (sample.indexOf('\n') !== -1) return 'lf';
  return sample.indexOf('\r') !== -1 ? 'cr' : 'lf';
}

/** How many leading rows of the sample to compare when guessing the delimiter. */
const SNIFF_ROWS = 50;

/**
 * Guesses the delimiter among `,` `;` tab `|`: each candidate tokenizes the first rows of the
 * sample (quote-aware); a candidate needs at least two header fields, and the one whose rows
 * most often have the header's field count wins (ties: more header fields, then the order
 * above). Falls back to `,` for a one-column file. Cost: a few tokenizer passes over at most
 * the first 50 rows.
 */
export function detectDelimiter(sample: string, newline: 'lf' | 'cr', final: boolean): string {
  let best = ',';
  let bestScore = -1;
  let bestWidth = 0;
  for (const delimiter of DELIMITERS) {
    const tok = new Tokenizer({
      delimiter,
      newline,
      maxFieldBytes: Number.MAX_SAFE_INTEGER,
      file: '',
      firstLine: 1,
      dropTrailingBlank: true,
    });
    tok.push(sample, final);
    const out = new BatchBuilder(1, SNIFF_ROWS);
    try {
      tok.fill(out, SNIFF_ROWS);
    } catch {
      continue;
    }
    if (out.count === 0) continue;
    const width = (out.offsets[1] as number) - (out.offsets[0] as number);
    if (width < 2) continue;
    let score = 0;
    for (let r = 1; r < out.count; r++) {
      if ((out.offsets[r + 1] as number) - (out.offsets[r] as number) === width) score++;
    }
    if (score > bestScore || (score === bestScore && width > bestWidth)) {
      best = delimiter;
      bestScore = score;
      bestWidth = width;
    }
  }
  return best;
}
