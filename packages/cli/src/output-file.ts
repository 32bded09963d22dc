import { stat } from 'node:fs/promises';
import { CodeweirError } from '@codeweir/core';

/**
 * Refuses an output path that would replace an input or, without --force, an existing file,
 * so a finished file is never lost. `shown` is the path as the user wrote it. Throws
 * CodeweirError CW_USAGE (exit 2).
 */
export async function checkOutputPath(out: string, shown: string, inputs: readonly string[], force: boolean): Promise<void> {
  if (inputs.includes(out)) throw new CodeweirError('CW_USAGE', `-o names an input file (${shown}); choose another file.`);
  if (force) return;
  let present = true;
  try {
    await stat(out);
  } catch {
    present = false;
  }
  if (present) throw new CodeweirError('CW_USAGE', `${shown} already exists; pass --force to replace it, or choose another file.`, { file: shown });
}
