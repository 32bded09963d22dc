/**
 * Deliveries in other formats: gzip-compressed delimited text, xlsx workbooks and Parquet
 * files. Each is read into the same flat row batches as a CSV file, with every cell as text,
 * so one classification judges every format: a typed cell (a Parquet integer, an xlsx number
 * or date) is handed on as the text of its value (`2`, `0.5`, `2026-03-02`) and classified as
 * if it had been written so in a CSV file. The delivered column types are kept on the Delivery
 * (`columnTypes`) so a caller can note where they disagree with the codebook's types.
 */
import { createReadStream } from 'node:fs';
import { createGunzip } from 'node:zlib';
import { CodeweirError } from '@codeweir/core';
import { BatchBuilder, BatchStream } from './tokenizer.ts';
import { parseHeader, tokenizerFor, type HeaderSettings } from './header.ts';
import { detectBom, detectDelimiter, detectNewline, looksBinary, sniffUtf16 } from './detect.ts';
import { makeDecoder } from './decode.ts';
import { fsError, openDelivery, openForRead } from './file.ts';
import { defaultBatchRows, normalizeReadOptions } from './options.ts';
import type { DeliveredType, Delivery, Encoding, ReadOptions, RowBatch } from './types.ts';

/** The input formats, by `--format` name. */
export const FORMATS = ['csv', 'csv.gz', 'xlsx', 'parquet'] as const;
export type DeliveryFormat = (typeof FORMATS)[number];

/**
 * The format of a delivery file from `format` (when given) or its name: `.gz` is csv.gz,
 * `.xlsx` xlsx, `.parquet` / `.parq` parquet, anything else (`.csv`, `.tsv`, `.txt`) csv.
 * Cost: O(1). Throws CodeweirError CW_USAGE for a format name that is not one of {@link FORMATS}.
 * @example formatOf('wave2.csv.gz') // 'csv.gz'
 */
export function formatOf(path: string, format?: string): DeliveryFormat {
  if (format !== undefined) {
    const f = String(format).toLowerCase().replace(/^\./, '');
    const named = f === 'gz' || f === 'csv.gz' ? 'csv.gz' : f === 'tsv' || f === 'txt' ? 'csv' : f;
    if (!(FORMATS as readonly string[]).includes(named)) throw new CodeweirError('CW_USAGE', `--format takes one of ${FORMATS.join(', ')}, got ${JSON.stringify(format)}.`);
    return named as DeliveryFormat;
  }
  const lower = path.toLowerCase();
  if (lower.endsWith('.gz')) return 'csv.gz';
  if (lower.endsWith('.xlsx')) return 'xlsx';
  if (lower.endsWith('.parquet') || lower.endsWith('.parq')) return 'parquet';
  return 'csv';
}

/** Read options plus the format and, for workbooks, the sheet. */
export interface AnyReadOptions extends ReadOptions {
  /** One of {@link FORMATS}; from the file name when absent. */
  format?: string;
  /** xlsx only: the worksheet's name (default: the first sheet). */
  sheet?: string;
}

/**
 * Opens a delivery in any supported format (see {@link formatOf}) as the same Delivery a CSV
 * file gives: `csv` through {@link openDelivery} unchanged; `csv.gz` decompressed as a stream
 * (never inflated to disk) into the same tokenizer; `xlsx` the first worksheet or `sheet`;
 * `parquet` row group by row group. `delimiter` and `encoding` apply to csv and csv.gz only.
 * Cost: as the format's reader; memory for xlsx is one row at a time (a streaming reader),
 * for Parquet one row group at a time. Throws CodeweirError (exit code 2): the file errors of
 * {@link openDelivery}, CW_FILE_UNREADABLE for a damaged gzip, workbook or Parquet file,
 * CW_USAGE for `sheet` on a non-workbook or a sheet name the workbook lacks.
 */
export async function openAnyDelivery(path: string, options: AnyReadOptions = {}): Promise<Delivery> {
  const { format, sheet, ...read } = options;
  const f = formatOf(path, format);
  if (sheet !== undefined && f !== 'xlsx') throw new CodeweirError('CW_USAGE', `--sheet applies to xlsx workbooks only; ${path} is read as ${f}.`);
  if ((f === 'xlsx' || f === 'parquet') && (read.delimiter !== undefined || read.encoding !== undefined)) {
    throw new CodeweirError('CW_USAGE', `--delimiter and --encoding apply to delimited text only; ${path} is read as ${f}.`);
  }
  switch (f) {
    case 'csv':
      return openDelivery(path, read);
    case 'csv.gz':
      return openGzipDelivery(path, read);
    case 'xlsx':
      return openXlsxDelivery(path, { ...read, sheet });
    case 'parquet':
      return openParquetDelivery(path, read);
  }
}

