/**
 * Disclosure control of the report: before it is drawn, the report's input is rewritten so that
 * every count from 1 to k - 1 (and each cell that would give one away) is suppressed, and the
 * values of id items and confidential items are withheld.
 *
 * Suppression: the missingness counts by item and by group (check's missingnessSuppression, the
 * same as its CSV files), each item's frequency table and histogram (one row whose total is the
 * item's valid count, itself suppressed when the missingness table suppresses it), the
 * cross-tables of pairs (cells with their row and column totals), the count of records by number
 * of missing items, and the groups of a categorical-continuous pair with fewer than k cases
 * (their statistics too). A suppressed count becomes NaN, which the report prints as "-", with
 * the legend of {@link disclosureSection}; charts of a suppressed table are left out (a bar's
 * height would give the count away), and scatter plots are left out (each point is a person).
 * Withheld: findings' values on withheld items and record ids (unless values are shown); everything
 * but counts and missingness of a confidential item; pairs with a confidential item.
 */
import { suppressCells, type CellState } from '@codeweir/stats';
import { invalidSuppressedItems, missingnessSuppression, withholdFindings, WITHHELD_MARK, type LineStates } from '@codeweir/check';
import { findingsSuppression, keyRule, keySeverity, keyRuleAt, keyItemRule, keyCrossRule, keyGroupSeverity, keyGroupRule, keyGroupTotal, KEY_TOTAL, NO_ROW, SEVERITIES, type FindingsSuppression } from '@codeweir/check';
import type { CheckSummary, FindingRule, FindingSeverity, GroupItemTally } from '@codeweir/check';
import type { ItemDescription, PairDescription } from '@codeweir/describe';
import { hideFrequencies, oneRow, suppressItem, suppressPair } from '@codeweir/describe';
import { KINDS, GROUP_INVALID, GROUP_MISSING } from '@codeweir/check';
import { UNASSIGNED, keyOfFinding, cappedRules } from './teams.ts';
import type { ReportInput } from './context.ts';
import { escapeHtml as esc } from './escape.ts';

/** The disclosure settings of a report. */
export interface ReportDisclosure {
  /** Counts from 1 to minCell - 1 are suppressed; 1: none. */
  minCell: number;
  /** The group item a split report has one page per code of (its codes' counts by rule are shown). */
  splitBy?: string;
  /** Items whose values are withheld. */
  withhold: ReadonlySet<string>;
  /** Record ids are withheld from findings. */
  withholdIds: boolean;
}

/** What the rewrite did, for the legend. */
export interface DisclosureNote {
  minCell: number;
  suppressed: number;
  withheld: string[];
  unprotected: number;
  /** A team page of a split report under suppression (it draws no histograms). */
  teamPage?: boolean;
  /** With suppression: the counts of findings as shown (NaN: suppressed); the findings themselves are left out. */
  findings?: FindingCounts;
}

/** The counts of findings a disclosure-controlled page shows, beside the summary's own. */
export interface FindingCounts {
  /** keyRuleAt(rule, severity) -> count. */
  ruleAt: Map<string, number>;
  /** Group item -> code (NO_ROW for findings of no row) -> count by severity. */
  groups: Map<string, Map<string, Record<FindingSeverity, number>>>;
  /** Rules whose findings the log keeps only in part. */
  capped: string[];
}

const clone = <T>(x: T): T => structuredClone(x);

function applyLine(t: GroupItemTally, s: LineStates | undefined): number {
  if (!s) return 0;
  let n = 0;
  const set = (j: number, write: () => void): void => {
    if (s.cells[j]) {
      write();
      n++;
    }
  };
  set(0, () => (t.valid = Number.NaN));
  set(1, () => (t.invalid = Number.NaN));
  KINDS.forEach((k, j) => set(2 + j, () => (t.missing[k] = Number.NaN)));
  return n;
}

/** Leaves only the counts and missingness of a confidential item's description. */
function withholdItem(d: ItemDescription): ItemDescription {
  return {
    level: d.level,
    label: d.label,
    n: d.n,
    missing: d.missing,
    invalid: d.invalid,
    withheld: { ...d.withheld, values: 'a confidential item: its values are withheld (codeweir report --show-values shows them)' },
    ...(d.conventions ? { conventions: d.conventions } : {}),
  };
}

