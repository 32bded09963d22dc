import { mkdir, open, rename, rm } from 'node:fs/promises';
import { dirname, basename, join } from 'node:path';
import { randomBytes } from 'node:crypto';
import { CodeweirError } from './error.ts';

/** Temporary files that are open right now; removed by {@link removePendingTemps} on interrupt. */
const pending = new Set<string>();

export function pendingTemps(): ReadonlySet<string> {
  return pending;
}

/** Removes every temporary file still being written (for SIGINT handlers). Synchronous. */
export async function removePendingTemps(): Promise<void> {
  await Promise.all([...pending].map((p) => rm(p, { force: true })));
  pending.clear();
}

function tempName(target: string): string {
  return join(dirname(target), `.${basename(target)}.${process.pid}.${randomBytes(4).toString('hex')}.tmp`);
}

/**
 * Writes `content` to `target` through a temporary file in the same folder, then renames it,
 * so a reader never sees a half-written file and an interrupted run leaves the previous file.
 * Throws CodeweirError CW_WRITE_FAILED with the target path.
 */
export async function writeFileAtomic(target: string, content: string | Uint8Array): Promise<void> {
  await writeFilesAtomic([[target, content]]);
}

/**
 * Writes several files so that all of them appear together: every temporary file is written
 * first, then each is renamed over its target. On failure every temporary file is removed.
 */
export async function writeFilesAtomic(files: ReadonlyArray<readonly [string, string | Uint8Array]>): Promise<void> {
  const temps: Array<[string, string]> = [];
  try {
    for (const [target, content] of files) {
      await mkdir(dirname(target), { recursive: true });
      const tmp = tempName(target);
      pending.add(tmp);
      temps.push([tmp, target]);
      const fh = await open(tmp, 'wx');
      try {
        await fh.writeFile(content);
        await fh.sync();
      } finally {
        await fh.close();
      }
    }
    for (const [tmp, target] of temps) {
      await rename(tmp, target);
      pending.delete(tmp);
    }
  } catch (e) {
    await Promise.all(temps.map(([tmp]) => rm(tmp, { force: true })));
    for (const [tmp] of temps) pending.delete(tmp);
    if (e instanceof CodeweirError) throw e;
    const target = temps.at(-1)?.[1] ?? files[0]?.[0] ?? '';
    throw new CodeweirError('CW_WRITE_FAILED', `Could not write ${target}: ${(e as Error).message}.`, { file: target, cause: e });
  }
}