function unreadable(file: string, what: string, e: unknown): CodeweirError {
  const why = e instanceof Error ? e.message.split('\n')[0]!.replace(/\.$/, '') : String(e);
  return new CodeweirError('CW_FILE_UNREADABLE', `The data file ${file} cannot be read as ${what} (${why}).`, { file, cause: e });
}

// ---------------------------------------------------------------------------------------------
// csv.gz

/** Decompressed bytes of a gzip file, as a stream of chunks. */
async function* gunzipped(file: string): AsyncGenerator<Uint8Array> {
  const src = createReadStream(file);
  const stream = src.pipe(createGunzip());
  src.on('error', (e) => stream.destroy(e));
  try {
    for await (const chunk of stream) yield chunk as Uint8Array;
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'ENOENT' || code === 'EACCES' || code === 'EISDIR') throw fsError(e, file);
    throw unreadable(file, 'gzip-compressed text', e);
  } finally {
    stream.destroy();
    src.destroy();
  }
}

const SAMPLE_BYTES = 64 * 1024;

/**
 * A gzip-compressed delimited file: the first 64 KiB of decompressed bytes settle encoding,
 * delimiter and header exactly as for a plain file; each pass then decompresses the file again
 * as a stream, decodes and tokenizes it block by block. A gzip stream cannot be cut at byte
 * offsets, so a compressed delivery is read on one thread. Invalid UTF-8 is CW_ENCODING with the
 * line reached (a column cannot be given for decompressed bytes).
 */
async function openGzipDelivery(file: string, read: ReadOptions): Promise<Delivery> {
  const options = normalizeReadOptions(read);
  await (await openForRead(file)).fh.close();
  const head: Uint8Array[] = [];
  let got = 0;
  for await (const chunk of gunzipped(file)) {
    head.push(chunk);
    got += chunk.length;
    if (got >= SAMPLE_BYTES) break;
  }
  const sample = Buffer.concat(head);
  const whole = got < SAMPLE_BYTES;
  if (sample.length === 0) throw new CodeweirError('CW_FILE_EMPTY', `The data file ${file} is empty (0 bytes once decompressed).`, { file });
  const bom = detectBom(sample);
  const encoding: Encoding = bom ? bom.encoding : (options.encoding ?? sniffUtf16(sample) ?? 'utf-8');
  const bomLength = bom ? bom.length : 0;
  let text: string;
  try {
    text = makeDecoder(encoding).decode(sample.subarray(bomLength), whole);
  } catch {
    throw gzEncodingError(file, 1);
  }
  if (looksBinary(text)) throw new CodeweirError('CW_CSV_BINARY', `${file} does not hold text once decompressed; export the data as CSV and try again.`, { file });
  const newline = detectNewline(text);
  const delimiter = options.delimiter ?? detectDelimiter(text, newline, whole);
  const settings: HeaderSettings = { file, delimiter, newline, options };
  // The header row must lie within the sample (64 KiB of decompressed text is far beyond any header).
  const header = parseHeader(text, true, settings);
  if (header === undefined) throw new CodeweirError('CW_FILE_UNREADABLE', `${file}: the header row is longer than 64 KiB.`, { file });
  return {
    file,
    header: header.header,
    delimiter,
    encoding,
    hadBom: bomLength > 0,
    newline,
    firstDataLine: header.nextLine,
    format: 'csv.gz',
    batches: () => gzipBatches(file, encoding, bomLength, header.consumed, header.nextLine, settings, header.header.length),
  };
}

function gzEncodingError(file: string, line: number): CodeweirError {
  return new CodeweirError(
    'CW_ENCODING',
    `${file}: near line ${line} of the decompressed text, the bytes are not valid UTF-8; if the file was saved by a spreadsheet program, read it with --encoding windows-1252.`,
    { file, line },
  );
}

async function* gzipBatches(file: string, encoding: Encoding, bomLength: number, skipChars: number, firstLine: number, s: HeaderSettings, columns: number): AsyncGenerator<RowBatch> {
  const tok = tokenizerFor(s, firstLine, true);
  const batches = new BatchStream(1, s.options.batchRows ?? defaultBatchRows(columns));
  const decoder = makeDecoder(encoding);
  let skipBytes = bomLength;
  let skip = skipChars;
  const feed = (bytes: Uint8Array, final: boolean): void => {
    let text: string;
    try {
      text = decoder.decode(bytes, final);
    } catch {
      throw gzEncodingError(file, tok.line);
    }
    if (skip > 0) {
      const cut = Math.min(skip, text.length);
      skip -= cut;
      text = text.slice(cut);
    }
    tok.push(text, final);
  };
  for await (const chunk of gunzipped(file)) {
    let bytes = chunk;
    if (skipBytes > 0) {
      const cut = Math.min(skipBytes, bytes.length);
      skipBytes -= cut;
      bytes = bytes.subarray(cut);
    }
    feed(bytes, false);
    if (yield* batches.drain(tok)) return;
  }
  feed(new Uint8Array(0), true);
  yield* batches.drain(tok);
}

