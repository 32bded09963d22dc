/**
 * A report split by a group item: the main report, one page per code holding only that code's
 * rows, and an index page. A team's findings are the delivery's findings in its rows; its
 * tallies are check's group tallies; its item summaries are `describe` run on its rows.
 */
import type { CheckResult, CheckSummary, ColumnStore, Finding, ItemColumn, ItemTally } from '@codeweir/check';
import { describe, type DescribeOptionsInput } from '@codeweir/describe';
import { CodeweirError } from '@codeweir/core';
import { escapeHtml as esc } from './escape.ts';
import { formatNumber as num, formatPercent as pct } from './format.ts';
import { table, type ReportInput, type ReportOptions, type TeamScope } from './context.ts';
import { UNASSIGNED, groupItemOrThrow, cappedRules, keyOfFinding, tallyByKey, teamRows, worstText, type TeamRow } from './teams.ts';
import { renderReport } from './report.ts';
import { pageShell } from './page.ts';
import { discloseReportInput, discloseTeamPart, teamDisclosurePlan, teamFindingCounts, type ReportDisclosure, type TeamDisclosurePlan } from './disclosure.ts';
import { NO_ROW, keyGroupTotal } from '@codeweir/check';

/** The count of findings of no row under the plan's suppression (NaN: suppressed). */
function noRowTotal(plan: TeamDisclosurePlan, group: string): number {
  const fs = plan.findings!;
  const n = [...(fs.bySeverity.get(group)?.get(NO_ROW)?.values() ?? [])].reduce((a, b) => a + b, 0);
  return fs.suppressed.has(keyGroupTotal(group, NO_ROW)) ? Number.NaN : n;
}

/** One code's share of a checked delivery: its rows as a CheckResult of their own. */
export interface TeamPart {
  row: TeamRow;
  /** 0-based rows of the delivery, ascending. */
  rows: Uint32Array;
  check: CheckResult;
}

/** Where each file of a split report goes, relative to the main report's folder. */
export interface SplitLayout {
  main: string;
  folder: string;
  index: string;
  /** Group key -> page path. */
  pages: Map<string, string>;
}

/**
 * The file layout of a split report: `-o out/report.html --split-by team` writes
 * `out/report.html`, `out/report-team/index.html` and `out/report-team/team-<code>.html` (one
 * per code with rows; `team-unassigned.html` for rows without a valid code). Codes become
 * file names with every character other than letters, digits, `-` and `_` replaced by `_`.
 */
export function splitLayout(mainFile: string, group: string, rows: readonly TeamRow[]): SplitLayout {
  const stem = mainFile.replace(/\.html?$/i, '');
  const folder = `${stem}-${group}`.replace(/[^A-Za-z0-9._-]+/g, '_');
  const safeGroup = group.replace(/[^A-Za-z0-9_-]+/g, '_');
  return {
    main: mainFile,
    folder,
    index: `${folder}/index.html`,
    pages: new Map(rows.filter((r) => r.rows > 0).map((r) => [r.key, `${folder}/${safeGroup}-${r.slug}.html`])),
  };
}

/** The group key of every row, from the group item's retained column. */
function rowKeys(input: ReportInput, group: string): (r: number) => string {
  const item = input.codebook.byName.get(group)!;
  const col: ItemColumn | undefined = input.check.store.columns[group];
  if (input.check.summary.items[group]?.absent) throw new CodeweirError('CW_USAGE', `--split-by ${group}: the delivery has no column ${group}.`);
  if (!col) throw new CodeweirError('CW_USAGE', `--split-by ${group}: ${group} is free text, so its rows cannot be told apart; split by a group item with codes or numbers.`);
  if (col.kind === 'coded') {
    const texts = item.codes.map((c) => c.text);
    return (r) => (col.codes[r] === 0 ? UNASSIGNED : texts[col.codes[r]! - 1]!);
  }
  // check keys a numeric group cell by String() of its parsed value.
  return (r) => (Number.isNaN(col.values[r]!) ? UNASSIGNED : String(col.values[r]!));
}

