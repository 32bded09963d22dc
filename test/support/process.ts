/** A real child process for the tests whose promises need one (signals, file locks, other users). */
import { spawn, type ChildProcess, type SpawnOptions } from 'node:child_process';
import { readdir, readlink } from 'node:fs/promises';

export interface Ended {
  code: number | null;
  signal: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
}

/** Starts `node <args>` and collects what it prints; `done` resolves when it has closed. */
export function startNode(args: string[], opts: SpawnOptions): { child: ChildProcess; done: Promise<Ended> } {
  const child = spawn(process.execPath, args, { stdio: ['ignore', 'pipe', 'pipe'], ...opts });
  let stdout = '';
  let stderr = '';
  child.stdout!.on('data', (d) => (stdout += d));
  child.stderr!.on('data', (d) => (stderr += d));
  const done = new Promise<Ended>((res) => child.on('close', (code, signal) => res({ code, signal, stdout, stderr })));
  return { child, done };
}

/** Whether `pid` holds `file` open right now (Linux /proc). */
export async function holdsOpen(pid: number, file: string): Promise<boolean> {
  const fds = await readdir(`/proc/${pid}/fd`).catch(() => [] as string[]);
  for (const fd of fds) if ((await readlink(`/proc/${pid}/fd/${fd}`).catch(() => '')) === file) return true;
  return false;
}

/** Polls every 5 ms, at most `tries` times, until `pid` holds `file` open; whether it was caught so. */
export async function waitUntilOpen(pid: number, file: string, tries: number): Promise<boolean> {
  for (let i = 0; i < tries; i++) {
    if (await holdsOpen(pid, file)) return true;
    await new Promise((r) => setTimeout(r, 5));
  }
  return false;
}
