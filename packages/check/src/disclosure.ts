/**
 * Disclosure control for the tables check writes for others (the missingness tables and the
 * per-group exports of `--split-by`): every count from 1 to k - 1 is suppressed with the
 * complementary cells that would give it away (stats' suppressCells), and the values of id
 * items and of items marked `confidential` are withheld from findings.
 *
 * The tables are linked: for one item, its counts by group (rows: the group's codes; columns:
 * valid, invalid and each missing kind) add up to the item's overall counts (missingness.csv)
 * and to each group's size. So each item is protected as one table per group item whose row
 * totals are the group sizes and whose column totals are the overall counts, with the delivery's
 * rows as the grand total (published everywhere, never suppressed); group sizes below k are
 * suppressed once for all items, and an overall count suppressed for one group item is
 * suppressed for the others too, until nothing changes. Invalid counts can be read off the
 * findings (which go out with the team folders), so invalid cells are the last choice of
 * complement. The `missing` and `percent_missing` of
 * every line of an item with any suppressed count are suppressed too: they add up across groups
 * like the cells, and where valid and invalid are shown they say nothing the rows do not.
 */
import { suppressCells, type CellState, type MarginShown } from '@codeweir/stats';
import { KINDS } from './classify.ts';
import type { CheckResult, CheckSummary, Finding, FindingRule, FindingSeverity, GroupItemTally } from './types.ts';
import { findingsSuppression, keyRule, keySeverity, keyItemRule, keyCrossRule, KEY_TOTAL } from './findings-disclosure.ts';

/** What a suppressed count is written as. */
export const SUPPRESSED_MARK = '[s]';
/** What a withheld value is written as. */
export const WITHHELD_MARK = '[withheld]';

export interface DisclosureOptions {
  /** Counts from 1 to minCell - 1 are suppressed; 1 turns suppression off. */
  minCell: number;
  /** Items whose values are withheld from findings (confidential items, and the id item unless values are shown). */
  withhold: ReadonlySet<string>;
  /** Withhold the record id of findings (the id item's value). */
  withholdIds: boolean;
  /** Severity of each cross-item rule by id (the codebook's); else read off the findings log. */
  ruleSeverity?: ReadonlyMap<string, FindingSeverity>;
}

/** Suppression states of one table line: valid, invalid, each missing kind, and the line's rows. */
export interface LineStates {
  cells: CellState[];
  rows: CellState;
  /** The line's `missing` and `percent_missing` are suppressed (for every line of an item with any suppressed count). */
  sums?: boolean;
}

export interface MissingnessSuppression {
  minCell: number;
  /** Item -> states of its overall line. */
  overall: Map<string, LineStates>;
  /** Group item -> group code -> item -> states. */
  byGroup: Map<string, Map<string, Map<string, LineStates>>>;
  /** Tables that could not be protected (every nonzero count in them suppressed). */
  unprotected: number;
}

/** The column of a tally line that the findings publish cell by cell: invalid (column 1). */
const INVALID_COLUMN = (width: number): boolean[] => Array.from({ length: width }, (_, j) => j === 1);

/** The counted cells of a tally line, in column order (valid, invalid, KINDS). */
export function tallyCells(t: GroupItemTally): number[] {
  return [t.valid, t.invalid, ...KINDS.map((k) => t.missing[k] ?? 0)];
}

/**
 * Suppression states for every line of the missingness tables (see the file comment).
 * Cost: O(items x group items x a suppression of a groups x (2 + kinds) table), repeated until
 * the shared overall lines settle (at most a few rounds). Throws nothing.
 */
