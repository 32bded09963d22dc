/**
 * Checking one delivery file on several cores. The file is cut at safe row boundaries into
 * byte ranges (`splitDelivery` of @codeweir/read), more ranges than threads, shared out through
 * one atomic counter: the calling thread and the worker threads each claim the next range, run the
 * single-thread pass over it (`createPass` -> `push` -> `finish`) and hand back its partial
 * result, whose typed arrays are transferred, not copied. The partials are merged in file
 * order (`mergePartials`) and finalized once, so the result is the one a single pass gives:
 * counts add, retained columns concatenate, duplicates across ranges resolve in row order.
 * While the calling thread merges, one worker computes the fence quartiles of the interval and
 * ratio items (the same selection finalize would run) on their joined columns, moved to it and
 * back without a copy.
 *
 * This module is also the worker's entry: started as a worker with the marker in
 * `workerData`, it compiles the codebook from its JSON source once and serves ranges.
 */
import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import { availableParallelism } from 'node:os';
import { stat } from 'node:fs/promises';
import { compileCodebook, type Codebook, type CompiledCodebook } from '@codeweir/codebook';
import { openDelivery, openDeliveryRange, splitDelivery, type ByteRange, type ReadOptions } from '@codeweir/read';
import { CodeweirError, isCodeweirError, workerEntry, type ErrorCode } from '@codeweir/core';
import type { QuantileType } from '@codeweir/stats';
import { createPass, detachPartial, attachPartial, type DetachedPartial, type PartialResult, type Pass } from './pass.ts';
import { mergePartials, finalize, fenceQuartiles, isFenced, joinColumn } from './finalize.ts';
import { normalizeCheckOptions, type CheckOptions, type CheckOptionsInput } from './options.ts';
import { checkDelivery } from './check.ts';
import type { CheckResult } from './types.ts';

/** Options of {@link checkFileParallel} on top of the check options. */
export interface ParallelOptions {
  /** Threads in all, the calling one included. Default: the number of cores. 1 = no workers. */
  threads?: number;
  /** Files smaller than this stay on one thread (worker start-up would cost more than it saves). Default 8 MiB. */
  minParallelBytes?: number;
  /** Ranges per thread; more ranges balance uneven start-up and row cost. Default 6. */
  rangesPerThread?: number;
  /**
   * Whether the calling thread checks ranges too while the workers start (default true). With
   * false every range goes to a worker (`threads` of them) and the calling thread stays free,
   * for a program that must keep responding.
   */
  useCallingThread?: boolean;
}

const MARKER = 'codeweir-check-worker';
const DEFAULT_MIN_PARALLEL_BYTES = 8 * 2 ** 20;
/** Ranges smaller than this are not worth a message round trip. */
const MIN_RANGE_BYTES = 1 * 2 ** 20;

interface WorkerInit {
  marker: typeof MARKER;
  path: string;
  source: unknown;
  codebookFile?: string;
  options: CheckOptions;
}
/** Every range, and the shared counter from which each thread claims the next one to check. */
type ToWorker = { ranges: ByteRange[]; next: Int32Array };
type FromWorker =
  | { index: number; partial: DetachedPartial }
  | { index: number; error: { code?: ErrorCode; message: string; codeweir: boolean } }
  | { done: true }
  | { quartiles: Array<[number, number] | null>; columns: Float64Array[] };
/** After its ranges, a worker computes the fence quartiles of some joined columns (and hands them back) or stops. */
type AfterRanges = { fences: Float64Array[]; quantileType: QuantileType } | { stop: true };

function readOptionsOf(o: CheckOptions): ReadOptions {
  return { delimiter: o.delimiter, encoding: o.encoding, maxFieldBytes: o.maxFieldBytes };
}

/**
 * Runs the thread's pass over one byte range. Rows are numbered from 1 within the range. The
 * thread keeps one pass (in `held`) for all its ranges of the file, so the engine optimizes its
 * functions once per thread, not again for each range (which cost a second of CPU in all).
 */
