/**
 * The text `codeweir sql` prints: the compiled queries as one SQL script, each statement with a
 * comment saying what it returns and which conventions it follows.
 */
import type { CompiledCodebook } from '@codeweir/codebook';
import type { CheckOptionsInput } from '@codeweir/check';
import { compileCheckSql, type CompiledSql } from './compile.ts';
import { ident, type DialectName } from './dialect.ts';

export interface ScriptOptions extends CheckOptionsInput {
  dialect: DialectName;
  /** The table, optionally schema-qualified (`survey.wave2`); each part is quoted. */
  table: string;
  /** The column that numbers the rows (1-based); default row_number() OVER (). */
  rowColumn?: string;
}

/** The statements of a script, in order, with their comment lines. */
export function scriptParts(compiled: CompiledSql): Array<{ name: keyof Pick<CompiledSql, 'findings' | 'counts' | 'tallies' | 'fences'>; comment: string[] }> {
  const groups = compiled.groupItems.map((g, k) => `g${k} = ${g}`).join(', ');
  return [
    {
      name: 'findings',
      comment: [
        'Findings log: row, id, item, value, rule, severity, message, suggestion, in log order',
        '(row, then item in codebook order with rules after the items, then rule), the first',
        'N of each rule kept; cw_col and cw_rule are the sort keys, cw_number the value as a number',
        `(outliers, numeric duplicates)${groups ? `, and the row's group keys: ${groups}` : ''}.`,
      ],
    },
    { name: 'counts', comment: ['Finding counts by rule, item and severity: every finding, logged or not.'] },
    {
      name: 'tallies',
      comment: [
        'Tallies: count of cells by item and class (ok, w:<warning rule>, m:<missing kind>, x:<invalid rule>),',
        'with the cells that had spaces around the value and the first row; overall (cw_byK = 1 for every',
        'group K) and by each group item (cw_byK = 0). Pseudo items: routing:<item> (asked, skipped,',
        'undetermined), rule:<id> (passed, failed, undetermined, skipped), record:missing (records by',
        'number of missing cells).',
      ],
    },
    { name: 'fences', comment: ['Fence quartiles q1, q3 and the number of valid values of each interval or ratio item.'] },
  ];
}

/**
 * The checks of `codebook` as one SQL script for `dialect` over `table`. Every statement is
 * complete on its own (the common table expressions are repeated), so each can be run alone.
 * Convention: as {@link compileCheckSql}; quartiles Hyndman-Fan type 7 (DuckDB quantile_cont,
 * PostgreSQL and standard SQL percentile_cont), Tukey fences at 1.5 and 3 x IQR.
 * Cost: linear in the codebook. Throws as compileCheckSql (CW_USAGE naming a construct with no
 * SQL form and its codebook path).
 * @example sqlScript(codebook, { dialect: 'postgres', table: 'wave2' }) // '-- codeweir sql ...'
 */
export function sqlScript(codebook: CompiledCodebook, options: ScriptOptions): string {
  const { table, rowColumn, ...rest } = options;
  const from = table.split('.').map(ident).join('.');
  const compiled = compileCheckSql(codebook, { ...rest, source: { from, row: rowColumn === undefined ? undefined : ident(rowColumn) } });
  const head = [
    `-- codeweir sql: the checks of codebook ${codebook.id} ${codebook.version} as ${compiled.dialect} SQL over the table ${table}.`,
    '-- The table has one row per record and one column per item, named as the items; every cell is',
    '-- read as text (CAST ... AS text), so a typed column is judged by its value.',
    rowColumn === undefined
      ? '-- Rows are numbered by row_number() OVER (), the order the engine returns them in; pass --row-column for a stable numbering.'
      : `-- Rows are numbered by the column ${rowColumn} (1-based).`,
    '-- Every check is per row except two aggregations: duplicate values of unique items (a window',
    '-- partitioned by value, ordered by row) and the Tukey fence quartiles (Hyndman-Fan type 7: continuous',
    '-- quantile, linear interpolation at (n - 1) p, as quantile_cont / percentile_cont compute it; fences',
    '-- at 1.5 and 3 x IQR from the quartiles).',
  ];
  const body = scriptParts(compiled).flatMap((p, k) => ['', `-- ${k + 1}. ${p.comment[0]}`, ...p.comment.slice(1).map((c) => `--    ${c}`), `${compiled[p.name]};`]);
  return [...head, ...body, ''].join('\n');
}
