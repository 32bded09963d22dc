/**
 * Describing the items of a large delivery on several cores. The interval and ratio items,
 * each summarised from a sort of its values, are the bulk of the work; they are shared out
 * through one atomic counter between the calling thread and worker threads, which claim the
 * next item as they come free (a worker that is still starting simply claims fewer). The other
 * items and the assembling stay on the calling thread. The pairs are shared out the same way
 * once the items are claimed (see pairs-parallel.ts). Every item and pair is described by the
 * same function from the same values, so the result equals `describe` exactly.
 *
 * This module is also the worker's entry: started as a worker with the marker in
 * `workerData`, it compiles the codebook from its JSON source and describes the items it claims.
 */
import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import { availableParallelism } from 'node:os';
import { compileCodebook, type Codebook, type CompiledCodebook } from '@codeweir/codebook';
import type { CheckResult, ItemColumn } from '@codeweir/check';
import { workerEntry } from '@codeweir/core';
import type { DescribeResult, PairDescription } from './types.ts';
import { normalizeDescribeOptions, type DescribeOptions, type DescribeOptionsInput, type NormalizedDescribeOptions } from './options.ts';
import { resolveWeight, weightsFor } from './weights.ts';
import { describePairs, requestedPairs } from './pairs.ts';
import { assemblePairs, claimPairs, sharePairs, type PairShare } from './pairs-parallel.ts';
import { assembleDescription, describeItem, isContinuous, type ItemPart } from './describe.ts';
import { designWeightName } from './design.ts';

const MARKER = 'codeweir-describe-worker';
/** Below this many rows the items are described on the calling thread (a worker's start costs more). */
const DEFAULT_MIN_ROWS = 200_000;

interface WorkerInit {
  marker: typeof MARKER;
  source: unknown;
  codebookFile?: string;
}
/** The items to share, in claiming order, and the counter each thread claims the next one from. */
interface Job {
  items: Array<{ name: string; values: Float64Array; tally: CheckResult['summary']['items'][string] | undefined; weighted: boolean }>;
  weights: Float64Array | undefined;
  opts: NormalizedDescribeOptions;
  next: Int32Array;
  /** Whether a PairShare follows, to be claimed once the items are done. */
  pairs: boolean;
}
type FromWorker = { name: string; part: ItemPart } | { pair: number; description: PairDescription } | { done: true };

/** Options of {@link describeParallel}. */
export interface DescribeThreads {
  /** Threads in all, the calling one included. Default: the number of cores. 1 = no workers. */
  threads?: number;
  /** Deliveries with fewer rows are described on the calling thread. Default 200,000. */
  minRows?: number;
  /**
   * Whether the calling thread claims interval and ratio items too (default true). With false
   * the workers (`threads - 1` of them, at least one) take them all unless they fail.
   */
  useCallingThread?: boolean;
}

/** A copy of `values` in a SharedArrayBuffer, which every worker then reads without a copy of its own. */
function shared(values: Float64Array): Float64Array {
  const out = new Float64Array(new SharedArrayBuffer(values.byteLength));
  out.set(values);
  return out;
}

/** The part of a check result that describing one item reads: the item's tallies. */
function tallyOnly(name: string, tally: Job['items'][number]['tally']): CheckResult {
  return { summary: { items: tally ? { [name]: tally } : {} } } as unknown as CheckResult;
}

/**
 * Describes a checked delivery as {@link describe} does, and returns the identical result, with
 * the interval and ratio items spread over `threads` threads (default: the number of cores).
 * Convention: as describe (quantiles of the chosen Hyndman-Fan type, sd with n - 1, ...).
 * Cost: describe's work, its sorts shared among the threads; each worker costs a start-up (a
 * few hundred milliseconds, overlapped with the calling thread's own items). The interval and
 * ratio columns (and the weights) are copied once into SharedArrayBuffers that every worker
 * reads: 8 bytes per row per such item, however many workers there are. Deliveries under
 * `minRows` rows, or with fewer than two such items, are described on the calling thread. Throws what describe throws (CW_USAGE for bad options),
 * before any thread starts. A worker that fails leaves its items to the calling thread.
 * @example const d = await describeParallel(checkResult, codebook, { weight: 'w' }, { threads: 2 });
 */
