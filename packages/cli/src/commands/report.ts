import { basename, dirname, join, resolve } from 'node:path';
import type { CheckResult } from '@codeweir/check';
import type { Delivery, RowBatch } from '@codeweir/read';
import { CodeweirError, writeFileAtomic, writeFilesAtomic } from '@codeweir/core';
import type { CommandDef } from '../io.ts';
import { FORMAT_OPTION, SHEET_OPTION, checkTypedInput, inputFormatOf, isPlainText } from '../formats.ts';
import { THREADS_OPTION, threadsOption } from '../threads.ts';
import { LANG_OPTION, langOption } from '../lang.ts';
import { createProgress, type Progress } from '../progress.ts';
import { LEDGER_WAIT_OPTION, DRIFT_P_OPTION, DRIFT_PSI_OPTION, reportSeasonOptions, seasonForReport } from '../season.ts';
import { MIN_CELL_OPTION, SHOW_VALUES_OPTION, disclosureChoice } from '../disclosure.ts';
import { DESIGN_OPTIONS, designArgs } from './describe.ts';

/** Counts rows as the one pass reads them, for the progress line. */
function counted(d: Delivery, progress: Progress): Delivery {
  return {
    ...d,
    batches: async function* (): AsyncGenerator<RowBatch> {
      let rows = 0;
      for await (const b of d.batches()) {
        rows += b.count;
        progress.update(rows);
        yield b;
      }
    },
  };
}

/**
 * `codeweir report <data> --codebook <file> -o <file.html> [--pair x:y ...] [--pairs all]
 * [--weight <item>] [--quantiles 1..9] [--delimiter c] [--encoding e] [--lang tag] [--threads N] [--split-by <group item>] [--quiet]`: one pass
 * over the delivery (check, whose retained columns describe then summarises), then one
 * self-contained HTML file written atomically. With `--split-by team`, `-o out/report.html`
 * also writes `out/report-team/index.html` and one `out/report-team/team-<code>.html` per team
 * (only that team's rows), all files together (every one written to a temporary file first). Exit 0 accepted, 1 error findings (the report
 * is written in both cases) or an invalid codebook, 2 usage errors or unreadable input.
 */