/** A check group key as the key of a team page (the rows without a valid code are one page). */
function teamKeyOf(key: string): string {
  return key === GROUP_MISSING || key === GROUP_INVALID ? UNASSIGNED : key;
}

/** Suppression states of one item's line on a team page: valid, invalid, each kind; and the team's rows. */
interface TeamLine {
  cells: boolean[];
  rows: boolean;
}

/**
 * The suppression the team pages of a split report share with the main page: each team's
 * missingness lines (check's byGroup states; the unassigned page joins the rows with a missing
 * and with an invalid group code, suppressed where either part is), and each coded item's
 * counts by team and code, protected as one table whose row totals are the teams' valid counts
 * and whose column totals are the main page's frequencies (both as the main page and the
 * missingness tables already settled them: shown ones fixed, suppressed ones unknown), so that
 * adding up team pages or comparing them with the main page gives no suppressed count back.
 */
export interface TeamDisclosurePlan {
  minCell: number;
  /** Team key -> item -> line states. */
  lines: Map<string, Map<string, TeamLine>>;
  /** Item -> team key -> state of each code's count (the item's code order). */
  frequencies: Map<string, Map<string, CellState[]>>;
  unprotected: number;
  /** The counts of findings, suppressed with the group item's codes by severity and by rule. */
  findings?: FindingsSuppression;
}

/**
 * The plan of {@link TeamDisclosurePlan} from the delivery as checked (`raw`), the main page's
 * disclosed description, the group item and, per coded item, the count of each team and code.
 * Cost: one missingness suppression and one teams x codes suppression per coded item. Throws nothing.
 */
export function teamDisclosurePlan(
  raw: ReportInput,
  mainDescribe: ReportInput['describe'],
  group: string,
  minCell: number,
  countsByTeam: (item: string) => Map<string, number[]> | undefined,
  findings?: FindingsSuppression,
): TeamDisclosurePlan {
  const s = missingnessSuppression(raw.check, minCell);
  const lines = new Map<string, Map<string, TeamLine>>();
  for (const [key, byItem] of s.byGroup.get(group) ?? new Map<string, Map<string, LineStates>>()) {
    const team = teamKeyOf(key);
    let into = lines.get(team);
    if (!into) lines.set(team, (into = new Map()));
    for (const [name, l] of byItem) {
      const was = into.get(name);
      const cells = l.cells.map((c, j) => c !== 0 || (was?.cells[j] ?? false));
      into.set(name, { cells, rows: l.rows !== 0 || (was?.rows ?? false) });
    }
  }
  const frequencies = new Map<string, Map<string, CellState[]>>();
  let unprotected = 0;
  for (const [name, d] of Object.entries(mainDescribe.items)) {
    if (!d.frequencies || d.frequencies.length === 0) continue;
    const byTeam = countsByTeam(name);
    if (!byTeam || byTeam.size === 0) continue;
    const teams = [...byTeam.keys()];
    const rowHidden = teams.map((t) => lines.get(t)?.get(name)?.cells[0] ?? false);
    const colHidden = d.frequencies.map((f) => Number.isNaN(f.count));
    const st = suppressCells(
      teams.map((t) => byTeam.get(t)!),
      minCell,
      { rows: rowHidden.map((h) => (h ? 'shown' : 'fixed')), columns: colHidden.map((h) => (h ? 'shown' : 'fixed')), grand: Number.isNaN(d.n) ? 'hidden' : 'fixed' },
      { rowTotals: rowHidden, columnTotals: colHidden },
    );
    if (!st.protected) unprotected++;
    frequencies.set(name, new Map(teams.map((t, i) => [t, st.cells[i]!])));
  }
  return { minCell, lines, frequencies, unprotected, ...(findings ? { findings } : {}) };
}

/**
 * A team page's input under the plan: its tallies (missingness, valid counts) and frequency
 * tables as the plan has them, no histograms (their bins add up across the team pages), and
 * the team's rows when its size is suppressed. Returns the suppressed cells counted. The
 * arguments are not changed. Cost: a copy of the part's summary and description. Throws nothing.
 */
