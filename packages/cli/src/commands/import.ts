import { resolve } from 'node:path';
import { CodeweirError, writeFileAtomic } from '@codeweir/core';
import type { ReadOptions } from '@codeweir/read';
import type { CommandDef } from '../io.ts';
import { checkOutputPath } from '../output-file.ts';
import { problemLine } from './lint.ts';

const count = (n: number, word: string, many: string) => `${n} ${n === 1 ? word : many}`;

/**
 * `codeweir import <file> [-o <codebook.json>] [--force] [--json] [--delimiter] [--encoding]
 * [--quiet]`: a codebook from a spreadsheet variable list (.xlsx, .csv) or a DDI-Codebook 2.5
 * file (.xml). Every guess is marked `[check: ...]` in a label for a person to confirm; the
 * result is linted and what lint still finds is listed as `file:line:column` lines of the
 * written codebook, for a person to decide. Writes atomically to -o (refusing to replace the
 * input, or an existing file unless --force), else prints the codebook on stdout. Exit 0 when
 * the codebook lints without errors, 1 when a person must decide something first (the
 * codebook is written all the same, to be finished), 2 usage or unreadable input.
 */
export const importCommand: CommandDef = {
  command: 'import <file>',
  describe: 'A codebook from a spreadsheet variable list (.xlsx, .csv) or a DDI-Codebook 2.5 XML file, every guess marked for a person to confirm.',
  builder: (y) =>
    y
      .positional('file', { type: 'string', describe: 'the variable list (.xlsx, .csv) or DDI-Codebook file (.xml)', demandOption: true })
      .option('out', { alias: 'o', type: 'string', describe: 'write the codebook to this file instead of stdout' })
      .option('force', { type: 'boolean', default: false, describe: 'with -o, replace an existing file' })
      .option('delimiter', { type: 'string', describe: 'CSV field delimiter (detected when absent)' })
      .option('encoding', { type: 'string', describe: 'CSV encoding: utf-8 (default), windows-1252, latin1, utf-16le, utf-16be' })
      .option('json', { type: 'boolean', default: false, describe: 'print { codebook, guesses, notes, problems } as one JSON document' })
      .option('quiet', { type: 'boolean', default: false, describe: 'no summary' }),
  handler: async (args, io) => {
    const input = resolve(io.cwd, String(args.file));
    const out = args.out === undefined ? undefined : resolve(io.cwd, String(args.out));
    if (out !== undefined) {
      if (!/\.json$/i.test(out)) throw new CodeweirError('CW_USAGE', `-o takes the path of a .json codebook file, got ${String(args.out)}.`);
      await checkOutputPath(out, String(args.out), [input], args.force === true);
    }
    // Loaded here, not at the top, so that starting the CLI costs only the command it runs.
    const [{ importCodebook }, { parseCodebook }, { formatJson }] = await Promise.all([
      import('@codeweir/interchange'),
      import('@codeweir/codebook'),
      import('@codeweir/draft'),
    ]);
    const readOptions: ReadOptions = {};
    if (args.delimiter !== undefined) readOptions.delimiter = String(args.delimiter);
    if (args.encoding !== undefined) readOptions.encoding = String(args.encoding) as ReadOptions['encoding'];
    const result = await importCodebook(input, readOptions);
    const text = formatJson(result.codebook);
    const shown = out === undefined ? 'the imported codebook' : String(args.out);
    const lint = parseCodebook(text, shown);
    if (out !== undefined) await writeFileAtomic(out, text);
    const errors = lint.problems.filter((p) => p.severity === 'error').length;
    if (args.json === true) {
      io.stdout(JSON.stringify({ codebook: result.codebook, guesses: result.guesses, notes: result.notes, problems: lint.problems }, null, 2) + '\n');
      return errors > 0 ? 1 : 0;
    }
    if (out === undefined) io.stdout(text);
    const say = out === undefined ? io.stderr : io.stdout;
    if (args.quiet !== true) {
      const where = out === undefined ? '' : ` to ${String(args.out)}`;
      const items = (result.codebook.items ?? []).length;
      say(
        `codeweir: imported ${count(items, 'item', 'items')} from ${String(args.file)}${where}; ` +
          `${result.guesses.length === 0 ? 'nothing had to be guessed' : `every guess (${count(result.guesses.length, 'guess', 'guesses')}) is marked [check: ...] in a label for a person to confirm`}.\n`,
      );
      for (const n of result.notes) say(`note: ${n}\n`);
    }
    const lines = lint.problems.map((p) => problemLine(p, shown));
    if (lines.length > 0) {
      say(errors > 0 ? `A person must decide before the codebook can be used (codeweir lint ${shown}):\n` : '');
      say(lines.join('\n') + '\n');
    }
    return errors > 0 ? 1 : 0;
  },
};
