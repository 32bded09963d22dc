/**
 * Two deliveries compared: which records were added, removed or changed (and in which items),
 * per item the codes that appeared or disappeared, each kind of missing before and after
 * (overall and by group) and the drift of the valid values, and per group the share of cells
 * missing and the cells with an error finding.
 */
import type { MissingTally } from '@codeweir/codebook';
import { neutraliseCell } from '@codeweir/check';
import { codedDrift, numericDrift, driftConventions, type Drift, type DriftThresholds, DEFAULT_THRESHOLDS } from './drift.ts';
import type { DeliverySnapshot, GroupSnapshot, ItemSnapshot } from './snapshot.ts';
import type { RecordSet } from './records.ts';

export interface Before<T> {
  previous: T;
  current: T;
}

export interface ItemChange {
  level?: string;
  /** Codes with valid cells now and none before, and the other way round (codebook order). */
  newCodes: string[];
  goneCodes: string[];
  /** Cells by kind of missing (every kind seen in either delivery). */
  missing: Partial<Record<MissingTally, Before<number>>>;
  /** Group code of the compared group item -> kind -> cells before and after (where either is non-zero). */
  missingByGroup: Record<string, Partial<Record<MissingTally, Before<number>>>>;
  valid: Before<number>;
  invalid: Before<number>;
  /** Null with `driftNote` when the item has no valid-value summary on one side. */
  drift: Drift | null;
  driftNote?: string;
}

export interface GroupChange {
  rows: Before<number>;
  /** Share (0 to 100) of the cells of the group's rows that are missing, valid skips and free-text items left out (see GroupSnapshot). */
  missingPercent: Before<number | null>;
  /** Cells of the group's rows with an error finding (invalid cells). */
  errors: Before<number>;
  /** Records of the group added, removed, changed (added and changed by the current group code, removed by the previous one). */
  records?: { added: number; removed: number; changed: number };
}

export interface DeliveryRef {
  file: string;
  hash: string;
  checkedAt: string;
  rows: number;
  codebook: { codebook: string; version: string };
  verdict: string;
  /** The delivery's number in the ledger, when it came from one. */
  delivery?: number;
}

/** The JSON document of `codeweir compare`. */
export interface CompareJson {
  previous: DeliveryRef;
  current: DeliveryRef;
  conventions: Record<string, string | number>;
  /** Null with `recordsNote` when records cannot be matched (no id item, or none stored). */
  /** `byItem`: changed records by item (items with at least one). */
  records: { idItem: string; added: number; removed: number; changed: number; unchanged: number; byItem: Record<string, number> } | null;
  recordsNote?: string;
  items: Record<string, ItemChange>;
  /** The group item of `groups` (--group; by default the codebook's first group item), or null. */
  groupItem: string | null;
  groups: Record<string, GroupChange>;
}

export interface RecordChange {
  id: string;
  change: 'added' | 'removed' | 'changed';
  /** Changed records: the items whose cells differ. */
  items: string[];
  /** Group item -> the record's group code (current delivery; previous for a removed record). */
  groups: Record<string, string>;
}

export interface Comparison {
  json: CompareJson;
  /** One entry per added, removed and changed record, ids in current-file order, then removed ones in previous-file order. */
  changes: RecordChange[];
}

export interface CompareOptions {
  thresholds?: DriftThresholds;
  /** The group item of the per-group part; default the first group item of either snapshot. */
  groupItem?: string;
  previousDelivery?: number;
  currentDelivery?: number;
}

function ref(s: DeliverySnapshot, delivery?: number): DeliveryRef {
  const r: DeliveryRef = { file: s.file, hash: s.hash, checkedAt: s.checkedAt, rows: s.rows, codebook: { ...s.codebook }, verdict: s.verdict };
  if (delivery !== undefined) r.delivery = delivery;
  return r;
}

function kindsOf(...ms: Array<Partial<Record<MissingTally, number>> | undefined>): MissingTally[] {
  const set = new Set<MissingTally>();
  for (const m of ms) for (const [k, v] of Object.entries(m ?? {})) if (v) set.add(k as MissingTally);
  return [...set].sort();
}