function pick(col: ItemColumn, rows: Uint32Array): ItemColumn {
  if (col.kind === 'coded') {
    const codes = new Uint16Array(rows.length);
    for (let i = 0; i < rows.length; i++) codes[i] = col.codes[rows[i]!]!;
    return { kind: 'coded', item: col.item, codes };
  }
  const values = new Float64Array(rows.length);
  for (let i = 0; i < rows.length; i++) values[i] = col.values[rows[i]!]!;
  return { kind: 'numeric', item: col.item, values };
}

function findingTotals(findings: readonly Finding[]): CheckSummary['findings'] {
  const byRule: CheckSummary['findings']['byRule'] = {};
  const bySeverity: CheckSummary['findings']['bySeverity'] = { error: 0, warning: 0, info: 0 };
  for (const f of findings) {
    byRule[f.rule] = (byRule[f.rule] ?? 0) + 1;
    bySeverity[f.severity] = (bySeverity[f.severity] ?? 0) + 1;
  }
  return { total: findings.length, byRule, bySeverity, logged: findings.length };
}

/**
 * Splits a checked delivery by a group item: for every code with rows (and the rows without a
 * valid code, as UNASSIGNED), a CheckResult of those rows only: its store holds the rows' values,
 * its item tallies are check's group tallies for the code, its findings are the delivery's
 * findings in those rows (row numbers stay those of the delivery; counts are of the findings
 * log). Findings of no row (header, whole columns) belong to no part. The parts' rows add up to
 * the delivery's. Cost: O(rows x retained items + findings). Throws CodeweirError CW_USAGE when
 * `group` is not a group item or has no retained column.
 */
export function splitCheck(input: ReportInput, group: string): TeamPart[] {
  return [...splitLazily(input, group)];
}

/**
 * The parts of splitCheck one at a time, each built when it is asked for, so that only one
 * part's copy of the columns is alive at once when the caller drops each after use.
 */
function* splitLazily(input: ReportInput, group: string): Generator<TeamPart> {
  groupItemOrThrow(input.codebook, group);
  const ctx = { input, item: (n: string) => input.codebook.byName.get(n) };
  const keyOf = rowKeys(input, group);
  const whole = input.check;
  const byKey = new Map<string, number[]>();
  for (let r = 0; r < whole.store.rows; r++) {
    const k = keyOf(r);
    let list = byKey.get(k);
    if (!list) byKey.set(k, (list = []));
    list.push(r);
  }
  const tallies = tallyByKey(ctx, group);
  const findingsOf = new Map<string, Finding[]>();
  for (const f of whole.findings) {
    const k = keyOfFinding(f, group);
    if (k === undefined) continue;
    let list = findingsOf.get(k);
    if (!list) findingsOf.set(k, (list = []));
    list.push(f);
  }
  for (const row of teamRows(ctx, group)) {
    const list = byKey.get(row.key);
    if (!list || list.length === 0) continue;
    const rows = Uint32Array.from(list);
    byKey.delete(row.key);
    const findings = findingsOf.get(row.key) ?? [];
    const perItem = tallies.get(row.key) ?? {};
    const items: Record<string, ItemTally> = {};
    for (const [name, t] of Object.entries(whole.summary.items)) {
      const g = perItem[name];
      const own: ItemTally['findings'] = {};
      for (const f of findings) if (f.item === name) own[f.rule] = (own[f.rule] ?? 0) + 1;
      items[name] = { valid: g?.valid ?? 0, invalid: g?.invalid ?? 0, missing: { ...(g?.missing ?? {}) }, findings: own, ...(t.absent ? { absent: true } : {}) };
    }
    const columns: ColumnStore['columns'] = {};
    for (const [name, col] of Object.entries(whole.store.columns)) columns[name] = pick(col, rows);
    const totals = findingTotals(findings);
    const summary: CheckSummary = {
      codebook: whole.summary.codebook,
      ...(whole.summary.file !== undefined ? { file: whole.summary.file } : {}),
      rows: rows.length,
      header: whole.summary.header,
      findings: totals,
      items,
      groups: {},
      rules: {},
      accepted: (totals.bySeverity.error ?? 0) === 0,
      ...(whole.summary.quantileType !== undefined ? { quantileType: whole.summary.quantileType } : {}),
    };
    yield { row: { ...row, rows: rows.length }, rows, check: { summary, findings, store: { rows: rows.length, columns } } };
  }
}

