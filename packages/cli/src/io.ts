/** Where a command writes. Tests pass their own to capture output in-process. */
export interface Io {
  stdout(text: string): void;
  stderr(text: string): void;
  /** True when stderr is a terminal (progress bars only then). */
  isTTY: boolean;
  cwd: string;
}

export function processIo(): Io {
  return {
    stdout: (t) => void process.stdout.write(t),
    stderr: (t) => void process.stderr.write(t),
    isTTY: Boolean(process.stderr.isTTY),
    cwd: process.cwd(),
  };
}

/** A command: its yargs definition and a handler returning the exit code. */
export interface CommandDef {
  command: string;
  describe: string;
  builder: (y: import('yargs').Argv) => import('yargs').Argv;
  handler: (args: Record<string, unknown>, io: Io) => Promise<number>;
}