export function missingnessSuppression(result: CheckResult, minCell: number): MissingnessSuppression {
  const rows = result.summary.rows;
  const items = Object.entries(result.summary.items).filter(([, t]) => !t.absent);
  const width = 2 + KINDS.length;
  const out: MissingnessSuppression = { minCell, overall: new Map(), byGroup: new Map(), unprotected: 0 };
  const groups = Object.entries(result.summary.groups);
  const overallPreset = new Map<string, boolean[]>(items.map(([name]) => [name, new Array<boolean>(width).fill(false)]));
  // Group sizes below k: suppressed once, for every item's table (sizes add up to the rows).
  const sizeStates = new Map<string, CellState[]>();
  for (const [g, byKey] of groups) {
    const first = items.find(([name]) => Object.values(byKey).some((perItem) => perItem[name]));
    const sizes = Object.values(byKey).map((perItem) => (first ? tallyCells(perItem[first[0]]!).reduce((a, b) => a + b, 0) : 0));
    sizeStates.set(g, suppressCells([sizes], minCell, { rows: 'fixed', columns: 'hidden' }).cells[0]!);
  }
  if (groups.length === 0) {
    for (const [name, t] of items) {
      const s = suppressCells([tallyCells(t)], minCell, { rows: 'fixed', columns: 'hidden' }, { avoid: [INVALID_COLUMN(width)] });
      if (!s.protected) out.unprotected++;
      out.overall.set(name, { cells: s.cells[0]!, rows: 0 });
    }
    markSums(out);
    return out;
  }
  const cellPreset = new Map<string, boolean[][]>();
  for (let round = 0; round < 10; round++) {
    let changed = false;
    for (const [g, byKey] of groups) {
      const codes = Object.keys(byKey);
      const sizes = sizeStates.get(g)!;
      const perGroup = out.byGroup.get(g) ?? new Map<string, Map<string, LineStates>>();
      out.byGroup.set(g, perGroup);
      for (const [name] of items) {
        const table = codes.map((code) => tallyCells(byKey[code]![name] ?? { valid: 0, invalid: 0, missing: {} }));
        const rowMargins = sizes.map((st): MarginShown => (st === 0 ? 'fixed' : 'shown'));
        const key = `${g}\u0000${name}`;
        const s = suppressCells(table, minCell, { rows: rowMargins, columns: 'shown', grand: 'fixed' }, {
          cells: cellPreset.get(key),
          avoid: table.map(() => INVALID_COLUMN(width)),
          rowTotals: sizes.map((st) => st !== 0),
          columnTotals: overallPreset.get(name),
        });
        if (round === 0 && !s.protected) out.unprotected++;
        cellPreset.set(key, s.cells.map((r) => r.map((c) => c !== 0)));
        codes.forEach((code, i) => {
          let byItem = perGroup.get(code);
          if (!byItem) perGroup.set(code, (byItem = new Map()));
          byItem.set(name, { cells: s.cells[i]!, rows: sizes[i]! });
        });
        const preset = overallPreset.get(name)!;
        s.columnTotals.forEach((c, j) => {
          if (c !== 0 && !preset[j]) {
            preset[j] = true;
            changed = true;
          }
        });
        out.overall.set(name, { cells: s.columnTotals, rows: 0 });
      }
    }
    if (!changed) break;
  }
  markSums(out);
  return out;
}

/** Sets `sums` on every line of each item that has a suppressed count in any line. */
function markSums(out: MissingnessSuppression): void {
  const touched = new Set<string>();
  const lines: Array<[string, LineStates]> = [...out.overall];
  for (const perGroup of out.byGroup.values()) for (const byItem of perGroup.values()) lines.push(...byItem);
  for (const [name, l] of lines) if (l.rows !== 0 || l.cells.some((c) => c !== 0)) touched.add(name);
  for (const [name, l] of lines) if (touched.has(name)) l.sums = true;
}

/**
 * A missingness line's cells as written under suppression: rows, valid, invalid, each kind,
 * missing and percent_missing, with the mark where suppressed. Cost: O(kinds). Throws nothing.
 */
export function suppressedMissingCells(t: GroupItemTally, states: LineStates | undefined, percent: (n: number, of: number) => string): Array<string | number> {
  const cells = tallyCells(t);
  const rows = cells.reduce((a, b) => a + b, 0);
  const missing = cells.slice(2).reduce((a, b) => a + b, 0);
  const st = states?.cells ?? [];
  const any = states?.sums === true || st.some((x) => x !== 0) || (states?.rows ?? 0) !== 0;
  return [
    states?.rows ? SUPPRESSED_MARK : rows,
    ...cells.map((v, j) => (st[j] ? SUPPRESSED_MARK : v)),
    any ? SUPPRESSED_MARK : missing,
    any ? SUPPRESSED_MARK : percent(missing, rows),
  ];
}

/**
 * Findings with withheld values: the value (and its text inside the message and suggestion) of
 * findings on withheld items, and every record id when ids are withheld. Cost: O(findings).
 * Throws nothing.
 */
export function withholdFindings(findings: readonly Finding[], opts: DisclosureOptions): Finding[] {
  return findings.map((f) => {
    const valueOut = opts.withhold.has(f.item) && f.value !== '';
    if (!valueOut && !(opts.withholdIds && f.id !== '')) return f;
    const g: Finding = { ...f };
    if (opts.withholdIds && f.id !== '') g.id = WITHHELD_MARK;
    if (valueOut) {
      g.value = WITHHELD_MARK;
      // Tukey fences come from the item's own values (its quartiles): withheld with them.
      if (f.rule === 'outlier' || f.rule === 'extreme') g.message = `${WITHHELD_MARK} in ${f.item} is beyond the ${f.rule === 'extreme' ? 'outer' : 'inner'} Tukey fences (withheld: they come from the item's values).`;
      else g.message = g.message.split(f.value).join(WITHHELD_MARK);
      if (g.suggestion !== undefined) g.suggestion = g.suggestion.split(f.value).join(WITHHELD_MARK);
    }
    return g;
  });
}

/** Items whose overall invalid count the missingness tables suppress (the findings suppression's starting point). Cost: O(items). */
export function invalidSuppressedItems(s: MissingnessSuppression): Set<string> {
  return new Set([...s.overall].filter(([, l]) => l.cells[1] !== 0).map(([name]) => name));
}