export function discloseTeamPart(check: ReportInput['check'], described: ReportInput['describe'], plan: TeamDisclosurePlan, team: string): { check: ReportInput['check']; describe: ReportInput['describe']; suppressed: number } {
  const summary: CheckSummary = clone(check.summary);
  const describe = clone(described);
  const lines = plan.lines.get(team);
  let suppressed = 0;
  if ([...(lines?.values() ?? [])].some((l) => l.rows)) {
    summary.rows = Number.NaN;
    suppressed++;
  }
  for (const [name, t] of Object.entries(summary.items)) {
    const l = lines?.get(name);
    if (l) suppressed += applyLine(t, { cells: l.cells.map((c) => (c ? 2 : 0)), rows: 0 });
  }
  for (const [name, d] of Object.entries(describe.items)) {
    const t = summary.items[name];
    if (t) {
      d.n = t.valid;
      d.invalid = t.invalid;
      d.missing = { ...t.missing };
    }
    const states = plan.frequencies.get(name)?.get(team);
    if (d.frequencies && states) suppressed += hideFrequencies(d.frequencies, states);
    if (d.histogram) {
      delete d.histogram;
      suppressed++;
    }
  }
  return { check: { ...check, summary }, describe, suppressed };
}

/**
 * The report input rewritten for disclosure control (see the file comment), and what was done.
 * The input is not changed. Cost: a copy of the check summary and the description, and one
 * suppression per item, pair and missingness table. Throws nothing.
 */
export function discloseReportInput(input: ReportInput, opts: ReportDisclosure): { input: ReportInput; note: DisclosureNote; findings?: FindingsSuppression } {
  const summary: CheckSummary = clone(input.check.summary);
  const describe = clone(input.describe);
  let suppressed = 0;
  let unprotected = 0;
  let fs: FindingsSuppression | undefined;
  const k = opts.minCell;
  // The verdict stays whatever is suppressed.
  summary.accepted = input.check.summary.accepted ?? (input.check.summary.findings.bySeverity.error ?? 0) === 0;
  if (k > 1) {
    const s = missingnessSuppression(input.check, k);
    unprotected += s.unprotected;
    for (const [name, t] of Object.entries(summary.items)) suppressed += applyLine(t, s.overall.get(name));
    for (const [g, byKey] of Object.entries(summary.groups)) {
      for (const [code, perItem] of Object.entries(byKey)) for (const [name, t] of Object.entries(perItem)) suppressed += applyLine(t, s.byGroup.get(g)?.get(code)?.get(name));
    }
    for (const [name, d] of Object.entries(describe.items)) suppressed += suppressItem(d, k, (s.overall.get(name)?.cells[0] ?? 0) !== 0);
    const pairs: PairDescription[] = [];
    for (const p of describe.pairs) {
      const r = suppressPair(p, k);
      suppressed += r.n;
      if (r.pair) pairs.push(r.pair);
    }
    describe.pairs = pairs;
    if (summary.recordMissing && summary.recordMissing.length > 0) {
      const states = oneRow(summary.recordMissing, k, false);
      summary.recordMissing = summary.recordMissing.map((v, i) => (states[i] ? Number.NaN : v));
      suppressed += states.filter((x) => x !== 0).length;
    }
    const invalidSuppressed = invalidSuppressedItems(s);
    fs = findingsSuppression(
      {
        summary: input.check.summary,
        findings: input.check.findings,
        ruleSeverity: new Map(input.codebook.rules.map((r) => [r.id, r.severity])),
        invalidSuppressed,
        groups: Object.keys(input.check.summary.groups).map((g) => ({ item: g, keyOf: (f) => keyOfFinding(f, g), byRule: g === opts.splitBy })),
      },
      k,
    );
    unprotected += fs.unprotected;
    suppressed += applyFindingCounts(summary, describe, fs);
  }
  for (const name of opts.withhold) if (describe.items[name]) describe.items[name] = withholdItem(describe.items[name]!);
  describe.pairs = describe.pairs.filter((p) => !opts.withhold.has(p.x) && !opts.withhold.has(p.y));
  // Under suppression the findings are not listed one by one: counting them would give the counts back.
  const findings = fs ? [] : withholdFindings(input.check.findings, { minCell: k, withhold: opts.withhold, withholdIds: opts.withholdIds });
  // Box plots and points read the retained columns: a withheld item's column is not handed on.
  const columns = Object.fromEntries(Object.entries(input.check.store.columns).filter(([name]) => !opts.withhold.has(name)));
  const note: DisclosureNote = { minCell: k, suppressed, withheld: [...opts.withhold], unprotected, ...(fs ? { findings: findingCounts(fs, cappedRules({ input })) } : {}) };
  return {
    input: { ...input, check: { ...input.check, summary, findings, store: { ...input.check.store, columns } }, describe, disclosure: note },
    note,
    ...(fs ? { findings: fs } : {}),
  };
}

