/**
 * The findings log and missingness tables as files: CSV for spreadsheets, JSON Lines for
 * programs, the summary as JSON. All files of one call appear together (written to temporary
 * names, then renamed), and the delivery itself is never touched.
 */
import { join } from 'node:path';
import { writeFilesAtomic, CodeweirError } from '@codeweir/core';
import { KINDS } from './classify.ts';
import type { CheckResult, Finding, GroupItemTally } from './types.ts';
import { missingnessSuppression, suppressedSummary, suppressedMissingCells, withholdFindings, type DisclosureOptions, type LineStates, type MissingnessSuppression } from './disclosure.ts';

const BOM = '\ufeff';

/**
 * Makes a CSV cell safe to open in a spreadsheet: a cell that starts with `=`, `+`, `-`, `@`,
 * a tab or a carriage return could be run as a formula, so it gets a leading apostrophe
 * (spreadsheets show the rest as text). This also applies to negative numbers such as a
 * missing code -9 in `value`: the log shows '-9, which a reader should take as the text -9.
 * Cost: O(1). Throws nothing.
 * @example neutraliseCell('=1+1') // "'=1+1"
 */
export function neutraliseCell(s: string): string {
  if (s.length === 0) return s;
  const c = s.charCodeAt(0);
  return c === 61 || c === 43 || c === 45 || c === 64 || c === 9 || c === 13 ? `'${s}` : s;
}

