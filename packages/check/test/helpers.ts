import { parseCodebook, type CompiledCodebook } from '@codeweir/codebook';
import { check } from '../src/index.ts';
import type { CheckResult, Finding } from '../src/types.ts';
import type { CheckOptionsInput } from '../src/options.ts';

/** Compiles an inline codebook; fails the test with the problems when it is not valid. */
export function codebook(items: unknown[], extra: Record<string, unknown> = {}): CompiledCodebook {
  const r = parseCodebook(JSON.stringify({ codebook: 'test', version: '1', title: 'Test codebook', items, ...extra }), 'test.codebook.json');
  if (!r.ok) throw new Error(`test codebook invalid: ${JSON.stringify(r.problems)}`);
  return r.codebook;
}

/** Checks rows given as arrays in item order. */
export function run(cb: CompiledCodebook, rows: string[][], options: CheckOptionsInput = {}): Promise<CheckResult> {
  return check(rows, cb, options);
}

/** Findings of one rule, as [row, item] pairs (the parts tests assert most). */
export function where(result: CheckResult, rule: Finding['rule']): Array<[number, string]> {
  return result.findings.filter((f) => f.rule === rule).map((f) => [f.row, f.item]);
}

/** Sum of an item's missing counts over all kinds. */
export function missingOf(result: CheckResult, item: string): number {
  return Object.values(result.summary.items[item]!.missing).reduce((a, b) => a + (b ?? 0), 0);
}

/** An integer id item. */
export const idItem = { name: 'id', label: 'Record', role: 'id', type: 'integer' };

/** A yes/no item with a refused code: the controlling item of routing tests. */
export const employedItem = {
  name: 'employed',
  label: 'Worked last week',
  type: 'integer',
  level: 'nominal',
  codes: [
    { code: 1, label: 'Yes' },
    { code: 2, label: 'No' },
  ],
  missing: [{ code: -9, kind: 'refused' }],
};

/** Worker threads started while `f` runs (Node emits 'worker' on process for each new one). */
export async function countingWorkers<T>(f: () => Promise<T>): Promise<{ value: T; workers: number }> {
  let workers = 0;
  const seen = (): void => void workers++;
  process.on('worker', seen);
  try {
    return { value: await f(), workers };
  } finally {
    process.off('worker', seen);
  }
}
