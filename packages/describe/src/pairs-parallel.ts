/**
 * Sharing the pairs of a description out between threads: the plan (see planPairs) is made once
 * in SharedArrayBuffers, and every thread claims the next pair from one atomic counter and
 * describes it with the same function and its own scratch buffers. Results are put back in the
 * plan's order, so the pairs are the same, to the byte, whichever thread described which.
 */
import type { CompiledCodebook } from '@codeweir/codebook';
import type { CheckResult } from '@codeweir/check';
import { describePlannedPair, planPairs, PairScratch, type PairOptions, type PairPlan } from './pairs.ts';
import type { PairDescription } from './types.ts';

/** A plan and the counter the threads claim its pairs from; posted to workers as it is (the arrays are shared, not copied). */
export interface PairShare {
  plan: PairPlan;
  next: Int32Array;
}

/**
 * The shared plan of the requested pairs. `values` gives continuous columns already copied to
 * shared memory (they are used instead of a second copy). Cost: as planPairs, plus one shared
 * copy of each coded column (2 bytes per row) and of each continuous column not given.
 * Throws as describePairs does.
 */
export function sharePairs(result: CheckResult, codebook: CompiledCodebook, options: PairOptions, values: (name: string) => Float64Array | undefined): PairShare {
  return { plan: planPairs(result, codebook, options, { shared: true, values }), next: new Int32Array(new SharedArrayBuffer(4)) };
}

/**
 * Claims and describes pairs until none is left, handing each to `done` with its index in the
 * plan. Cost: the claimed pairs' work, one scratch set (about 23 bytes per row). Throws nothing
 * for a plan made by sharePairs.
 */
export function claimPairs(share: PairShare, codebook: CompiledCodebook, done: (index: number, pair: PairDescription) => void): void {
  const scratch = new PairScratch(share.plan.rows);
  const total = share.plan.pairs.length;
  for (let k = Atomics.add(share.next, 0, 1); k < total; k = Atomics.add(share.next, 0, 1)) done(k, describePlannedPair(share.plan, k, codebook, scratch));
}

/**
 * The pairs in plan order: those in `got`, and any a thread claimed but never returned (a worker
 * that failed) described here. Cost: the missing pairs' work. Throws nothing.
 */
export function assemblePairs(share: PairShare, codebook: CompiledCodebook, got: Map<number, PairDescription>): PairDescription[] {
  let scratch: PairScratch | undefined;
  return share.plan.pairs.map((_, k) => got.get(k) ?? describePlannedPair(share.plan, k, codebook, (scratch ??= new PairScratch(share.plan.rows))));
}
