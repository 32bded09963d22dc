/**
 * Disclosure control of the counts of findings: by rule, by severity, in all, per item and rule,
 * per cross-item rule (passed, failed, undetermined, not applicable) and, where a page shows them,
 * per group code by severity and rule. Every count from 1 to k - 1 is suppressed with the
 * complementary cells that would give it away.
 *
 * The counts are the margins and cells of a few linked tables of counts, each protected by
 * stats' suppressCells, with a count shared by several tables suppressed in all of them, round
 * after round, until nothing changes:
 * - rules by severity: rows the severities (totals: by severity), columns the rules (totals:
 *   by rule), the total of findings in the corner;
 * - targets by rule: one row of each item's findings that make a cell invalid (their total is
 *   the item's invalid count, as the missingness suppression left it), one of its other findings
 *   (total not shown), one per cross-item rule (its failed count), and one of the findings that
 *   name neither (the header, whole rows); columns the rules (totals: by rule);
 * - each cross-item rule's passed, failed, undetermined and not applicable, which add up to the
 *   delivery's rows (published, never suppressed);
 * - per group item: its codes by severity (totals: by severity; a code's total shown when
 *   `byRule`), and with `byRule` its codes and severities by rule (totals: by rule, and the
 *   code's count at each severity). Findings of no row are one more code; findings the log left
 *   out (a rule capped by --max-findings-per-rule) are another, not shown but following from the
 *   totals.
 */
import { suppressCells, type MarginShown } from '@codeweir/stats';
import type { CheckSummary, Finding, FindingRule, FindingSeverity } from './types.ts';
import { rules as RULE_DEFS } from './rules/index.ts';

export const SEVERITIES = ['error', 'warning', 'info'] as const satisfies readonly FindingSeverity[];

/** Rules whose findings make the cell invalid: the item's invalid count is their sum. */
export const INVALIDATING_RULES: ReadonlySet<FindingRule> = new Set<FindingRule>(['not-a-number', 'not-an-integer', 'not-a-date', 'not-a-code', 'unbinned-value', 'impossible', 'pattern-mismatch', 'answered-when-skipped']);

/** A cell, margin or corner of a linked table: its count, and the key it is shared by (null: in this table only). */
interface Slot {
  value: number;
  key: string | null;
  how: MarginShown;
}

interface Linked {
  cells: Slot[][];
  rows: Slot[];
  columns: Slot[];
  grand: Slot;
}

/** What a group item's codes show of the findings in their rows. */
export interface FindingsGroup {
  item: string;
  /** The code of a finding's row (undefined: a finding of no row). */
  keyOf: (f: Finding) => string | undefined;
  /** The codes' counts by rule are shown (the pages of a split report), and so their totals. */
  byRule: boolean;
}

export interface FindingsSuppressionInput {
  summary: CheckSummary;
  findings: readonly Finding[];
  /** Severity of each cross-item rule, by id. */
  ruleSeverity: ReadonlyMap<string, FindingSeverity>;
  /** Items whose invalid count the missingness tables suppress. */
  invalidSuppressed: ReadonlySet<string>;
  groups?: readonly FindingsGroup[];
}

/** The code that stands for findings of no row, and for those the log left out. */
export const NO_ROW = '\u0000no row';
export const NOT_LOGGED = '\u0000not logged';

export interface FindingsSuppression {
  minCell: number;
  /** Keys of the suppressed counts (see the key functions below). */
  suppressed: Set<string>;
  /** Count of a rule at a severity (rules whose findings have several severities). */
  ruleAt: Map<string, number>;
  /** Group item -> code -> severity -> count; and code -> `${severity}|${rule}` -> count. */
  bySeverity: Map<string, Map<string, Map<FindingSeverity, number>>>;
  byRule: Map<string, Map<string, Map<string, number>>>;
  unprotected: number;
}

export const keyRule = (rule: string): string => `rule|${rule}`;
export const keySeverity = (s: string): string => `severity|${s}`;
export const KEY_TOTAL = 'total';
export const keyRuleAt = (rule: string, s: string): string => `at|${rule}|${s}`;
export const keyItemRule = (item: string, rule: string): string => `item|${item}|${rule}`;
export const keyCrossRule = (id: string, column: string): string => `cross|${id}|${column}`;
export const keyGroupSeverity = (g: string, code: string, s: string): string => `group|${g}|${code}|${s}`;
export const keyGroupTotal = (g: string, code: string): string => `group-total|${g}|${code}`;
export const keyGroupRule = (g: string, code: string, s: string, rule: string): string => `group-rule|${g}|${code}|${s}|${rule}`;

const slot = (value: number, key: string | null, how: MarginShown = 'shown'): Slot => ({ value, key, how });

