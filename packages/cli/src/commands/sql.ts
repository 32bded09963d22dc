import { resolve } from 'node:path';
import { CodeweirError, writeFileAtomic } from '@codeweir/core';
import type { CommandDef } from '../io.ts';

/**
 * `codeweir sql <codebook> --dialect duckdb|postgres|ansi --table <name> [--row-column <c>]
 * [--max-findings-per-rule N] [--decimal-comma] [-o <file.sql>] [--json]`: the codebook's checks
 * as SQL over a table holding a delivery (one column per item): the findings log in the
 * findings-log columns, the finding counts, the tallies (missingness by item and group, routing,
 * rules) and the fence quartiles (Hyndman-Fan type 7). Printed on stdout, or written to -o.
 * Exit 0 with the SQL; 1 for an invalid codebook; 2 for usage errors and for a codebook with a
 * construct that has no SQL form (the message names it and its codebook path; the built-in
 * check runs such a codebook).
 */
export const sqlCommand: CommandDef = {
  command: 'sql <codebook>',
  describe: "Compile a codebook's checks to SQL (DuckDB, PostgreSQL, or ANSI for distributed engines) over a table holding a delivery.",
  builder: (y) =>
    y
      .positional('codebook', { type: 'string', describe: 'the codebook JSON file', demandOption: true })
      .option('dialect', { type: 'string', choices: ['duckdb', 'postgres', 'ansi'], demandOption: true, describe: 'the SQL dialect: duckdb, postgres, or ansi (Spark SQL, Trino and other distributed engines)' })
      .option('table', { type: 'string', demandOption: true, describe: 'the table holding the delivery, one column per item (schema.table allowed)' })
      .option('row-column', { type: 'string', describe: 'the column that numbers the rows from 1 (default: row_number() OVER (), the order the engine returns them in)' })
      .option('max-findings-per-rule', { type: 'string', describe: 'findings kept in the log per rule (counts stay exact); default 1000' })
      .option('decimal-comma', { type: 'boolean', default: false, describe: 'decimals are written with a comma (1,5)' })
      .option('o', { alias: 'output', type: 'string', describe: 'write the SQL to this file instead of stdout' })
      .option('json', { type: 'boolean', default: false, describe: 'print { dialect, table, quantileType, queries: { findings, counts, tallies, fences } } as JSON' }),
  handler: async (args, io) => {
    const table = String(args.table);
    if (table.trim() === '') throw new CodeweirError('CW_USAGE', '--table takes the name of a table, got nothing.');
    // Loaded here, not at the top, so that starting the CLI costs only the command it runs.
    const [{ loadCodebookOrThrow }, { compileCheckSql, ident, sqlScript }] = await Promise.all([import('@codeweir/codebook'), import('@codeweir/sql')]);
    const codebook = await loadCodebookOrThrow(resolve(io.cwd, String(args.codebook)));
    const dialect = String(args.dialect) as 'duckdb' | 'postgres' | 'ansi';
    const rowColumn = args['row-column'] === undefined ? undefined : String(args['row-column']);
    const options = { dialect, maxFindingsPerRule: args['max-findings-per-rule'], decimalComma: args['decimal-comma'] === true };
    let text: string;
    if (args.json === true) {
      const from = table.split('.').map(ident).join('.');
      const c = compileCheckSql(codebook, { ...options, source: { from, row: rowColumn === undefined ? undefined : ident(rowColumn) } });
      text = JSON.stringify({ dialect, table, quantileType: 7, groupKeys: c.groupItems, queries: { findings: c.findings, counts: c.counts, tallies: c.tallies, fences: c.fences } }, null, 2) + '\n';
    } else text = sqlScript(codebook, { ...options, table, rowColumn });
    if (args.o !== undefined) {
      await writeFileAtomic(resolve(io.cwd, String(args.o)), text);
      if (args.json !== true) io.stdout(`SQL for ${dialect} written to ${String(args.o)}.\n`);
    } else io.stdout(text);
    return 0;
  },
};
