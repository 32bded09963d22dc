/**
 * The library entry points: check rows from any (async) iterable, a Delivery, or a file.
 */
import type { CompiledCodebook } from '@codeweir/codebook';
import type { Delivery, RowBatch } from '@codeweir/read';
import { openDelivery } from '@codeweir/read';
import { availableParallelism } from 'node:os';
import { CodeweirError } from '@codeweir/core';
import { createPass } from './pass.ts';
import { finalize } from './finalize.ts';
import { normalizeCheckOptions, type CheckOptionsInput } from './options.ts';
import type { CheckResult } from './types.ts';
import type { ParallelOptions } from './parallel.ts';

type Row = string[] | Record<string, string>;

function isAsync<T>(x: Iterable<T> | AsyncIterable<T>): x is AsyncIterable<T> {
  return typeof (x as AsyncIterable<T>)[Symbol.asyncIterator] === 'function';
}

/**
 * Checks rows against a compiled codebook. Array rows are laid out in codebook item order
 * (the header is the item names); record rows are keyed by column name, the header being the
 * first record's keys (a key absent from a later record reads as a blank cell, keys not in the
 * header are ignored).
 * Convention and findings: as {@link createPass} and {@link finalize} (quartiles Hyndman-Fan
 * type 7 unless `quantileType`). Cost: O(rows x items). Throws CodeweirError CW_USAGE for bad options.
 * @example await check([['1', '34']], codebook) // CheckResult for one row
 */
export async function check(rows: Iterable<Row> | AsyncIterable<Row>, codebook: CompiledCodebook, rawOptions: CheckOptionsInput = {}): Promise<CheckResult> {
  const options = normalizeCheckOptions(rawOptions);
  let pass: ReturnType<typeof createPass> | undefined;
  let header: string[] | undefined;
  let fields: string[] = [];
  let offsets: number[] = [0];
  let firstRow = 1;
  const flush = (): void => {
    if (!pass || offsets.length === 1) return;
    const count = offsets.length - 1;
    const batch: RowBatch = { count, firstRow, fields, offsets: Uint32Array.from(offsets), lines: new Uint32Array(count) };
    pass.push(batch);
    firstRow += count;
    fields = [];
    offsets = [0];
  };
  const take = (row: Row): void => {
    if (header === undefined) {
      header = Array.isArray(row) ? codebook.items.map((i) => i.name) : Object.keys(row);
      pass = createPass(codebook, header, options);
    }
    if (Array.isArray(row)) for (const c of row) fields.push(c == null ? '' : String(c));
    else for (const h of header) fields.push(row[h] == null ? '' : String(row[h]));
    offsets.push(fields.length);
    if (offsets.length > options.batchRows) flush();
  };
  if (isAsync(rows)) for await (const row of rows) take(row);
  else for (const row of rows) take(row);
  if (pass === undefined) pass = createPass(codebook, codebook.items.map((i) => i.name), options);
  flush();
  return finalize(pass.finish());
}

/**
 * Checks an opened delivery: its header against the codebook, then every batch of rows.
 * Convention: as {@link check}. Cost: one streaming pass over the file, O(rows x items) memory
 * only for retained typed columns. Throws what the delivery's reader throws (CodeweirError for
 * unreadable input, exit code 2) and CW_USAGE for bad options.
 */
export async function checkDelivery(delivery: Delivery, codebook: CompiledCodebook, rawOptions: CheckOptionsInput = {}): Promise<CheckResult> {
  const pass = createPass(codebook, delivery.header, rawOptions);
  for await (const batch of delivery.batches()) pass.push(batch);
  const partial = pass.finish();
  if (delivery.file !== undefined) partial.file = delivery.file;
  return finalize(partial);
}

/**
 * Opens a delivery file with @codeweir/read (delimiter and encoding from the options, detected
 * otherwise) and checks it, on `threads` threads (default: the number of cores,
 * `os.availableParallelism()`; 1 = this thread only). With more than one thread the work goes
 * to {@link checkFileParallel}, whose result is the single-thread one to the byte; files under
 * its minimum size (8 MiB) stay on this thread, since starting workers would cost more than it
 * saves. The file is only read, never changed.
 * Convention: as {@link check}. Cost: one streaming pass, shared among the threads. Throws
 * CodeweirError for a missing, unreadable or malformed file (exit code 2) and CW_USAGE for bad
 * options (a `threads` that is not a whole number of at least 1 among them).
 * @example await checkFile('wave2.csv', codebook, { threads: 1 }) // CheckResult, one thread
 */
export async function checkFile(path: string, codebook: CompiledCodebook, rawOptions: CheckOptionsInput & ParallelOptions = {}): Promise<CheckResult> {
  const { threads, minParallelBytes, rangesPerThread, useCallingThread, ...rest } = rawOptions;
  const options = normalizeCheckOptions(rest);
  const wanted = threads === undefined ? availableParallelism() : Number(threads);
  if (!Number.isInteger(wanted) || wanted < 1) throw new CodeweirError('CW_USAGE', `--threads takes a positive whole number, got ${String(threads)}.`);
  if (wanted > 1) {
    // Loaded only when needed: a one-thread check never starts the worker machinery.
    const { checkFileParallel } = await import('./parallel.ts');
    return checkFileParallel(path, codebook, { ...rest, threads: wanted, minParallelBytes, rangesPerThread, useCallingThread });
  }
  const delivery = await openDelivery(path, { delimiter: options.delimiter, encoding: options.encoding, maxFieldBytes: options.maxFieldBytes });
  return checkDelivery(delivery, codebook, options);
}
