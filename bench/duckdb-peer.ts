/**
 * The same checks as codeweir's, written as SQL for DuckDB: code membership per coded item,
 * missing kinds by CASE, hard and soft range checks, the routed item, the cross-item rule,
 * duplicate ids and quartiles (quantile_cont, which is Hyndman-Fan type 7). Built from the
 * codebook JSON so that every item gets its check. The peer is what the benchmark measures
 * codeweir against; the smoke test checks that both count the same invalid cells.
 */
import type { QuerySpec } from './duckdb-child.mjs';

interface RawCode {
  code: number | string;
  bin?: { min: number; max?: number };
}
interface RawMissing {
  code: number | string;
  kind: string;
}
interface RawItem {
  name: string;
  role?: string;
  type: 'integer' | 'decimal' | 'text' | 'date';
  level?: string;
  codes?: RawCode[];
  range?: { min?: number; max?: number };
  expect?: { min?: number; max?: number };
  missing?: string | RawMissing[];
  askedWhen?: string;
  pattern?: string;
}
interface RawCodebook {
  missingSets?: Record<string, RawMissing[]>;
  items: RawItem[];
}

/**
 * SQL text of routing conditions and rules, keyed by item name and rule id, over item names
 * (each read as the item's valid value). A rule's optional `when` limits it to the rows where
 * that is true (elsewhere the rule is skipped).
 */
export interface PeerSqlExtras {
  askedWhen: Record<string, string>;
  rules: Record<string, { test: string; variables: string[]; when?: string; whenVariables?: string[] }>;
}

export interface PeerItem {
  valid: number;
  invalid: number;
  missing: Record<string, number>;
  findings: Record<string, number>;
  quartiles?: [number, number, number];
}

export interface PeerResult {
  rows: number;
  items: Record<string, PeerItem>;
  rules: Record<string, { passed: number; failed: number; undetermined: number; skipped?: number }>;
  duplicateIds: number;
}

const q = (name: string): string => `"${name.replaceAll('"', '""')}"`;
const lit = (s: string): string => `'${s.replaceAll("'", "''")}'`;
const num = (x: number): string => (Number.isInteger(x) ? `${x}.0` : String(x));

function missingOf(cb: RawCodebook, item: RawItem): RawMissing[] {
  if (item.missing === undefined) return [];
  return typeof item.missing === 'string' ? (cb.missingSets?.[item.missing] ?? []) : item.missing;
}

/**
 * Per item: the classes of a cell as an ordered list of (label, condition), tested in order by
 * one CASE, so each condition assumes the earlier ones failed; the last has no condition (ELSE).
 * Labels: `valid`, `missing|<kind>` (blank included) and `finding|<rule>`. A text item's
 * pattern must match the whole value (`regexp_full_match`; the shapes' patterns use only the
 * syntax RE2 and JavaScript read alike).
 */
function classify(cb: RawCodebook, item: RawItem) {
  const x = q(item.name);
  const numeric = item.type === 'integer' || item.type === 'decimal';
  // Numeric items compare their parsed value (one TRY_CAST per cell, done in the stage before);
  // comparing numbers is several times faster in DuckDB than comparing text.
  const v = numeric ? q(`${item.name}|n`) : `TRY_CAST(${x} AS DOUBLE)`;
  const kinds = new Map<string, string[]>();
  for (const m of missingOf(cb, item)) kinds.set(m.kind, [...(kinds.get(m.kind) ?? []), String(m.code)]);
  const member = (list: Array<number | string>): string =>
    numeric && list.every((c) => typeof c === 'number' || /^-?\d+(\.\d+)?$/.test(c))
      ? `${v} IN (${list.map((c) => num(Number(c))).join(', ')})`
      : `${x} IN (${list.map((c) => lit(String(c))).join(', ')})`;
  const cases: Array<[string, string | null]> = [['missing|blank', `${x} IS NULL OR ${x} = ''`]];
  for (const [kind, codes] of kinds) cases.push([`missing|${kind}`, member(codes)]);
  if (item.codes?.length) {
    cases.push(['valid', member(item.codes.map((c) => c.code))]);
    const bins = item.codes.filter((c) => c.bin);
    if (bins.length) {
      const inBin = bins
        .map((c) => `(${v} >= ${num(c.bin!.min)}${c.bin!.max === undefined ? '' : ` AND ${v} <= ${num(c.bin!.max)}`})`)
        .join(' OR ');
      cases.push(['finding|unbinned-value', inBin]);
    }
    cases.push(['finding|not-a-code', null]);
  } else if (numeric) {
    cases.push(['finding|not-a-number', `${v} IS NULL`]);
    if (item.type === 'integer') cases.push(['finding|not-an-integer', `${v} <> floor(${v})`]);
    const lo = item.range?.min;
    const hi = item.range?.max;
    const outside = [lo === undefined ? '' : `${v} < ${num(lo)}`, hi === undefined ? '' : `${v} > ${num(hi)}`].filter(Boolean);
    if (outside.length) cases.push(['finding|impossible', outside.join(' OR ')]);
    cases.push(['valid', null]);
  } else {
    if (item.pattern !== undefined) cases.push(['finding|pattern-mismatch', `NOT regexp_full_match(${x}, ${lit(item.pattern)})`]);
    cases.push(['valid', null]);
  }
  return { x, v, numeric, cases, validK: cases.findIndex(([label]) => label === 'valid') + 1 };
}

