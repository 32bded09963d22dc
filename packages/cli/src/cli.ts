import yargs from 'yargs';
import { isCodeweirError } from '@codeweir/core';
import { processIo, type Io, type CommandDef } from './io.ts';
import { commands } from './commands/index.ts';

export type { Io, CommandDef } from './io.ts';

/** One clear sentence for an error: the CLI never prints a stack unless --debug. */
export function formatError(e: unknown): string {
  if (isCodeweirError(e)) {
    const where = [e.file, e.line !== undefined ? `line ${e.line}` : undefined, e.column !== undefined ? `column ${e.column}` : undefined]
      .filter(Boolean)
      .join(', ');
    const msg = e.message.trim();
    return where && !msg.includes(e.file ?? '\u0000') ? `codeweir: ${where}: ${msg}` : `codeweir: ${msg}`;
  }
  const m = e instanceof Error ? e.message : String(e);
  return `codeweir: unexpected failure: ${m.split('\n')[0]} (run with --debug for details).`;
}

/**
 * Runs the CLI on `argv` (without `node` and the script) and resolves to the exit code:
 * 0 nothing at error severity, 1 error findings or an invalid codebook, 2 usage error or
 * unreadable input. Never throws, never calls process.exit.
 */
export async function run(argv: string[], ioIn: Partial<Io> = {}): Promise<number> {
  const io: Io = { ...processIo(), ...ioIn };
  const debug = argv.includes('--debug');
  let exit = 0;
  let usageError: string | undefined;
  const y = yargs(argv)
    .scriptName('codeweir')
    .strict()
    .help()
    .version(false)
    .wrap(Math.min(100, process.stdout.columns ?? 100))
    .option('debug', { type: 'boolean', describe: 'show stack traces on failure', global: true })
    .demandCommand(1, 'Name a command: lint, check, describe, report or draft.')
    .exitProcess(false)
    .fail((msg, err) => {
      usageError = msg ?? (err ? err.message : 'usage error');
    });
  let stdoutBuf = '';
  y.parserConfiguration({ 'duplicate-arguments-array': true });
  for (const c of commands as CommandDef[]) {
    y.command(c.command, c.describe, c.builder, async (args) => {
      try {
        exit = await c.handler(args as Record<string, unknown>, io);
      } catch (e) {
        io.stderr(formatError(e) + '\n');
        if (debug && e instanceof Error && e.stack) io.stderr(e.stack + '\n');
        exit = isCodeweirError(e) ? e.exitCode : 2;
      }
    });
  }
  try {
    await y.parseAsync(argv, {}, (err, _argv, output) => {
      if (output) stdoutBuf += output;
      if (err && !usageError) usageError = err.message;
    });
  } catch (e) {
    if (!usageError) usageError = e instanceof Error ? e.message : String(e);
  }
  if (usageError) {
    io.stderr(`codeweir: ${usageError.split('\n')[0]} (see codeweir --help).\n`);
    return 2;
  }
  if (stdoutBuf) io.stdout(stdoutBuf.endsWith('\n') ? stdoutBuf : stdoutBuf + '\n');
  return exit;
}