function missingChange(a: Partial<Record<MissingTally, number>> | undefined, b: Partial<Record<MissingTally, number>> | undefined): Partial<Record<MissingTally, Before<number>>> {
  const out: Partial<Record<MissingTally, Before<number>>> = {};
  for (const k of kindsOf(a, b)) out[k] = { previous: a?.[k] ?? 0, current: b?.[k] ?? 0 };
  return out;
}

const EMPTY: ItemSnapshot = { valid: 0, invalid: 0, missing: {} };

function itemChange(name: string, a: ItemSnapshot | undefined, b: ItemSnapshot | undefined, groupItem: string | null, pg: Record<string, GroupSnapshot>, cg: Record<string, GroupSnapshot>, t: DriftThresholds): ItemChange {
  const p = a ?? EMPTY;
  const c = b ?? EMPTY;
  const out: ItemChange = {
    newCodes: [],
    goneCodes: [],
    missing: missingChange(p.missing, c.missing),
    missingByGroup: {},
    valid: { previous: p.valid, current: c.valid },
    invalid: { previous: p.invalid, current: c.invalid },
    drift: null,
  };
  const level = c.level ?? p.level;
  if (level !== undefined) out.level = level;
  if (groupItem !== null) {
    for (const code of [...new Set([...Object.keys(pg), ...Object.keys(cg)])]) {
      const m = missingChange(pg[code]?.missing[name], cg[code]?.missing[name]);
      if (Object.keys(m).length) out.missingByGroup[code] = m;
    }
  }
  if (p.codes && c.codes) {
    const codes = [...new Set([...Object.keys(c.codes), ...Object.keys(p.codes)])];
    for (const code of codes) {
      const before = p.codes[code] ?? 0;
      const now = c.codes[code] ?? 0;
      if (now > 0 && before === 0) out.newCodes.push(code);
      if (before > 0 && now === 0) out.goneCodes.push(code);
    }
    if (a && b) out.drift = codedDrift(codes.map((k) => p.codes![k] ?? 0), codes.map((k) => c.codes![k] ?? 0), t);
  } else if (level === 'interval' || level === 'ratio') {
    if (p.values && c.values && a && b) out.drift = numericDrift(p.values, c.values, t);
    else out.driftNote = a && b ? 'the valid values of one delivery are not in the ledger (it was recorded by an earlier ledger schema)' : `${name} is in only one of the deliveries`;
  }
  if (out.drift === null && out.driftNote === undefined && (level === 'nominal' || level === 'ordinal')) out.driftNote = a && b ? 'no code counts on one side' : `${name} is in only one of the deliveries`;
  return out;
}

function percent(n: number, of: number): number | null {
  return of > 0 ? (100 * n) / of : null;
}

function recordChanges(p: RecordSet, c: RecordSet): { changes: RecordChange[]; unchanged: number; byItem: Record<string, number> } {
  const prevIndex = new Map<string, number>();
  p.ids.forEach((id, i) => prevIndex.set(id, i));
  // Items hashed in both deliveries, as positions in each side's cells.
  const shared = c.items.map((name, k) => [name, k, p.items.indexOf(name)] as const).filter(([, , j]) => j >= 0);
  const byItem: Record<string, number> = {};
  for (const [name] of shared) byItem[name] = 0;
  const groupsOf = (set: RecordSet, r: number): Record<string, string> => Object.fromEntries(set.groupItems.map((g, k) => [g, set.groups[k]![r]!]));
  const changes: RecordChange[] = [];
  const seen = new Uint8Array(p.ids.length);
  let unchanged = 0;
  const wc = c.items.length;
  const wp = p.items.length;
  c.ids.forEach((id, r) => {
    const i = prevIndex.get(id);
    if (i === undefined) {
      changes.push({ id, change: 'added', items: [], groups: groupsOf(c, r) });
      return;
    }
    seen[i] = 1;
    const items: string[] = [];
    for (const [name, k, j] of shared) if (c.cells[r * wc + k] !== p.cells[i * wp + j]) items.push(name);
    if (items.length === 0) unchanged++;
    else {
      for (const name of items) byItem[name]!++;
      changes.push({ id, change: 'changed', items, groups: groupsOf(c, r) });
    }
  });
  p.ids.forEach((id, i) => {
    if (!seen[i]) changes.push({ id, change: 'removed', items: [], groups: groupsOf(p, i) });
  });
  return { changes, unchanged, byItem };
}

