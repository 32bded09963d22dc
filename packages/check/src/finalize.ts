/**
 * Combining partial passes and turning a pass into its CheckResult.
 */
import { quantilesInPlace, tukeyFences, type QuantileType } from '@codeweir/stats';
import { CodeweirError } from '@codeweir/core';
import type { CompiledCodebook, CompiledItem } from '@codeweir/codebook';
import { KINDS } from './classify.ts';
import { rules, RULE_NUMBER, RULE_ORDER } from './rules/index.ts';
import { SEVERITIES, SLOTS, type GroupPartial, type IdColumn, type PartialResult } from './pass.ts';
import { NumberFirsts, TextFirsts, type UniqueEntries } from './unique.ts';
import { designFindings } from './design.ts';
import type { CheckResult, CheckSummary, ColumnStore, Finding, FindingRule, GroupItemTally, ItemColumn, ItemTally } from './types.ts';

const NR = RULE_ORDER.length;
const R = RULE_NUMBER;

/** Sort key of a finding's item: -1 for row-level (ragged) or unknown, item index, then rules after the items. */
function columnOrderOf(codebook: CompiledCodebook): (f: Finding) => number {
  const ruleIndex = new Map(codebook.rules.map((r, i) => [r.id, i]));
  const n = codebook.items.length;
  return (f) => {
    if (f.rule === 'rule-failed') return n + (ruleIndex.get(f.item) ?? 0);
    return codebook.byName.get(f.item)?.index ?? -1;
  };
}

/**
 * Sorts findings by row, then column (codebook item order, cross-item rules after the items),
 * then rule, and keeps the first `cap` of each rule. Stable. Cost: O(f log f). Throws nothing.
 */
export function sortAndCapFindings(findings: Finding[], codebook: CompiledCodebook, cap: number): Finding[] {
  const col = columnOrderOf(codebook);
  const keyed = findings.map((f) => ({ f, c: col(f), r: R[f.rule] }));
  keyed.sort((a, b) => a.f.row - b.f.row || a.c - b.c || a.r - b.r);
  const kept = new Int32Array(NR);
  const out: Finding[] = [];
  for (const { f, r } of keyed) {
    if (kept[r]! < cap) {
      kept[r]++;
      out.push(f);
    }
  }
  return out;
}

function concatTyped<T extends Float64Array | Uint16Array | Uint32Array>(parts: T[]): T {
  // One part: nothing to join, and no copy (the merged result only reads its columns).
  if (parts.length === 1) return parts[0]!;
  const total = parts.reduce((s, p) => s + p.length, 0);
  const out = new (parts[0]!.constructor as { new (n: number): T })(total);
  let at = 0;
  for (const p of parts) {
    out.set(p as never, at);
    at += p.length;
  }
  return out;
}

function remapInPlace(keys: Uint32Array, remap: Uint32Array): Uint32Array {
  for (let r = 0; r < keys.length; r++) keys[r] = remap[keys[r]!]!;
  return keys;
}

function sumInto(target: Float64Array, src: Float64Array): void {
  for (let i = 0; i < src.length; i++) target[i]! += src[i]!;
}

/**
 * Merges partial passes over consecutive row ranges of one delivery, in order, into the
 * partial a single pass over all rows would have produced. `rowOffsets[k]` is the number of
 * rows before part k (default: the running sum of the parts' rows). Counts add up; retained
 * columns, group keys and ids are concatenated; duplicate values of unique items across parts
 * are resolved in row order (the first occurrence overall is the original); findings are
 * shifted to global rows, sorted and capped per rule. With `release`, the parts' per-row arrays
 * (columns, row keys, ids, unique tables) are dropped from the parts as soon as they are copied,
 * so the merge needs memory for the result plus one column, not a second copy of every column;
 * the parts are then spent and must not be merged again. `joined` holds retained columns (by
 * item index) already concatenated with {@link joinColumn}; they are taken as they are.
 * Cost: O(rows x retained items + distinct unique values). Throws CodeweirError CW_USAGE when
 * `parts` is empty or the parts were made with different headers.
 */
