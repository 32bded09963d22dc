/**
 * The checking pass as a mergeable partial state. `createPass` compiles the codebook against a
 * header; `push` classifies batches of rows (the hot path); `finish` hands back a plain,
 * structured-cloneable {@link PartialResult}. Parts of one delivery (for example byte ranges
 * read by worker threads) are combined by `mergePartials` in row order, and `finalize` turns a
 * partial into the CheckResult: quartiles, fences and outliers from the retained values,
 * header and item-level findings, findings sorted and capped per rule.
 */
import type { CompiledCodebook, CompiledExpression } from '@codeweir/codebook';
import type { RowBatch } from '@codeweir/read';
import { compileClassifiers, INVALID, KINDS, MISSING, VALID, VALID_WARN, type ItemClassifier } from './classify.ts';
import { mapHeader, type HeaderMap } from './header.ts';
import { normalizeCheckOptions, type CheckOptions, type CheckOptionsInput } from './options.ts';
import { rules, RULE_NUMBER, RULE_ORDER } from './rules/index.ts';
import { Chunked } from './grow.ts';
import { NumberFirsts, TextFirsts, type Firsts, type UniqueEntries } from './unique.ts';
import type { Finding, FindingSeverity } from './types.ts';

/** Tally slots per item: valid, invalid, then one per missing kind (blank first). */
export const SLOTS = 2 + KINDS.length;
/** Severities by number, for the severity counters. */
export const SEVERITIES: readonly FindingSeverity[] = ['error', 'warning', 'info'];
const NR = RULE_ORDER.length;
const R = RULE_NUMBER;
const ST_VALID = 0;
const ST_MISSING = 1;
const ST_INVALID = 2;
const ST_ABSENT = 3;
/** Cell outcome past the end of a ragged row: invalid, explained by the row's ragged-row finding. */
const CELL_ABSENT = 4;
/** The tally number of the `not-applicable` kind (a valid skip). */
const NOT_APPLICABLE = KINDS.indexOf('not-applicable');
/** Group key of a row whose group cell is missing (or whose group column is absent). */
export const GROUP_MISSING = '(missing)';
/** Group key of a row whose group cell is invalid. */
export const GROUP_INVALID = '(invalid)';
/** Longest value text kept in a finding; longer values are cut (the message says why). */
const MAX_VALUE_CHARS = 1000;

/** Per-row group keys and per-key tallies of one group item. */
export interface GroupPartial {
  item: string;
  keys: string[];
  /** One Float64Array(items x SLOTS) per key, same order as `keys`. */
  tallies: Float64Array[];
  /** Key index of each row. */
  rowKeys: Uint32Array;
}

/** Id text per row, for findings made after the pass (outliers, duplicates across parts). */
export interface IdColumn {
  /** Numeric id items: the parsed id, NaN where it was not valid. */
  numbers?: Float64Array;
  /** Text id items: the trimmed cell. */
  texts?: string[];
  /** Numeric id items: trimmed cell text of rows whose id was not valid, by 1-based row. */
  odd: Map<number, string>;
}

/**
 * The state of a pass over some rows, plain data only. Row numbers in `findings`, `unique`
 * and `ids.odd` are 1-based within the part; {@link mergePartials} shifts them. `codebook` is
 * the one field that is not structured-cloneable: a worker sends {@link detachPartial}'s form
 * and the receiver puts the codebook back with {@link attachPartial}.
 */
export interface PartialResult {
  codebook: CompiledCodebook;
  options: CheckOptions;
  header: HeaderMap;
  file?: string;
  rows: number;
  /** items x SLOTS. */
  tallies: Float64Array;
  /** items x rules: row-level findings by item and rule. */
  findingCounts: Float64Array;
  /** Row-level findings by rule. */
  ruleTotals: Float64Array;
  /** Row-level findings by severity number ({@link SEVERITIES}). */
  severityTotals: Float64Array;
  /** items x 3: asked, skipped, undetermined. */
  routing: Float64Array;
  /** codebook rules x 4: passed, failed, undetermined, skipped. */
  rules: Float64Array;
  trimmed: Float64Array;
  unbinned: Float64Array;
  /** recordMissing[k]: rows with exactly k present items missing. */
  recordMissing: Float64Array;
  groups: GroupPartial[];
  /** By item index: retained values (coded: 1 + code index; numeric: value or NaN), or null. */
  columns: Array<Float64Array | Uint16Array | null>;
  ids: IdColumn | null;
  /** By item index: first occurrences of each value of a unique item, or null. */
  unique: Array<UniqueEntries | null>;
  /** Row-level findings, in row order, at most maxFindingsPerRule per rule. */
  findings: Finding[];
}

