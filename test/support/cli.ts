/** Runs the CLI in-process (no TTY) and returns its exit code and what it printed. */
import { run } from '../../packages/cli/src/cli.ts';

export async function cli(argv: string[], cwd: string): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await run(argv, { stdout: (t) => void (out += t), stderr: (t) => void (err += t), isTTY: false, cwd });
  return { code, out, err };
}