/** Options of {@link renderSplitReport}. */
export interface SplitReportOptions extends ReportOptions {
  /** The group item to split by. */
  splitBy: string;
  /** The main report's file name (its folder is where the layout starts), e.g. `report.html`. */
  mainFile: string;
  /** Describe options for the team pages; default: the main describe's quantile type and weight. */
  describeOptions?: DescribeOptionsInput;
  /**
   * Disclosure control with suppression (minCell above 1): `input` is then the delivery as
   * checked, and the main page and the team pages are disclosed together, sharing one
   * suppression (see teamDisclosurePlan). Without it `input` is drawn as it is.
   */
  disclosure?: ReportDisclosure;
}

/** Each team's count of each code of a coded item (the item's code order), from the retained column. */
function countsByTeam(input: ReportInput, group: string): (item: string) => Map<string, number[]> | undefined {
  const keyOf = rowKeys(input, group);
  return (name) => {
    const col = input.check.store.columns[name];
    const item = input.codebook.byName.get(name);
    if (!col || col.kind !== 'coded' || !item) return undefined;
    const out = new Map<string, number[]>();
    for (let r = 0; r < input.check.store.rows; r++) {
      const k = keyOf(r);
      let row = out.get(k);
      if (!row) out.set(k, (row = new Array<number>(item.codes.length).fill(0)));
      const c = col.codes[r]!;
      if (c > 0) row[c - 1]!++;
    }
    return out;
  };
}

/** The pages of a split report, each with its path relative to the main report's folder. */
export interface SplitReport {
  layout: SplitLayout;
  files: Array<{ path: string; html: string }>;
  /** The parts the pages were drawn from; their stores are emptied once drawn (the tallies and findings stay). */
  parts: TeamPart[];
}

/**
 * The main report with its first-screen table linked to one page per code of `splitBy`, the
 * pages themselves (each a full report of the code's rows: its findings, missingness beside the
 * whole delivery's, item summaries from `describe` on its rows; no pairs), and an index page.
 * Nothing is written: the caller writes `files` together (atomically). Cost: one describe of
 * each part plus one report per page; the parts are built one at a time, so beside the
 * delivery's columns one team's copy of them is held at once. Throws CodeweirError CW_USAGE for a `splitBy` that is not
 * a group item with a retained column.
 */
export async function renderSplitReport(raw: ReportInput, options: SplitReportOptions): Promise<SplitReport> {
  const { splitBy: group, mainFile, describeOptions, disclosure, ...reportOptions } = options;
  groupItemOrThrow(raw.codebook, group);
  let input = raw;
  let mainInput = raw;
  let plan: TeamDisclosurePlan | undefined;
  if (disclosure && disclosure.minCell > 1) {
    // The team pages are cut from the delivery with values withheld and counts intact, then
    // suppressed by the plan the main page shares.
    const disclosed = discloseReportInput(raw, { ...disclosure, splitBy: group });
    mainInput = disclosed.input;
    input = discloseReportInput(raw, { ...disclosure, minCell: 1 }).input;
    plan = teamDisclosurePlan(raw, mainInput.describe, group, disclosure.minCell, countsByTeam(raw, group), disclosed.findings);
    if (mainInput.disclosure) mainInput.disclosure.unprotected += plan.unprotected;
  }
  const layout = splitLayout(mainFile, group, teamRows({ input, item: (n) => input.codebook.byName.get(n) }, group));
  const fromMain = Object.fromEntries([...layout.pages].map(([k, p]) => [k, p]));
  const main = await renderReport(mainInput, { ...reportOptions, groupBy: group, pages: { index: layout.index, byCode: fromMain } });
  const capped = cappedRules({ input });
  const fileFindings = plan?.findings ? noRowTotal(plan, group) : input.check.findings.filter((f) => f.row <= 0).length;
  const dOpts: DescribeOptionsInput = {
    quantileType: input.describe.quantileType,
    ...(input.describe.weight !== undefined ? { weight: input.describe.weight } : {}),
    ...(input.describe.listwise ? { listwise: true } : {}),
    ...describeOptions,
    pairs: [],
  };
  const files: SplitReport['files'] = [{ path: layout.main, html: main }];
  const parts: TeamPart[] = [];
  for (const part of splitLazily(input, group)) {
    const team: TeamScope = {
      group,
      code: part.row.key,
      name: part.row.name,
      whole: mainInput.check.summary,
      main: `../${mainFile}`,
      index: 'index.html',
      fileFindings,
      ...(capped.length > 0 ? { capped: `The findings log keeps only the first findings of ${capped.join(', ')} in the whole delivery; this page shows the logged ones in the team’s rows.` } : {}),
    };
    const described = describe(part.check, input.codebook, dOpts);
    const shown = plan ? discloseTeamPart(part.check, described, plan, part.row.key) : { check: part.check, describe: described, suppressed: 0 };
    const counts = plan?.findings ? { findings: teamFindingCounts(shown.check.summary, shown.describe, plan.findings, group, part.row.key, capped) } : {};
    if (plan?.findings) shown.check = { ...shown.check, findings: [] };
    const note = plan && mainInput.disclosure ? { disclosure: { ...mainInput.disclosure, suppressed: shown.suppressed, unprotected: 0, teamPage: true, ...counts } } : {};
    const html = await renderReport({ ...input, ...note, check: shown.check, describe: shown.describe }, { ...reportOptions, team, groupBy: group });
    files.push({ path: layout.pages.get(part.row.key)!, html });
    // The page is drawn: its copy of the columns goes, so one team's copy is alive at a time.
    part.check.store.columns = {};
    parts.push(part);
  }
  files.push({ path: layout.index, html: indexPage(mainInput, group, parts, layout, plan) });
  return { layout, files, parts };
}

