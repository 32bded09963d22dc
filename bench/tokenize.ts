/**
 * The tokenizer-only floor: reads and splits the delivery into fields with the read package's
 * tokenizer and does nothing else, so the harness can show how much of a check is parsing.
 * Usage: node --import tsx bench/tokenize.ts <file.csv>
 */
import * as read from '../packages/read/src/index.ts';

const tokenizeFile = (read as Record<string, unknown>).tokenizeFile as
  | ((path: string, options: Record<string, unknown>) => Promise<{ rows: number; fields: number }>)
  | undefined;
if (!tokenizeFile) {
  process.stderr.write('tokenizeFile is not exported by @codeweir/read yet.\n');
  process.exitCode = 3;
} else {
  const r = await tokenizeFile(process.argv[2], {});
  process.stdout.write(JSON.stringify(r) + '\n');
}