// ---------------------------------------------------------------------------------------------
// Typed cells as text

/** Days of a Date at UTC midnight as YYYY-MM-DD; with a time of day, YYYY-MM-DD HH:MM:SS. */
function dateText(d: Date): string {
  const iso = d.toISOString();
  const day = iso.slice(0, 10);
  const time = iso.slice(11, 19);
  const ms = iso.slice(19, 23);
  if (time === '00:00:00' && ms === '.000') return day;
  return `${day} ${time}${ms === '.000' ? '' : ms}`;
}

/** A timestamp as YYYY-MM-DD HH:MM:SS (UTC), milliseconds appended when there are any. */
function timestampText(d: Date): string {
  const iso = d.toISOString();
  const ms = iso.slice(19, 23);
  return `${iso.slice(0, 10)} ${iso.slice(11, 19)}${ms === '.000' ? '' : ms}`;
}

/**
 * The text form of a typed cell, the form the classifiers judge: numbers as JavaScript's
 * shortest round-trip text (`2`, `0.1`, `-9`), big integers in full, dates as YYYY-MM-DD (a time
 * of day appended when there is one), booleans as `true` / `false`, absent values as an empty
 * (blank) cell. Pure; O(length of the text). Throws nothing.
 * @example cellText(2.5) // '2.5'
 */
export function cellText(v: unknown): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'string') return v;
  if (typeof v === 'number') return Number.isFinite(v) ? String(v + 0) : String(v);
  if (typeof v === 'bigint' || typeof v === 'boolean') return String(v);
  if (v instanceof Date) return Number.isNaN(v.getTime()) ? '' : dateText(v);
  if (v instanceof Uint8Array) return Buffer.from(v).toString('utf8');
  return JSON.stringify(v, (_k, x) => (typeof x === 'bigint' ? String(x) : x));
}

/** Rows of text cells, cut into batches of at most `batchRows` rows numbered from `firstRow`. */
class RowCollector {
  private out: BatchBuilder;
  constructor(
    private row: number,
    private readonly batchRows: number,
  ) {
    this.out = new BatchBuilder(row, batchRows);
  }
  add(fields: readonly string[], line: number): RowBatch | undefined {
    const out = this.out;
    for (const f of fields) out.fields.push(f);
    out.endRow(line);
    if (out.count >= this.batchRows) return this.flush();
    return undefined;
  }
  flush(): RowBatch | undefined {
    if (this.out.count === 0) return undefined;
    this.row += this.out.count;
    const b = this.out.finish();
    this.out = new BatchBuilder(this.row, this.batchRows);
    return b;
  }
}

// ---------------------------------------------------------------------------------------------
// xlsx

interface XlsxOptions extends ReadOptions {
  sheet?: string;
}

/** The delivered type of an xlsx cell value. */
function xlsxType(v: unknown): DeliveredType | undefined {
  if (v === null || v === undefined || v === '') return undefined;
  if (typeof v === 'number') return Number.isInteger(v) ? 'integer' : 'decimal';
  if (typeof v === 'boolean') return 'boolean';
  if (v instanceof Date) return 'date';
  return 'text';
}

/** A cell's value once formulas, rich text, hyperlinks and errors are unwrapped. */
function xlsxValue(v: unknown): unknown {
  if (v === null || v === undefined) return v;
  if (typeof v !== 'object' || v instanceof Date) return v;
  const o = v as Record<string, unknown>;
  if ('result' in o) return xlsxValue(o.result);
  if ('richText' in o && Array.isArray(o.richText)) return (o.richText as Array<{ text: string }>).map((r) => r.text).join('');
  if ('text' in o) return xlsxValue(o.text);
  if ('error' in o) return String(o.error);
  return cellText(v);
}

/** The kind of column a set of delivered cell kinds makes. */
function columnKind(seen: ReadonlySet<DeliveredType>): DeliveredType {
  if (seen.size === 0) return 'text';
  if (seen.size === 1) return [...seen][0]!;
  if (seen.has('text')) return 'text';
  return [...seen].every((t) => t === 'integer' || t === 'decimal') ? 'decimal' : 'mixed';
}