/** The index of the team pages: one row per page with its counts, and the way back. */
function indexPage(input: ReportInput, group: string, parts: readonly TeamPart[], layout: SplitLayout, plan?: TeamDisclosurePlan): string {
  const cb = input.codebook;
  const summary = input.check.summary;
  const label = cb.byName.get(group)?.label;
  const counts = input.disclosure?.findings?.groups.get(group);
  const shownErrors = (p: TeamPart): { error: number; warning: number } => counts ? (counts.get(p.row.key) ?? { error: 0, warning: 0 }) : { error: p.row.errors, warning: p.row.warnings };
  const rows = parts.map((p) => {
    const page = layout.pages.get(p.row.key)!.slice(layout.folder.length + 1);
    return [
      `<a href="${esc(page)}">${esc(p.row.name)}</a>`,
      num(plan && [...(plan.lines.get(p.row.key)?.values() ?? [])].some((l) => l.rows) ? Number.NaN : p.row.rows),
      num(shownErrors(p).error),
      num(shownErrors(p).warning),
      pct(plan && [...(plan.lines.get(p.row.key)?.values() ?? [])].some((l) => l.cells.some(Boolean)) ? Number.NaN : p.row.missingPercent),
      worstText({ input, item: (n) => cb.byName.get(n) }, p.row.worst),
    ];
  });
  const sum = (f: (p: TeamPart) => number) => parts.reduce((a, p) => a + f(p), 0);
  const fileFindings = plan?.findings ? noRowTotal(plan, group) : input.check.findings.filter((f) => f.row <= 0).length;
  const body = `<section id="pages" class="block"><h2>${esc(`One page per ${group}${label ? ` (${label})` : ''}`)}</h2>
${table({ head: [group, 'rows', 'errors', 'warnings', 'missing %', 'worst items'], numeric: [1, 2, 3, 4], rows, className: 'wide teams' })}
<p class="note">${esc(
    `The pages hold ${num(sum((p) => p.row.rows))} of the delivery's ${num(summary.rows)} rows and ${num(sum((p) => shownErrors(p).error))} of its ${num(summary.findings.bySeverity.error ?? 0)} errors` +
      (fileFindings !== 0 ? `; ${num(fileFindings)} findings belong to no row (header, whole columns) and are in the main report.` : '.'),
  )}</p></section>`;
  return pageShell({
    title: `${cb.title || cb.id}: pages by ${group}`,
    heading: `${cb.title || cb.id}: pages by ${group}`,
    meta: `${input.file ?? summary.file ? `Delivery <code>${esc(input.file ?? summary.file ?? '')}</code>, ` : ''}codebook <code>${esc(cb.id)}</code> version ${esc(cb.version)}`,
    crumbs: `<a href="../${esc(layout.main)}">Main report</a>`,
    nav: [],
    body,
  });
}
