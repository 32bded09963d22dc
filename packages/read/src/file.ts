/**
 * The file wrapper around the tokenizer: opening and sniffing a delivery, and streaming the
 * rows of a byte range with large reads (one read ahead while the previous block is tokenized).
 */
import { open, stat, type FileHandle } from 'node:fs/promises';
import { CodeweirError } from '@codeweir/core';
import { BatchStream } from './tokenizer.ts';
import { parseHeader, tokenizerFor } from './header.ts';
import { detectBom, detectDelimiter, detectNewline, looksBinary, sniffUtf16 } from './detect.ts';
import { encodedLength, firstInvalidUtf8, makeDecoder } from './decode.ts';
import { defaultBatchRows, normalizeReadOptions, type NormalizedOptions } from './options.ts';
import type { ByteRange, Delivery, Encoding, RangeDelivery, ReadOptions, RowBatch } from './types.ts';

/** What the first block of a file says about the whole file. */
export interface Layout {
  file: string;
  size: number;
  encoding: Encoding;
  hadBom: boolean;
  bomLength: number;
  delimiter: string;
  newline: 'lf' | 'cr';
  header: string[];
  /** Byte offset just after the header row. */
  dataStart: number;
  /** 1-based physical line of the first data row. */
  dataLine: number;
  options: NormalizedOptions;
}

const SAMPLE_BYTES = 64 * 1024;

/** The CodeweirError for a failed stat, open or read of a data file (exit code 2). */
export function fsError(e: unknown, file: string): CodeweirError {
  const code = (e as NodeJS.ErrnoException).code;
  if (code === 'ENOENT' || code === 'ENOTDIR') {
    return new CodeweirError('CW_FILE_NOT_FOUND', `The data file ${file} does not exist.`, { file, cause: e });
  }
  if (code === 'EISDIR') {
    return new CodeweirError('CW_FILE_IS_DIRECTORY', `${file} is a folder, not a data file.`, { file, cause: e });
  }
  const why = code === 'EACCES' || code === 'EPERM' ? 'permission denied' : (code ?? (e as Error).message);
  return new CodeweirError('CW_FILE_UNREADABLE', `The data file ${file} cannot be read (${why}).`, { file, cause: e });
}

/** Opens `file` for reading and returns the handle and size. Throws the CW_FILE_* errors. */
export async function openForRead(file: string): Promise<{ fh: FileHandle; size: number }> {
  let size: number;
  try {
    const st = await stat(file);
    if (st.isDirectory()) {
      throw new CodeweirError('CW_FILE_IS_DIRECTORY', `${file} is a folder, not a data file.`, { file });
    }
    size = st.size;
  } catch (e) {
    if (e instanceof CodeweirError) throw e;
    throw fsError(e, file);
  }
  let fh: FileHandle;
  try {
    fh = await open(file, 'r');
  } catch (e) {
    throw fsError(e, file);
  }
  return { fh, size };
}

async function readAt(fh: FileHandle, file: string, buf: Uint8Array, length: number, position: number): Promise<number> {
  try {
    let got = 0;
    while (got < length) {
      const { bytesRead } = await fh.read(buf, got, length - got, position + got);
      if (bytesRead === 0) break;
      got += bytesRead;
    }
    return got;
  } catch (e) {
    throw fsError(e, file);
  }
}

/** Line and character column of byte `offset` (for an encoding error), by reading up to it. */
async function locateByte(fh: FileHandle, file: string, offset: number, newline: 'lf' | 'cr'): Promise<{ line: number; column: number }> {
  const nl = newline === 'cr' ? 13 : 10;
  const buf = new Uint8Array(1024 * 1024);
  let line = 1;
  let lineStart = 0;
  for (let pos = 0; pos < offset; ) {
    const n = await readAt(fh, file, buf, Math.min(buf.length, offset - pos), pos);
    if (n === 0) break;
    for (let i = buf.indexOf(nl, 0); i !== -1 && i < n; i = buf.indexOf(nl, i + 1)) {
      line++;
      lineStart = pos + i + 1;
    }
    pos += n;
  }
  const prefix = new Uint8Array(offset - lineStart);
  await readAt(fh, file, prefix, prefix.length, lineStart);
  const column = new TextDecoder('utf-8').decode(prefix).length + 1;
  return { line, column };
}

