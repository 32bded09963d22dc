/**
 * A codebook's checks compiled to SQL: the same cell classification, routing, rules,
 * duplicate ids and Tukey fences as the built-in check, as a chain of common table expressions
 * over a table whose columns hold the cells as text, and three queries over that chain:
 * the findings log (capped per rule), the finding counts, and the tallies (missingness by item
 * and group, routing, rules, missing cells per record) with the fence quartiles.
 *
 * Every check is per row except two aggregations: duplicate values of unique items (a window
 * partitioned by value, ordered by row) and the fence quartiles (one continuous quantile,
 * Hyndman-Fan type 7, per interval or ratio item).
 */
import { CodeweirError } from '@codeweir/core';
import { ExpressionContext, MISSING_KINDS, type CompiledCodebook, type CompiledItem } from '@codeweir/codebook';
import { compileClassifiers, mapHeader, normalizeCheckOptions, parseNumber, RULE_NUMBER, rules, type CheckOptionsInput, type FindingRule } from '@codeweir/check';
import { celToSql } from './cel-sql.ts';
import { dialectOf, ident, lit, num, type Dialect, type DialectName } from './dialect.ts';

/** Where the rows come from. */
export interface SqlSource {
  /** FROM clause: a table name (quoted as needed) or a table function. */
  from: string;
  /** 1-based row number of a row (default: `row_number() OVER ()`, the order the engine returns the rows in). */
  row?: string;
  /** Number of fields of a ragged-aware source (a CSV read with padding), or undefined for a table. */
  fields?: string;
  /** The delivered header (default: the item names, in codebook order). */
  header?: readonly string[];
  /** SQL of the cell at header position `p` (default: the column named as the header, cast to text). */
  column?: (position: number, name: string) => string;
  /** True when a NULL cell lies past the end of a short row (a padded CSV); otherwise NULL is a blank cell. */
  nullIsAbsent?: boolean;
}

export interface CompileSqlOptions extends CheckOptionsInput {
  dialect: DialectName;
  source: SqlSource;
  /**
   * A table already holding the classified cells (made from {@link CompiledSql.cells}): the four
   * queries then read it instead of classifying every cell again each.
   */
  cellsTable?: string;
}

/** The compiled queries. Each is one complete statement (the shared CTE chain repeated). */
export interface CompiledSql {
  dialect: DialectName;
  /** The findings log: row, id, item, value, rule, severity, message, suggestion (+ sort keys, group keys, number). */
  findings: string;
  /** Finding counts by rule, item and severity (every finding, not only the logged ones). */
  counts: string;
  /** Tallies: (grouping, group key, item, class) -> count, spaced cells, first row; routing, rules and missing-per-record as pseudo items. */
  tallies: string;
  /** Fence quartiles (q1, q3) per interval or ratio item. */
  fences: string;
  /** The classified cells, one row per record (the chain's last step), to keep in a table for {@link CompileSqlOptions.cellsTable}. */
  cells: string;
  /** Group items by their position in the tallies' group key columns. */
  groupItems: string[];
  /** Item indices of the present items. */
  present: number[];
  /** The header map of the source's header. */
  header: ReturnType<typeof mapHeader>;
}

const R = RULE_NUMBER;
const MAX_VALUE_CHARS = 1000;
/** Marker put in place of a finding's value when its message text is made, then cut into SQL around it. */
const MARK = '\u0000\u0001value\u0001\u0000';
const NUMBER_RE = '^[+-]?([0-9]+([.][0-9]*)?|[.][0-9]+)([eE][+-]?[0-9]+)?$';
const DATE_RE = '^[0-9]{4}-[0-9]{2}-[0-9]{2}$';

/** A message template as SQL: the literal pieces joined around `value` (and any other marked parameters). */
function template(message: string, value: string, more: ReadonlyArray<[string, string]> = []): string {
  const marks: Array<[string, string]> = [[MARK, value], ...more];
  let pieces: Array<{ sql: string } | string> = [message];
  for (const [mark, sql] of marks) {
    pieces = pieces.flatMap((p) => (typeof p !== 'string' ? [p] : p.split(mark).flatMap((t, k) => (k === 0 ? [t] : [{ sql }, t]))));
  }
  const parts = pieces.filter((p) => p !== '').map((p) => (typeof p === 'string' ? lit(p) : p.sql));
  return parts.length === 1 ? parts[0]! : `(${parts.join(' || ')})`;
}

function shapeOf(item: CompiledItem): 'coded' | 'numeric' | 'text' {
  if (item.codes.length > 0 && item.level !== 'interval' && item.level !== 'ratio') return 'coded';
  if (item.type === 'integer' || item.type === 'decimal' || item.type === 'date') return 'numeric';
  return 'text';
}

