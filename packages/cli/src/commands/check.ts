import { resolve } from 'node:path';
import type { Delivery, RowBatch } from '@codeweir/read';
import type { CheckResult, Finding } from '@codeweir/check';
import { CodeweirError } from '@codeweir/core';
import type { CommandDef, Io } from '../io.ts';
import { THREADS_OPTION, threadsOption } from '../threads.ts';
import { FORMAT_OPTION, SHEET_OPTION, checkTypedInput, inputFormatOf, isPlainText } from '../formats.ts';
import { LEDGER_WAIT_OPTION, DRIFT_P_OPTION, DRIFT_PSI_OPTION, checkSeason } from '../season.ts';
import { MIN_CELL_OPTION, SHOW_VALUES_OPTION, disclosureChoice, withDesignOptions } from '../disclosure.ts';

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`;
}

/** Findings shown on the terminal; the rest are in the log written with --out. */
const SHOWN_FINDINGS = 20;

function findingLine(f: Finding): string {
  const where = f.row > 0 ? `row ${f.row}${f.id ? ` (${f.id})` : ''}` : 'file';
  const item = f.item ? ` ${f.item}` : '';
  const hint = f.suggestion !== undefined ? ` Suggested code: ${f.suggestion}.` : '';
  return `  ${where}${item}: ${f.severity} ${f.rule}: ${f.message}${hint}`;
}

/** The human report: verdict line first, then header problems, counts by rule, the first findings. */
function humanReport(result: CheckResult, data: string, failOnWarning: boolean): string {
  const s = result.summary;
  const errors = s.findings.bySeverity.error ?? 0;
  const warnings = s.findings.bySeverity.warning ?? 0;
  const infos = s.findings.bySeverity.info ?? 0;
  const accepted = errors === 0 && !(failOnWarning && warnings > 0);
  const lines: string[] = [];
  lines.push(
    `${data}: ${plural(s.rows, 'row')} checked against ${s.codebook.codebook} ${s.codebook.version}: ` +
      `${accepted ? 'accepted' : 'not accepted'} (${plural(errors, 'error')}, ${plural(warnings, 'warning')}${infos ? `, ${infos} info` : ''}).`,
  );
  const h = s.header;
  if (h.missing.length) lines.push(`Missing columns: ${h.missing.join(', ')}.`);
  if (h.duplicate.length) lines.push(`Repeated columns: ${h.duplicate.join(', ')}.`);
  if (h.unexpected.length) lines.push(`Columns not in the codebook: ${h.unexpected.join(', ')}.`);
  if (h.outOfOrder) lines.push('Columns are not in codebook order (matched by name).');
  for (const n of h.typeNotes ?? []) lines.push(`Note: ${n.message}`);
  const byRule = Object.entries(s.findings.byRule).sort((a, b) => (b[1] ?? 0) - (a[1] ?? 0));
  if (byRule.length) {
    lines.push('Findings by rule:');
    for (const [rule, n] of byRule) lines.push(`  ${rule}: ${n}`);
  }
  const shown = result.findings.filter((f) => f.severity !== 'info').slice(0, SHOWN_FINDINGS);
  if (shown.length) {
    lines.push(`First ${plural(shown.length, 'finding')} at error or warning severity:`);
    for (const f of shown) lines.push(findingLine(f));
  }
  return lines.join('\n') + '\n';
}

/** Wraps a delivery so that rows read so far are shown on a terminal (stderr), then cleared. */
function withProgress(d: Delivery, io: Io): Delivery {
  return {
    ...d,
    batches: async function* (): AsyncGenerator<RowBatch> {
      let rows = 0;
      let shown = 0;
      for await (const b of d.batches()) {
        rows += b.count;
        if (rows - shown >= 50_000) {
          io.stderr(`\rchecking: ${rows.toLocaleString('en')} rows`);
          shown = rows;
        }
        yield b;
      }
      if (shown > 0) io.stderr('\r\u001b[K');
    },
  };
}

/**
 * `codeweir check <data> --codebook <file> [--out <dir>] [--split-by <item>] [--json]
 * [--fail-on warning] [--strict] [--max-findings-per-rule N] [--delimiter c] [--encoding e]
 * [--decimal-comma] [--quantiles N] [--max-field-bytes N] [--threads N] [--format f] [--sheet s]
 * [--engine builtin|duckdb|postgres] [--connection url] [--row-column c] [--quiet]`. A csv.gz,
 * xlsx or Parquet delivery is read on one thread through the same classification. With more than one
 * thread (the default on a multi-core machine) a large file is checked in parallel, with the
 * same result; progress is shown for a one-thread check only. Exit 0 when no finding is at error severity
 * (with --fail-on warning: no warning either), 1 when there are error findings or the
 * codebook is invalid (with --strict: has lint warnings), 2 for usage errors and unreadable input.
 */
export const checkCommand: CommandDef = {
  command: 'check <data>',
  describe: 'Check a delivery against a codebook; with --out write the findings log, missingness tables and summary.',
  builder: (y) =>
    y
      .positional('data', { type: 'string', describe: 'the delivery (CSV or other delimited text)', demandOption: true })
      .option('codebook', { type: 'string', demandOption: true, describe: 'the codebook JSON file' })
      .option('out', { type: 'string', describe: 'folder for findings.csv, findings.jsonl, missingness.csv, missingness-by-group.csv, summary.json' })
      .option('split-by', { type: 'string', describe: 'a group item: also write by-<item>/<code>/ files holding only that group\'s rows (needs --out)' })
      .option('json', { type: 'boolean', default: false, describe: 'print the check summary as one JSON document on stdout' })
      .option('fail-on', { type: 'string', choices: ['error', 'warning'], default: 'error', describe: 'lowest severity that makes the exit code 1' })
      .option('strict', { type: 'boolean', default: false, describe: "the codebook's lint warnings count as errors: the check refuses to start (exit 1)" })
      .option('max-findings-per-rule', { type: 'string', describe: 'findings kept in the log per rule (counts stay exact); default 1000' })
      .option('delimiter', { type: 'string', describe: 'field delimiter (detected from the header when absent)' })
      .option('encoding', { type: 'string', describe: 'utf-8 (default), windows-1252, latin1, utf-16le, utf-16be' })
      .option('decimal-comma', { type: 'boolean', default: false, describe: 'decimals are written with a comma (1,5)' })
      .option('quantiles', { type: 'string', describe: 'Hyndman-Fan quantile type 1 to 9 for the outlier fences; default 7' })
      .option('max-field-bytes', { type: 'string', describe: 'largest field allowed, in bytes (a larger one makes the file unreadable)' })
      .option('threads', THREADS_OPTION)
      .option('format', FORMAT_OPTION)
      .option('sheet', SHEET_OPTION)
      .option('engine', { type: 'string', choices: ['builtin', 'duckdb', 'postgres'], default: 'builtin', describe: 'where the checks run: the built-in reader, embedded DuckDB (CSV or Parquet), or a PostgreSQL server (needs --connection; <data> is then a table name)' })
      .option('connection', { type: 'string', describe: 'with --engine postgres: the server, as postgresql://user@host:port/database (a host of /path is a unix-socket folder)' })
      .option('row-column', { type: 'string', describe: 'with --engine postgres: the table column that numbers the rows (default: the order the server returns them in)' })
      .option('ledger', { type: 'string', describe: 'a ledger file (DuckDB; created when absent): record this delivery in it and compare it with the one recorded before (default: the ledger named in codeweir.json beside the codebook)' })
      .option('ledger-wait', LEDGER_WAIT_OPTION)
      .option('previous', { type: 'string', describe: 'the delivery before this one: compare with it (without a ledger); with --split-by each team folder gets its changes' })
      .option('drift-p', DRIFT_P_OPTION)
      .option('drift-psi', DRIFT_PSI_OPTION)
      .option('min-cell', MIN_CELL_OPTION)
      .option('show-values', SHOW_VALUES_OPTION)
      .option('weight', { type: 'string', describe: "with --strata or --cluster: the design's weight item" })
      .option('strata', { type: 'string', describe: "strata item of the sample design, for the design findings (default: the codebook's design)" })
      .option('cluster', { type: 'string', describe: 'cluster item of the sample design, for the design findings' })
      .option('quiet', { type: 'boolean', default: false, describe: 'no progress on stderr' }),
  handler: async (args, io) => {
    const data = String(args.data);
    // The ledger (and DuckDB) is loaded only with --ledger, --previous or a ledger in the project file
    // (codeweir.json beside the codebook): without them the check runs exactly as before.
    const season = await checkSeason(args, io.cwd);
    const threads = threadsOption(args.threads);
    // Loaded here, not at the top, so that starting the CLI costs only the command it runs.
    const [{ loadCodebookOrThrow }, { openDelivery }, { checkDelivery, checkFile, normalizeCheckOptions, writeCheckOutputs }] = await Promise.all([
      import('@codeweir/codebook'),
      import('@codeweir/read'),
      import('@codeweir/check'),
    ]);
    const options = normalizeCheckOptions({
      maxFindingsPerRule: args['max-findings-per-rule'],
      quantileType: args.quantiles,
      decimalComma: args['decimal-comma'] === true,
      delimiter: args.delimiter,
      encoding: args.encoding,
      maxFieldBytes: args['max-field-bytes'],
      // check alone describes nothing: coded items are tallied as rows pass and keep no per-row memory
      // (with --ledger they are kept for the ledger's code counts).
      retainCoded: season !== undefined,
    });
    const splitBy = args['split-by'] === undefined ? undefined : String(args['split-by']);
    if (splitBy !== undefined && args.out === undefined) throw new CodeweirError('CW_USAGE', '--split-by writes files, so it needs --out <dir>.');
    const codebook = withDesignOptions(await loadCodebookOrThrow(resolve(io.cwd, String(args.codebook)), { strict: args.strict === true }), args);
    const disclosure = disclosureChoice(args, codebook);
    if (splitBy !== undefined && !codebook.groupItems.some((g) => g.name === splitBy)) {
      const groups = codebook.groupItems.map((g) => g.name);
      throw new CodeweirError('CW_USAGE', `--split-by takes a group item of the codebook${groups.length ? ` (${groups.join(', ')})` : ', which has none'}, got ${splitBy}.`);
    }
    const engine = String(args.engine ?? 'builtin');
    const input = inputFormatOf(args);
    if (args.connection !== undefined && engine !== 'postgres') throw new CodeweirError('CW_USAGE', '--connection applies to --engine postgres only.');
    if (args['row-column'] !== undefined && engine !== 'postgres') throw new CodeweirError('CW_USAGE', '--row-column applies to --engine postgres only.');
    const dataPath = resolve(io.cwd, data);
    let result: CheckResult;
    if (engine !== 'builtin') {
      // Loaded only for these engines, so the built-in check starts as fast as before.
      const { checkWithEngine } = await import('@codeweir/sql');
      result = await checkWithEngine(engine === 'postgres' ? data : dataPath, codebook, options, {
        engine: engine as 'duckdb' | 'postgres',
        connection: args.connection === undefined ? undefined : String(args.connection),
        rowColumn: args['row-column'] === undefined ? undefined : String(args['row-column']),
        format: input.format,
      });
    } else if (!(await isPlainText(dataPath, input))) {
      result = await checkTypedInput(dataPath, codebook, options, input, (d) => (io.isTTY && args.quiet !== true && args.json !== true ? withProgress(d, io) : d));
    } else if (threads > 1) result = await checkFile(dataPath, codebook, { ...options, threads });
    else {
      const opened = await openDelivery(dataPath, { delimiter: options.delimiter, encoding: options.encoding, maxFieldBytes: options.maxFieldBytes });
      const delivery = io.isTTY && args.quiet !== true && args.json !== true ? withProgress(opened, io) : opened;
      result = await checkDelivery(delivery, codebook, options);
    }
    result.summary.file = data;
    const failOnWarning = args['fail-on'] === 'warning';
    const errors = result.summary.findings.bySeverity.error ?? 0;
    const warnings = result.summary.findings.bySeverity.warning ?? 0;
    const exit = errors > 0 || (failOnWarning && warnings > 0) ? 1 : 0;
    // The verdict in the summary follows the same threshold as the exit code.
    result.summary.accepted = exit === 0;
    if (args.out !== undefined) await writeCheckOutputs(result, resolve(io.cwd, String(args.out)), { splitBy, disclosure: { ...disclosure, ruleSeverity: new Map(codebook.rules.map((r) => [r.id, r.severity])) } });
    const recorded = season === undefined ? undefined : await season.record(result, codebook, { io, data, dataPath, engine, input, options, splitBy, out: args.out });
    if (args.json === true) io.stdout(JSON.stringify(recorded === undefined ? result.summary : { ...result.summary, [recorded.key]: recorded.json }, null, 2) + '\n');
    else {
      io.stdout(humanReport(result, data, failOnWarning));
      if (args.out !== undefined) io.stdout(`Findings log, missingness and summary written to ${String(args.out)}.\n`);
      if (recorded !== undefined) io.stdout(recorded.line);
    }
    return exit;
  },
};