interface SheetRow {
  /** 1-based row number in the sheet. */
  number: number;
  values: unknown[];
}

/**
 * The rows of one worksheet, streamed with exceljs's streaming workbook reader (one row in
 * memory at a time; the reader parks worksheets that come before the shared strings in the
 * archive in temporary files, which it removes). `sheet` names the worksheet; absent, the
 * workbook's first. Calls `found` with the sheet's name before its first row. Throws
 * CW_FILE_UNREADABLE for a file that is not a workbook, CW_USAGE for a sheet name the
 * workbook lacks.
 */
async function* sheetRows(file: string, sheet: string | undefined, found: (name: string) => void): AsyncGenerator<SheetRow> {
  const { default: ExcelJS } = await import('exceljs');
  const reader = new ExcelJS.stream.xlsx.WorkbookReader(file, { sharedStrings: 'cache', hyperlinks: 'ignore', styles: 'cache', worksheets: 'emit', entries: 'ignore' });
  let seen = false;
  try {
    for await (const ws of reader as unknown as AsyncIterable<AsyncIterable<{ number: number; values: unknown }> & { name: string }>) {
      const sheets = ((reader as unknown as { model?: { sheets?: Array<{ name: string }> } }).model?.sheets ?? []).map((x) => x.name);
      const want = sheet ?? sheets[0] ?? ws.name;
      if (seen || ws.name !== want) {
        for await (const _row of ws) void _row;
        continue;
      }
      seen = true;
      found(ws.name);
      for await (const row of ws) {
        const values = Array.isArray(row.values) ? (row.values as unknown[]).slice(1).map(xlsxValue) : [];
        yield { number: row.number, values };
      }
    }
  } catch (e) {
    if (e instanceof CodeweirError) throw e;
    throw unreadable(file, 'an xlsx workbook', e);
  }
  if (!seen) {
    const names = ((reader as unknown as { model?: { sheets?: Array<{ name: string }> } }).model?.sheets ?? []).map((x) => x.name);
    if (sheet === undefined) throw new CodeweirError('CW_FILE_EMPTY', `The workbook ${file} has no worksheet.`, { file });
    throw new CodeweirError('CW_USAGE', `--sheet: the workbook ${file} has no sheet ${JSON.stringify(sheet)} (it has ${names.map((n) => JSON.stringify(n)).join(', ')}).`, { file });
  }
}

/**
 * An xlsx workbook: the first worksheet, or the one named `sheet`. Row 1 is the header; every
 * later row (empty rows inside the data kept as rows of blank cells, trailing empty rows
 * dropped) is a data row with as many cells as the header. Read with exceljs's streaming
 * reader: opening reads up to the header row; each pass streams the sheet again, row by row.
 * `columnTypes` is complete once a pass has ended.
 */
async function openXlsxDelivery(file: string, options: XlsxOptions): Promise<Delivery> {
  const opts = normalizeReadOptions(options);
  await (await openForRead(file)).fh.close();
  let header: string[] | undefined;
  let name = '';
  for await (const row of sheetRows(file, options.sheet, (n) => (name = n))) {
    if (row.values.every((v) => cellText(v) === '')) continue;
    header = row.values.map(cellText);
    break;
  }
  if (header === undefined) throw new CodeweirError('CW_FILE_EMPTY', `The worksheet ${name} of ${file} is empty.`, { file });
  while (header.length > 0 && header[header.length - 1] === '') header.pop();
  const width = header.length;
  const cols = header;
  const batchRows = opts.batchRows ?? defaultBatchRows(width);
  const delivery: Delivery = {
    file,
    header,
    delimiter: '',
    encoding: 'utf-8',
    hadBom: false,
    firstDataLine: 2,
    format: 'xlsx',
    sheet: name,
    batches: async function* () {
      const seen: Array<Set<DeliveredType>> = cols.map(() => new Set());
      const rc = new RowCollector(1, batchRows);
      const fields: string[] = new Array(width);
      const blank: string[] = new Array(width).fill('');
      let inHeader = true;
      let last = 0;
      /** Empty rows are held back until a later row has data: trailing empty rows are dropped. */
      let held: number[] = [];
      for await (const row of sheetRows(file, options.sheet, () => undefined)) {
        if (inHeader) {
          if (row.values.every((v) => cellText(v) === '')) continue;
          inHeader = false;
          last = row.number;
          continue;
        }
        for (let n = last + 1; n < row.number; n++) held.push(n);
        last = row.number;
        let any = false;
        for (let c = 0; c < width; c++) {
          const v = row.values[c];
          fields[c] = cellText(v);
          if (fields[c] !== '') any = true;
          const t = xlsxType(v);
          if (t !== undefined) seen[c]!.add(t);
        }
        if (!any) {
          held.push(row.number);
          continue;
        }
        for (const n of held) {
          const b = rc.add(blank, n);
          if (b) yield b;
        }
        held = [];
        const b = rc.add(fields, row.number);
        if (b) yield b;
      }
      const tail = rc.flush();
      if (tail) yield tail;
      delivery.columnTypes = Object.fromEntries(cols.map((h, c) => [h, columnKind(seen[c]!)]));
    },
  };
  return delivery;
}