/**
 * The summary as `summary.json` writes it under suppression: every count from 1 to k - 1 and its
 * complements written as null, with the same states as the files beside it (the item tallies as
 * missingness.csv, the group tallies as missingness-by-group.csv), the counts of findings as one
 * set of linked tables (by rule, by severity, the total, each item's by rule, each cross-item
 * rule's; see findingsSuppression), each item's routing counts and the records by number of
 * missing items as rows adding up to the delivery's rows, trimmed cells on their own; and a
 * `disclosure` block: `{ minCell, suppressed: [the JSON paths written as null], unprotected }`.
 * Cost: one findings suppression and a copy of the summary. Throws nothing.
 */
export function suppressedSummary(result: CheckResult, s: MissingnessSuppression, opts: DisclosureOptions): Record<string, unknown> {
  const k = s.minCell;
  const doc = structuredClone(result.summary) as unknown as Record<string, unknown> & CheckSummary;
  const paths: string[] = [];
  const nul = (obj: Record<string, unknown>, key: string, path: string): void => {
    obj[key] = null;
    paths.push(path);
  };
  const line = (t: GroupItemTally, st: LineStates | undefined, path: string): void => {
    if (!st) return;
    const o = t as unknown as Record<string, unknown>;
    if (st.cells[0]) nul(o, 'valid', `${path}.valid`);
    if (st.cells[1]) nul(o, 'invalid', `${path}.invalid`);
    KINDS.forEach((kind, j) => st.cells[2 + j] && t.missing[kind] !== undefined && nul(t.missing as Record<string, unknown>, kind, `${path}.missing.${kind}`));
  };
  for (const [name, t] of Object.entries(doc.items)) line(t, s.overall.get(name), `items.${name}`);
  for (const [g, byKey] of Object.entries(doc.groups)) for (const [code, perItem] of Object.entries(byKey)) for (const [name, t] of Object.entries(perItem)) line(t, s.byGroup.get(g)?.get(code)?.get(name), `groups.${g}.${code}.${name}`);
  const ruleSeverity = new Map(opts.ruleSeverity ?? []);
  for (const f of result.findings) if (f.rule === 'rule-failed' && !ruleSeverity.has(f.item)) ruleSeverity.set(f.item, f.severity);
  const fs = findingsSuppression({ summary: result.summary, findings: result.findings, ruleSeverity, invalidSuppressed: invalidSuppressedItems(s) }, k);
  const hide = (obj: Record<string, unknown>, key: string, sKey: string, path: string): void => {
    if (obj[key] !== undefined && fs.suppressed.has(sKey)) nul(obj, key, path);
  };
  const f = doc.findings as unknown as Record<string, Record<string, unknown>>;
  for (const r of Object.keys(doc.findings.byRule)) hide(f.byRule!, r, keyRule(r), `findings.byRule.${r}`);
  for (const sv of Object.keys(doc.findings.bySeverity)) hide(f.bySeverity!, sv, keySeverity(sv), `findings.bySeverity.${sv}`);
  if (fs.suppressed.has(KEY_TOTAL)) {
    nul(doc.findings as unknown as Record<string, unknown>, 'total', 'findings.total');
    if (doc.findings.logged !== undefined) nul(doc.findings as unknown as Record<string, unknown>, 'logged', 'findings.logged');
  }
  for (const [name, t] of Object.entries(doc.items)) {
    for (const r of Object.keys(t.findings) as FindingRule[]) hide(t.findings as Record<string, unknown>, r, keyItemRule(name, r), `items.${name}.findings.${r}`);
    const o = t as unknown as Record<string, unknown>;
    if (t.trimmed !== undefined && t.trimmed >= 1 && t.trimmed < k) nul(o, 'trimmed', `items.${name}.trimmed`);
    if (t.routing) {
      const cols = ['asked', 'skipped', 'undetermined'] as const;
      const st = suppressCells([cols.map((c) => t.routing![c])], k, { rows: 'fixed', columns: 'hidden' }).cells[0]!;
      cols.forEach((c, j) => st[j] && nul(t.routing as unknown as Record<string, unknown>, c, `items.${name}.routing.${c}`));
    }
  }
  for (const [id, res] of Object.entries(doc.rules)) for (const c of ['passed', 'failed', 'undetermined', 'skipped']) hide(res as Record<string, unknown>, c, keyCrossRule(id, c), `rules.${id}.${c}`);
  if (doc.recordMissing && doc.recordMissing.length > 0) {
    const st = suppressCells([doc.recordMissing], k, { rows: 'fixed', columns: 'hidden' }).cells[0]!;
    const rec = doc.recordMissing as unknown as Array<number | null>;
    st.forEach((x, i) => {
      if (x) {
        rec[i] = null;
        paths.push(`recordMissing.${i}`);
      }
    });
  }
  return { ...doc, disclosure: { minCell: k, suppressed: paths, unprotected: s.unprotected + fs.unprotected } };
}
