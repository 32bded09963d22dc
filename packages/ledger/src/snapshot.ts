/**
 * A delivery as the ledger remembers it: the counts of its check (by item, kind of missing and
 * group; by rule, item and group), the valid-value summaries the drift tests need, and one hash
 * per record. Made from a check result and one extra pass over the file's records; comparing two
 * snapshots needs nothing else, whether they come from two files or from the ledger.
 */
import type { CheckResult, FindingRule } from '@codeweir/check';
import type { CompiledCodebook, Level, MissingTally } from '@codeweir/codebook';
import { sortedValid } from '@codeweir/stats';
import type { RecordSet } from './records.ts';

/**
 * The group code of findings that cannot be put to a group: file- and item-level findings, and
 * findings beyond the log's cap (--max-findings-per-rule), which the log does not hold.
 */
export const NOT_BY_GROUP = '(not by group)';

export interface ItemSnapshot {
  level?: Level;
  /** The item had no column in the delivery. */
  absent?: boolean;
  valid: number;
  invalid: number;
  /** Cells by kind of missing (`blank` and each declared kind that occurred). */
  missing: Partial<Record<MissingTally, number>>;
  /** Coded items: valid cells by code text, every code of the codebook listed (0 when unused), in codebook order. */
  codes?: Record<string, number>;
  /** Interval and ratio items: the valid values, sorted ascending (null when not stored). */
  values?: Float64Array | null;
}

export interface GroupSnapshot {
  /** Rows whose group cell holds this code (or `(missing)`, `(invalid)`). */
  rows: number;
  /**
   * Cells of these rows: all, missing, invalid. Free-text items (text without codes, other than
   * the id) are left out, as they are blank by design on most rows, and `missingCells` leaves out
   * valid skips (`not-applicable`): the routing, not a gap. The report's team table counts the same way.
   */
  cells: number;
  missingCells: number;
  invalidCells: number;
  /** item -> kind -> cells. */
  missing: Record<string, Partial<Record<MissingTally, number>>>;
}

export interface FindingCount {
  rule: FindingRule;
  item: string;
  /** '' with group '' for the count over the whole delivery. */
  groupItem: string;
  group: string;
  n: number;
}

export interface DeliverySnapshot {
  file: string;
  /** sha256 of the file's bytes, hex. */
  hash: string;
  codebook: { codebook: string; version: string };
  /** ISO 8601 UTC. */
  checkedAt: string;
  rows: number;
  verdict: 'accepted' | 'not accepted';
  errors: number;
  warnings: number;
  items: Record<string, ItemSnapshot>;
  /** group item -> group code -> counts. */
  groups: Record<string, Record<string, GroupSnapshot>>;
  findings: FindingCount[];
  /** Records by id with their hashes; null when the codebook has no id item or the snapshot came from a ledger without them. */
  records: RecordSet | null;
}

const CODED_LEVELS: ReadonlySet<string> = new Set(['nominal', 'ordinal']);

function sum(o: Partial<Record<string, number>>): number {
  let s = 0;
  for (const v of Object.values(o)) s += v ?? 0;
  return s;
}

/**
 * Builds the snapshot of a checked delivery. `result` must come from a check that retained its
 * columns (`retainCoded: true`) for the code counts of coded items; interval and ratio values
 * are always retained. Findings by rule x item x group come from the findings log (each finding
 * carries its row's group codes); where the log was capped (--max-findings-per-rule) the count
 * beyond it is kept under the group code {@link NOT_BY_GROUP}, so every rule x item total stays exact.
 * Cost: O(rows) to count codes, O(n log n) per interval or ratio item to sort. Throws nothing.
 */
