/**
 * The row source contract. A delivery is read as batches of rows laid out flat: no object per
 * row. Row `r` of a batch has fields `fields[offsets[r]] .. fields[offsets[r+1]-1]`.
 */
export type Encoding = 'utf-8' | 'windows-1252' | 'latin1' | 'utf-16le' | 'utf-16be';

export interface ReadOptions {
  /** One character; detected from the header line when absent (`,` `;` tab `|`). */
  delimiter?: string;
  /** Default utf-8 (BOM accepted and removed). A UTF-16 BOM is detected and decoded. */
  encoding?: Encoding;
  /** Largest field allowed, in bytes; a larger one is a CodeweirError CW_CSV_FIELD_TOO_LARGE. */
  maxFieldBytes?: number;
  /** Rows per batch (a hint). */
  batchRows?: number;
  /**
   * Size of each read, in bytes for files and characters for in-memory text (default 8 MiB).
   * Small values exist for tests of chunk seams.
   */
  blockSize?: number;
  /** Name used in error messages for {@link readDeliveryText} input (default `<text>`). */
  name?: string;
}

export interface RowBatch {
  /** Number of rows in the batch. */
  count: number;
  /** 1-based data row number of the batch's first row (header excluded). */
  firstRow: number;
  fields: string[];
  /** Length count + 1. */
  offsets: Uint32Array;
  /** 1-based physical line on which each row starts (length count). */
  lines: Uint32Array;
}

/**
 * The type a typed format (xlsx, Parquet) delivered a column as: `integer`, `decimal`, `text`,
 * `date`, `timestamp` (a date with a time of day), `boolean`, or `mixed` (cells of several kinds).
 */
export type DeliveredType = 'integer' | 'decimal' | 'text' | 'date' | 'timestamp' | 'boolean' | 'mixed';

export interface Delivery {
  file?: string;
  /** The format read (`csv` when absent): `csv.gz`, `xlsx` or `parquet` for the other readers. */
  format?: 'csv' | 'csv.gz' | 'xlsx' | 'parquet';
  /** xlsx: the worksheet read. */
  sheet?: string;
  /** Typed formats: the delivered type of each column, by header name. Absent for delimited text. */
  columnTypes?: Record<string, DeliveredType>;
  header: string[];
  delimiter: string;
  encoding: Encoding;
  hadBom: boolean;
  /** Streams the data rows after the header. Each call starts a fresh pass. */
  batches(): AsyncIterable<RowBatch>;
  /** Row terminator found in the first block: LF (CRLF accepted) or CR alone. */
  newline?: 'lf' | 'cr';
  /** 1-based physical line of the first data row (after the header and any blank lines before it). */
  firstDataLine?: number;
}

/**
 * A byte range of a delivery's data rows, cut at a row boundary. `firstRow` and `firstLine`
 * number the range's first row within the whole file.
 */
export interface ByteRange {
  start: number;
  end: number;
  firstRow?: number;
  firstLine?: number;
}

/** The rows of one byte range, numbered from the range's firstRow/firstLine (default 1). */
export interface RangeDelivery extends Delivery {
  range: ByteRange;
}