async function passOverRange(path: string, range: ByteRange, codebook: CompiledCodebook, options: CheckOptions, held: { pass?: Pass }): Promise<PartialResult> {
  const delivery = await openDeliveryRange(path, { start: range.start, end: range.end }, readOptionsOf(options));
  // Every range has the file's header, so the pass made for the first fits them all.
  const pass = (held.pass ??= createPass(codebook, delivery.header, options));
  for await (const batch of delivery.batches()) pass.push(batch);
  return pass.finish();
}

/**
 * Every ArrayBuffer under exactly one typed array of `value` (safe to transfer: the view arrives
 * with its offset and length, even when it covers only part of a grown buffer).
 */
function transferables(value: unknown): ArrayBuffer[] {
  const out = new Set<ArrayBuffer>();
  const seen = new Set<ArrayBuffer>();
  const visit = (v: unknown): void => {
    // Strings and numbers (most elements of the id and key lists) hold no buffer.
    if (v === null || typeof v !== 'object') return;
    if (ArrayBuffer.isView(v)) {
      const b = v.buffer as ArrayBuffer;
      // A buffer under two views would be detached while the other view is still in use.
      if (seen.has(b)) out.delete(b);
      else out.add(b);
      seen.add(b);
    } else if (Array.isArray(v)) {
      for (const x of v) visit(x);
    } else if (!(v instanceof Map) && !(v instanceof RegExp)) {
      for (const x of Object.values(v)) visit(x);
    }
  };
  visit(value);
  return [...out];
}

function rebuildError(e: { code?: ErrorCode; message: string; codeweir: boolean }): Error {
  return e.codeweir && e.code ? new CodeweirError(e.code, e.message) : new Error(e.message);
}

/**
 * Checks a delivery file on `threads` threads (default: the number of cores) and returns the
 * CheckResult that {@link checkFile} returns on one thread, identical to the byte: the same
 * summary, findings (row order, per-rule cap) and retained columns.
 * Convention: as checkFile (Hyndman-Fan type 7 quartiles unless `quantileType`).
 * Cost: one read of the file in all, split among the threads; memory is the retained columns
 * (8 bytes per row per numeric item, 2 per coded item) plus, briefly while merging, one more
 * copy of them; each worker costs a start-up (tens of milliseconds bundled, about a second
 * from TypeScript source). Files under `minParallelBytes` (8 MiB) are checked on one thread.
 * Throws what checkFile throws: CodeweirError for a missing, unreadable or malformed file (the
 * error is reproduced by a single-thread pass so that its line and column are exact) and
 * CW_USAGE for bad options.
 * @example const r = await checkFileParallel('wave2.csv', codebook, { threads: 2 });
 */