function encodingError(file: string, line: number, column: number): CodeweirError {
  return new CodeweirError(
    'CW_ENCODING',
    `${file}: line ${line}, column ${column}: the bytes are not valid UTF-8; if the file was saved by a spreadsheet program, read it with --encoding windows-1252.`,
    { file, line, column },
  );
}

/** Throws CW_ENCODING for the invalid UTF-8 inside `bytes`, which begin at byte `base` of the file. */
async function throwEncoding(fh: FileHandle, file: string, bytes: Uint8Array, base: number, newline: 'lf' | 'cr'): Promise<never> {
  const at = firstInvalidUtf8(bytes);
  const { line, column } = await locateByte(fh, file, base + (at === -1 ? bytes.length : at), newline);
  throw encodingError(file, line, column);
}

/**
 * Reads the header from the first block and settles encoding, delimiter and terminator.
 * Cost: one read of 64 KiB (more only when the header row is longer).
 */
export async function readLayout(file: string, options: NormalizedOptions): Promise<Layout> {
  const { fh, size } = await openForRead(file);
  try {
    if (size === 0) throw new CodeweirError('CW_FILE_EMPTY', `The data file ${file} is empty (0 bytes).`, { file });
    let want = Math.min(size, SAMPLE_BYTES);
    for (;;) {
      const bytes = new Uint8Array(want);
      const got = await readAt(fh, file, bytes, want, 0);
      const sample = bytes.subarray(0, got);
      const whole = got >= size;
      const bom = detectBom(sample);
      // A byte-order mark is unambiguous, so it wins over --encoding.
      const encoding: Encoding = bom ? bom.encoding : (options.encoding ?? sniffUtf16(sample) ?? 'utf-8');
      const bomLength = bom ? bom.length : 0;
      const body = sample.subarray(bomLength);
      let text: string;
      try {
        text = makeDecoder(encoding).decode(body, whole);
      } catch {
        if (looksBinary(Buffer.from(body).toString('latin1'))) throw binaryError(file);
        return await throwEncoding(fh, file, body, bomLength, detectNewline(Buffer.from(body).toString('latin1')));
      }
      if (looksBinary(text)) throw binaryError(file);
      const newline = detectNewline(text);
      const delimiter = options.delimiter ?? detectDelimiter(text, newline, whole);
      const head = parseHeader(text, whole, { file, delimiter, newline, options });
      if (head === undefined) {
        want = Math.min(size, want * 4);
        continue;
      }
      return {
        file,
        size,
        encoding,
        hadBom: bomLength > 0,
        bomLength,
        delimiter,
        newline,
        header: head.header,
        dataStart: bomLength + encodedLength(text.slice(0, head.consumed), encoding),
        dataLine: head.nextLine,
        options,
      };
    }
  } finally {
    await fh.close();
  }
}

function binaryError(file: string): CodeweirError {
  return new CodeweirError(
    'CW_CSV_BINARY',
    `${file} is not a text file (its first block is full of control bytes); export the data as CSV and try again.`,
    { file },
  );
}

/**
 * Streams the rows in bytes [range.start, range.end) of a file whose layout is known. The range
 * must start at a row boundary. Rows are numbered from range.firstRow (default 1; 0 also means unknown), lines from
 * range.firstLine (default 1). Memory: two read buffers, one decoded block and one batch.
 */