// ---------------------------------------------------------------------------------------------
// Parquet

interface ParquetSchemaElement {
  name: string;
  type?: string;
  converted_type?: string;
  logical_type?: { type: string };
  num_children?: number;
}

/** The delivered type of a Parquet column from its physical and logical types. */
function parquetType(el: ParquetSchemaElement): DeliveredType {
  const logical = el.logical_type?.type;
  const conv = el.converted_type;
  if (logical === 'DATE' || conv === 'DATE') return 'date';
  if (logical === 'TIMESTAMP' || conv === 'TIMESTAMP_MILLIS' || conv === 'TIMESTAMP_MICROS' || el.type === 'INT96') return 'timestamp';
  if (logical === 'DECIMAL' || conv === 'DECIMAL') return 'decimal';
  if (logical === 'STRING' || conv === 'UTF8' || logical === 'ENUM' || conv === 'ENUM') return 'text';
  switch (el.type) {
    case 'BOOLEAN':
      return 'boolean';
    case 'INT32':
    case 'INT64':
      return 'integer';
    case 'FLOAT':
    case 'DOUBLE':
      return 'decimal';
    case 'BYTE_ARRAY':
    case 'FIXED_LEN_BYTE_ARRAY':
      return 'text';
    default:
      return 'mixed';
  }
}

/**
 * A Parquet file read with hyparquet, one row group at a time (memory: one row group's
 * columns). Top-level columns are the header; nested columns are handed on as JSON text.
 */
async function openParquetDelivery(file: string, read: ReadOptions): Promise<Delivery> {
  const opts = normalizeReadOptions(read);
  const { size } = await openForRead(file).then(async (h) => (await h.fh.close(), h));
  if (size === 0) throw new CodeweirError('CW_FILE_EMPTY', `The data file ${file} is empty (0 bytes).`, { file });
  const hp = await import('hyparquet');
  let buffer: Awaited<ReturnType<typeof hp.asyncBufferFromFile>>;
  let metadata: Awaited<ReturnType<typeof hp.parquetMetadataAsync>>;
  try {
    buffer = await hp.asyncBufferFromFile(file);
    metadata = await hp.parquetMetadataAsync(buffer);
  } catch (e) {
    throw unreadable(file, 'a Parquet file', e);
  }
  const tree = hp.parquetSchema(metadata);
  const top = tree.children.map((c) => c.element as ParquetSchemaElement);
  const header = top.map((el) => el.name);
  const columnTypes: Record<string, DeliveredType> = {};
  for (const el of top) columnTypes[el.name] = el.num_children ? 'mixed' : parquetType(el);
  const batchRows = opts.batchRows ?? defaultBatchRows(header.length);
  const groups = metadata.row_groups.map((g) => Number(g.num_rows));
  // A timestamp keeps its time of day even at midnight: it is not a calendar day.
  const stamped = header.map((h) => columnTypes[h] === 'timestamp');
  return {
    file,
    header,
    delimiter: '',
    encoding: 'utf-8',
    hadBom: false,
    firstDataLine: 1,
    format: 'parquet',
    columnTypes,
    batches: async function* () {
      const rc = new RowCollector(1, batchRows);
      const fields: string[] = new Array(header.length);
      let start = 0;
      for (const n of groups) {
        let rows: unknown[][] = [];
        try {
          await hp.parquetRead({ file: buffer, metadata, rowStart: start, rowEnd: start + n, onComplete: (r: unknown[][]) => (rows = r) });
        } catch (e) {
          throw unreadable(file, 'a Parquet file', e);
        }
        for (let r = 0; r < rows.length; r++) {
          const row = rows[r]!;
          for (let c = 0; c < header.length; c++) fields[c] = stamped[c] && row[c] instanceof Date ? timestampText(row[c] as Date) : cellText(row[c]);
          const b = rc.add(fields, start + r + 1);
          if (b) yield b;
        }
        start += n;
      }
      const last = rc.flush();
      if (last) yield last;
    },
  };
}