/** The JS pattern as a regular expression every dialect reads alike, or a refusal naming what it cannot. */
function patternSql(item: CompiledItem, dialect: Dialect): string {
  const re = item.pattern!;
  // u (code points) is how the SQL engines' regular expressions read text anyway.
  const flags = re.flags.replace(/[gyu]/g, '');
  if (/[^i]/.test(flags)) {
    throw new CodeweirError('CW_USAGE', `/items/${item.index}/pattern: the regular expression flags "${flags}" have no ${dialect.name} SQL form; check this codebook with the built-in engine.`, { path: `/items/${item.index}/pattern` });
  }
  const body = /^\^\(\?:([\s\S]*)\)\$$/.exec(re.source)?.[1] ?? re.source;
  const bad = /\(\?[=!<]|\\[1-9kpPuxcbB]|\(\?<[A-Za-z]/.exec(body);
  if (bad) {
    throw new CodeweirError(
      'CW_USAGE',
      `/items/${item.index}/pattern: ${JSON.stringify(bad[0])} in ${JSON.stringify(body)} has no ${dialect.name} SQL regular-expression form; check this codebook with the built-in engine.`,
      { path: `/items/${item.index}/pattern` },
    );
  }
  return lit(`${flags.includes('i') ? '(?i)' : ''}^(?:${body})$`);
}

/**
 * Compiles the checks of `codebook` to SQL for `dialect` over `source`.
 *
 * Convention: as the built-in check (see @codeweir/check createPass and finalize): a cell is
 * trimmed of spaces, tabs and no-break spaces; blank and declared missing codes are missing by
 * kind; numbers are plain decimal notation (sign, digits, one decimal mark, exponent), dates
 * YYYY-MM-DD calendar days; routing and rules read the cell-level classification and are
 * undetermined on a row where an item they read is not valid; a valid answer where routing
 * says skip is answered-when-skipped and counts as invalid. Fence quartiles are Hyndman-Fan
 * type 7 (quantile_cont / percentile_cont); another `quantileType` is refused. Findings are
 * ordered by row, item (codebook order, rules after items) and rule, and the first
 * `maxFindingsPerRule` of each rule are kept in the log.
 * Cost: linear in the codebook. Throws CodeweirError CW_USAGE for a construct with no SQL form
 * (a CEL function, a regular-expression feature), naming it and its codebook path, for
 * `quantileType` other than 7 and for bad options.
 */
export function compileCheckSql(codebook: CompiledCodebook, options: CompileSqlOptions): CompiledSql {
  const d = dialectOf(options.dialect);
  const opts = normalizeCheckOptions(options);
  if (opts.quantileType !== 7) {
    throw new CodeweirError('CW_USAGE', `--quantiles ${opts.quantileType} has no SQL form: the SQL engines' continuous quantile (quantile_cont / percentile_cont) is Hyndman-Fan type 7 only.`);
  }
  const src = options.source;
  const header = src.header ?? codebook.items.map((i) => i.name);
  const hmap = mapHeader(codebook, header);
  const { items: cls } = compileClassifiers(codebook, opts);
  const present = codebook.items.filter((it) => hmap.positions[it.index]! >= 0).map((it) => it.index);
  const isPresent = new Set(present);
  const colOf = src.column ?? ((_p: number, name: string) => `CAST(${ident(name)} AS ${d.text})`);
  const T = (i: number) => `t${i}`;
  const RAW = (i: number) => `r${i}`;
  const N = (i: number) => `n${i}`;
  const C = (i: number) => `c${i}`;
  const V = (i: number) => `v${i}`;
  const F = (i: number) => `f${i}`;
  const validOf = (i: number) => `${C(i)} IN ('ok', 'w:implausible')`;
  const double = (x: string) => `CAST(${x} AS ${d.double})`;

  // --- 1. The cells as text, trimmed; numbers parsed; dates split.
  const srcCols: string[] = [`${src.row ?? 'row_number() OVER ()'} AS cw_row`, `${src.fields ?? num(header.length)} AS cw_nf`];
  for (const i of present) srcCols.push(`${colOf(hmap.positions[i]!, header[hmap.positions[i]!]!)} AS ${RAW(i)}`);
  const trimCols: string[] = ['cw_row', 'cw_nf'];
  for (const i of present) trimCols.push(RAW(i), `${d.trim(`COALESCE(${RAW(i)}, '')`)} AS ${T(i)}`);
  const parseCols: string[] = ['*'];
  for (const i of present) {
    const item = codebook.items[i]!;
    if (item.type === 'date') {
      parseCols.push(
        `CASE WHEN ${d.regex(T(i), lit(DATE_RE))} THEN CAST(SUBSTRING(${T(i)}, 1, 4) AS INTEGER) END AS y${i}`,
        `CASE WHEN ${d.regex(T(i), lit(DATE_RE))} THEN CAST(SUBSTRING(${T(i)}, 6, 2) AS INTEGER) END AS m${i}`,
        `CASE WHEN ${d.regex(T(i), lit(DATE_RE))} THEN CAST(SUBSTRING(${T(i)}, 9, 2) AS INTEGER) END AS d${i}`,
      );
    } else if (item.type === 'integer' || item.type === 'decimal') {
      const t = opts.decimalComma ? `REPLACE(${T(i)}, ',', '.')` : T(i);
      const guard = opts.decimalComma ? `POSITION('.' IN ${T(i)}) = 0 AND ` : '';
      parseCols.push(`CASE WHEN ${guard}${d.regex(t, lit(NUMBER_RE))} THEN ${double(t)} END AS ${N(i)}`);
    }
  }

  // --- 2. Classification: c<i> is 'ok', 'w:<rule>', 'm:<kind>' or 'x:<rule>'; v<i> the valid value.
  const cellCols: string[] = ['*'];
  const suggestion: Map<number, string> = new Map();
  for (const i of present) {
    const item = codebook.items[i]!;
    const shape = shapeOf(item);
    const whens: string[] = [];
    if (src.nullIsAbsent) whens.push(`WHEN ${RAW(i)} IS NULL THEN 'x:absent'`);
    whens.push(`WHEN ${T(i)} = '' THEN 'm:blank'`);
    const textMissing = item.missing.map((m) => `WHEN ${T(i)} = ${lit(m.text)} THEN ${lit(`m:${m.kind}`)}`);
    const numericMissing = item.missing
      .map((m) => ({ v: typeof m.code === 'number' ? m.code : parseNumber(m.text, opts.decimalComma), kind: m.kind }))
      .filter((m) => Number.isFinite(m.v));
    let value = 'NULL';
    // Text that is no number: a declared missing code written as text, else not-a-number.
    const notANumber = `WHEN ${N(i)} IS NULL THEN ${textMissing.length ? `CASE ${textMissing.join(' ')} ELSE 'x:not-a-number' END` : "'x:not-a-number'"}`;
    if (shape === 'coded' && item.type !== 'text' && item.type !== 'date') {
      const codeValues = item.codes.map((c) => (typeof c.code === 'number' ? c.code : parseNumber(c.text, opts.decimalComma))).filter((v) => Number.isFinite(v));
      whens.push(notANumber);
      if (codeValues.length) whens.push(`WHEN ${N(i)} IN (${codeValues.map(num).join(', ')}) THEN 'ok'`);
      for (const m of numericMissing) whens.push(`WHEN ${N(i)} = ${num(m.v)} THEN ${lit(`m:${m.kind}`)}`);
      if (item.type === 'integer') whens.push(`WHEN ${N(i)} <> FLOOR(${N(i)}) THEN 'x:not-an-integer'`);
      if (item.binned) {
        const bins = item.bins.map((b) => `${N(i)} >= ${num(b.min)}${b.max === null ? '' : ` AND ${N(i)} <= ${num(b.max)}`}`);
        whens.push(`WHEN ${bins.map((b) => `(${b})`).join(' OR ')} THEN 'x:unbinned-value'`);
        suggestion.set(i, `CASE ${item.bins.map((b) => `WHEN ${N(i)} >= ${num(b.min)}${b.max === null ? '' : ` AND ${N(i)} <= ${num(b.max)}`} THEN ${lit(item.codes[b.index]!.text)}`).join(' ')} END`);
      }
      whens.push(`ELSE 'x:not-a-code'`);
      value = N(i);
    } else if (shape === 'coded') {
      const keys = [...item.codeByText.entries()];
      whens.push(`WHEN ${T(i)} IN (${keys.map(([k]) => lit(k)).join(', ')}) THEN 'ok'`, ...textMissing, `ELSE 'x:not-a-code'`);
      value = `CASE ${keys.map(([k, idx]) => { const c = item.codes[idx]!.code; return `WHEN ${T(i)} = ${lit(k)} THEN ${typeof c === 'number' ? lit(String(c)) : lit(c)}`; }).join(' ')} END`;
    } else if (shape === 'numeric' && item.type === 'date') {
      const y = `y${i}`;
      const m = `m${i}`;
      const dd = `d${i}`;
      const leap = `((MOD(${y}, 4) = 0 AND MOD(${y}, 100) <> 0) OR MOD(${y}, 400) = 0)`;
      const monthDays = `CASE WHEN ${m} IN (4, 6, 9, 11) THEN 30 WHEN ${m} = 2 THEN CASE WHEN ${leap} THEN 29 ELSE 28 END ELSE 31 END`;
      // Years before 100 are refused as the built-in check's calendar refuses them.
      const isDay = `${y} >= 100 AND ${m} BETWEEN 1 AND 12 AND ${dd} BETWEEN 1 AND ${monthDays}`;
      whens.push(...textMissing, `WHEN ${y} IS NULL OR NOT (${isDay}) THEN 'x:not-a-date'`, `ELSE 'ok'`);
      // Days since 1970-01-01 by the proleptic Gregorian civil-from-days arithmetic (March-based
      // years of 365.2425 days on average; all terms are non-negative, so FLOOR is integer division).
      const yy = `(${y} - CASE WHEN ${m} <= 2 THEN 1 ELSE 0 END)`;
      const era = `FLOOR(${yy} / 400.0)`;
      const yoe = `(${yy} - ${era} * 400)`;
      const mp = `MOD(${m} + 9, 12)`;
      const doy = `(FLOOR((153 * ${mp} + 2) / 5.0) + ${dd} - 1)`;
      const doe = `(${yoe} * 365 + FLOOR(${yoe} / 4.0) - FLOOR(${yoe} / 100.0) + ${doy})`;
      value = `CASE WHEN ${y} IS NOT NULL AND ${isDay} THEN ${double(`${era} * 146097 + ${doe} - 719468`)} END`;
    } else if (shape === 'numeric') {
      whens.push(notANumber);
      for (const mm of numericMissing) whens.push(`WHEN ${N(i)} = ${num(mm.v)} THEN ${lit(`m:${mm.kind}`)}`);
      if (item.type === 'integer') whens.push(`WHEN ${N(i)} <> FLOOR(${N(i)}) THEN 'x:not-an-integer'`);
      const r = item.range;
      if (r && (r.min !== undefined || r.max !== undefined)) {
        const out = [r.min !== undefined ? `${N(i)} < ${num(r.min)}` : '', r.max !== undefined ? `${N(i)} > ${num(r.max)}` : ''].filter(Boolean).join(' OR ');
        whens.push(`WHEN ${out} THEN 'x:impossible'`);
      }
      const e = item.expect;
      if (e && (e.min !== undefined || e.max !== undefined)) {
        const out = [e.min !== undefined ? `${N(i)} < ${num(e.min)}` : '', e.max !== undefined ? `${N(i)} > ${num(e.max)}` : ''].filter(Boolean).join(' OR ');
        whens.push(`WHEN ${out} THEN 'w:implausible'`);
      }
      whens.push(`ELSE 'ok'`);
      value = N(i);
    } else {
      whens.push(...textMissing);
      if (item.pattern) whens.push(`WHEN LENGTH(${T(i)}) > ${opts.maxPatternLength} OR NOT ${d.regex(T(i), patternSql(item, d))} THEN 'x:pattern-mismatch'`);
      whens.push(`ELSE 'ok'`);
      value = T(i);
    }
    cellCols.push(`CASE ${whens.join(' ')} END AS ${C(i)}`, `${value} AS ${V(i)}`);
  }

  // --- 3. Routing and rules on the cell-level classification.
  const ctx = new ExpressionContext(codebook.items.map((it) => ({ index: it.index, name: it.name, type: it.type })));
  const intItems = new Set(codebook.items.filter((it) => it.type === 'integer' || it.type === 'date').map((it) => it.name));
  const varSql = (name: string) => {
    const it = codebook.byName.get(name);
    if (!it || !isPresent.has(it.index)) return undefined;
    const kind = it.type === 'text' ? ('string' as const) : ('num' as const);
    return { sql: V(it.index), kind };
  };
  const allValid = (names: readonly string[]) => {
    if (names.length === 0) return 'TRUE';
    const parts: string[] = [];
    for (const n of names) {
      const it = codebook.byName.get(n);
      if (!it || !isPresent.has(it.index)) return 'FALSE';
      parts.push(`(${validOf(it.index)})`);
    }
    return parts.join(' AND ');
  };
  const routeCols: string[] = ['*'];
  const routed: number[] = [];
  for (const i of present) {
    const item = codebook.items[i]!;
    if (!item.askedWhen) continue;
    routed.push(i);
    const cond = celToSql(ctx, { path: `/items/${i}/askedWhen`, source: item.askedWhen.source }, varSql, intItems, d);
    routeCols.push(`CASE WHEN ${allValid(item.askedWhen.variables)} THEN CASE WHEN ${cond} THEN 1 ELSE 0 END END AS a${i}`);
  }
  codebook.rules.forEach((rule, k) => {
    const test = celToSql(ctx, { path: `/rules/${k}/test`, source: rule.test.source }, varSql, intItems, d);
    const parts: string[] = [];
    if (rule.when) {
      const when = celToSql(ctx, { path: `/rules/${k}/when`, source: rule.when.source }, varSql, intItems, d);
      parts.push(`WHEN NOT (${allValid(rule.when.variables)}) THEN 'undetermined'`, `WHEN NOT ${when} THEN 'skipped'`);
    }
    parts.push(`WHEN NOT (${allValid(rule.test.variables)}) THEN 'undetermined'`, `WHEN ${test} THEN 'passed'`, `ELSE 'failed'`);
    routeCols.push(`CASE ${parts.join(' ')} END AS q${k}`);
  });

  // --- 4. Final classification (routing applied), group keys, the row's id, missing cells.
  const finalCols: string[] = ['*'];
  for (const i of present) {
    finalCols.push(codebook.items[i]!.askedWhen ? `CASE WHEN a${i} = 0 AND ${validOf(i)} THEN 'x:answered-when-skipped' ELSE ${C(i)} END AS ${F(i)}` : `${C(i)} AS ${F(i)}`);
  }
  /** Text of a valid cell as the built-in check keys it: the code's text, the number, or the text. */
  const keyText = (it: CompiledItem): string => {
    const i = it.index;
    const s = shapeOf(it);
    if (s === 'coded' && it.type !== 'text' && it.type !== 'date') {
      const byValue = it.codes.map((c) => `WHEN ${N(i)} = ${num(typeof c.code === 'number' ? c.code : parseNumber(c.text, opts.decimalComma))} THEN ${lit(c.text)}`);
      return `CASE ${byValue.join(' ')} END`;
    }
    if (s === 'coded') return `CASE ${[...it.codeByText.entries()].map(([k, idx]) => `WHEN ${T(i)} = ${lit(k)} THEN ${lit(it.codes[idx]!.text)}`).join(' ')} END`;
    if (s === 'numeric') return it.type === 'decimal' ? `CAST(${V(i)} AS ${d.text})` : `CAST(CAST(${V(i)} AS BIGINT) AS ${d.text})`;
    return T(i);
  };
  const groupItems = codebook.groupItems.map((g) => g.name);
  codebook.groupItems.forEach((g, k) => {
    const i = g.index;
    finalCols.push(isPresent.has(i) ? `CASE WHEN ${C(i)} LIKE 'm:%' THEN '(missing)' WHEN ${C(i)} LIKE 'x:%' THEN '(invalid)' ELSE ${keyText(g)} END AS g${k}` : `'(missing)' AS g${k}`);
  });
  const idItem = codebook.idItem && isPresent.has(codebook.idItem.index) ? codebook.idItem : undefined;
  finalCols.push(idItem ? `CASE WHEN ${validOf(idItem.index)} THEN ${keyText(idItem)} ELSE ${T(idItem.index)} END AS cw_id` : `'' AS cw_id`);
  finalCols.push(`${present.length ? present.map((i) => `CASE WHEN ${C(i)} LIKE 'm:%' THEN 1 ELSE 0 END`).join(' + ') : '0'} AS cw_missing`);

  const fenced = present.filter((i) => cls[i]!.fenced);
  const chain = [
    `cw_src AS ${d.materialize}(SELECT ${srcCols.join(', ')} FROM ${src.from})`,
    `cw_trim AS ${d.materialize}(SELECT ${trimCols.join(', ')} FROM cw_src)`,
    `cw_parse AS ${d.materialize}(SELECT ${parseCols.join(', ')} FROM cw_trim)`,
    `cw_cell AS ${d.materialize}(SELECT ${cellCols.join(', ')} FROM cw_parse)`,
    `cw_route AS ${d.materialize}(SELECT ${routeCols.join(', ')} FROM cw_cell)`,
    `cw_final AS ${d.materialize}(SELECT ${finalCols.join(', ')} FROM cw_route)`,
  ];
  // Fence quartiles: one aggregation per fenced item over its valid values (after routing).
  const fenceSelects = fenced.map(
    (i) =>
      `SELECT ${lit(codebook.items[i]!.name)} AS item, ${d.quantile(`CASE WHEN ${F(i)} IN ('ok', 'w:implausible') THEN ${V(i)} END`, 0.25)} AS q1, ${d.quantile(`CASE WHEN ${F(i)} IN ('ok', 'w:implausible') THEN ${V(i)} END`, 0.75)} AS q3, COUNT(CASE WHEN ${F(i)} IN ('ok', 'w:implausible') THEN 1 END) AS n FROM cw_final`,
  );
  const fencesCte = fenceSelects.length
    ? `cw_fences AS (${fenceSelects.join(' UNION ALL ')})`
    : `cw_fences AS (SELECT CAST(NULL AS ${d.text}) AS item, CAST(NULL AS ${d.double}) AS q1, CAST(NULL AS ${d.double}) AS q3, 0 AS n FROM cw_final WHERE 1 = 0)`;

  // --- 5. Findings.
  const groupCols = groupItems.map((_, k) => `g${k}`);
  const gsel = groupCols.length ? `, ${groupCols.join(', ')}` : '';
  const cut = (x: string) => `CASE WHEN LENGTH(${x}) > ${MAX_VALUE_CHARS} THEN SUBSTRING(${x}, 1, ${MAX_VALUE_CHARS}) || '...' ELSE ${x} END`;
  const ruleOrder = (rule: FindingRule) => num(R[rule]);
  const fsel = (row: string, item: string, value: string, rule: FindingRule, severity: string, message: string, sugg: string, col: number, numeric: string, where: string) =>
    `SELECT ${row} AS "row", cw_id AS id, ${item} AS item, ${value} AS value, ${lit(rule)} AS rule, ${severity} AS severity, ${message} AS message, ${sugg} AS suggestion, ${num(col)} AS cw_col, ${ruleOrder(rule)} AS cw_rule, ${numeric} AS cw_number${gsel} FROM cw_final WHERE ${where}`;
  const findings: string[] = [];
  const nHeader = header.length;
  if (src.fields) {
    const short = rules['ragged-row'].message({ fields: 1, expected: nHeader }).replace(/^The row has 1 field /, '');
    const msgShort = `'The row has ' || CAST(cw_nf AS ${d.text}) || ' field' || CASE WHEN cw_nf = 1 THEN '' ELSE 's' END || ${lit(' ' + short)}`;
    const long = rules['ragged-row'].message({ fields: nHeader + 1, expected: nHeader }).replace(/^The row has \d+ fields /, '');
    const msgLong = `'The row has ' || CAST(cw_nf AS ${d.text}) || ' fields ' || ${lit(long)}`;
    findings.push(fsel('cw_row', "''", `CAST(cw_nf AS ${d.text}) || ' fields'`, 'ragged-row', "'error'", `CASE WHEN cw_nf < ${nHeader} THEN ${msgShort} ELSE ${msgLong} END`, 'NULL', -1, 'NULL', `cw_nf <> ${nHeader}`));
  }
  /** The cell rules an item's classification can give, by its shape, type, bins and bounds. */
  const cellRulesOf = (item: CompiledItem): FindingRule[] => {
    const shape = shapeOf(item);
    if (shape === 'coded' && item.type !== 'text' && item.type !== 'date') return ['not-a-number', ...(item.type === 'integer' ? (['not-an-integer'] as const) : []), ...(item.binned ? (['unbinned-value'] as const) : []), 'not-a-code'];
    if (shape === 'coded') return ['not-a-code'];
    if (item.type === 'date') return ['not-a-date'];
    if (shape === 'numeric') return ['not-a-number', ...(item.type === 'integer' ? (['not-an-integer'] as const) : []), ...(item.range ? (['impossible'] as const) : []), ...(item.expect ? (['implausible'] as const) : [])];
    return item.pattern ? ['pattern-mismatch'] : [];
  };
  for (const i of present) {
    const item = codebook.items[i]!;
    const c = cls[i]!;
    const cellRules = cellRulesOf(item);
    if (cellRules.length === 0) continue;
    const classes = cellRules.map((rule) => lit((rule === 'implausible' ? 'w:' : 'x:') + rule));
    const messages = cellRules.map((rule) => {
      if (rule !== 'unbinned-value') return `WHEN ${C(i)} = ${lit('x:' + rule)} THEN ${template(c.message(R[rule], MARK, ''), T(i))}`.replace(lit('x:implausible'), lit('w:implausible'));
      return item.bins.map((b) => `WHEN ${C(i)} = 'x:unbinned-value' AND ${N(i)} >= ${num(b.min)}${b.max === null ? '' : ` AND ${N(i)} <= ${num(b.max)}`} THEN ${template(c.message(R[rule], MARK, item.codes[b.index]!.text), T(i))}`).join(' ');
    });
    const ruleOf = `SUBSTRING(${C(i)}, 3)`;
    findings.push(
      `SELECT cw_row AS "row", cw_id AS id, ${lit(item.name)} AS item, ${cut(`COALESCE(${RAW(i)}, '')`)} AS value, ${ruleOf} AS rule, CASE WHEN ${C(i)} LIKE 'w:%' THEN 'warning' ELSE 'error' END AS severity, CASE ${messages.join(' ')} END AS message, ${item.binned && suggestion.has(i) ? `CASE WHEN ${C(i)} = 'x:unbinned-value' THEN ${suggestion.get(i)!} END` : `CAST(NULL AS ${d.text})`} AS suggestion, ${num(i)} AS cw_col, CASE ${cellRules.map((r) => `WHEN ${C(i)} = ${lit((r === 'implausible' ? 'w:' : 'x:') + r)} THEN ${ruleOrder(r)}`).join(' ')} END AS cw_rule, CAST(NULL AS ${d.double}) AS cw_number${gsel} FROM cw_final WHERE ${C(i)} IN (${classes.join(', ')})`,
    );
  }
  // Duplicate values of unique items: every occurrence after the first, in row order.
  const uniqueItems = present.filter((i) => codebook.items[i]!.unique);
  for (const i of uniqueItems) {
    const item = codebook.items[i]!;
    const numeric = cls[i]!.shape === 'numeric' || (cls[i]!.shape === 'coded' && item.type !== 'text');
    const key = numeric ? V(i) : T(i);
    const valueText = numeric ? keyText(item) : T(i);
    findings.push(
      `SELECT "row", id, item, value, rule, severity, message, suggestion, cw_col, cw_rule, cw_number${gsel} FROM (SELECT cw_row AS "row", cw_id AS id, ${lit(item.name)} AS item, ${valueText} AS value, 'duplicate-id' AS rule, 'error' AS severity, ${template(rules['duplicate-id'].message({ item: item.name, value: MARK }), valueText)} AS message, CAST(NULL AS ${d.text}) AS suggestion, ${num(i)} AS cw_col, ${ruleOrder('duplicate-id')} AS cw_rule, ${numeric ? V(i) : `CAST(NULL AS ${d.double})`} AS cw_number${gsel}, row_number() OVER (PARTITION BY ${key} ORDER BY cw_row) AS cw_seen FROM cw_final WHERE ${validOf(i)}) cw_dup WHERE cw_seen > 1`,
    );
  }
  for (const i of routed) {
    const item = codebook.items[i]!;
    const condition = item.askedWhen!.source;
    findings.push(fsel('cw_row', lit(item.name), "''", 'blank-when-asked', "'warning'", lit(rules['blank-when-asked'].message({ item: item.name, condition })), 'NULL', i, 'NULL', `a${i} = 1 AND ${C(i)} = 'm:blank'`));
    const kinds = MISSING_KINDS.filter((k) => k !== 'not-applicable');
    findings.push(
      fsel(
        'cw_row',
        lit(item.name),
        cut(`COALESCE(${RAW(i)}, '')`),
        'missing-code-when-skipped',
        "'warning'",
        `CASE ${kinds.map((k) => `WHEN ${C(i)} = ${lit(`m:${k}`)} THEN ${template(rules['missing-code-when-skipped'].message({ item: item.name, value: MARK, condition, kind: k }), T(i))}`).join(' ')} END`,
        'NULL',
        i,
        'NULL',
        `a${i} = 0 AND ${C(i)} LIKE 'm:%' AND ${C(i)} NOT IN ('m:blank', 'm:not-applicable')`,
      ),
    );
    findings.push(fsel('cw_row', lit(item.name), cut(`COALESCE(${RAW(i)}, '')`), 'answered-when-skipped', "'error'", template(rules['answered-when-skipped'].message({ item: item.name, value: MARK, condition }), T(i)), 'NULL', i, 'NULL', `${F(i)} = 'x:answered-when-skipped'`));
  }
  const nItems = codebook.items.length;
  codebook.rules.forEach((rule, k) => {
    findings.push(fsel('cw_row', lit(rule.id), "''", 'rule-failed', lit(rule.severity), lit(rules['rule-failed'].message({ rule: rule.id, message: rule.message })), 'NULL', nItems + k, 'NULL', `q${k} = 'failed'`));
  });
  // Tukey fences: outlier beyond 1.5 x IQR (exclusive), extreme beyond 3 x IQR, one finding per value.
  for (const i of fenced) {
    const item = codebook.items[i]!;
    const fv = `CASE WHEN ${F(i)} IN ('ok', 'w:implausible') THEN ${V(i)} END`;
    const lower = (k: string) => `(cw_q.q1 - ${k} * (cw_q.q3 - cw_q.q1))`;
    const upper = (k: string) => `(cw_q.q3 + ${k} * (cw_q.q3 - cw_q.q1))`;
    const beyond = (k: string) => `(${fv} < ${lower(k)} OR ${fv} > ${upper(k)})`;
    const LO = '\u0000\u0001lower\u0001\u0000';
    const HI = '\u0000\u0001upper\u0001\u0000';
    const msg = (rule: 'outlier' | 'extreme', k: string) =>
      template(rules[rule].message({ item: item.name, value: MARK, lower: LO as never, upper: HI as never }), `CAST(${fv} AS ${d.text})`, [
        [LO, `CAST(${lower(k)} AS ${d.text})`],
        [HI, `CAST(${upper(k)} AS ${d.text})`],
      ]);
    findings.push(
      `SELECT cw_row AS "row", cw_id AS id, ${lit(item.name)} AS item, CAST(${fv} AS ${d.text}) AS value, CASE WHEN ${beyond('3')} THEN 'extreme' ELSE 'outlier' END AS rule, 'info' AS severity, CASE WHEN ${beyond('3')} THEN ${msg('extreme', '3')} ELSE ${msg('outlier', '1.5')} END AS message, CAST(NULL AS ${d.text}) AS suggestion, ${num(i)} AS cw_col, CASE WHEN ${beyond('3')} THEN ${ruleOrder('extreme')} ELSE ${ruleOrder('outlier')} END AS cw_rule, ${fv} AS cw_number${gsel} FROM cw_final CROSS JOIN (SELECT q1, q3 FROM cw_fences WHERE item = ${lit(item.name)}) cw_q WHERE ${beyond('1.5')}`,
    );
  }
  const none = `SELECT CAST(NULL AS BIGINT) AS "row", CAST(NULL AS ${d.text}) AS id, CAST(NULL AS ${d.text}) AS item, CAST(NULL AS ${d.text}) AS value, CAST(NULL AS ${d.text}) AS rule, CAST(NULL AS ${d.text}) AS severity, CAST(NULL AS ${d.text}) AS message, CAST(NULL AS ${d.text}) AS suggestion, 0 AS cw_col, 0 AS cw_rule, CAST(NULL AS ${d.double}) AS cw_number${groupCols.map((g) => `, CAST(NULL AS ${d.text}) AS ${g}`).join('')} FROM cw_final WHERE 1 = 0`;
  const findingsCte = `cw_findings AS (${[none, ...findings].join('\nUNION ALL\n')})`;

  // --- 6. Tallies: one long relation of (item, class) per row and cell, grouped three ways.
  const tallyRows: string[] = [];
  for (const i of present) tallyRows.push(`SELECT cw_row${gsel}, ${lit(codebook.items[i]!.name)} AS item, ${F(i)} AS cls, CASE WHEN ${RAW(i)} IS NOT NULL AND ${RAW(i)} <> ${T(i)} THEN 1 ELSE 0 END AS spaced FROM cw_final`);
  for (const i of routed) tallyRows.push(`SELECT cw_row${gsel}, ${lit(`routing:${codebook.items[i]!.name}`)} AS item, CASE a${i} WHEN 1 THEN 'asked' WHEN 0 THEN 'skipped' ELSE 'undetermined' END AS cls, 0 AS spaced FROM cw_final`);
  codebook.rules.forEach((rule, k) => tallyRows.push(`SELECT cw_row${gsel}, ${lit(`rule:${rule.id}`)} AS item, q${k} AS cls, 0 AS spaced FROM cw_final`));
  tallyRows.push(`SELECT cw_row${gsel}, 'record:missing' AS item, CAST(cw_missing AS ${d.text}) AS cls, 0 AS spaced FROM cw_final`);
  const sets = ['(item, cls)', ...groupCols.map((g) => `(${g}, item, cls)`)];
  const grouping = groupCols.map((g, k) => `GROUPING(${g}) AS cw_by${k}`);
  const tallies = `SELECT ${groupCols.length ? `${groupCols.join(', ')}, ${grouping.join(', ')}, ` : ''}item, cls, COUNT(*) AS n, SUM(spaced) AS spaced, MIN(cw_row) AS first_row FROM (${tallyRows.join('\nUNION ALL\n')}) cw_cells GROUP BY GROUPING SETS (${sets.join(', ')})`;

  const cells = `WITH ${chain.join(',\n')}\nSELECT * FROM cw_final`;
  // With a table of classified cells, the queries start from it.
  if (options.cellsTable !== undefined) chain.splice(0, chain.length, `cw_final AS (SELECT * FROM ${options.cellsTable})`);
  const withAll = `WITH ${[...chain, fencesCte, findingsCte].join(',\n')}\n`;
  const cap = opts.maxFindingsPerRule;
  return {
    dialect: d.name,
    findings: `${withAll}SELECT "row", id, item, value, rule, severity, message, suggestion, cw_col, cw_rule, cw_number${gsel} FROM (SELECT *, row_number() OVER (PARTITION BY rule ORDER BY "row", cw_col, cw_rule) AS cw_rank FROM cw_findings) cw_ranked WHERE cw_rank <= ${cap} ORDER BY "row", cw_col, cw_rule`,
    counts: `${withAll}SELECT rule, item, severity, COUNT(*) AS n FROM cw_findings GROUP BY rule, item, severity ORDER BY rule, item`,
    tallies: `WITH ${chain.join(',\n')}\n${tallies}`,
    fences: `WITH ${[...chain, fencesCte].join(',\n')}\nSELECT item, q1, q3, n FROM cw_fences`,
    cells,
    groupItems,
    present,
    header: hmap,
  };
}
