/**
 * The season so far: every delivery of a ledger in order, per group the trend of missingness
 * and of findings, and for one item its missing kinds and drift from each delivery to the next.
 */
import { CodeweirError } from '@codeweir/core';
import type { Level, MissingTally } from '@codeweir/codebook';
import type { Ledger, DeliveryRow } from './ledger.ts';
import { codedDrift, numericDrift, driftConventions, DEFAULT_THRESHOLDS, type Drift, type DriftThresholds } from './drift.ts';

export interface HistoryOptions {
  /** One item's trend (missing by kind, drift from the delivery before). */
  item?: string;
  /** The group item of the per-group trend; default the first group item recorded. */
  groupItem?: string;
  thresholds?: DriftThresholds;
}

export interface GroupPoint {
  delivery: number;
  rows: number;
  /** Share (0 to 100) of the group's cells that are missing (valid skips and free-text items left out); null when the group had no rows in that delivery. */
  missingPercent: number | null;
  /** Cells of the group's rows with an error finding (invalid cells). */
  errors: number;
  /** Findings by rule in the group's rows (as the findings log put them to the group). */
  findings: Record<string, number>;
}

export interface ItemPoint {
  delivery: number;
  valid: number;
  invalid: number;
  missing: Partial<Record<MissingTally, number>>;
  /** Share (0 to 100) of the delivery's rows missing in this item (any kind). */
  missingPercent: number | null;
  /** Group code -> share (0 to 100) of the group's rows missing in this item. */
  missingPercentByGroup: Record<string, number | null>;
  /** Drift from the delivery before (null for the first, or when its summaries are not stored). */
  drift: Drift | null;
}

/** The JSON document of `codeweir history`. */
export interface History {
  ledger: string;
  schemaVersion: number;
  deliveries: DeliveryRow[];
  groupItem: string | null;
  /** Group code -> one point per delivery, in delivery order. */
  groups: Record<string, GroupPoint[]>;
  item?: { name: string; level: Level | null; points: ItemPoint[] };
  conventions: Record<string, string | number>;
}

function num(v: unknown): number {
  return typeof v === 'bigint' ? Number(v) : Number(v);
}

/**
 * The history of a ledger (see {@link History}). Missing percentages are of cells (groups) or
 * rows (an item); errors count invalid cells; findings by rule per group come from the
 * findings table, whose `(not by group)` code holds findings the log did not put to a group.
 * Drift between consecutive deliveries follows {@link driftConventions}.
 * Cost: a few queries, plus reading one item's valid values per delivery with `item`.
 * Throws CodeweirError CW_USAGE for an item or group item the ledger has never seen.
 */
export async function ledgerHistory(ledger: Ledger, options: HistoryOptions = {}): Promise<History> {
  const t = options.thresholds ?? DEFAULT_THRESHOLDS;
  const deliveries = await ledger.deliveries();
  const known = (await ledger.rows('SELECT DISTINCT group_item FROM group_counts ORDER BY group_item')).map((r) => String(r.group_item));
  if (options.groupItem !== undefined && !known.includes(options.groupItem)) {
    throw new CodeweirError('CW_USAGE', `--group takes a group item recorded in the ledger${known.length ? ` (${known.join(', ')})` : ', which has none'}, got ${options.groupItem}.`);
  }
  const groupItem = options.groupItem ?? known[0] ?? null;
  const groups: Record<string, GroupPoint[]> = {};
  if (groupItem !== null) {
    const counts = await ledger.rows('SELECT * FROM group_counts WHERE group_item = $1 ORDER BY delivery, rowid', [groupItem]);
    const findings = await ledger.rows('SELECT delivery, group_code, rule, sum(n) AS n FROM finding_counts WHERE group_item = $1 GROUP BY ALL ORDER BY delivery, group_code, rule', [groupItem]);
    const codes = [...new Set(counts.map((r) => String(r.group_code)))];
    for (const code of codes) {
      groups[code] = deliveries.map((d) => {
        const r = counts.find((x) => num(x.delivery) === d.id && String(x.group_code) === code);
        const cells = r ? num(r.cells) : 0;
        const f: Record<string, number> = {};
        for (const x of findings) if (num(x.delivery) === d.id && String(x.group_code) === code) f[String(x.rule)] = num(x.n);
        return { delivery: d.id, rows: r ? num(r.rows) : 0, missingPercent: cells > 0 ? (100 * num(r!.missing_cells)) / cells : null, errors: r ? num(r.invalid_cells) : 0, findings: f };
      });
    }
  }
  const out: History = { ledger: ledger.path, schemaVersion: ledger.version, deliveries, groupItem, groups, conventions: driftConventions(t) };
  if (options.item !== undefined) out.item = await itemHistory(ledger, deliveries, options.item, groupItem, t);
  return out;
}