export async function* rangeBatches(layout: Layout, range: ByteRange): AsyncGenerator<RowBatch> {
  const { file, options } = layout;
  const { fh } = await openForRead(file);
  try {
    const end = Math.min(range.end, layout.size);
    const tok = tokenizerFor(layout, range.firstLine || 1, end >= layout.size);
    const decoder = makeDecoder(layout.encoding);
    const blockSize = Math.max(4, Math.min(options.blockSize, Math.max(end - range.start, 4)));
    const buffers = [new Uint8Array(blockSize), new Uint8Array(blockSize)];
    let which = 0;
    let pos = range.start;
    const read = (into: Uint8Array, at: number) => readAt(fh, file, into, Math.min(into.length, end - at), at);
    let pending: Promise<number> | undefined = pos < end ? read(buffers[0] as Uint8Array, pos) : undefined;
    const batches = new BatchStream(range.firstRow || 1, options.batchRows ?? defaultBatchRows(layout.header.length));
    for (;;) {
      let text = '';
      let final = true;
      if (pending) {
        const buf = buffers[which] as Uint8Array;
        const n = await pending;
        const blockStart = pos;
        pos += n;
        final = n === 0 || pos >= end;
        which ^= 1;
        pending = final ? undefined : read(buffers[which] as Uint8Array, pos);
        try {
          text = decoder.decode(buf.subarray(0, n), final);
        } catch {
          if (pending) await pending.catch(() => 0);
          pending = undefined;
          return await throwEncoding(fh, file, buf.subarray(0, n), blockStart, layout.newline);
        }
      } else {
        text = decoder.decode(new Uint8Array(0), true);
      }
      tok.push(text, final);
      if (yield* batches.drain(tok)) return;
    }
  } finally {
    await fh.close();
  }
}

function deliveryOf(layout: Layout, range: ByteRange): Delivery {
  return {
    file: layout.file,
    header: layout.header,
    delimiter: layout.delimiter,
    encoding: layout.encoding,
    hadBom: layout.hadBom,
    newline: layout.newline,
    firstDataLine: layout.dataLine,
    batches: () => rangeBatches(layout, range),
  };
}

/**
 * Opens a delivery: reads the header (first non-blank row), detects the delimiter (`,` `;` tab
 * `|`, the one giving the most consistent field count over the first 50 rows) unless given,
 * the encoding (UTF-8 default; a UTF-8 or UTF-16 byte-order mark is honoured and removed;
 * UTF-16 without a mark is recognised by its zero bytes), and the row terminator.
 * `batches()` then streams the data rows in flat batches, numbered from 1, each row carrying the
 * physical line it starts on. Cost: one 64 KiB read now; each pass reads the file once in
 * blocks of `blockSize`, with memory independent of the number of rows.
 *
 * Throws CodeweirError (exit code 2): CW_FILE_NOT_FOUND, CW_FILE_IS_DIRECTORY,
 * CW_FILE_UNREADABLE, CW_FILE_EMPTY, CW_CSV_BINARY, CW_ENCODING (invalid UTF-8, with line and
 * column and a hint to pass --encoding windows-1252), CW_USAGE (bad options); while streaming,
 * CW_CSV_UNCLOSED_QUOTE and CW_CSV_FIELD_TOO_LARGE with line and column.
 *
 * @example
 * const d = await openDelivery('wave2.csv');
 * for await (const b of d.batches()) for (let r = 0; r < b.count; r++) b.fields[b.offsets[r]];
 */
export async function openDelivery(path: string, options: ReadOptions = {}): Promise<Delivery> {
  const layout = await readLayout(path, normalizeReadOptions(options));
  return deliveryOf(layout, { start: layout.dataStart, end: layout.size, firstRow: 1, firstLine: layout.dataLine });
}

/**
 * The rows of one byte range of a delivery (from {@link splitDelivery}): the header and
 * settings come from the file's first block, the rows from the range only. Rows and lines are
 * numbered from `range.firstRow` / `range.firstLine` (default 1, so numbering within the
 * range). Throws as {@link openDelivery}.
 */
export async function openDeliveryRange(path: string, range: ByteRange, options: ReadOptions = {}): Promise<RangeDelivery> {
  const layout = await readLayout(path, normalizeReadOptions(options));
  const start = Math.max(range.start, layout.dataStart);
  return { ...deliveryOf(layout, { ...range, start }), range };
}

/**
 * Tokenizes the whole file and counts data rows and fields, doing nothing else: the floor for
 * any pass over the file. Cost: one streaming pass. Throws as {@link openDelivery}.
 */
export async function tokenizeFile(path: string, options: ReadOptions = {}): Promise<{ rows: number; fields: number }> {
  const d = await openDelivery(path, options);
  let rows = 0;
  let fields = 0;
  for await (const b of d.batches()) {
    rows += b.count;
    fields += b.fields.length;
  }
  return { rows, fields };
}
