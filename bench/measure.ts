/**
 * Times one child process and reads its peak resident set size from the operating system:
 * through GNU time (`/usr/bin/time -v`, "Maximum resident set size") when it is there, else
 * through a preloaded probe that writes the child's own getrusage maxRSS on exit.
 */
import { spawn } from 'node:child_process';
import { existsSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { tmpdir } from 'node:os';

export interface Measurement {
  /** Wall-clock seconds from spawn to exit. */
  seconds: number;
  /** Peak resident set size in bytes (the process and its threads). */
  peakRss: number;
  exitCode: number;
  stdout: string;
  stderr: string;
}

const GNU_TIME = '/usr/bin/time';
const hasGnuTime = existsSync(GNU_TIME);
const PROBE = new URL('./rss-probe.mjs', import.meta.url).pathname;

/** How peak RSS is measured on this machine, for the printed table. */
export const rssSource = hasGnuTime ? '/usr/bin/time -v' : 'getrusage in the child (rss-probe.mjs)';

/**
 * Runs `node <args>` from `cwd` and measures it. `okCodes` are the exit codes that count as a
 * completed run (check exits 1 on error findings); anything else throws with the child's stderr.
 */
export async function measureNode(args: string[], cwd: string, okCodes: number[] = [0]): Promise<Measurement> {
  const rssFile = join(tmpdir(), `codeweir-bench-rss-${process.pid}-${Math.random().toString(36).slice(2)}`);
  const argv = hasGnuTime ? [GNU_TIME, '-v', process.execPath, ...args] : [process.execPath, '--import', PROBE, ...args];
  const start = process.hrtime.bigint();
  const child = spawn(argv[0], argv.slice(1), {
    cwd,
    env: { ...process.env, CODEWEIR_BENCH_RSS_FILE: rssFile },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const out: Buffer[] = [];
  const err: Buffer[] = [];
  child.stdout.on('data', (b: Buffer) => out.push(b));
  child.stderr.on('data', (b: Buffer) => err.push(b));
  const exitCode: number = await new Promise((resolve, reject) => {
    child.on('error', reject);
    child.on('close', (code) => resolve(code ?? -1));
  });
  const seconds = Number(process.hrtime.bigint() - start) / 1e9;
  const stderr = Buffer.concat(err).toString('utf8');
  let peakKb = NaN;
  const m = /Maximum resident set size \(kbytes\): (\d+)/.exec(stderr);
  if (m) peakKb = Number(m[1]);
  else if (existsSync(rssFile)) peakKb = Number(readFileSync(rssFile, 'utf8'));
  rmSync(rssFile, { force: true });
  // GNU time reports a failing child as "Command exited with non-zero status N".
  if (!okCodes.includes(exitCode)) {
    const shown = stderr.split('\n').filter((l) => l && !/^\t/.test(l)).slice(0, 8).join('\n');
    throw new Error(`node ${args.join(' ')} exited with ${exitCode}:\n${shown}`);
  }
  return { seconds, peakRss: peakKb * 1024, exitCode, stdout: Buffer.concat(out).toString('utf8'), stderr };
}

/** Median of a non-empty list (mean of the two middle values for an even count). */
export function median(xs: readonly number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const h = s.length >> 1;
  return s.length % 2 ? s[h] : (s[h - 1] + s[h]) / 2;
}