/** A pass in progress. */
export interface Pass {
  push(batch: RowBatch): void;
  /**
   * The partial result of the rows pushed since the pass was made or last finished. The pass
   * then starts afresh (rows numbered from 1 again) and takes the batches of another range of
   * the same file: one pass per thread, whose functions the engine optimizes once, not again
   * for every range.
   */
  finish(): PartialResult;
}

interface Routed {
  item: number;
  expr: CompiledExpression;
  vars: number[];
}

interface RuleSlot {
  index: number;
  id: string;
  test: CompiledExpression;
  when?: CompiledExpression;
  severity: number;
  message: string;
  testVars: number[];
  whenVars: number[];
}

function varIndices(codebook: CompiledCodebook, e: CompiledExpression): number[] {
  if (e.variableIndices && e.variableIndices.length === e.variables.length) return [...e.variableIndices];
  return e.variables.map((v) => codebook.byName.get(v)?.index ?? -1);
}

function cutValue(v: string): string {
  return v.length > MAX_VALUE_CHARS ? `${v.slice(0, MAX_VALUE_CHARS)}...` : v;
}

/**
 * Starts a pass of `codebook` over rows laid out as `header`.
 *
 * Convention: every cell is classified once (see compileClassifiers); routing (`askedWhen`)
 * and cross-item rules are evaluated only on rows where every variable they read is valid
 * (otherwise undetermined and counted), and read the cell-level classification, so a routing
 * finding on one item does not change how another item's routing is decided. A valid answer
 * where routing says skip is `answered-when-skipped` and the cell counts as invalid; blank or a
 * not-applicable code there is correct; another declared missing kind (refused, dont-know...)
 * there stays missing of that kind and is a `missing-code-when-skipped` warning, since the
 * codebook says a skipped item is blank or a valid skip. A blank where routing says ask is `blank-when-asked` (warning; still missing,
 * blank). Duplicate values of a unique item are findings but stay valid values. Ragged rows:
 * the fields present are checked; cells past the row's end count as invalid (the ragged-row
 * finding explains them); extra fields are ignored. A row's group key (missingness by group,
 * the group codes of its findings) comes from the group cell's own classification.
 * Cost: O(items + codes) to set up; push is O(rows x items) with no allocation per cell: a batch
 * is classified and tallied one item (column) at a time into per-batch scratch arrays, then walked
 * row by row for findings (in row order, so the per-rule cap keeps the same findings), unique
 * values, routing and rules.
 * Memory: the retained columns (8 bytes a row per numeric item and the numeric id, 2 per coded
 * item, 4 per group item) in chunks; `expectedRows` (optional, e.g. estimated from the file
 * size) sizes the first chunk, so a good estimate means one allocation per column and no copy.
 * Throws CodeweirError CW_USAGE for bad options.
 */