/** RFC 4180 quoting: quote a field holding the delimiter, a quote or a line break; double quotes inside. */
function quote(s: string): string {
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** One CSV line from cells (neutralised, then quoted), CRLF-terminated as RFC 4180 has it. */
function csvLine(cells: ReadonlyArray<string | number>): string {
  return cells.map((c) => quote(neutraliseCell(String(c)))).join(',') + '\r\n';
}

const FINDING_COLUMNS = ['row', 'id', 'item', 'value', 'rule', 'severity', 'message', 'suggestion'] as const;

/**
 * The findings log as CSV text: UTF-8 with a byte-order mark (so spreadsheets pick the
 * encoding), columns row,id,item,value,rule,severity,message,suggestion, every cell
 * neutralised by {@link neutraliseCell}. Cost: O(findings). Throws nothing.
 */
export function findingsCsv(findings: readonly Finding[]): string {
  let out = BOM + csvLine(FINDING_COLUMNS);
  for (const f of findings) out += csvLine([f.row, f.id, f.item, f.value, f.rule, f.severity, f.message, f.suggestion ?? '']);
  return out;
}

/** The findings log as JSON Lines (one finding object a line, values unchanged). Cost: O(findings). Throws nothing. */
export function findingsJsonl(findings: readonly Finding[]): string {
  return findings.map((f) => JSON.stringify(f)).join('\n') + (findings.length ? '\n' : '');
}

function missingTotal(t: GroupItemTally): number {
  let s = 0;
  for (const k of KINDS) s += t.missing[k] ?? 0;
  return s;
}

function percent(n: number, of: number): string {
  return of === 0 ? '' : String(Math.round((1e4 * n) / of) / 100);
}

function missingRow(lead: Array<string | number>, item: string, t: GroupItemTally, states?: LineStates | null): string {
  if (states !== undefined) return csvLine([...lead, item, ...suppressedMissingCells(t, states ?? undefined, percent)]);
  const rows = t.valid + t.invalid + missingTotal(t);
  return csvLine([...lead, item, rows, t.valid, t.invalid, ...KINDS.map((k) => t.missing[k] ?? 0), missingTotal(t), percent(missingTotal(t), rows)]);
}

const MISSING_HEAD = ['item', 'rows', 'valid', 'invalid', ...KINDS, 'missing', 'percent_missing'];

/**
 * Missingness by item as CSV (UTF-8 with BOM): rows, valid, invalid, one column per missing
 * kind (blank first), all missing, and the percentage of rows missing (0 to 100, two decimals,
 * empty when there are no rows). Items absent from the delivery are left out. Cost: O(items). Throws nothing.
 */
export function missingnessCsv(result: CheckResult, suppression?: MissingnessSuppression): string {
  let out = BOM + csvLine(MISSING_HEAD);
  for (const [name, t] of Object.entries(result.summary.items)) if (!t.absent) out += missingRow([], name, t, suppression && (suppression.overall.get(name) ?? null));
  return out;
}

/** Missingness by group as CSV: one line per group item, group code and item, columns as {@link missingnessCsv}. Cost: O(groups x items). Throws nothing. */
export function missingnessByGroupCsv(result: CheckResult, suppression?: MissingnessSuppression): string {
  let out = BOM + csvLine(['group_item', 'group', ...MISSING_HEAD]);
  for (const [g, byKey] of Object.entries(result.summary.groups)) {
    for (const [key, perItem] of Object.entries(byKey)) {
      for (const [name, t] of Object.entries(perItem)) out += missingRow([g, key], name, t, suppression && (suppression.byGroup.get(g)?.get(key)?.get(name) ?? null));
    }
  }
  return out;
}

/**
 * A group code as a folder name of `--split-by`: characters outside letters, digits, `.`, `_`
 * and `-` become `_`. Cost: O(length). Throws nothing.
 * @example folderName('Team 7') // "Team_7"
 */
export function folderName(code: string): string {
  const s = code.replace(/[^A-Za-z0-9._-]/g, '_');
  return s === '' || s === '.' || s === '..' ? `_${s}` : s;
}

export interface WriteCheckOptions {
  /** A group item: also write `by-<item>/<code>/findings.csv` and `missingness.csv` for each of its codes. */
  splitBy?: string;
  /** Disclosure control of the missingness tables and the per-group files (see disclosure.ts). */
  disclosure?: DisclosureOptions;
}

/**
 * Writes the outputs of a check to `dir` (created when absent): `findings.csv`,
 * `findings.jsonl`, `missingness.csv` (by item), `missingness-by-group.csv` and
 * `summary.json`; with `splitBy` also `by-<item>/<code>/findings.csv` and `missingness.csv`
 * holding only the rows of that group (row-level findings whose row has that group code; the
 * group's own missingness table). The log holds the findings kept in memory
 * (maxFindingsPerRule per rule over the whole delivery), so a split file lists that group's
 * share of them. All files are written to temporary names first and renamed together.
 * Returns the paths written. Cost: O(findings + groups x items). Throws CodeweirError
 * CW_USAGE when `splitBy` is not a group item, CW_WRITE_FAILED when a file cannot be written.
 */
export async function writeCheckOutputs(result: CheckResult, dir: string, opts: WriteCheckOptions = {}): Promise<string[]> {
  const disclosure = opts.disclosure;
  const suppression = disclosure && disclosure.minCell > 1 ? missingnessSuppression(result, disclosure.minCell) : undefined;
  const files: Array<[string, string]> = [
    [join(dir, 'findings.csv'), findingsCsv(result.findings)],
    [join(dir, 'findings.jsonl'), findingsJsonl(result.findings)],
    [join(dir, 'missingness.csv'), missingnessCsv(result, suppression)],
    [join(dir, 'missingness-by-group.csv'), missingnessByGroupCsv(result, suppression)],
    [join(dir, 'summary.json'), JSON.stringify(suppression && disclosure ? suppressedSummary(result, suppression, disclosure) : result.summary, null, 2) + '\n'],
  ];
  if (opts.splitBy !== undefined) {
    const g = opts.splitBy;
    const byKey = result.summary.groups[g];
    if (byKey === undefined) {
      const known = Object.keys(result.summary.groups);
      throw new CodeweirError('CW_USAGE', `--split-by takes a group item${known.length ? ` (${known.join(', ')})` : ' and the codebook has none'}, got ${g}.`);
    }
    const used = new Set<string>();
    for (const [key, perItem] of Object.entries(byKey)) {
      let folder = folderName(key);
      while (used.has(folder)) folder += '_';
      used.add(folder);
      const base = join(dir, `by-${folderName(g)}`, folder);
      const theirs = result.findings.filter((f) => f.groups?.[g] === key);
      const mine = disclosure ? withholdFindings(theirs, disclosure) : theirs;
      let miss = BOM + csvLine(MISSING_HEAD);
      for (const [name, t] of Object.entries(perItem)) miss += missingRow([], name, t, suppression && (suppression.byGroup.get(g)?.get(key)?.get(name) ?? null));
      files.push([join(base, 'findings.csv'), findingsCsv(mine)], [join(base, 'missingness.csv'), miss]);
    }
  }
  await writeFilesAtomic(files);
  return files.map(([p]) => p);
}