export function mergePartials(
  parts: PartialResult[],
  rowOffsets?: readonly number[],
  how: { release?: boolean; joined?: ReadonlyMap<number, Float64Array | Uint16Array> } = {},
): PartialResult {
  const release = how.release === true;
  if (parts.length === 0) throw new CodeweirError('CW_USAGE', 'mergePartials needs at least one partial result.');
  const first = parts[0]!;
  const offs: number[] = [];
  let acc = 0;
  for (let k = 0; k < parts.length; k++) {
    offs.push(rowOffsets?.[k] ?? acc);
    acc += parts[k]!.rows;
    if (parts[k]!.header.columns.join('\u0000') !== first.header.columns.join('\u0000')) {
      throw new CodeweirError('CW_USAGE', `Partial result ${k + 1} was made with a different header than the first.`);
    }
  }
  const { codebook, options } = first;
  const nItems = codebook.items.length;
  const add = (get: (p: PartialResult) => Float64Array): Float64Array => {
    const out = new Float64Array(get(first).length);
    for (const p of parts) sumInto(out, get(p));
    return out;
  };
  const findingCounts = add((p) => p.findingCounts);
  const ruleTotals = add((p) => p.ruleTotals);
  const severityTotals = add((p) => p.severityTotals);

  const findings: Finding[] = [];
  parts.forEach((p, k) => {
    for (const f of p.findings) findings.push(offs[k] === 0 ? f : { ...f, row: f.row + offs[k]! });
  });

  // Unique values across parts.
  const unique: Array<UniqueEntries | null> = first.unique.map((u0, i) => {
    if (u0 === null) return null;
    const keepIds = u0.ids !== undefined;
    const expected = parts.reduce((s, p) => s + p.unique[i]!.rows.length, 0);
    const table = u0.kind === 'number' ? new NumberFirsts(keepIds, expected) : new TextFirsts(keepIds, expected);
    const name = codebook.items[i]!.name;
    parts.forEach((p, k) => {
      const e = p.unique[i]!;
      const hashes = e.kind === 'text' ? e.hashes : undefined;
      for (let j = 0; j < e.rows.length; j++) {
        const key = e.keys[j]!;
        const row = e.rows[j]! + offs[k]!;
        const id = e.ids ? e.ids[j]! : '';
        const fresh = table instanceof NumberFirsts ? table.add(key as number, row, id) : table.add(key as string, row, id, hashes?.[j]);
        if (fresh) continue;
        findingCounts[i * NR + R['duplicate-id']]++;
        ruleTotals[R['duplicate-id']]++;
        severityTotals[0]++;
        const value = typeof key === 'number' ? String(key + 0) : key;
        findings.push({ row, id: e.ids ? id : value, item: name, value, rule: 'duplicate-id', severity: 'error', message: rules['duplicate-id'].message({ item: name, value }) });
      }
      if (release) p.unique[i] = null;
    });
    return table.entries();
  });

  // Groups: union of keys in order of first appearance; row keys remapped.
  const groups: GroupPartial[] = first.groups.map((g0, g) => {
    const keys: string[] = [];
    const keyOf = new Map<string, number>();
    const tallies: Float64Array[] = [];
    const rowKeyParts: Uint32Array[] = [];
    for (const p of parts) {
      const gp = p.groups[g]!;
      const remap = new Uint32Array(gp.keys.length);
      gp.keys.forEach((key, j) => {
        let at = keyOf.get(key);
        if (at === undefined) {
          at = keys.length;
          keys.push(key);
          keyOf.set(key, at);
          tallies.push(new Float64Array(nItems * SLOTS));
        }
        remap[j] = at;
        sumInto(tallies[at]!, gp.tallies[j]!);
      });
      // Remapped in place when the part is spent: no third copy of the row keys.
      rowKeyParts.push(release ? remapInPlace(gp.rowKeys, remap) : gp.rowKeys.map((x) => remap[x]!));
      if (release) gp.rowKeys = new Uint32Array(0);
    }
    return { item: g0.item, keys, tallies, rowKeys: rowKeyParts.length ? concatTyped(rowKeyParts) : new Uint32Array(0) };
  });

  // A column joined beforehand released its pieces then.
  const columns = first.columns.map((_, i) => how.joined?.get(i) ?? joinColumn(parts, i, release));
  let ids: IdColumn | null = null;
  if (first.ids) {
    const odd = new Map<number, string>();
    parts.forEach((p, k) => p.ids!.odd.forEach((v, row) => odd.set(row + offs[k]!, v)));
    const numbers = first.ids.numbers ? concatTyped(parts.map((p) => p.ids!.numbers!)) : undefined;
    if (release) for (const p of parts) delete p.ids!.numbers;
    ids = {
      numbers,
      texts: first.ids.texts ? parts.flatMap((p) => p.ids!.texts!) : undefined,
      odd,
    };
  }

  return {
    codebook,
    options,
    header: first.header,
    file: first.file,
    rows: parts.reduce((s, p) => s + p.rows, 0),
    tallies: add((p) => p.tallies),
    findingCounts,
    ruleTotals,
    severityTotals,
    routing: add((p) => p.routing),
    rules: add((p) => p.rules),
    trimmed: add((p) => p.trimmed),
    unbinned: add((p) => p.unbinned),
    recordMissing: add((p) => p.recordMissing),
    groups,
    columns,
    ids,
    unique,
    findings: sortAndCapFindings(findings, codebook, options.maxFindingsPerRule),
  };
}

