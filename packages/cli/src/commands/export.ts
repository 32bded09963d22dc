import { basename, resolve } from 'node:path';
import { readFile } from 'node:fs/promises';
import { CodeweirError, writeFileAtomic } from '@codeweir/core';
import type { Codebook } from '@codeweir/codebook';
import type { CommandDef } from '../io.ts';
import { THREADS_OPTION, threadsOption } from '../threads.ts';
import { checkOutputPath } from '../output-file.ts';

/**
 * `codeweir export <codebook> --to ddi|xlsx [-o <file>] [--data <delivery>] [--force]
 * [--delimiter] [--encoding] [--threads N]`: the codebook as DDI-Codebook 2.5 XML (with the
 * delivery's summary statistics when --data is given: valid and invalid counts, level-
 * appropriate statistics, category frequencies) or as the spreadsheet variable list that
 * `codeweir import` reads back to the same codebook. The codebook must lint without errors.
 * DDI goes to stdout without -o; an xlsx workbook needs -o. Exit 0 written, 1 invalid codebook,
 * 2 usage or unreadable input. Error findings in the delivery do not stop the export: the
 * statistics cover what check classifies as valid.
 */
export const exportCommand: CommandDef = {
  command: 'export <codebook>',
  describe: 'Write a codebook as DDI-Codebook 2.5 XML (with a delivery\'s summary statistics via --data) or as a spreadsheet variable list (xlsx).',
  builder: (y) =>
    y
      .positional('codebook', { type: 'string', describe: 'the codebook JSON file', demandOption: true })
      .option('to', { type: 'string', choices: ['ddi', 'xlsx'], demandOption: true, describe: 'ddi (DDI-Codebook 2.5 XML) or xlsx (the variable list)' })
      .option('out', { alias: 'o', type: 'string', describe: 'the file to write (DDI goes to stdout without it)' })
      .option('data', { type: 'string', describe: 'with --to ddi: a delivery whose summary statistics go into the DDI file' })
      .option('force', { type: 'boolean', default: false, describe: 'with -o, replace an existing file' })
      .option('delimiter', { type: 'string', describe: 'field delimiter of --data (detected when absent)' })
      .option('encoding', { type: 'string', describe: 'encoding of --data: utf-8 (default), windows-1252, latin1, utf-16le, utf-16be' })
      .option('threads', THREADS_OPTION),
  handler: async (args, io) => {
    const to = String(args.to);
    const codebookPath = resolve(io.cwd, String(args.codebook));
    const out = args.out === undefined ? undefined : resolve(io.cwd, String(args.out));
    const threads = threadsOption(args.threads);
    if (to === 'xlsx' && out === undefined) throw new CodeweirError('CW_USAGE', '--to xlsx writes a workbook, so it needs -o <file.xlsx>.');
    if (to === 'xlsx' && args.data !== undefined) throw new CodeweirError('CW_USAGE', '--data applies to --to ddi only: the variable list carries no statistics.');
    if (out !== undefined) {
      const ext = to === 'xlsx' ? /\.xlsx$/i : /\.xml$/i;
      if (!ext.test(out)) throw new CodeweirError('CW_USAGE', `-o takes the path of ${to === 'xlsx' ? 'an .xlsx' : 'an .xml'} file for --to ${to}, got ${String(args.out)}.`);
      const inputs = [codebookPath, ...(args.data === undefined ? [] : [resolve(io.cwd, String(args.data))])];
      await checkOutputPath(out, String(args.out), inputs, args.force === true);
    }
    // Loaded here, not at the top, so that starting the CLI costs only the command it runs.
    const [{ loadCodebookOrThrow }, interchange] = await Promise.all([import('@codeweir/codebook'), import('@codeweir/interchange')]);
    // Validated first, then exported as written (labels in every language), not as compiled.
    const compiled = await loadCodebookOrThrow(codebookPath);
    const text = await readFile(codebookPath, 'utf8');
    const raw = JSON.parse(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text) as Codebook;
    if (to === 'xlsx') {
      await writeFileAtomic(out!, await interchange.variableListXlsx(interchange.variableListFromCodebook(raw)));
      return 0;
    }
    let stats: import('@codeweir/interchange').DeliveryStatistics | undefined;
    if (args.data !== undefined) {
      const [{ checkFile }, { describe }] = await Promise.all([import('@codeweir/check'), import('@codeweir/describe')]);
      const result = await checkFile(resolve(io.cwd, String(args.data)), compiled, { delimiter: args.delimiter, encoding: args.encoding, threads });
      stats = { file: basename(String(args.data)), summary: result.summary, described: describe(result, compiled, {}) };
    }
    const xml = interchange.ddiFromCodebook(raw, stats);
    if (out === undefined) io.stdout(xml);
    else await writeFileAtomic(out, xml);
    return 0;
  },
};