/**
 * Compares two delivery snapshots (from two files, or from the ledger). Records are matched by
 * id (the codebook's id item); a record is changed when the hash of any item's cell differs
 * (items hashed in both deliveries). Drift and its thresholds: see {@link driftConventions}.
 * Per group (`groupItem`): rows, the share of cells missing, the cells with an error finding,
 * and the group's own record changes.
 * Cost: O(records x items + codes + valid values); an exact Kolmogorov-Smirnov p-value only for
 * fewer than 10,000 value pairs. Throws nothing.
 */
export function compareSnapshots(previous: DeliverySnapshot, current: DeliverySnapshot, options: CompareOptions = {}): Comparison {
  const t = options.thresholds ?? DEFAULT_THRESHOLDS;
  const groupItem = options.groupItem ?? Object.keys(current.groups)[0] ?? Object.keys(previous.groups)[0] ?? null;
  const pg = (groupItem !== null ? previous.groups[groupItem] : undefined) ?? {};
  const cg = (groupItem !== null ? current.groups[groupItem] : undefined) ?? {};
  const json: CompareJson = {
    previous: ref(previous, options.previousDelivery),
    current: ref(current, options.currentDelivery),
    conventions: driftConventions(t),
    records: null,
    items: {},
    groupItem,
    groups: {},
  };
  let changes: RecordChange[] = [];
  if (previous.records && current.records) {
    const r = recordChanges(previous.records, current.records);
    changes = r.changes;
    const count = (k: RecordChange['change']): number => changes.filter((x) => x.change === k).length;
    const byItem = Object.fromEntries(Object.entries(r.byItem).filter(([, n]) => n > 0));
    json.records = { idItem: current.records.idItem, added: count('added'), removed: count('removed'), changed: count('changed'), unchanged: r.unchanged, byItem };
  } else {
    json.recordsNote = 'records cannot be matched: the codebook has no id item, a delivery has no id column, or the ledger holds no records for one of the deliveries (recorded under ledger schema 1)';
  }
  const names = [...new Set([...Object.keys(current.items), ...Object.keys(previous.items)])];
  for (const name of names) {
    const a = previous.items[name];
    const b = current.items[name];
    json.items[name] = itemChange(name, a && !a.absent ? a : undefined, b && !b.absent ? b : undefined, groupItem, pg, cg, t);
  }
  if (groupItem !== null) {
    const codes = [...new Set([...Object.keys(cg), ...Object.keys(pg)])];
    for (const code of codes) {
      const a = pg[code];
      const b = cg[code];
      const g: GroupChange = {
        rows: { previous: a?.rows ?? 0, current: b?.rows ?? 0 },
        missingPercent: { previous: a ? percent(a.missingCells, a.cells) : null, current: b ? percent(b.missingCells, b.cells) : null },
        errors: { previous: a?.invalidCells ?? 0, current: b?.invalidCells ?? 0 },
      };
      if (json.records) {
        const mine = changes.filter((x) => x.groups[groupItem] === code);
        g.records = { added: mine.filter((x) => x.change === 'added').length, removed: mine.filter((x) => x.change === 'removed').length, changed: mine.filter((x) => x.change === 'changed').length };
      }
      json.groups[code] = g;
    }
  }
  return { json, changes };
}

const BOM = '\ufeff';

function csvCell(s: string): string {
  // A cell a spreadsheet would run as a formula gets an apostrophe, as in the findings log.
  const t = neutraliseCell(s);
  return /[",\r\n]/.test(t) ? `"${t.replace(/"/g, '""')}"` : t;
}

/**
 * The record changes as CSV (UTF-8 with BOM, CRLF): id, change (added, removed, changed),
 * items (the changed items, separated by spaces), then one column per group item with the
 * record's group code. Cost: O(changes). Throws nothing.
 */
export function recordsCsv(changes: readonly RecordChange[], groupItems: readonly string[]): string {
  let out = BOM + ['id', 'change', 'items', ...groupItems].map(csvCell).join(',') + '\r\n';
  for (const c of changes) out += [c.id, c.change, c.items.join(' '), ...groupItems.map((g) => c.groups[g] ?? '')].map(csvCell).join(',') + '\r\n';
  return out;
}