export function createPass(codebook: CompiledCodebook, header: readonly string[], rawOptions: CheckOptionsInput | CheckOptions = {}, expectedRows?: number): Pass {
  const options = normalizeCheckOptions(rawOptions as CheckOptionsInput);
  const hmap = mapHeader(codebook, header);
  const { out, items: cls } = compileClassifiers(codebook, options);
  const nItems = codebook.items.length;
  const headerLen = header.length;
  const cap = options.maxFindingsPerRule;

  const present: number[] = [];
  // Group items first: their cells give the row's group keys, which the tallies of every other
  // cell need, so each cell can be tallied as soon as it is classified.
  const isGroup = new Uint8Array(nItems);
  for (const g of codebook.groupItems) isGroup[g.index] = 1;
  for (let i = 0; i < nItems; i++) if (hmap.positions[i]! >= 0 && isGroup[i]) present.push(i);
  const nGroupPresent = present.length;
  for (let i = 0; i < nItems; i++) if (hmap.positions[i]! >= 0 && !isGroup[i]) present.push(i);
  const presentIdx = Int32Array.from(present);
  const presentPos = Int32Array.from(present, (i) => hmap.positions[i]!);
  const nPresent = presentIdx.length;
  const absent = new Uint8Array(nItems);
  for (let i = 0; i < nItems; i++) absent[i] = hmap.positions[i]! < 0 ? 1 : 0;

  // Expressions.
  const routed: Routed[] = [];
  for (const item of codebook.items) {
    if (item.askedWhen && !absent[item.index]) routed.push({ item: item.index, expr: item.askedWhen, vars: varIndices(codebook, item.askedWhen) });
  }
  const ruleSlots: RuleSlot[] = codebook.rules.map((r, index) => ({
    index,
    id: r.id,
    test: r.test,
    when: r.when,
    severity: r.severity === 'warning' ? 1 : 0,
    message: r.message,
    testVars: varIndices(codebook, r.test),
    whenVars: r.when ? varIndices(codebook, r.when) : [],
  }));
  const needVal = new Uint8Array(nItems);
  const vars: Record<string, unknown> = {};
  for (const x of [...routed.flatMap((r) => r.vars), ...ruleSlots.flatMap((r) => [...r.testVars, ...r.whenVars])]) {
    if (x >= 0) {
      needVal[x] = 1;
      vars[codebook.items[x]!.name] = null;
    }
  }
  const varNames = codebook.items.map((it) => it.name);

  // Per-row scratch.
  const state = new Uint8Array(nItems);
  // An absent column is never valid, so expressions reading it are undetermined on every row.
  for (let i = 0; i < nItems; i++) if (absent[i]) state[i] = ST_ABSENT;
  const kind = new Uint8Array(nItems);
  const codeIdx = new Int32Array(nItems);
  const num = new Float64Array(nItems);
  const text: string[] = new Array(nItems).fill('');
  const val: unknown[] = new Array(nItems).fill(null);
  const skipInvalid: number[] = [];

  // Accumulators of the rows pushed since the pass began or last finished (see begin()).
  let tallies = new Float64Array(0);
  let findingCounts = tallies;
  let ruleTotals = tallies;
  let severityTotals = tallies;
  let kept = new Int32Array(NR);
  let routing = tallies;
  let ruleCounts = tallies;
  let trimmed = tallies;
  let unbinned = tallies;
  let recordMissing = tallies;
  let findings: Finding[] = [];
  const pending: Finding[] = [];
  // The design's strata and cluster are kept per row even when coded items are not (design findings need them).
  const designParts = new Set([codebook.design?.strata, codebook.design?.cluster]);
  const retainedShape = cls.map((c) => (c.retained && !absent[c.item.index] && (c.shape !== 'coded' || options.retainCoded || designParts.has(c.item.name)) ? c.shape : null));
  let columns: Array<Chunked<Float64Array> | Chunked<Uint16Array> | null> = [];
  const coded = Uint8Array.from(cls, (c) => (c.shape === 'coded' ? 1 : 0));
  /** Items whose valid value is text (free text, or text codes): the trimmed text is kept per row. */
  const keepText = Uint8Array.from(cls, (c) => (c.shape === 'text' || (c.shape === 'coded' && c.item.type === 'text') ? 1 : 0));

  const idItem = codebook.idItem && !absent[codebook.idItem.index] ? codebook.idItem : undefined;
  const idIndex = idItem ? idItem.index : -1;
  const idNumeric = idItem !== undefined && cls[idIndex]!.shape !== 'text' && !(cls[idIndex]!.shape === 'coded' && idItem.type === 'text');
  let idNumbers: Chunked<Float64Array> | null = null;
  let idTexts: string[] | null = null;
  let idOdd = new Map<number, string>();

  const uniqueList = codebook.items.filter((it) => it.unique && !absent[it.index]).map((it) => it.index);
  const newUniques = (): Array<Firsts | null> =>
    codebook.items.map((it) => {
      if (!it.unique || absent[it.index]) return null;
      const numeric = cls[it.index]!.shape === 'numeric' || (cls[it.index]!.shape === 'coded' && it.type !== 'text');
      return numeric ? new NumberFirsts(it.index !== idIndex) : new TextFirsts(it.index !== idIndex);
    });
  let uniques: Array<Firsts | null> = [];

  const groupItems = codebook.groupItems;
  const KEY_STRIDE = nItems * SLOTS;
  const newGroupStates = () =>
    groupItems.map((g) => ({
      index: g.index,
      keys: [] as string[],
      /** The tallies of every key, key after key (items x SLOTS each): one flat array, so a cell's count is one increment. */
      flat: new Float64Array(4 * KEY_STRIDE),
      keyOf: new Map<string, number>(),
      rowKeys: new Chunked(Uint32Array, expectedRows),
    }));
  let groupStates: ReturnType<typeof newGroupStates> = [];
  const groupKey = (gs: (typeof groupStates)[number], key: string): number => {
    let k = gs.keyOf.get(key);
    if (k === undefined) {
      k = gs.keys.length;
      gs.keys.push(key);
      if ((k + 1) * KEY_STRIDE > gs.flat.length) {
        const grown = new Float64Array(gs.flat.length * 2);
        grown.set(gs.flat);
        gs.flat = grown;
      }
      gs.keyOf.set(key, k);
    }
    return k;
  };
  const codeKeyCache = groupItems.map((g) => new Int32Array(g.codes.length));

  let rows = 0;

  /** Starts the accumulators afresh: at creation, and after each finish() (the compiled closures stay). */
  const begin = (): void => {
    tallies = new Float64Array(nItems * SLOTS);
    findingCounts = new Float64Array(nItems * NR);
    ruleTotals = new Float64Array(NR);
    severityTotals = new Float64Array(SEVERITIES.length);
    kept = new Int32Array(NR);
    routing = new Float64Array(nItems * 3);
    ruleCounts = new Float64Array(ruleSlots.length * 4);
    trimmed = new Float64Array(nItems);
    unbinned = new Float64Array(nItems);
    recordMissing = new Float64Array(nItems + 1);
    findings = [];
    columns = retainedShape.map((shape) => (shape === null ? null : shape === 'coded' ? new Chunked(Uint16Array, expectedRows) : new Chunked(Float64Array, expectedRows)));
    idNumbers = idItem && idNumeric ? new Chunked(Float64Array, expectedRows) : null;
    idTexts = idItem && !idNumeric ? [] : null;
    idOdd = new Map<number, string>();
    uniques = newUniques();
    groupStates = newGroupStates();
    for (let g = 0; g < groupStates.length; g++) groupFlat[g] = groupStates[g]!.flat;
    for (const cache of codeKeyCache) cache.fill(-1);
    rows = 0;
  };

  /** Canonical id text of row r of the batch: a valid numeric id as its number, else the trimmed cell. */
  const rowId = (r: number): string => {
    if (idIndex < 0) return '';
    if (state[idIndex] === ST_VALID) return idNumeric ? String(num[idIndex]) : text[idIndex]!;
    return rawCell(idIndex, r).trim();
  };

  const count = (rule: number, item: number, sev: number): boolean => {
    if (item >= 0 && item < nItems) findingCounts[item * NR + rule]++;
    ruleTotals[rule]++;
    severityTotals[sev]++;
    return kept[rule]! < cap ? (kept[rule]++, true) : false;
  };

  /** Puts the row's values of `list` into `vars`; false (undetermined) when one is not valid or absent. */
  const bind = (list: readonly number[]): boolean => {
    for (let k = 0; k < list.length; k++) {
      const v = list[k]!;
      if (v < 0 || state[v] !== ST_VALID) return false;
      vars[varNames[v]!] = val[v];
    }
    return true;
  };

  // Per-batch scratch, one set per present item (index k in present order): the outcome of
  // each row's cell, then its kind (missing) or rule (findings), number, code index and text.
  let scratchRows = 0;
  const cellState: Uint8Array[] = [];
  const cellAux: Uint8Array[] = [];
  const cellNum: Float64Array[] = [];
  const cellCode: Int32Array[] = [];
  const cellText: Array<string[] | null> = [];
  /** Present items missing in each row of the batch, and whether the row has a cell finding. */
  let rowMissing = new Uint16Array(0);
  let rowFlag = new Uint8Array(0);
  /** The tally slot of each row's cell of the item being tallied, and each row's key offset in each group's flat tallies. */
  let slotOf = new Int32Array(0);
  const keyBase: Int32Array[] = [];
  const presentAt = new Int32Array(nItems).fill(-1);
  for (let k = 0; k < nPresent; k++) presentAt[presentIdx[k]!] = k;
  // Items whose per-row state the row loop reads: routing and rule variables, routed, unique and id items.
  const rowNeeded = [
    ...new Set([...routed.flatMap((r) => [r.item, ...r.vars]), ...ruleSlots.flatMap((r) => [...r.testVars, ...r.whenVars]), ...uniqueList, idIndex]),
  ].filter((i) => i >= 0 && i < nItems && presentAt[i]! >= 0);

  const ensureCapacity = (n: number): void => {
    if (n <= scratchRows) return;
    scratchRows = Math.max(n, scratchRows * 2);
    for (let k = 0; k < nPresent; k++) {
      cellState[k] = new Uint8Array(scratchRows);
      cellAux[k] = new Uint8Array(scratchRows);
      cellNum[k] = new Float64Array(scratchRows);
      cellCode[k] = new Int32Array(scratchRows);
      cellText[k] = keepText[presentIdx[k]!] ? new Array<string>(scratchRows).fill('') : null;
    }
    rowMissing = new Uint16Array(scratchRows);
    rowFlag = new Uint8Array(scratchRows);
    slotOf = new Int32Array(scratchRows);
    for (let g = 0; g < nGroups; g++) keyBase[g] = new Int32Array(scratchRows);
  };

  let fields: string[] = [];
  let offsets: Uint32Array = new Uint32Array(1);
  let f64Cols: Array<Float64Array | null> = [];
  let u16Cols: Array<Uint16Array | null> = [];
  let rowKeyData: Uint32Array[] = [];
  const nGroups = groupItems.length;
  const groupFlat: Float64Array[] = [];

  /**
   * Classifies the cells of the k-th present item in rows 0..n-1 of the batch into the scratch.
   * One item at a time, so the loop calls one classifier and its data stays in cache.
   */
  const scanColumn = (k: number, n: number): void => {
    const i = presentIdx[k]!;
    const pos = presentPos[k]!;
    const classify = cls[i]!.classify;
    const st = cellState[k]!;
    const aux = cellAux[k]!;
    const nums = cellNum[k]!;
    const codes = cellCode[k]!;
    const texts = cellText[k]!;
    let spaced = 0;
    let unb = 0;
    for (let r = 0; r < n; r++) {
      const start = offsets[r]!;
      if (pos >= offsets[r + 1]! - start) {
        st[r] = CELL_ABSENT;
        continue;
      }
      const s = classify(fields[start + pos]!);
      st[r] = s;
      if (out.spaced) spaced++;
      if (s <= VALID_WARN) {
        nums[r] = out.num;
        codes[r] = out.code;
        if (texts !== null) texts[r] = out.text;
        if (s !== VALID) aux[r] = out.rule;
      } else if (s === MISSING) aux[r] = out.kind;
      else {
        aux[r] = out.rule;
        if (out.unbinned) unb++;
      }
    }
    trimmed[i] += spaced;
    unbinned[i] += unb;
  };

  /** Tallies the scanned cells of the k-th present item (overall and by group) and retains their values. */
  const tallyColumn = (k: number, n: number): void => {
    const i = presentIdx[k]!;
    const st = cellState[k]!;
    const aux = cellAux[k]!;
    const base = i * SLOTS;
    const u16 = u16Cols[i]!;
    const f64 = f64Cols[i]!;
    const codes = cellCode[k]!;
    const nums = cellNum[k]!;
    const slots = slotOf;
    // Valid cells are counted in a local: one increment of the same tally per row would make
    // every row wait for the previous row's store.
    let nValid = 0;
    for (let r = 0; r < n; r++) {
      const s = st[r]!;
      const valid = s <= VALID_WARN;
      let slot = base;
      if (valid) nValid++;
      else {
        slot = base + (s === MISSING ? 2 + aux[r]! : 1);
        tallies[slot]++;
      }
      slots[r] = slot;
      if (u16 !== null) u16[r] = valid ? codes[r]! + 1 : 0;
      else if (f64 !== null) f64[r] = valid ? nums[r]! : Number.NaN;
      if (s === MISSING) rowMissing[r]++;
      else if (s === VALID_WARN || s === INVALID) rowFlag[r] = 1;
    }
    tallies[base] += nValid;
    // By group, one group item at a time: a tight loop over the row's key offset and slot.
    for (let g = 0; g < nGroups; g++) {
      const flat = groupFlat[g]!;
      const at = keyBase[g]!;
      for (let r = 0; r < n; r++) flat[at[r]! + slots[r]!]++;
    }
  };

  /** The row's key in each group item, from the group cells' classification. */
  const groupKeysOf = (r: number): void => {
    for (let g = 0; g < nGroups; g++) {
      const gs = groupStates[g]!;
      const gi = gs.index;
      const k = presentAt[gi]!;
      const s = k < 0 ? MISSING : cellState[k]![r]!;
      let key: number;
      if (s === MISSING) key = groupKey(gs, GROUP_MISSING);
      else if (s > VALID_WARN) key = groupKey(gs, GROUP_INVALID);
      else if (coded[gi]) {
        const cache = codeKeyCache[g]!;
        const ci = cellCode[k]![r]!;
        key = cache[ci]!;
        if (key < 0) key = cache[ci] = groupKey(gs, codebook.items[gi]!.codes[ci]!.text);
      } else key = groupKey(gs, idNumericLike(cls[gi]!) ? String(cellNum[k]![r]!) : cellText[k]![r]!);
      rowKeyData[g]![r] = key;
      keyBase[g]![r] = key * KEY_STRIDE;
    }
  };

  /** Raw text of item i's cell in row r of the batch ('' past the end of a ragged row). */
  const rawCell = (i: number, r: number): string => {
    const start = offsets[r]!;
    const pos = hmap.positions[i]!;
    return pos >= 0 && pos < offsets[r + 1]! - start ? fields[start + pos]! : '';
  };

  /** Loads the per-row scratch (state, kind, number, code, text, CEL value) of item i for row r; the raw cell stays in the batch (rawCell). */
  const loadRowState = (i: number, r: number): void => {
    const k = presentAt[i]!;
    const s = cellState[k]![r]!;
    if (s <= VALID_WARN) {
      state[i] = ST_VALID;
      num[i] = cellNum[k]![r]!;
      codeIdx[i] = cellCode[k]![r]!;
      const texts = cellText[k];
      if (texts !== null) text[i] = texts![r]!;
      if (needVal[i]) {
        out.num = num[i]!;
        out.code = codeIdx[i]!;
        out.text = text[i]!;
        val[i] = cls[i]!.celValue(out);
      }
    } else if (s === MISSING) {
      state[i] = ST_MISSING;
      kind[i] = cellAux[k]![r]!;
    } else state[i] = ST_INVALID;
  };

  /** The findings of the cells of row r, in present order (the order a row is read in). */
  const cellFindings = (r: number, row: number): void => {
    for (let k = 0; k < nPresent; k++) {
      const s = cellState[k]![r]!;
      if (s !== VALID_WARN && s !== INVALID) continue;
      const i = presentIdx[k]!;
      const c = cls[i]!;
      const rule = cellAux[k]![r]!;
      const cell = rawCell(i, r);
      if (s === VALID_WARN) {
        if (count(rule, i, 1)) pending.push({ row, id: '', item: c.item.name, value: cutValue(cell), rule: RULE_ORDER[rule]!, severity: 'warning', message: c.message(rule, cell.trim(), '') });
      } else if (count(rule, i, 0)) {
        // The suggestion of an unbinned value is not kept per cell: classifying again gives it.
        const suggestion = rule === R['unbinned-value'] ? (c.classify(cell), out.suggestion) : '';
        const f: Finding = { row, id: '', item: c.item.name, value: cutValue(cell), rule: RULE_ORDER[rule]!, severity: 'error', message: c.message(rule, cell.trim(), suggestion) };
        if (rule === R['unbinned-value']) f.suggestion = suggestion;
        pending.push(f);
      }
    }
  };

  /** A routing finding made a valid cell of row r invalid after it was tallied: move it, drop its value. */
  const untallyValid = (i: number, r: number): void => {
    state[i] = ST_INVALID;
    tallies[i * SLOTS]--;
    tallies[i * SLOTS + 1]++;
    for (let g = 0; g < nGroups; g++) {
      const t = groupStates[g]!.flat;
      const at = rowKeyData[g]![r]! * KEY_STRIDE + i * SLOTS;
      t[at]--;
      t[at + 1]++;
    }
    const u16 = u16Cols[i];
    if (u16 !== null) u16[r] = 0;
    const f64 = f64Cols[i];
    if (f64 !== null) f64[r] = Number.NaN;
  };

  /** Unique values of row r (first occurrence wins; later ones are findings but stay valid). */
  const uniqueRow = (r: number, row: number): void => {
    for (let u = 0; u < uniqueList.length; u++) {
      const i = uniqueList[u]!;
      if (state[i] !== ST_VALID) continue;
      const table = uniques[i]!;
      const isNum = table instanceof NumberFirsts;
      const fresh = isNum ? table.add(num[i]!, row, i === idIndex ? '' : rowId(r)) : table.add(text[i]!, row, i === idIndex ? '' : rowId(r));
      if (!fresh && count(R['duplicate-id'], i, 0)) {
        const v = isNum ? String(num[i]! + 0) : text[i]!;
        pending.push({ row, id: '', item: varNames[i]!, value: v, rule: 'duplicate-id', severity: 'error', message: rules['duplicate-id'].message({ item: varNames[i]!, value: v }) });
      }
    }
  };

  /** A routing finding of item i in row r (the routing counts are made by the caller). */
  const routingFinding = (rule: number, i: number, r: number, row: number, rt: Routed): void => {
    const name = varNames[i]!;
    const condition = rt.expr.source;
    if (rule === R['blank-when-asked']) {
      pending.push({ row, id: '', item: name, value: '', rule: 'blank-when-asked', severity: 'warning', message: rules['blank-when-asked'].message({ item: name, condition }) });
      return;
    }
    const cell = rawCell(i, r);
    if (rule === R['missing-code-when-skipped']) {
      pending.push({ row, id: '', item: name, value: cutValue(cell), rule: 'missing-code-when-skipped', severity: 'warning', message: rules['missing-code-when-skipped'].message({ item: name, value: cell.trim(), condition, kind: KINDS[kind[i]!]! }) });
    } else {
      pending.push({ row, id: '', item: name, value: cutValue(cell), rule: 'answered-when-skipped', severity: 'error', message: rules['answered-when-skipped'].message({ item: name, value: cell.trim(), condition }) });
    }
  };

  /** Routing of row r, on the cell-level classification. */
  const routingRow = (r: number, row: number): void => {
    for (let q = 0; q < routed.length; q++) {
      const rt = routed[q]!;
      const i = rt.item;
      if (!bind(rt.vars)) {
        routing[i * 3 + 2]++;
        continue;
      }
      if (rt.expr.evaluate(vars)) {
        routing[i * 3]++;
        if (state[i] === ST_MISSING && kind[i] === 0 && count(R['blank-when-asked'], i, 1)) routingFinding(R['blank-when-asked'], i, r, row, rt);
      } else {
        routing[i * 3 + 1]++;
        if (state[i] === ST_MISSING && kind[i] !== 0 && kind[i] !== NOT_APPLICABLE) {
          if (count(R['missing-code-when-skipped'], i, 1)) routingFinding(R['missing-code-when-skipped'], i, r, row, rt);
        } else if (state[i] === ST_VALID) {
          skipInvalid.push(i);
          if (count(R['answered-when-skipped'], i, 0)) routingFinding(R['answered-when-skipped'], i, r, row, rt);
        }
      }
    }
  };

  /** Cross-item rules of row r. */
  const rulesRow = (row: number): void => {
    for (let q = 0; q < ruleSlots.length; q++) {
      const rs = ruleSlots[q]!;
      const base = rs.index * 4;
      if (rs.when) {
        if (!bind(rs.whenVars)) {
          ruleCounts[base + 2]++;
          continue;
        }
        if (!rs.when.evaluate(vars)) {
          ruleCounts[base + 3]++;
          continue;
        }
      }
      if (!bind(rs.testVars)) {
        ruleCounts[base + 2]++;
        continue;
      }
      if (rs.test.evaluate(vars)) ruleCounts[base]++;
      else {
        ruleCounts[base + 1]++;
        if (count(R['rule-failed'], -1, rs.severity)) {
          pending.push({ row, id: '', item: rs.id, value: '', rule: 'rule-failed', severity: SEVERITIES[rs.severity]!, message: rules['rule-failed'].message({ rule: rs.id, message: rs.message }) });
        }
      }
    }
  };

  /** The ragged-row finding of row r. */
  const raggedFinding = (nf: number, row: number): void => {
    pending.push({ row, id: '', item: '', value: `${nf} fields`, rule: 'ragged-row', severity: 'error', message: rules['ragged-row'].message({ fields: nf, expected: headerLen }) });
  };

  /** The row's findings get its id, in the order they were made. */
  const keepPending = (r: number): void => {
    const id = rowId(r);
    for (const f of pending) {
      f.id = id;
      findings.push(f);
    }
  };

  /**
   * Then row by row, for what reads several cells of a row, and for the row's findings. Each
   * part is a function of its own, not one body with push: each stays small enough for the
   * optimizing compiler to finish soon, and a change that invalidates one does not recompile
   * the others (recompiling one large body was most of the compiler's work on two threads).
   */
  const checkRows = (n: number, idNumData: Float64Array | null): void => {
    for (let r = 0; r < n; r++) {
      const nf = offsets[r + 1]! - offsets[r]!;
      const row = rows + 1;
      pending.length = 0;
      if (nf !== headerLen && count(R['ragged-row'], -1, 0)) raggedFinding(nf, row);
      if (rowFlag[r]) cellFindings(r, row);
      for (let q = 0; q < rowNeeded.length; q++) loadRowState(rowNeeded[q]!, r);
      if (uniqueList.length > 0) uniqueRow(r, row);
      skipInvalid.length = 0;
      if (routed.length > 0) routingRow(r, row);
      if (ruleSlots.length > 0) rulesRow(row);
      for (let q = 0; q < skipInvalid.length; q++) untallyValid(skipInvalid[q]!, r);

      // Id column, for findings made after the pass.
      if (idIndex >= 0) {
        if (idNumData) {
          if (state[idIndex] === ST_VALID) idNumData[r] = num[idIndex]!;
          else {
            idNumData[r] = Number.NaN;
            idOdd.set(row, rawCell(idIndex, r).trim());
          }
        } else idTexts!.push(rowId(r));
      }

      recordMissing[rowMissing[r]!]++;
      if (pending.length > 0) keepPending(r);
      rows++;
    }
  };

  const push = (batch: RowBatch): void => {
    const n = batch.count;
    fields = batch.fields;
    offsets = batch.offsets;
    ensureCapacity(n);
    rowMissing.fill(0, 0, n);
    rowFlag.fill(0, 0, n);
    // Split by element type so each store below stays monomorphic.
    f64Cols = [];
    u16Cols = [];
    for (let i = 0; i < nItems; i++) {
      const c = columns[i];
      const data = c ? c.reserve(n) : null;
      f64Cols.push(data instanceof Float64Array ? data : null);
      u16Cols.push(data instanceof Uint16Array ? data : null);
    }
    const idNumData = idNumbers ? idNumbers.reserve(n) : null;
    rowKeyData = groupStates.map((gs) => gs.rowKeys.reserve(n));
    // Column by column: group items first (every other tally needs the row's group keys).
    // Retained values are written into this batch's windows (see Chunked.reserve), from 0.
    for (let k = 0; k < nGroupPresent; k++) scanColumn(k, n);
    for (let r = 0; r < n; r++) groupKeysOf(r);
    // Read after the keys are known: adding a key may have grown the flat tallies.
    for (let g = 0; g < nGroups; g++) groupFlat[g] = groupStates[g]!.flat;
    for (let k = 0; k < nGroupPresent; k++) tallyColumn(k, n);
    for (let k = nGroupPresent; k < nPresent; k++) {
      scanColumn(k, n);
      tallyColumn(k, n);
    }

    checkRows(n, idNumData);
    for (const c of columns) if (c) c.commit(n);
    if (idNumbers) idNumbers.commit(n);
    for (const gs of groupStates) gs.rowKeys.commit(n);
  };

  const partial = (): PartialResult => ({
    codebook,
    options,
    header: hmap,
    rows,
    tallies,
    findingCounts,
    ruleTotals,
    severityTotals,
    routing,
    rules: ruleCounts,
    trimmed,
    unbinned,
    recordMissing,
    groups: groupStates.map((gs) => ({ item: codebook.items[gs.index]!.name, keys: gs.keys, tallies: gs.keys.map((_, k) => gs.flat.slice(k * KEY_STRIDE, (k + 1) * KEY_STRIDE)), rowKeys: gs.rowKeys.trimmed() })),
    columns: columns.map((c) => (c ? c.trimmed() : null)),
    ids: idIndex < 0 ? null : { numbers: idNumbers?.trimmed(), texts: idTexts ?? undefined, odd: idOdd },
    unique: uniques.map((u) => (u ? u.entries() : null)),
    findings,
  });

  /** The partial result of the rows pushed so far; the pass then starts afresh, its compiled code kept. */
  const finish = (): PartialResult => {
    const result = partial();
    begin();
    return result;
  };

  begin();
  return { push, finish };
}

function idNumericLike(c: ItemClassifier): boolean {
  return c.shape === 'numeric';
}

/** The structured-cloneable form of a partial (without the compiled codebook), for postMessage. */
export type DetachedPartial = Omit<PartialResult, 'codebook'>;

/** Drops the compiled codebook (functions do not cross threads). Cost: O(1). Throws nothing. */
export function detachPartial(p: PartialResult): DetachedPartial {
  const { codebook: _cb, ...rest } = p;
  return rest;
}

/** Puts the compiled codebook back on a partial received from another thread. Cost: O(1). Throws nothing. */
export function attachPartial(p: DetachedPartial, codebook: CompiledCodebook): PartialResult {
  return { ...p, codebook };
}