function idOfRow(ids: IdColumn | null, row: number): string {
  if (ids === null) return '';
  if (ids.texts) return ids.texts[row - 1] ?? '';
  const v = ids.numbers?.[row - 1];
  if (v === undefined || Number.isNaN(v)) return ids.odd.get(row) ?? '';
  return String(v);
}

/** Copies the valid (non-NaN) values of `col` to the start of `out`; returns how many. Cost: O(n). */
function copyValid(col: Float64Array, out: Float64Array): number {
  let m = 0;
  for (let r = 0; r < col.length; r++) {
    const v = col[r]!;
    if (v === v) out[m++] = v; // NaN marks a cell that is not valid
  }
  return m;
}

/**
 * Item `i`'s retained column of consecutive parts, concatenated in order (the column
 * mergePartials makes); with `release` the parts' pieces are dropped once copied. Cost: O(rows).
 */
export function joinColumn(parts: PartialResult[], i: number, release = false): Float64Array | Uint16Array | null {
  if (parts[0]!.columns[i] === null) return null;
  const joined = concatTyped(parts.map((p) => p.columns[i]!));
  if (release) for (const p of parts) p.columns[i] = null;
  return joined;
}

/** Whether an item gets Tukey fences: interval or ratio, not text, with retained numeric values. */
export function isFenced(item: CompiledItem, column: unknown): column is Float64Array {
  return (item.level === 'interval' || item.level === 'ratio') && item.type !== 'text' && column instanceof Float64Array;
}

/**
 * The quartiles (q1, q3) by which an item's Tukey fences are set, of the valid (non-NaN) values
 * of its column; null when no value is valid. `scratch`, when at least as long as the column,
 * is used for the copy of the valid values.
 * Convention: Hyndman-Fan type `type`, identical to quantileSorted of the sorted valid values
 * (selection, not a sort). Cost: O(n) expected, one n-value copy. Throws nothing.
 */
export function fenceQuartiles(col: Float64Array, type: QuantileType, scratch?: Float64Array): [number, number] | null {
  const buf = scratch !== undefined && scratch.length >= col.length ? scratch : new Float64Array(col.length);
  const m = copyValid(col, buf);
  if (m === 0) return null;
  return quantilesInPlace(buf.subarray(0, m), [0.25, 0.75], type) as [number, number];
}

/** 0-based indices of the values below `lower` or above `upper`, in order (NaN is neither). Cost: O(n). */
function outsideRows(col: Float64Array, lower: number, upper: number): number[] {
  const out: number[] = [];
  for (let r = 0; r < col.length; r++) {
    const v = col[r]!;
    if (v < lower || v > upper) out.push(r);
  }
  return out;
}

/** Shortest decimal text of a fence, rounded to 12 significant digits so 3.2500000000000004 prints as 3.25. */
function fenceText(v: number): string {
  return String(Number(v.toPrecision(12)));
}

/**
 * Turns a (merged) partial into the CheckResult: header findings (`missing-column` error per
 * absent item, `unexpected-column` warning, `duplicate-column` error, one `column-order`
 * warning), `no-rows` for an empty delivery, one `surrounding-space` warning per item with the
 * count, `unbinned-column` when more than `unbinnedColumnShare` of a binned item's answered
 * cells are raw quantities, and Tukey `outlier` / `extreme` findings (info) in interval and
 * ratio items: quartiles q1, q3 by Hyndman-Fan type `quantileType` (default 7) of the valid
 * values, fences q1 - 1.5 IQR, q3 + 1.5 IQR (outlier beyond, exclusive) and q1 - 3 IQR,
 * q3 + 3 IQR (extreme beyond; an extreme value is reported once, as extreme). Outlier values
 * are written as the parsed number. Findings are sorted (row, column, rule), group codes of
 * their rows attached, and capped per rule. The delivery is accepted when nothing is at error
 * severity. `given.quartiles` (by item index) holds fence quartiles already computed elsewhere
 * with {@link fenceQuartiles} on the same values (a worker thread does, while this thread
 * merges); the others are computed here. Cost: O(rows) expected per fenced item (quartiles by
 * selection, no sort), one rows-long scratch buffer. Throws nothing.
 */