/** A count as shown: NaN where its key is suppressed. */
const shownCount = (fs: FindingsSuppression, key: string, n: number): number => (fs.suppressed.has(key) ? Number.NaN : n);

/**
 * Writes the suppression of the counts of findings into the summary (by rule, by severity, the
 * total, each item's by rule, each cross-item rule's counts) and the description (each item's
 * outliers and extremes, which are its counts of those findings). Returns the cells suppressed.
 */
function applyFindingCounts(summary: CheckSummary, describe: ReportInput['describe'], fs: FindingsSuppression): number {
  let n = 0;
  const put = (key: string, v: number): number => {
    const out = shownCount(fs, key, v);
    if (Number.isNaN(out)) n++;
    return out;
  };
  const f = summary.findings;
  for (const r of Object.keys(f.byRule) as FindingRule[]) f.byRule[r] = put(keyRule(r), f.byRule[r]!);
  for (const sv of Object.keys(f.bySeverity) as FindingSeverity[]) f.bySeverity[sv] = put(keySeverity(sv), f.bySeverity[sv]!);
  f.total = put(KEY_TOTAL, f.total);
  delete f.logged;
  for (const [name, t] of Object.entries(summary.items)) {
    for (const r of Object.keys(t.findings) as FindingRule[]) t.findings[r] = put(keyItemRule(name, r), t.findings[r]!);
    const d = describe.items[name];
    if (d?.outliers !== undefined) d.outliers = shownCount(fs, keyItemRule(name, 'outlier'), d.outliers);
    if (d?.extremes !== undefined) d.extremes = shownCount(fs, keyItemRule(name, 'extreme'), d.extremes);
  }
  for (const [id, res] of Object.entries(summary.rules)) {
    res.passed = put(keyCrossRule(id, 'passed'), res.passed);
    res.failed = put(keyCrossRule(id, 'failed'), res.failed);
    res.undetermined = put(keyCrossRule(id, 'undetermined'), res.undetermined);
    if (res.skipped !== undefined) res.skipped = put(keyCrossRule(id, 'skipped'), res.skipped);
  }
  return n;
}

/** The counts of findings a page shows (see FindingCounts), from the suppression. */
function findingCounts(fs: FindingsSuppression, capped: string[]): FindingCounts {
  const ruleAt = new Map([...fs.ruleAt].map(([key, v]) => [key, shownCount(fs, key, v)]));
  const groups = new Map<string, Map<string, Record<FindingSeverity, number>>>();
  for (const [g, byCode] of fs.bySeverity) {
    const out = new Map<string, Record<FindingSeverity, number>>();
    for (const [code, bySev] of byCode) {
      const rec = { error: 0, warning: 0, info: 0 };
      for (const sv of SEVERITIES) rec[sv] = shownCount(fs, keyGroupSeverity(g, code, sv), bySev.get(sv) ?? 0);
      out.set(code, rec);
    }
    groups.set(g, out);
  }
  return { ruleAt, groups, capped };
}

/**
 * A team page's counts of findings under the shared suppression: its summary's counts by rule,
 * by severity and in all (its items' counts by rule are not shown: they are cells of a table
 * by team, item and rule that no page adds up), its findings left out, and its describe's
 * outlier counts with them. The arguments are not changed. Cost: O(rules). Throws nothing.
 */