export async function describeParallel(
  result: CheckResult,
  codebook: CompiledCodebook,
  options: DescribeOptions | DescribeOptionsInput | NormalizedDescribeOptions = {},
  how: DescribeThreads = {},
): Promise<DescribeResult> {
  const opts = normalizeDescribeOptions(options as DescribeOptionsInput);
  const weight = resolveWeight(result.store, codebook, designWeightName(codebook, opts));
  // Pairs checked first: a bad pair name fails before any work on the items (as in describe).
  const pairNames = opts.pairs === 'all' || opts.pairs.length > 0 ? requestedPairs(result, codebook, opts) : [];
  let pairs: PairDescription[] | undefined;
  const store = result.store;
  const heavy = codebook.items.filter((item) => isContinuous(item, store.columns[item.name]));
  const threads = how.threads ?? availableParallelism();
  const parts = new Map<string, ItemPart>();
  const one = (name: string): ItemPart => describeItem(codebook.byName.get(name)!, store.columns[name]!, result, opts, weightsFor(weight, name));
  if (threads > 1 && Math.max(heavy.length, pairNames.length) >= 2 && store.rows >= (how.minRows ?? DEFAULT_MIN_ROWS)) {
    const next = new Int32Array(new SharedArrayBuffer(4));
    const job: Job = {
      items: heavy.map((item) => {
        const col = store.columns[item.name] as Extract<ItemColumn, { kind: 'numeric' }>;
        return { name: item.name, values: shared(col.values), tally: result.summary.items[item.name], weighted: weightsFor(weight, item.name) !== undefined };
      }),
      weights: weight ? shared(weight.weights) : undefined,
      opts,
      next,
      pairs: pairNames.length > 0,
    };
    const entry = workerEntry(import.meta.url, 'describe-worker.mjs');
    const init: WorkerInit = { marker: MARKER, source: codebook.source, codebookFile: codebook.file };
    const workers: Worker[] = [];
    const caller = how.useCallingThread ?? true;
    // Beside the calling thread threads - 1 workers, no more than there are items to share;
    // without it, at least one.
    const work = Math.max(heavy.length, pairNames.length);
    const nWorkers = caller ? Math.min(threads, work) - 1 : Math.max(1, Math.min(threads - 1, work));
    for (let t = 0; t < nWorkers; t++) workers.push(new Worker(entry.file, { eval: entry.eval, workerData: init }));
    const gotPairs = new Map<number, PairDescription>();
    const served = workers.map(
      (w) =>
        new Promise<void>((resolve) => {
          w.on('message', (m: FromWorker) => {
            if ('done' in m) resolve();
            else if ('pair' in m) gotPairs.set(m.pair, m.description);
            else parts.set(m.name, m.part);
          });
          // A worker that fails or stops early: its unfinished items are described here below.
          w.on('error', () => resolve());
          w.on('messageerror', () => resolve());
          w.on('exit', () => resolve());
          // The columns are shared, not copied, however many workers there are.
          w.postMessage(job);
        }),
    );
    // The pairs' columns are sorted here while the workers take the items, then shared: a
    // worker claims pairs once the items are gone.
    let share: PairShare | undefined;
    if (pairNames.length > 0) {
      const sharedValues = new Map(job.items.map((i) => [i.name, i.values]));
      share = sharePairs(result, codebook, opts, (name) => sharedValues.get(name));
      for (const w of workers) w.postMessage(share);
    }
    // The other items first, while the workers start; then the calling thread claims interval
    // and ratio items too (the workers' answers wait in their ports meanwhile).
    for (const item of codebook.items) {
      if (item.role === 'id' || heavy.includes(item) || !store.columns[item.name]) continue;
      parts.set(item.name, one(item.name));
    }
    for (let k = caller ? Atomics.add(next, 0, 1) : heavy.length; k < heavy.length; k = Atomics.add(next, 0, 1)) {
      const name = heavy[k]!.name;
      parts.set(name, one(name));
    }
    if (share !== undefined && caller) claimPairs(share, codebook, (k, pair) => gotPairs.set(k, pair));
    await Promise.all(served);
    await Promise.all(workers.map((w) => w.terminate()));
    if (share !== undefined) pairs = assemblePairs(share, codebook, gotPairs);
  }
  pairs ??= pairNames.length > 0 ? describePairs(result, codebook, opts) : [];
  return assembleDescription(result, codebook, opts, weight, pairs, (item) => parts.get(item.name) ?? one(item.name));
}

function serve(init: WorkerInit): void {
  const port = parentPort!;
  let codebook: CompiledCodebook | undefined;
  try {
    codebook = compileCodebook(init.source as Codebook, init.codebookFile);
  } catch {
    // The calling thread compiled the same source; were this to fail, it describes every item.
  }
  const finish = () => {
    port.postMessage({ done: true } satisfies FromWorker);
    port.close();
  };
  port.once('message', (job: Job) => {
    if (codebook) {
      for (let k = Atomics.add(job.next, 0, 1); k < job.items.length; k = Atomics.add(job.next, 0, 1)) {
        const { name, values, tally, weighted } = job.items[k]!;
        const item = codebook.byName.get(name)!;
        const part = describeItem(item, { kind: 'numeric', item: name, values }, tallyOnly(name, tally), job.opts, weighted ? job.weights : undefined);
        port.postMessage({ name, part } satisfies FromWorker);
      }
    }
    if (!job.pairs) return finish();
    // The pairs' share follows the job; its pairs are claimed once the items are gone.
    port.once('message', (share: PairShare) => {
      if (codebook) claimPairs(share, codebook, (pair, description) => port.postMessage({ pair, description } satisfies FromWorker));
      finish();
    });
  });
}

if (!isMainThread && (workerData as WorkerInit | undefined)?.marker === MARKER) serve(workerData as WorkerInit);