/**
 * Builds the peer's statements: one load of the CSV into a table (every column as text, as
 * delivered), then one aggregate query over it, one for duplicate ids and one for the routed
 * items. Cost: O(items) string building.
 */
export function buildPeer(codebook: unknown, csvPath: string, extras: PeerSqlExtras): QuerySpec {
  const cb = codebook as RawCodebook;
  // count_if rather than count(*) FILTER: with some 180 counts in one query, DuckDB runs the
  // FILTER form about fifteen times slower.
  // First every cell gets one class (a small integer: 1 valid, 2 blank, 3.. a missing kind or an
  // invalid rule) and, when valid, its typed value; then one scan counts the classes.
  const classCols: string[] = [];
  const typedCols: string[] = [];
  const cols: string[] = ['count(*) AS "rows"'];
  const validTyped = new Map<string, string>();
  const sub = (expr: string): string =>
    expr.replace(/\b[a-z_][a-z0-9_]*\b/gi, (w) => (validTyped.has(w) ? validTyped.get(w)! : w));
  // An expression is determined only where every item it reads is valid (codeweir's convention).
  const determined = (vars: string[]): string => vars.map((vname) => `${validTyped.get(vname)} IS NOT NULL`).join(' AND ') || 'true';
  const itemsIn = (expr: string): string[] => [...new Set(expr.match(/\b[a-z_][a-z0-9_]*\b/gi) ?? [])].filter((w) => validTyped.has(w));
  for (const item of cb.items) {
    const c = classify(cb, item);
    const n = item.name;
    const cls = q(`${n}|c`);
    typedCols.push(c.x);
    if (c.numeric) typedCols.push(`TRY_CAST(${c.x} AS DOUBLE) AS ${c.v}`);
    classCols.push(`CASE ${c.cases.map(([, cond], k) => (cond === null ? `ELSE ${k + 1}` : `WHEN ${cond} THEN ${k + 1}`)).join(' ')} END AS ${cls}`);
    c.cases.forEach(([label], k) => cols.push(`count_if(${cls} = ${k + 1}) AS ${q(`${n}|${label}`)}`));
    // DuckDB lets a later column of the same SELECT name an earlier one (`cls`).
    if (c.numeric) {
      classCols.push(`CASE WHEN ${cls} = ${c.validK} THEN ${c.v} END AS ${q(`${n}|v`)}`);
      validTyped.set(n, q(`${n}|v`));
    } else validTyped.set(n, `(CASE WHEN ${cls} = ${c.validK} THEN ${c.x} END)`);
    if (item.expect && !item.codes?.length && validTyped.has(n)) {
      const v = validTyped.get(n)!;
      const o = [item.expect.min === undefined ? '' : `${v} < ${num(item.expect.min)}`, item.expect.max === undefined ? '' : `${v} > ${num(item.expect.max)}`]
        .filter(Boolean)
        .join(' OR ');
      cols.push(`count_if(${o}) AS ${q(`${n}|finding|implausible`)}`);
    }
    if ((item.level === 'interval' || item.level === 'ratio') && !item.codes?.length && item.role !== 'id') {
      cols.push(`quantile_cont(${validTyped.get(n)}, [0.25, 0.5, 0.75]) AS ${q(`${n}|quartiles`)}`);
    }
  }
  for (const [id, rule] of Object.entries(extras.rules)) {
    const allValid = determined(rule.variables);
    const typed = sub(rule.test);
    // Rows where the rule applies: all of them, or those where `when` is determined and true.
    let applies = 'true';
    if (rule.when !== undefined) {
      const w = determined(rule.whenVariables ?? itemsIn(rule.when));
      const wt = sub(rule.when);
      applies = `(${w} AND (${wt}))`;
      cols.push(`count_if(${w} AND NOT (${wt})) AS ${q(`rule|${id}|skipped`)}`);
      cols.push(`count_if(NOT (${w}) OR (${applies} AND NOT (${allValid}))) AS ${q(`rule|${id}|undetermined`)}`);
    } else cols.push(`count_if(NOT (${allValid})) AS ${q(`rule|${id}|undetermined`)}`);
    cols.push(`count_if(${applies} AND ${allValid} AND (${typed})) AS ${q(`rule|${id}|passed`)}`);
    cols.push(`count_if(${applies} AND ${allValid} AND NOT (${typed})) AS ${q(`rule|${id}|failed`)}`);
  }
  for (const [name, cond] of Object.entries(extras.askedWhen)) {
    cols.push(`count_if(${determined(itemsIn(cond))} AND NOT (${sub(cond)}) AND ${validTyped.get(name)} IS NOT NULL) AS ${q(`${name}|finding|answered-when-skipped`)}`);
  }
  const idItem = cb.items.find((i) => i.role === 'id');
  const counts = cols.filter((c) => !c.startsWith('quantile_cont'));
  const quartiles = cols.filter((c) => c.startsWith('quantile_cont'));
  // Counts and quartiles are separate queries: mixed with the FILTER counts, DuckDB plans each
  // holistic quantile aggregate as its own branch joined back, several times slower.
  const queries: Record<string, string> = { summary: `SELECT ${counts.join(',\n  ')} FROM cells` };
  if (quartiles.length) queries.quartiles = `SELECT ${quartiles.join(',\n  ')} FROM cells`;
  if (idItem) {
    const id = q(idItem.name);
    classCols.push(`${id} AS "id|raw"`);
    queries.duplicates = `SELECT coalesce(sum(n - 1), 0) AS "duplicateIds" FROM (SELECT count(*) AS n FROM cells WHERE "id|raw" IS NOT NULL GROUP BY "id|raw" HAVING count(*) > 1)`;
  }
  return {
    setup: [
      // One scan of the file: every column read as text (as delivered), parsed once, classified,
      // and only the classes, the valid values and the id kept.
      `CREATE TEMP TABLE cells AS SELECT ${classCols.join(',\n  ')} FROM (SELECT ${typedCols.join(', ')} FROM ` +
        `read_csv(${lit(csvPath)}, header = true, all_varchar = true, delim = ',', quote = '"', escape = '"'))`,
    ],
    queries,
  };
}