export async function checkFileParallel(path: string, codebook: CompiledCodebook, rawOptions: CheckOptionsInput & ParallelOptions = {}): Promise<CheckResult> {
  const { threads: rawThreads, minParallelBytes, rangesPerThread, useCallingThread, ...rest } = rawOptions;
  const options = normalizeCheckOptions(rest as CheckOptionsInput);
  const threads = rawThreads === undefined ? availableParallelism() : Number(rawThreads);
  if (!Number.isInteger(threads) || threads < 1) throw new CodeweirError('CW_USAGE', `--threads takes a whole number of at least 1, got ${String(rawThreads)}.`);
  // Opening first reports a missing or unreadable file, a bad encoding or delimiter at once.
  const delivery = await openDelivery(path, readOptionsOf(options));
  const size = (await stat(path)).size;
  const single = async (): Promise<CheckResult> => checkDelivery(await openDelivery(path, readOptionsOf(options)), codebook, options);
  if (threads === 1 || size < (minParallelBytes ?? DEFAULT_MIN_PARALLEL_BYTES)) return single();

  const caller = useCallingThread ?? true;
  const perThread = rangesPerThread ?? 6;
  // At least `threads` ranges (threads >= 2 here), at most perThread each, none under MIN_RANGE_BYTES.
  const wanted = minParallelBytes === 0 ? threads * perThread : Math.max(threads, Math.min(threads * perThread, Math.floor(size / MIN_RANGE_BYTES)));
  const entry = workerEntry(import.meta.url, 'check-worker.mjs');
  const init: WorkerInit = { marker: MARKER, path, source: codebook.source, codebookFile: codebook.file, options };
  // Workers start loading before the file is split: their start-up overlaps the split scan.
  const workers: Worker[] = [];
  for (let t = caller ? 1 : 0; t < threads; t++) workers.push(new Worker(entry.file, { eval: entry.eval, workerData: init }));
  let ranges: ByteRange[];
  try {
    // Sizes shrink towards the end of the file (the last quarter in ranges half as big), so the
    // threads run out of work at about the same time. Rows are numbered when merging. The cuts
    // are guessed near each target rather than found by a scan from the file's start (which
    // took a tenth of the run on quoted text, with the workers waiting for it): a wrong guess
    // makes the range before it fail, and any failure below redoes the check on one thread.
    ranges = await splitDelivery(path, rangeShares(wanted), readOptionsOf(options), { numbered: false, guess: true });
  } catch (e) {
    await Promise.all(workers.map((w) => w.terminate()));
    throw e;
  }
  if (ranges.length <= 1) {
    await Promise.all(workers.map((w) => w.terminate()));
    return single();
  }

  const partials: Array<PartialResult | undefined> = new Array(ranges.length);
  // The queue is one shared counter: every thread claims the next range itself, with no message
  // round trip, so none waits on another between ranges and the file's end is shared out evenly.
  const next = new Int32Array(new SharedArrayBuffer(4));
  let failure: Error | undefined;
  const fail = (e: Error): void => {
    failure ??= e;
    // No thread claims another range.
    Atomics.store(next, 0, ranges.length);
  };

  const serveWorker = (w: Worker): Promise<void> =>
    new Promise<void>((resolve) => {
      let done = false;
      w.on('message', (m: FromWorker) => {
        if ('quartiles' in m) return; // answered to the fences request below
        if ('done' in m) {
          done = true;
          resolve();
        } else if ('error' in m) fail(rebuildError(m.error));
        else partials[m.index] = attachPartial(m.partial, codebook);
      });
      w.on('error', (e) => {
        fail(e);
        resolve();
      });
      // A message that could not be read would otherwise leave its range's partial missing.
      w.on('messageerror', (e) => fail(e));
      w.on('exit', () => {
        if (!done) fail(new Error('A check worker thread stopped before it finished its ranges.'));
        resolve();
      });
      w.postMessage({ ranges, next } satisfies ToWorker);
    });

  const served = workers.map(serveWorker);
  // The calling thread works through the queue too.
  const held: { pass?: Pass } = {};
  try {
    for (let index = caller ? Atomics.add(next, 0, 1) : ranges.length; index < ranges.length && !failure; index = Atomics.add(next, 0, 1)) {
      partials[index] = await passOverRange(path, ranges[index]!, codebook, options, held);
    }
  } catch (e) {
    fail(e as Error);
  }
  held.pass = undefined;
  await Promise.all(served);
  if (failure) {
    await Promise.all(workers.map((w) => w.terminate()));
    // One pass from the start gives the error its exact line and column, and the right result
    // when a guessed cut fell inside a quoted field (the range before it failed on that).
    if (isCodeweirError(failure)) return single();
    throw failure;
  }
  // The fence quartiles of the interval and ratio items on one worker while this thread merges
  // the rest: their columns are joined first and moved (transferred, not copied) to the worker,
  // which sends them back with the quartiles. The other workers stop.
  const finished = partials as PartialResult[];
  const fenced = codebook.items.filter((item) => isFenced(item, finished[0]!.columns[item.index])).map((item) => item.index);
  const helper = fenced.length > 0 ? workers[0] : undefined;
  for (const w of workers) if (w !== helper) w.postMessage({ stop: true } satisfies AfterRanges);
  const joined = new Map(fenced.map((i) => [i, joinColumn(finished, i, true) as Float64Array]));
  const back = new Promise<Extract<FromWorker, { quartiles: unknown }> | undefined>((resolve) => {
    if (helper === undefined) return resolve(undefined);
    helper.on('message', (m: FromWorker) => {
      if ('quartiles' in m) resolve(m);
    });
    helper.once('exit', () => resolve(undefined));
    helper.once('error', () => resolve(undefined));
    const columns = fenced.map((i) => joined.get(i)!);
    helper.postMessage({ fences: columns, quantileType: options.quantileType } satisfies AfterRanges, columns.map((c) => c.buffer as ArrayBuffer));
  });
  const merged = mergePartials(finished, undefined, { release: true, joined });
  merged.file = delivery.file;
  const answer = await back;
  if (helper !== undefined) {
    // The columns went to the worker; without its answer they are gone, and one pass from the
    // start gives the result instead.
    if (answer === undefined) return single();
    fenced.forEach((i, k) => (merged.columns[i] = answer.columns[k]!));
  }
  return finalize(merged, { quartiles: answer && new Map(fenced.map((i, k) => [i, answer.quartiles[k]!])) });
}