export const reportCommand: CommandDef = {
  command: 'report <data>',
  describe: 'Check and describe a delivery in one pass and write one self-contained HTML report.',
  builder: (y) =>
    y
      .positional('data', { type: 'string', describe: 'the delivery (CSV or other delimited text)', demandOption: true })
      .option('codebook', { type: 'string', demandOption: true, describe: 'the codebook JSON file' })
      .option('o', { alias: 'output', type: 'string', demandOption: true, describe: 'the HTML file to write' })
      .option('pair', { type: 'string', array: true, describe: 'a pair of items to summarise together, as x:y (repeatable)' })
      .option('pairs', { type: 'string', describe: "'all' for every pair of described items" })
      .option('weight', { type: 'string', describe: "weight item (default: the codebook's weight item)" })
      .option('quantiles', { type: 'string', describe: 'Hyndman-Fan quantile type, 1 to 9 (default 7)' })
      .option('delimiter', { type: 'string', describe: 'field delimiter (detected when absent)' })
      .option('encoding', { type: 'string', describe: 'utf-8 (default), windows-1252, latin1, utf-16le, utf-16be' })
      .option('lang', LANG_OPTION)
      .option('threads', THREADS_OPTION)
      .option('format', FORMAT_OPTION)
      .option('sheet', SHEET_OPTION)
      .option('split-by', { type: 'string', describe: 'a group item: the first screen tables its codes, and one page per code is written beside the report' })
      .option('previous', { type: 'string', describe: 'the delivery before this one: adds a "since the previous delivery" section and per-team trend charts' })
      .option('ledger', { type: 'string', describe: 'a ledger (check --ledger): the delivery recorded before this one is the previous, and the trend runs over all of them (read only)' })
      .option('ledger-wait', LEDGER_WAIT_OPTION)
      .option('drift-p', DRIFT_P_OPTION)
      .option('drift-psi', DRIFT_PSI_OPTION)
      .options(DESIGN_OPTIONS)
      .option('min-cell', MIN_CELL_OPTION)
      .option('show-values', SHOW_VALUES_OPTION)
      .option('quiet', { type: 'boolean', default: false, describe: 'no progress on stderr' }),
  handler: async (args, io) => {
    // Every option is checked before any file is read, so a typo fails at once.
    const pairsFlag = args.pairs;
    if (pairsFlag !== undefined && pairsFlag !== 'all') {
      throw new CodeweirError('CW_USAGE', `--pairs takes 'all', got ${JSON.stringify(pairsFlag)}; name single pairs with --pair x:y.`);
    }
    const out = String(args.o);
    if (!/\.html?$/i.test(out)) throw new CodeweirError('CW_USAGE', `-o takes the path of an .html file, got ${out}.`);
    const threads = threadsOption(args.threads);
    // Loaded here, not at the top, so that starting the CLI costs only the command it runs (the
    // report package, with its chart libraries, is by far the largest).
    const [{ loadCodebookOrThrow }, { checkDelivery, checkFile, normalizeCheckOptions }, { describeParallel, normalizeDescribeOptions }, { openDelivery }, { renderReport, renderSplitReport, groupItemOrThrow, discloseReportInput }] = await Promise.all([
      import('@codeweir/codebook'),
      import('@codeweir/check'),
      import('@codeweir/describe'),
      import('@codeweir/read'),
      import('@codeweir/report'),
    ]);
    const describeOptions = normalizeDescribeOptions({
      quantileType: args.quantiles,
      weight: args.weight,
      pairs: pairsFlag === 'all' ? 'all' : ((args.pair as string[] | undefined) ?? []),
      ...designArgs(args),
    });
    const checkOptions = normalizeCheckOptions({ quantileType: args.quantiles, delimiter: args.delimiter, encoding: args.encoding });
    const data = String(args.data);
    const dataPath = resolve(io.cwd, data);
    const outPath = resolve(io.cwd, out);
    if (outPath === dataPath) throw new CodeweirError('CW_USAGE', `-o names the delivery itself (${data}); choose another file for the report.`);

    const lang = langOption(args.lang);
    const codebook = await loadCodebookOrThrow(resolve(io.cwd, String(args.codebook)), lang === undefined ? {} : { lang });
    const splitBy = args['split-by'] === undefined ? undefined : groupItemOrThrow(codebook, String(args['split-by']));
    const disclosure = disclosureChoice(args, codebook);
    const seasonOptions = await reportSeasonOptions(args, io.cwd);
    const progress = createProgress(io, { label: 'reading rows', quiet: args.quiet === true });
    try {
      let result: CheckResult;
      const input = inputFormatOf(args);
      if (!(await isPlainText(dataPath, input))) {
        progress.phase('checking');
        result = await checkTypedInput(dataPath, codebook, checkOptions, input);
      } else if (threads > 1) {
        progress.phase('checking');
        result = await checkFile(dataPath, codebook, { ...checkOptions, threads });
      } else {
        const opened = await openDelivery(dataPath, { delimiter: checkOptions.delimiter, encoding: checkOptions.encoding });
        result = await checkDelivery(counted(opened, progress), codebook, checkOptions);
      }
      result.summary.file = data;
      progress.phase('describing');
      const described = await describeParallel(result, codebook, describeOptions, { threads });
      progress.phase('drawing charts');
      // With --previous or --ledger: the comparison and the trend (the ledger is loaded only then).
      if (seasonOptions !== undefined) progress.phase('comparing with the previous delivery');
      const season = seasonOptions === undefined ? undefined : await seasonForReport(seasonOptions, io.cwd, result, codebook, { path: dataPath, name: data, input, read: { delimiter: checkOptions.delimiter, encoding: checkOptions.encoding }, threads, ...(splitBy ? { groupItem: splitBy } : {}) });
      const plainInput = { check: result, describe: described, codebook, file: data, ...(season ? { season } : {}) };
      // Disclosure control only when asked for or needed (a confidential item): otherwise the report is as before.
      // With suppression and --split-by, renderSplitReport discloses the main page and the team pages together.
      const together = splitBy !== undefined && disclosure.minCell > 1;
      const reportInput = !together && (disclosure.minCell > 1 || disclosure.withhold.size > 0) ? discloseReportInput(plainInput, disclosure).input : plainInput;
      let pages = '';
      if (splitBy === undefined) {
        await writeFileAtomic(outPath, await renderReport(reportInput));
      } else {
        const split = await renderSplitReport(reportInput, { splitBy, mainFile: basename(outPath), describeOptions: { ...describeOptions, pairs: [] }, ...(together ? { disclosure } : {}) });
        await writeFilesAtomic(split.files.map((f) => [join(dirname(outPath), f.path), f.html] as const));
        pages = ` and ${split.parts.length} ${splitBy} page${split.parts.length === 1 ? '' : 's'} in ${join(dirname(out), split.layout.folder)}`;
      }
      progress.done();
      const errors = result.summary.findings.bySeverity.error ?? 0;
      const warnings = result.summary.findings.bySeverity.warning ?? 0;
      if (args.quiet !== true) {
        io.stdout(`Report written to ${out}${pages}: ${errors === 0 ? 'accepted' : 'not accepted'} (${errors} error${errors === 1 ? '' : 's'}, ${warnings} warning${warnings === 1 ? '' : 's'}).\n`);
      }
      return errors > 0 ? 1 : 0;
    } finally {
      progress.done();
    }
  },
};