export function snapshotFromCheck(
  result: CheckResult,
  codebook: CompiledCodebook,
  meta: { file: string; hash: string; checkedAt: string; accepted: boolean },
  records: RecordSet | null,
): DeliverySnapshot {
  const s = result.summary;
  const items: Record<string, ItemSnapshot> = {};
  for (const item of codebook.items) {
    const t = s.items[item.name];
    if (t === undefined) continue;
    const snap: ItemSnapshot = { valid: t.valid, invalid: t.invalid, missing: { ...t.missing } };
    if (item.level !== undefined) snap.level = item.level;
    if (t.absent) snap.absent = true;
    const col = result.store.columns[item.name];
    if (item.codes.length > 0 && (item.level === undefined || CODED_LEVELS.has(item.level))) {
      const counts = new Float64Array(item.codes.length + 1);
      if (col?.kind === 'coded') for (const c of col.codes) counts[c]++;
      snap.codes = {};
      for (const c of item.codes) snap.codes[c.text] = counts[c.index + 1]!;
    } else if (item.level === 'interval' || item.level === 'ratio') {
      snap.values = col?.kind === 'numeric' ? sortedValid(col.values) : new Float64Array(0);
    }
    items[item.name] = snap;
  }
  const groups: Record<string, Record<string, GroupSnapshot>> = {};
  for (const [g, byCode] of Object.entries(s.groups)) {
    groups[g] = {};
    for (const [code, perItem] of Object.entries(byCode)) {
      const own = perItem[g];
      const gs: GroupSnapshot = { rows: own ? own.valid + own.invalid + sum(own.missing) : 0, cells: 0, missingCells: 0, invalidCells: 0, missing: {} };
      for (const [name, t] of Object.entries(perItem)) {
        const m = sum(t.missing);
        if (m > 0) gs.missing[name] = { ...t.missing };
        gs.invalidCells += t.invalid;
        const it = codebook.byName.get(name);
        if (it !== undefined && it.type === 'text' && it.codes.length === 0 && it.role !== 'id') continue;
        gs.cells += t.valid + t.invalid + m;
        gs.missingCells += m - (t.missing['not-applicable'] ?? 0);
      }
      groups[g][code] = gs;
    }
  }
  const findings: FindingCount[] = [];
  const logged = new Map<string, number>();
  for (const f of result.findings) {
    for (const [g, code] of Object.entries(f.groups ?? {})) {
      const key = JSON.stringify([f.rule, f.item, g, code]);
      logged.set(key, (logged.get(key) ?? 0) + 1);
    }
  }
  const add = (rule: FindingRule, item: string, n: number): void => {
    findings.push({ rule, item, groupItem: '', group: '', n });
    for (const g of Object.keys(s.groups)) {
      let inLog = 0;
      for (const code of Object.keys(s.groups[g]!)) {
        const k = logged.get(JSON.stringify([rule, item, g, code])) ?? 0;
        if (k > 0) findings.push({ rule, item, groupItem: g, group: code, n: k });
        inLog += k;
      }
      if (n > inLog) findings.push({ rule, item, groupItem: g, group: NOT_BY_GROUP, n: n - inLog });
    }
  };
  for (const [name, t] of Object.entries(s.items)) for (const [rule, n] of Object.entries(t.findings)) if (n) add(rule as FindingRule, name, n);
  // A failed cross-item rule is logged with the rule id as its item.
  for (const [id, r] of Object.entries(s.rules)) if (r.failed > 0 && s.items[id] === undefined) add('rule-failed', id, r.failed);
  // Whatever is left of a rule's total belongs to no item (a ragged row, a header finding).
  const counted = new Map<string, number>();
  for (const f of findings) if (f.groupItem === '') counted.set(f.rule, (counted.get(f.rule) ?? 0) + f.n);
  for (const [rule, n] of Object.entries(s.findings.byRule)) {
    const rest = (n ?? 0) - (counted.get(rule) ?? 0);
    if (rest > 0) add(rule as FindingRule, '', rest);
  }
  return {
    file: meta.file,
    hash: meta.hash,
    codebook: { ...s.codebook },
    checkedAt: meta.checkedAt,
    rows: s.rows,
    verdict: meta.accepted ? 'accepted' : 'not accepted',
    errors: s.findings.bySeverity.error ?? 0,
    warnings: s.findings.bySeverity.warning ?? 0,
    items,
    groups,
    findings,
    records,
  };
}