/** Shapes the peer's raw result rows into per-item tallies. Cost: O(columns). */
export function shapePeer(raw: Record<string, Array<Record<string, unknown>>>): PeerResult {
  const row = { ...raw.summary[0], ...(raw.quartiles?.[0] ?? {}) };
  const out: PeerResult = { rows: Number(row.rows), items: {}, rules: {}, duplicateIds: Number(raw.duplicates?.[0]?.duplicateIds ?? 0) };
  const itemOf = (n: string): PeerItem => (out.items[n] ??= { valid: 0, invalid: 0, missing: {}, findings: {} });
  for (const [key, value] of Object.entries(row)) {
    const p = key.split('|');
    if (p[0] === 'rule') {
      const r = (out.rules[p[1]] ??= { passed: 0, failed: 0, undetermined: 0 });
      r[p[2] as 'passed' | 'skipped'] = Number(value);
    } else if (p[1] === 'valid') itemOf(p[0]).valid = Number(value);
    else if (p[1] === 'missing') {
      if (Number(value) > 0) itemOf(p[0]).missing[p[2]] = Number(value);
    } else if (p[1] === 'finding') {
      if (Number(value) > 0) itemOf(p[0]).findings[p[2]] = Number(value);
      if (p[2] !== 'implausible') itemOf(p[0]).invalid += Number(value);

    } else if (p[1] === 'quartiles' && Array.isArray(value)) itemOf(p[0]).quartiles = value.map(Number) as [number, number, number];
  }
  // A valid answer where routing says skip counts as invalid, not valid (codeweir's convention).
  for (const it of Object.values(out.items)) it.valid -= it.findings['answered-when-skipped'] ?? 0;
  return out;
}