/** Protects linked tables together (see the file comment); returns the suppressed keys and the tables left unprotected. */
function solve(tables: readonly Linked[], minCell: number, start: ReadonlySet<string>): { suppressed: Set<string>; unprotected: number } {
  const suppressed = new Set(start);
  const hidden = (s: Slot): boolean => s.key !== null && suppressed.has(s.key);
  let unprotected = 0;
  for (let round = 0; round < 20; round++) {
    let changed = false;
    unprotected = 0;
    for (const t of tables) {
      if (t.cells.length === 0 || t.columns.length === 0) continue;
      const r = suppressCells(
        t.cells.map((row) => row.map((c) => c.value)),
        minCell,
        { rows: t.rows.map((s) => s.how), columns: t.columns.map((s) => s.how), grand: t.grand.how },
        { cells: t.cells.map((row) => row.map(hidden)), rowTotals: t.rows.map(hidden), columnTotals: t.columns.map(hidden), grandTotal: hidden(t.grand) },
      );
      if (!r.protected) unprotected++;
      const mark = (s: Slot, state: number): void => {
        if (state !== 0 && s.key !== null && s.how !== 'hidden' && !suppressed.has(s.key)) {
          suppressed.add(s.key);
          changed = true;
        }
      };
      t.cells.forEach((row, i) => row.forEach((c, j) => mark(c, r.cells[i]![j]!)));
      t.rows.forEach((s, i) => mark(s, r.rowTotals[i]!));
      t.columns.forEach((s, j) => mark(s, r.columnTotals[j]!));
      mark(t.grand, r.grandTotal);
    }
    if (!changed) break;
  }
  return { suppressed, unprotected };
}

/** The severity of a rule's findings (one severity for every rule but the cross-item rules). */
function severityOfRule(rule: FindingRule, findings: readonly Finding[]): FindingSeverity {
  return findings.find((f) => f.rule === rule)?.severity ?? RULE_DEFS[rule]?.severity ?? 'error';
}

/**
 * The suppression of every count of findings a page or file shows (see the file comment).
 * Cost: a few rounds of one suppression per table (rules x severities, targets x rules, one per
 * cross-item rule, and per group item codes x severities and codes x rules). Throws nothing.
 */