async function itemHistory(ledger: Ledger, deliveries: DeliveryRow[], name: string, groupItem: string | null, t: DriftThresholds): Promise<NonNullable<History['item']>> {
  const counts = await ledger.rows('SELECT * FROM item_counts WHERE item = $1 ORDER BY delivery', [name]);
  if (counts.length === 0) {
    const items = (await ledger.rows('SELECT DISTINCT item FROM item_counts ORDER BY item')).map((r) => String(r.item));
    throw new CodeweirError('CW_USAGE', `--item takes an item recorded in the ledger (${items.slice(0, 12).join(', ')}${items.length > 12 ? ', ...' : ''}), got ${name}.`);
  }
  const level = (counts.find((r) => r.level !== null)?.level ?? null) as Level | null;
  const missing = await ledger.rows('SELECT * FROM missing_counts WHERE item = $1 ORDER BY delivery, rowid', [name]);
  const groupRows = groupItem === null ? [] : await ledger.rows('SELECT delivery, group_code, rows FROM group_counts WHERE group_item = $1', [groupItem]);
  const codes = level === 'nominal' || level === 'ordinal' ? await ledger.rows('SELECT delivery, code, n FROM code_counts WHERE item = $1 ORDER BY delivery, position', [name]) : [];
  const numeric = level === 'interval' || level === 'ratio';
  const points: ItemPoint[] = [];
  let before: { codes: Map<string, number>; values: Float64Array | null } | null = null;
  for (const d of deliveries) {
    const c = counts.find((r) => num(r.delivery) === d.id);
    if (c === undefined || c.absent === true) {
      before = null;
      continue;
    }
    const m: Partial<Record<MissingTally, number>> = {};
    const byGroup: Record<string, number> = {};
    for (const r of missing) {
      if (num(r.delivery) !== d.id) continue;
      if (r.group_item === '') m[String(r.kind) as MissingTally] = num(r.n);
      else if (r.group_item === groupItem) byGroup[String(r.group_code)] = (byGroup[String(r.group_code)] ?? 0) + num(r.n);
    }
    const missingPercentByGroup: Record<string, number | null> = {};
    for (const g of groupRows) {
      if (num(g.delivery) !== d.id) continue;
      const rows = num(g.rows);
      missingPercentByGroup[String(g.group_code)] = rows > 0 ? (100 * (byGroup[String(g.group_code)] ?? 0)) / rows : null;
    }
    let total = 0;
    for (const v of Object.values(m)) total += v ?? 0;
    const now = {
      codes: new Map(codes.filter((r) => num(r.delivery) === d.id).map((r) => [String(r.code), num(r.n)] as const)),
      values: numeric ? await ledger.values(d.id, name) : null,
    };
    let drift: Drift | null = null;
    if (before !== null) {
      if (numeric && before.values && now.values) drift = numericDrift(before.values, now.values, t);
      else if (!numeric && now.codes.size > 0 && before.codes.size > 0) {
        const keys = [...new Set([...before.codes.keys(), ...now.codes.keys()])];
        drift = codedDrift(keys.map((k) => before!.codes.get(k) ?? 0), keys.map((k) => now.codes.get(k) ?? 0), t);
      }
    }
    points.push({ delivery: d.id, valid: num(c.valid), invalid: num(c.invalid), missing: m, missingPercent: d.rows > 0 ? (100 * total) / d.rows : null, missingPercentByGroup, drift });
    before = now;
  }
  return { name, level, points };
}
