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
import { missingnessSuppression, withholdFindings, WITHHELD_MARK, type LineStates } from '@codeweir/check';
import type { CheckSummary, GroupItemTally } from '@codeweir/check';
import type { ItemDescription, PairDescription } from '@codeweir/describe';
import { KINDS, GROUP_INVALID, GROUP_MISSING } from '@codeweir/check';
import { UNASSIGNED } from './teams.ts';
import type { ReportInput } from './context.ts';
import { escapeHtml as esc } from './escape.ts';

/** The disclosure settings of a report. */
export interface ReportDisclosure {
  /** Counts from 1 to minCell - 1 are suppressed; 1: none. */
  minCell: number;
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

/**
 * Suppresses a one-row table of counts whose total is shown elsewhere ('fixed'), or suppressed
 * elsewhere (`totalHidden`: then the row must not give the total away either).
 */
function oneRow(counts: readonly number[], minCell: number, totalHidden: boolean): CellState[] {
  return suppressCells([counts], minCell, { rows: totalHidden ? 'shown' : 'fixed', columns: 'hidden' }, { rowTotals: [totalHidden] }).cells[0]!;
}

/** A frequency row's count and everything made from it, as suppressed. */
function hideFrequency(f: NonNullable<ItemDescription['frequencies']>[number]): void {
  f.count = Number.NaN;
  f.percent = Number.NaN;
  if (f.weightedCount !== undefined) f.weightedCount = Number.NaN;
  if (f.weightedPercent !== undefined) f.weightedPercent = Number.NaN;
}

/** Hides the frequency rows whose state is nonzero and every cumulative percent from the first on; returns how many. */
function hideFrequencies(freqs: NonNullable<ItemDescription['frequencies']>, states: readonly CellState[]): number {
  let first = -1;
  let n = 0;
  freqs.forEach((f, i) => {
    if (!states[i]) return;
    if (first === -1) first = i;
    n++;
    hideFrequency(f);
  });
  // A cumulative percent after a suppressed row would give its count away.
  if (first >= 0) for (let i = first; i < freqs.length; i++) if (freqs[i]!.cumulativePercent !== undefined) freqs[i]!.cumulativePercent = Number.NaN;
  return n;
}

function suppressItem(d: ItemDescription, minCell: number, validHidden: boolean): number {
  let n = 0;
  if (validHidden) d.n = Number.NaN;
  if (d.frequencies && d.frequencies.length > 0) {
    n += hideFrequencies(d.frequencies, oneRow(d.frequencies.map((f) => f.count), minCell, validHidden));
  }
  if (d.histogram) {
    const states = oneRow(d.histogram.counts, minCell, validHidden);
    if (states.some((s) => s !== 0)) {
      n += states.filter((s) => s !== 0).length;
      delete d.histogram;
    }
  }
  return n;
}

function suppressPair(p: PairDescription, minCell: number): { pair: PairDescription | null; n: number } {
  if (p.kind === 'continuous-continuous') {
    // Each point of a scatter plot is a record; only the coefficients are kept.
    const q = { ...p, bivariateOutliers: [] as number[] };
    delete q.sample;
    delete q.sampleRows;
    return { pair: q, n: 0 };
  }
  if (p.kind === 'categorical-categorical') {
    const s = suppressCells(p.table, minCell, { rows: 'shown', columns: 'shown', grand: 'fixed' });
    let n = 0;
    const hide = (m: number[][]): void => m.forEach((row, i) => row.forEach((_, j) => s.cells[i]![j] && (row[j] = Number.NaN)));
    s.cells.forEach((row) => row.forEach((c) => c && n++));
    if (n > 0) {
      hide(p.table);
      hide(p.expected);
      hide(p.rowPercent);
      hide(p.columnPercent);
      hide(p.cellPercent);
    }
    return { pair: p, n };
  }
  let n = 0;
  for (const g of p.groups) {
    if (g.n > 0 && g.n < minCell) {
      g.n = Number.NaN;
      g.mean = g.sd = g.median = g.q1 = g.q3 = null;
      delete g.fences;
      delete g.outliers;
      delete g.extremes;
      n++;
    }
  }
  return { pair: p, n };
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
  return { minCell, lines, frequencies, unprotected };
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
export function discloseReportInput(input: ReportInput, opts: ReportDisclosure): { input: ReportInput; note: DisclosureNote } {
  const summary: CheckSummary = clone(input.check.summary);
  const describe = clone(input.describe);
  let suppressed = 0;
  let unprotected = 0;
  const k = opts.minCell;
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
  }
  for (const name of opts.withhold) if (describe.items[name]) describe.items[name] = withholdItem(describe.items[name]!);
  describe.pairs = describe.pairs.filter((p) => !opts.withhold.has(p.x) && !opts.withhold.has(p.y));
  const findings = withholdFindings(input.check.findings, { minCell: k, withhold: opts.withhold, withholdIds: opts.withholdIds });
  // Box plots and points read the retained columns: a withheld item's column is not handed on.
  const columns = Object.fromEntries(Object.entries(input.check.store.columns).filter(([name]) => !opts.withhold.has(name)));
  const note: DisclosureNote = { minCell: k, suppressed, withheld: [...opts.withhold], unprotected };
  return {
    input: { ...input, check: { ...input.check, summary, findings, store: { ...input.check.store, columns } }, describe, disclosure: note },
    note,
  };
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
