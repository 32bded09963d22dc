import { basename, resolve } from 'node:path';
import { stat } from 'node:fs/promises';
import { CodeweirError, writeFileAtomic } from '@codeweir/core';
import type { ReadOptions } from '@codeweir/read';
import type { CommandDef } from '../io.ts';
import { FORMAT_OPTION, SHEET_OPTION, inputFormatOf } from '../formats.ts';

function plural(n: number, word: string, many = `${word}s`): string {
  return `${n} ${n === 1 ? word : many}`;
}

/** --max-codes: a whole number 1 to 1000 (yargs hands over NaN for text). */
function maxCodesOption(v: unknown): number | undefined {
  if (v === undefined) return undefined;
  const n = typeof v === 'number' ? v : Number(v);
  if (!Number.isInteger(n) || n < 1 || n > 1000) {
    throw new CodeweirError('CW_USAGE', `--max-codes takes a whole number from 1 to 1000, got ${JSON.stringify(String(v))}.`);
  }
  return n;
}

async function exists(path: string): Promise<boolean> {
  try {
    await stat(path);
    return true;
  } catch {
    return false;
  }
}

/**
 * `codeweir draft <data> [-o <file>] [--force] [--delimiter] [--encoding] [--decimal-comma]
 * [--max-codes n] [--id slug] [--json] [--quiet]`: a first codebook inferred from a delivery,
 * every guess marked `[check: ...]` in its item's label. Prints the codebook on stdout, or
 * writes it atomically to `-o` (refusing to replace the data file, or an existing file unless
 * --force, so a finished codebook is never lost). Exit 0 drafted, 1 if the draft would not
 * lint (never expected: nothing is written then), 2 usage or unreadable input.
 */
export const draftCommand: CommandDef = {
  command: 'draft <data>',
  describe: 'A first codebook inferred from a data file, every guess marked for a person to confirm.',
  builder: (y) =>
    y
      .positional('data', { type: 'string', describe: 'the delivery (CSV or other delimited text)', demandOption: true })
      .option('out', { alias: 'o', type: 'string', describe: 'write the codebook to this file instead of stdout' })
      .option('force', { type: 'boolean', default: false, describe: 'with -o, replace an existing file' })
      .option('delimiter', { type: 'string', describe: 'field delimiter (detected when absent)' })
      .option('encoding', { type: 'string', describe: 'utf-8 (default), windows-1252, latin1, utf-16le, utf-16be' })
      .option('format', FORMAT_OPTION)
      .option('sheet', SHEET_OPTION)
      .option('decimal-comma', { type: 'boolean', default: false, describe: 'numbers are written with a decimal comma (3,5)' })
      .option('max-codes', { type: 'string', describe: 'most distinct values for a column to get a code list (default 12)' })
      .option('id', { type: 'string', describe: 'identifier (slug) of the drafted codebook (default from the file name)' })
      .option('json', { type: 'boolean', default: false, describe: 'print { codebook, guesses, rows, raggedRows } as one JSON document' })
      .option('quiet', { type: 'boolean', default: false, describe: 'no summary on stderr' }),
  handler: async (args, io) => {
    // Options first, so a typo fails before any file is read.
    const maxCodes = maxCodesOption(args['max-codes']);
    const data = resolve(io.cwd, String(args.data));
    const out = args.out === undefined ? undefined : resolve(io.cwd, String(args.out));
    if (out !== undefined && out === data) {
      throw new CodeweirError('CW_USAGE', `-o names the data file ${String(args.data)} itself; choose another file for the codebook.`);
    }
    if (out !== undefined && args.force !== true && (await exists(out))) {
      throw new CodeweirError('CW_USAGE', `${String(args.out)} already exists; pass --force to replace it, or choose another file.`, { file: String(args.out) });
    }
    // Loaded here, not at the top, so that starting the CLI costs only the command it runs.
    const [{ openAnyDelivery }, { parseCodebook }, { draftDelivery, formatJson }] = await Promise.all([
      import('@codeweir/read'),
      import('@codeweir/codebook'),
      import('@codeweir/draft'),
    ]);
    const readOptions: ReadOptions = {};
    if (args.delimiter !== undefined) readOptions.delimiter = String(args.delimiter);
    if (args.encoding !== undefined) readOptions.encoding = String(args.encoding) as ReadOptions['encoding'];
    const delivery = await openAnyDelivery(data, { ...readOptions, ...inputFormatOf(args) });
    const result = await draftDelivery(delivery, {
      source: basename(String(args.data)),
      codebook: args.id === undefined ? undefined : String(args.id),
      maxCodes,
      decimalComma: args['decimal-comma'] === true,
    });
    const text = formatJson(result.codebook);

    // The draft is built to lint clean; should it not, say so rather than hand over a broken file.
    const lint = parseCodebook(text, out);
    const errors = lint.problems.filter((p) => p.severity === 'error');
    if (errors.length > 0) {
      for (const p of errors) io.stderr(`codeweir: the drafted codebook has a problem at ${p.path}: ${p.message}\n`);
      return 1;
    }

    if (out !== undefined) await writeFileAtomic(out, text);
    if (args.json === true) io.stdout(JSON.stringify(result, null, 2) + '\n');
    else if (out === undefined) io.stdout(text);
    if (args.quiet !== true) {
      const where = out === undefined ? '' : ` to ${String(args.out)}`;
      const ragged = result.raggedRows > 0 ? ` ${plural(result.raggedRows, 'row')} had the wrong number of fields.` : '';
      io.stderr(
        `codeweir: drafted ${plural(result.codebook.items.length, 'item')} from ${plural(result.rows, 'row')}${where}; ` +
          `every guess (${plural(result.guesses.length, 'guess', 'guesses')}) is marked [check: ...] in a label for a person to confirm.${ragged}\n`,
      );
    }
    return 0;
  },
};
