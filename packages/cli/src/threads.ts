import { availableParallelism } from 'node:os';
import { CodeweirError } from '@codeweir/core';

/** The `--threads` option as check, describe and report declare it. */
export const THREADS_OPTION = {
  type: 'string',
  describe: 'threads for checking the delivery and describing its interval and ratio items (default: the number of cores; 1 = one thread)',
} as const;

/**
 * Reads `--threads`: absent means the number of cores (`os.availableParallelism()`), else a
 * whole number of at least 1 written in digits. Cost: O(1). Throws CodeweirError CW_USAGE
 * (exit code 2) for anything else, e.g. "--threads takes a positive whole number, got 0.".
 * @example threadsOption('2') // 2
 */
export function threadsOption(v: unknown): number {
  if (v === undefined) return availableParallelism();
  // Given twice, yargs hands over an array; digits only, so "1.5", "2e0" and "" are refused.
  const text = Array.isArray(v) ? v.join(' ') : String(v);
  if (!/^\d+$/.test(text.trim()) || Number(text) < 1 || !Number.isSafeInteger(Number(text))) {
    throw new CodeweirError('CW_USAGE', `--threads takes a positive whole number, got ${text === '' ? 'nothing' : text}.`);
  }
  return Number(text);
}