export function teamFindingCounts(summary: CheckSummary, describe: ReportInput['describe'], fs: FindingsSuppression, group: string, code: string, capped: string[]): FindingCounts {
  const byRule: CheckSummary['findings']['byRule'] = {};
  const ruleAt = new Map<string, number>();
  for (const [key, v] of fs.byRule.get(group)?.get(code) ?? new Map<string, number>()) {
    const [sv, rule] = key.split('|') as [FindingSeverity, FindingRule];
    const shown = shownCount(fs, keyGroupRule(group, code, sv, rule), v);
    ruleAt.set(keyRuleAt(rule, sv), shown);
    byRule[rule] = (byRule[rule] ?? 0) + shown;
  }
  const bySeverity: CheckSummary['findings']['bySeverity'] = {};
  const counts = fs.bySeverity.get(group)?.get(code);
  let total = 0;
  for (const sv of SEVERITIES) {
    const v = counts?.get(sv) ?? 0;
    bySeverity[sv] = shownCount(fs, keyGroupSeverity(group, code, sv), v);
    total += v;
  }
  summary.findings = { total: shownCount(fs, keyGroupTotal(group, code), total), byRule, bySeverity };
  for (const t of Object.values(summary.items)) t.findings = {};
  for (const d of Object.values(describe.items)) {
    if (d.outliers !== undefined) d.outliers = Number.NaN;
    if (d.extremes !== undefined) d.extremes = Number.NaN;
  }
  return { ruleAt, groups: new Map(), capped };
}

/** A count in running text: as it is, or "-" when suppressed (NaN). Cost: O(1). */
export function countText(n: number): string {
  return Number.isNaN(n) ? '-' : String(n);
}

/** Whether a chart's data holds a suppressed count (NaN). Cost: a walk of the spec's data values. */
export function holdsSuppressed(spec: unknown): boolean {
  const walk = (x: unknown, depth: number): boolean => {
    if (typeof x === 'number') return Number.isNaN(x);
    if (depth > 6 || x === null || typeof x !== 'object') return false;
    return Array.isArray(x) ? x.some((v) => walk(v, depth + 1)) : Object.values(x as Record<string, unknown>).some((v) => walk(v, depth + 1));
  };
  const data = (spec as { data?: unknown; datasets?: unknown; layer?: unknown } | null) ?? {};
  return walk(data.data, 0) || walk(data.datasets, 0) || walk(data.layer, 0);
}

/**
 * The legend of a disclosure-controlled report: what "-" and the withheld mark stand for.
 * Cost: O(withheld items). Throws nothing.
 */
export function disclosureSection(note: DisclosureNote | undefined): string {
  if (!note || (note.minCell <= 1 && note.withheld.length === 0)) return '';
  const parts: string[] = [];
  if (note.minCell > 1) {
    parts.push(
      `<p>Counts from 1 to ${note.minCell - 1} are suppressed, with the other cells that would let them be worked out from the totals shown: ${note.suppressed} cell${note.suppressed === 1 ? '' : 's'} of this report show <strong>-</strong> in place of a count (and of the percentages made from it). A zero is shown: an empty cell describes nobody. Charts of a table with a suppressed count, and scatter plots, are left out.${
        note.teamPage ? ' The team pages share the main report’s suppression and draw no histograms: their bins add up across the pages.' : ''
      }</p>`,
    );
    if (note.unprotected > 0) parts.push(`<p>${note.unprotected} table${note.unprotected === 1 ? '' : 's'} could not be protected by suppressing cells alone; every nonzero count in ${note.unprotected === 1 ? 'it' : 'them'} is suppressed.</p>`);
  }
  if (note.withheld.length > 0) {
    parts.push(`<p>Values of ${note.withheld.map((n) => `<code>${esc(n)}</code>`).join(', ')} are withheld (${esc(WITHHELD_MARK)}): id items and items the codebook marks confidential. <code>--show-values</code> shows them.</p>`);
  }
  return `<section id="disclosure"><h2>Disclosure control</h2>${parts.join('')}</section>`;
}