export function findingsSuppression(input: FindingsSuppressionInput, minCell: number): FindingsSuppression {
  const { summary, findings } = input;
  const ruleList = (Object.keys(summary.findings.byRule) as FindingRule[]).filter((r) => (summary.findings.byRule[r] ?? 0) > 0);
  const total = slot(summary.findings.total, KEY_TOTAL);
  const byRuleSlots = ruleList.map((r) => slot(summary.findings.byRule[r]!, keyRule(r)));
  const severitySlots = SEVERITIES.map((s) => slot(summary.findings.bySeverity[s] ?? 0, keySeverity(s)));
  // The count of each rule at each severity: cross-item rules by their ids' severities.
  const ruleAt = new Map<string, number>();
  for (const r of ruleList) {
    if (r === 'rule-failed' && Object.keys(summary.rules).length > 0) {
      for (const [id, res] of Object.entries(summary.rules)) {
        const s = input.ruleSeverity.get(id) ?? 'error';
        ruleAt.set(keyRuleAt(r, s), (ruleAt.get(keyRuleAt(r, s)) ?? 0) + res.failed);
      }
    } else ruleAt.set(keyRuleAt(r, severityOfRule(r, findings)), summary.findings.byRule[r]!);
  }
  const tables: Linked[] = [];
  tables.push({
    cells: SEVERITIES.map((s) => ruleList.map((r) => slot(ruleAt.get(keyRuleAt(r, s)) ?? 0, keyRuleAt(r, s)))),
    rows: severitySlots,
    columns: byRuleSlots,
    grand: total,
  });
  // Targets by rule.
  const targets: Slot[][] = [];
  const targetTotals: Slot[] = [];
  const rest = ruleList.map((r) => summary.findings.byRule[r]!);
  const publicKeys: string[] = [];
  for (const [name, t] of Object.entries(summary.items)) {
    if (!ruleList.some((r) => (t.findings[r] ?? 0) > 0)) continue;
    const part = (inv: boolean): Slot[] => ruleList.map((r, j) => {
      const v = INVALIDATING_RULES.has(r) === inv ? (t.findings[r] ?? 0) : 0;
      rest[j]! -= v;
      return slot(v, v > 0 ? keyItemRule(name, r) : null);
    });
    const inv = part(true);
    const nonzero = inv.filter((c) => c.value > 0);
    // A single rule behind a shown invalid count: its count is that count, public already.
    if (nonzero.length === 1 && !input.invalidSuppressed.has(name)) publicKeys.push(nonzero[0]!.key!);
    if (nonzero.length > 0) {
      targets.push(inv);
      targetTotals.push(input.invalidSuppressed.has(name) ? slot(t.invalid, `invalid|${name}`) : slot(t.invalid, null, 'fixed'));
    }
    const other = part(false);
    if (other.some((c) => c.value > 0)) {
      targets.push(other);
      targetTotals.push(slot(0, null, 'hidden'));
    }
  }
  const crossColumn = ruleList.indexOf('rule-failed');
  for (const [id, res] of Object.entries(summary.rules)) {
    if (crossColumn >= 0 && res.failed > 0) {
      targets.push(ruleList.map((_, j) => slot(j === crossColumn ? res.failed : 0, j === crossColumn ? keyCrossRule(id, 'failed') : null)));
      targetTotals.push(slot(res.failed, keyCrossRule(id, 'failed')));
      rest[crossColumn]! -= res.failed;
    }
    const cells = [res.passed, res.failed, res.undetermined, ...(res.skipped !== undefined ? [res.skipped] : [])];
    const names = ['passed', 'failed', 'undetermined', 'skipped'];
    tables.push({ cells: [cells.map((v, j) => slot(v, keyCrossRule(id, names[j]!)))], rows: [slot(summary.rows, null, 'fixed')], columns: cells.map(() => slot(0, null, 'hidden')), grand: slot(summary.rows, null, 'fixed') });
  }
  if (rest.some((v) => v > 0)) {
    targets.push(rest.map((v) => slot(Math.max(0, v), null)));
    targetTotals.push(slot(0, null, 'hidden'));
  }
  if (targets.length > 0) tables.push({ cells: targets, rows: targetTotals, columns: byRuleSlots, grand: total });
  // Group items.
  const bySeverity = new Map<string, Map<string, Map<FindingSeverity, number>>>();
  const byRule = new Map<string, Map<string, Map<string, number>>>();
  for (const g of input.groups ?? []) {
    const sev = new Map<string, Map<FindingSeverity, number>>();
    const rul = new Map<string, Map<string, number>>();
    const add = (code: string, s: FindingSeverity, rule: string, n: number): void => {
      let a = sev.get(code);
      if (!a) sev.set(code, (a = new Map()));
      a.set(s, (a.get(s) ?? 0) + n);
      let b = rul.get(code);
      if (!b) rul.set(code, (b = new Map()));
      b.set(`${s}|${rule}`, (b.get(`${s}|${rule}`) ?? 0) + n);
    };
    const logged = new Map<string, number>();
    for (const f of findings) {
      add(g.keyOf(f) ?? NO_ROW, f.severity, f.rule, 1);
      logged.set(keyRuleAt(f.rule, f.severity), (logged.get(keyRuleAt(f.rule, f.severity)) ?? 0) + 1);
    }
    for (const [k, n] of ruleAt) {
      const [, rule, s] = k.split('|') as [string, string, FindingSeverity];
      const left = n - (logged.get(k) ?? 0);
      if (left > 0) add(NOT_LOGGED, s, rule, left);
    }
    bySeverity.set(g.item, sev);
    byRule.set(g.item, rul);
    const codes = [...sev.keys()];
    tables.push({
      // What the log left out follows from the totals: a count like the others, never a key of its own.
      cells: codes.map((c) => SEVERITIES.map((s) => slot(sev.get(c)!.get(s) ?? 0, c === NOT_LOGGED ? null : keyGroupSeverity(g.item, c, s)))),
      rows: codes.map((c) => (g.byRule && c !== NOT_LOGGED ? slot(SEVERITIES.reduce((a, s) => a + (sev.get(c)!.get(s) ?? 0), 0), keyGroupTotal(g.item, c)) : slot(0, null, 'hidden'))),
      columns: severitySlots,
      grand: total,
    });
    if (g.byRule) {
      const rows = codes.flatMap((c) => SEVERITIES.map((s) => [c, s] as const)).filter(([c, s]) => (sev.get(c)!.get(s) ?? 0) > 0);
      tables.push({
        cells: rows.map(([c, s]) => ruleList.map((r) => slot(rul.get(c)!.get(`${s}|${r}`) ?? 0, c === NOT_LOGGED ? null : keyGroupRule(g.item, c, s, r)))),
        rows: rows.map(([c, s]) => (c === NOT_LOGGED ? slot(0, null, 'hidden') : slot(sev.get(c)!.get(s)!, keyGroupSeverity(g.item, c, s)))),
        columns: byRuleSlots,
        grand: total,
      });
    }
  }
  const { suppressed, unprotected } = solve(tables, minCell, new Set([...input.invalidSuppressed].map((n) => `invalid|${n}`)));
  // A table that could not be protected has every count suppressed; those shown elsewhere stay shown.
  for (const key of publicKeys) suppressed.delete(key);
  return { minCell, suppressed, ruleAt, bySeverity, byRule, unprotected };
}