async function serve(init: WorkerInit): Promise<void> {
  const port = parentPort!;
  const errorOf = (e: unknown): { code?: ErrorCode; message: string; codeweir: boolean } => ({ message: (e as Error).message, code: isCodeweirError(e) ? e.code : undefined, codeweir: isCodeweirError(e) });
  let codebook: CompiledCodebook | undefined;
  try {
    codebook = compileCodebook(init.source as Codebook, init.codebookFile);
  } catch (e) {
    port.postMessage({ index: -1, error: errorOf(e) } satisfies FromWorker);
  }
  port.once('message', async ({ ranges, next }: ToWorker) => {
    const held: { pass?: Pass } = {};
    // Claim ranges until the counter passes the last one (or a failure elsewhere pushed it there).
    for (let index = codebook ? Atomics.add(next, 0, 1) : ranges.length; index < ranges.length; index = Atomics.add(next, 0, 1)) {
      try {
        const partial = detachPartial(await passOverRange(init.path, ranges[index]!, codebook!, init.options, held));
        // The header map stays with the pass, which reads it for the next range: it is copied.
        const { header: _kept, ...moved } = partial;
        port.postMessage({ index, partial } satisfies FromWorker, transferables(moved));
      } catch (e) {
        Atomics.store(next, 0, ranges.length);
        port.postMessage({ index, error: errorOf(e) } satisfies FromWorker);
      }
    }
    // The pass's fresh accumulators and batch scratch are not needed any more.
    held.pass = undefined;
    port.postMessage({ done: true } satisfies FromWorker);
    // Then, at most once: the fence quartiles of the joined columns it is sent (handed back with
    // them) while the calling thread merges; or word that there is nothing more to do.
    port.once('message', (m: AfterRanges) => {
      if ('fences' in m) {
        const quartiles = m.fences.map((col) => fenceQuartiles(col, m.quantileType));
        port.postMessage({ quartiles, columns: m.fences } satisfies FromWorker, m.fences.map((c) => c.buffer as ArrayBuffer));
      }
      port.close();
    });
  });
}

/**
 * Relative sizes of `n` ranges: the first three quarters of the file in equal ranges, the last
 * quarter in ranges half that size, so no thread is left with a big range when the others finish.
 */
export function rangeShares(n: number): number[] {
  if (n < 4) return new Array<number>(n).fill(1);
  const small = Math.max(1, Math.round(n / 2));
  const big = n - small;
  const bigSize = 3 / (4 * big);
  const smallSize = 1 / (4 * small);
  return [...new Array<number>(big).fill(bigSize), ...new Array<number>(small).fill(smallSize)];
}

if (!isMainThread && (workerData as WorkerInit | undefined)?.marker === MARKER) {
  void serve(workerData as WorkerInit);
}