export function finalize(p: PartialResult, given?: { quartiles?: ReadonlyMap<number, [number, number] | null> }): CheckResult {
  const { codebook, options, header } = p;
  const findingCounts = Float64Array.from(p.findingCounts);
  const ruleTotals = Float64Array.from(p.ruleTotals);
  const severityTotals = Float64Array.from(p.severityTotals);
  const extra: Finding[] = [];
  const note = (rule: FindingRule, item: number, f: Finding | null): void => {
    const r = R[rule];
    if (item >= 0) findingCounts[item * NR + r]++;
    ruleTotals[r]++;
    severityTotals[SEVERITIES.indexOf(f ? f.severity : rules[rule].severity)]++;
    if (f) extra.push(f);
  };
  const itemLevel = (rule: FindingRule, item: string, value: string, message: string): Finding => ({
    row: 0,
    id: '',
    item,
    value,
    rule,
    severity: rules[rule].severity,
    message,
  });

  for (const name of header.missing) {
    note('missing-column', codebook.byName.get(name)!.index, itemLevel('missing-column', name, '', rules['missing-column'].message({ item: name })));
  }
  for (const u of header.unexpected) {
    note('unexpected-column', -1, itemLevel('unexpected-column', u.column, u.column, rules['unexpected-column'].message(u)));
  }
  for (const d of header.duplicate) {
    note('duplicate-column', codebook.byName.get(d.column)?.index ?? -1, itemLevel('duplicate-column', d.column, d.column, rules['duplicate-column'].message(d)));
  }
  if (header.outOfOrder !== undefined) {
    note('column-order', -1, itemLevel('column-order', header.outOfOrder, '', rules['column-order'].message({ first: header.outOfOrder })));
  }
  if (p.rows === 0) note('no-rows', -1, itemLevel('no-rows', '', '', rules['no-rows'].message({ file: p.file ?? 'The delivery' })));

  for (const item of codebook.items) {
    const i = item.index;
    const t = p.trimmed[i]!;
    if (t > 0) note('surrounding-space', i, itemLevel('surrounding-space', item.name, String(t), rules['surrounding-space'].message({ item: item.name, count: t })));
    if (item.binned && p.unbinned[i]! > 0) {
      const answered = p.tallies[i * SLOTS]! + p.tallies[i * SLOTS + 1]!;
      if (p.unbinned[i]! > options.unbinnedColumnShare * answered) {
        note('unbinned-column', i, itemLevel('unbinned-column', item.name, '', rules['unbinned-column'].message({ item: item.name, count: p.unbinned[i]!, of: answered })));
      }
    }
  }

  // Tukey fences from the retained values: a second pass over the typed column, not the file.
  const fences: NonNullable<CheckSummary['fences']> = {};
  const cap = options.maxFindingsPerRule;
  // One scratch buffer for the valid values of every fenced item in turn: each column has
  // p.rows values, so a single allocation serves them all.
  let scratch: Float64Array | null = null;
  for (const item of codebook.items) {
    const col = p.columns[item.index];
    if (!isFenced(item, col)) continue;
    let quartiles = given?.quartiles?.get(item.index);
    if (quartiles === undefined) {
      if (scratch === null || scratch.length < col.length) scratch = new Float64Array(col.length);
      quartiles = fenceQuartiles(col, options.quantileType, scratch);
    }
    if (quartiles === null) continue;
    const [q1, q3] = quartiles;
    const f = tukeyFences(q1, q3);
    fences[item.name] = { q1, q3, ...f };
    let keptOut = 0;
    let keptExt = 0;
    // The fences as printed, once per item; a finding's text is built only when it is kept.
    const bounds = {
      outlier: { lower: Number(fenceText(f.lower)), upper: Number(fenceText(f.upper)) },
      extreme: { lower: Number(fenceText(f.lowerExtreme)), upper: Number(fenceText(f.upperExtreme)) },
    };
    for (const r of outsideRows(col, f.lower, f.upper)) {
      const v = col[r]!;
      const isExtreme = v < f.lowerExtreme || v > f.upperExtreme;
      const rule: FindingRule = isExtreme ? 'extreme' : 'outlier';
      const keep = isExtreme ? keptExt++ < cap : keptOut++ < cap;
      if (!keep) {
        note(rule, item.index, null);
        continue;
      }
      const value = String(v);
      const message = rules[rule].message({ item: item.name, value, ...bounds[rule] });
      note(rule, item.index, { row: r + 1, id: idOfRow(p.ids, r + 1), item: item.name, value, rule, severity: 'info', message });
    }
  }

  for (const d of designFindings(p, codebook, cap, (row) => idOfRow(p.ids, row))) note(d.rule, d.item, d.finding);

  const all = sortAndCapFindings([...p.findings, ...extra], codebook, cap);
  for (const f of all) {
    if (f.row <= 0 || p.groups.length === 0) continue;
    const g: Record<string, string> = {};
    for (const gp of p.groups) g[gp.item] = gp.keys[gp.rowKeys[f.row - 1]!] ?? '';
    f.groups = g;
  }

  const tallyOf = (t: Float64Array, i: number): GroupItemTally => {
    const missing: GroupItemTally['missing'] = {};
    for (let k = 0; k < KINDS.length; k++) {
      const n = t[i * SLOTS + 2 + k]!;
      if (n > 0) missing[KINDS[k]!] = n;
    }
    return { valid: t[i * SLOTS]!, invalid: t[i * SLOTS + 1]!, missing };
  };
  const absent = new Set(header.missing);
  const items: Record<string, ItemTally> = {};
  for (const item of codebook.items) {
    const i = item.index;
    const fc: ItemTally['findings'] = {};
    for (let r = 0; r < NR; r++) {
      const n = findingCounts[i * NR + r]!;
      if (n > 0) fc[RULE_ORDER[r]!] = n;
    }
    const tally: ItemTally = { ...tallyOf(p.tallies, i), findings: fc };
    if (absent.has(item.name)) tally.absent = true;
    if (p.trimmed[i]! > 0) tally.trimmed = p.trimmed[i]!;
    if (item.askedWhen && !absent.has(item.name)) tally.routing = { asked: p.routing[i * 3]!, skipped: p.routing[i * 3 + 1]!, undetermined: p.routing[i * 3 + 2]! };
    items[item.name] = tally;
  }
  const groups: CheckSummary['groups'] = {};
  for (const gp of p.groups) {
    const byKey: Record<string, Record<string, GroupItemTally>> = {};
    gp.keys.forEach((key, k) => {
      const perItem: Record<string, GroupItemTally> = {};
      for (const item of codebook.items) if (!absent.has(item.name)) perItem[item.name] = tallyOf(gp.tallies[k]!, item.index);
      byKey[key] = perItem;
    });
    groups[gp.item] = byKey;
  }
  const rulesOut: CheckSummary['rules'] = {};
  codebook.rules.forEach((r, k) => {
    rulesOut[r.id] = { passed: p.rules[k * 4]!, failed: p.rules[k * 4 + 1]!, undetermined: p.rules[k * 4 + 2]!, skipped: p.rules[k * 4 + 3]! };
  });
  const byRule: CheckSummary['findings']['byRule'] = {};
  let total = 0;
  for (let r = 0; r < NR; r++) {
    if (ruleTotals[r]! > 0) byRule[RULE_ORDER[r]!] = ruleTotals[r]!;
    total += ruleTotals[r]!;
  }
  const bySeverity: CheckSummary['findings']['bySeverity'] = {};
  SEVERITIES.forEach((s, k) => {
    bySeverity[s] = severityTotals[k]!;
  });
  let lastNonZero = 0;
  p.recordMissing.forEach((n, k) => {
    if (n > 0) lastNonZero = k;
  });

  const summary: CheckSummary = {
    codebook: { codebook: codebook.id, version: codebook.version },
    ...(p.file !== undefined ? { file: p.file } : {}),
    rows: p.rows,
    header: {
      missing: [...header.missing],
      unexpected: header.unexpected.map((u) => u.column),
      duplicate: header.duplicate.map((d) => d.column),
      outOfOrder: header.outOfOrder !== undefined,
    },
    findings: { total, byRule, bySeverity, logged: all.length },
    items,
    groups,
    rules: rulesOut,
    recordMissing: Array.from(p.recordMissing.subarray(0, lastNonZero + 1)),
    accepted: severityTotals[0] === 0,
    quantileType: options.quantileType,
    fences,
  };

  const columns: Record<string, ItemColumn> = {};
  codebook.items.forEach((item, i) => {
    const c = p.columns[i];
    if (c instanceof Uint16Array) columns[item.name] = { kind: 'coded', item: item.name, codes: c };
    else if (c instanceof Float64Array) columns[item.name] = { kind: 'numeric', item: item.name, values: c };
  });
  const store: ColumnStore = { rows: p.rows, columns };
  if (p.groups.length > 0) store.groupKeys = Object.fromEntries(p.groups.map((g) => [g.item, { keys: g.keys, rowKeys: g.rowKeys }]));
  return { summary, findings: all, store };
}
