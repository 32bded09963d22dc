/**
 * A seeded synthetic delivery and its codebook for the benchmark: one id, one group, nominal,
 * ordinal, binned, integer and decimal ratio and interval items, a weight, a Likert block with
 * missing codes, one routed item, one free-text item with quoted commas, quotes and newlines,
 * and one cross-item rule. The generator counts what it injects (invalid codes, impossible
 * values, duplicate ids, skipped-but-answered cells), so the counts are known from
 * construction and any checker can be compared against them.
 */
import { closeSync, mkdirSync, openSync, writeFileSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import { seededRandom } from '@codeweir/core';
import type { PeerSqlExtras } from './duckdb-peer.ts';

export { seededRandom };

/** What the generator put into each column, counted while writing it. */
export interface ItemTruth {
  /** Cells that are neither a valid code nor a declared missing code (coded items). */
  notACode: number;
  /** Raw quantities written into the binned item. */
  unbinned: number;
  notANumber: number;
  notAnInteger: number;
  impossible: number;
  blank: number;
  missingCodes: number;
  /** Text values written that do not match the item's pattern. */
  patternMismatch: number;
  /** Valid answers written where the item's routing condition is false. */
  answeredWhenSkipped: number;
}

/** A fresh, all-zero tally. */
export function emptyTruth(): ItemTruth {
  return { notACode: 0, unbinned: 0, notANumber: 0, notAnInteger: 0, impossible: 0, blank: 0, missingCodes: 0, patternMismatch: 0, answeredWhenSkipped: 0 };
}

/** The cells of an item that any checker must call invalid: every injected fault but blanks and missing codes. */
export function invalidOf(t: ItemTruth): number {
  return t.notACode + t.unbinned + t.notANumber + t.notAnInteger + t.impossible + t.patternMismatch + t.answeredWhenSkipped;
}

/** Cross-item rule outcomes counted while writing (the codebook's rule semantics). */
export interface RuleTruth {
  passed: number;
  failed: number;
  undetermined: number;
  skipped: number;
}

/**
 * Writes lines to a file in 4 MB chunks (memory stays flat at any row count). `line` takes one
 * record without its newline; `close` flushes and returns the bytes written.
 */
export function openLineWriter(path: string): { line: (text: string) => void; close: () => number } {
  const fd = openSync(path, 'w');
  let bytes = 0;
  const chunk: string[] = [];
  let chunkLen = 0;
  const flush = (): void => {
    if (chunk.length) bytes += writeSync(fd, chunk.join('\n') + '\n');
    chunk.length = 0;
    chunkLen = 0;
  };
  return {
    line(text) {
      chunk.push(text);
      chunkLen += text.length;
      if (chunkLen > 4_000_000) flush();
    },
    close() {
      flush();
      closeSync(fd);
      return bytes;
    },
  };
}

export interface GeneratedDelivery {
  /** The delivery's shape (bench/shapes.ts); `mixed` for this file's delivery. */
  shape: string;
  csvPath: string;
  codebookPath: string;
  rows: number;
  bytes: number;
  items: string[];
  /** The item with role id (duplicates are counted on it). */
  idItem: string;
  truth: Record<string, ItemTruth>;
  duplicateIds: number;
  /** Valid answers written where routing says skip, over all routed items. */
  answeredWhenSkipped: number;
  /** Outcomes of each rule, counted from construction (absent where the generator does not count them). */
  rules?: Record<string, RuleTruth>;
  /** The routing condition and rule written as SQL over the typed values (for the SQL peer). */
  sql: PeerSqlExtras;
}

const STD_MISSING = [
  { code: -1, kind: 'dont-know', label: "Don't know" },
  { code: -2, kind: 'refused', label: 'Refused' },
  { code: -3, kind: 'not-applicable', label: 'Valid skip' },
] as const;

export const DISTRICTS = ['Amberlow', 'Corrin Flats', 'Dunmere', 'Faltow', 'Greyhaven', 'Hollin Reach'];
const SYLLABLES = ['ka', 'ren', 'tol', 'mir', 'sa', 'vel', 'dor', 'un', 'bri', 'ost'];

/** Codes from..from+n-1 labelled in order. */
export function codes(labels: readonly string[], from = 1): Array<{ code: number; label: string }> {
  return labels.map((label, i) => ({ code: from + i, label }));
}

/** Five bins of a count (0, 1-3, 4-7, 8-14, 15 or more): every count >= 0 lies in one. */
export const COUNT_BINS = [
  { code: 1, label: 'None', bin: { min: 0, max: 0 } },
  { code: 2, label: '1 to 3', bin: { min: 1, max: 3 } },
  { code: 3, label: '4 to 7', bin: { min: 4, max: 7 } },
  { code: 4, label: '8 to 14', bin: { min: 8, max: 14 } },
  { code: 5, label: '15 or more', bin: { min: 15 } },
];

export const WALL_CODES = [
  { code: 'brick', label: 'Fired brick' },
  { code: 'timber', label: 'Timber' },
  { code: 'mud', label: 'Mud and wattle' },
  { code: 'other', label: 'Other material' },
];

const LIKERT = ['Strongly disagree', 'Disagree', 'Neither', 'Agree', 'Strongly agree'];
const LIKERT_ITEMS = Array.from({ length: 10 }, (_, i) => `lk${String(i + 1).padStart(2, '0')}`);

/** The benchmark codebook (format: the codebook contract). 30 items. */
export function benchCodebook(): Record<string, unknown> {
  const items: Array<Record<string, unknown>> = [
    { name: 'resp_id', label: 'Respondent identifier', role: 'id', type: 'integer' },
    { name: 'district', label: 'District', role: 'group', type: 'integer', level: 'nominal', codes: codes(DISTRICTS) },
    {
      name: 'team',
      label: 'Field team',
      type: 'integer',
      level: 'nominal',
      codes: codes(Array.from({ length: 12 }, (_, i) => `Team ${i + 1}`)),
    },
    { name: 'sex', label: 'Sex of respondent', type: 'integer', level: 'nominal', codes: codes(['Female', 'Male']), missing: 'std' },
    {
      name: 'marital',
      label: 'Marital status',
      type: 'integer',
      level: 'nominal',
      codes: codes(['Never married', 'Married', 'Cohabiting', 'Separated', 'Widowed']),
      missing: 'std',
    },
    {
      name: 'dwelling',
      label: 'Main wall material',
      type: 'text',
      level: 'nominal',
      codes: WALL_CODES,
    },
    {
      name: 'edu',
      label: 'Highest schooling completed',
      type: 'integer',
      level: 'ordinal',
      codes: codes(['None', 'Some primary', 'Primary', 'Lower secondary', 'Upper secondary', 'Tertiary']),
      missing: 'std',
    },
    {
      name: 'health',
      label: 'Self-rated health',
      type: 'integer',
      level: 'ordinal',
      codes: codes(['Very poor', 'Poor', 'Fair', 'Good', 'Very good']),
      missing: 'std',
    },
    {
      name: 'trips',
      label: 'Trips to the district market last month',
      type: 'integer',
      level: 'ordinal',
      codes: COUNT_BINS,
      missing: 'std',
    },
    {
      name: 'hh_size',
      label: 'Household size',
      type: 'integer',
      level: 'ratio',
      unit: 'persons',
      range: { min: 1, max: 30 },
      expect: { max: 15 },
      missing: 'std',
    },
    {
      name: 'age',
      label: 'Age of respondent',
      type: 'integer',
      level: 'ratio',
      unit: 'years',
      range: { min: 15, max: 110 },
      expect: { min: 18, max: 95 },
      missing: 'std',
    },
    {
      name: 'income',
      label: 'Household income last month',
      type: 'decimal',
      level: 'ratio',
      unit: 'crowns',
      range: { min: 0, max: 1000000 },
      expect: { max: 200000 },
      missing: 'std',
    },
    {
      name: 'commute_min',
      label: 'Usual travel time to work',
      type: 'decimal',
      level: 'ratio',
      unit: 'minutes',
      range: { min: 0, max: 600 },
      expect: { max: 180 },
      missing: 'std',
    },
    {
      name: 'temp_c',
      label: 'Indoor temperature at the visit',
      type: 'decimal',
      level: 'interval',
      unit: 'degrees Celsius',
      range: { min: -40, max: 60 },
      missing: [{ code: 999, kind: 'not-reached', label: 'Not measured' }],
    },
    {
      name: 'year_built',
      label: 'Year the dwelling was built',
      type: 'integer',
      level: 'interval',
      range: { min: 1900, max: 2026 },
      missing: 'std',
    },
    { name: 'weight', label: 'Sampling weight', role: 'weight', type: 'decimal', level: 'ratio', range: { min: 0.01, max: 100 } },
    ...LIKERT_ITEMS.map((name, i) => ({
      name,
      label: `Neighbourhood statement ${i + 1}`,
      type: 'integer',
      level: 'ordinal',
      codes: codes(LIKERT),
      missing: 'std',
    })),
    { name: 'employed', label: 'Worked for pay last week', type: 'integer', level: 'nominal', codes: codes(['Yes', 'No']), missing: 'std' },
    {
      name: 'hours_work',
      label: 'Hours worked last week',
      type: 'integer',
      level: 'ratio',
      unit: 'hours',
      range: { min: 0, max: 120 },
      expect: { max: 80 },
      askedWhen: 'employed == 1',
      missing: 'std',
    },
    { name: 'village', label: 'Village name as told', type: 'text' },
    {
      name: 'interview_min',
      label: 'Interview length',
      type: 'decimal',
      level: 'ratio',
      unit: 'minutes',
      range: { min: 1, max: 600 },
      expect: { min: 5, max: 180 },
    },
  ];
  return {
    codebook: 'bench-synthetic',
    version: '1.0.0',
    title: 'Synthetic benchmark delivery (generated)',
    missingSets: { std: STD_MISSING },
    items,
    rules: [
      {
        id: 'young-worker',
        test: 'age >= 16 || employed == 2',
        severity: 'warning',
        message: 'A respondent aged 15 is reported as working for pay.',
      },
    ],
  };
}

export interface GenerateOptions {
  rows: number;
  dir: string;
  seed?: number;
  /** File stem; default `delivery-<rows>`. */
  name?: string;
}

/**
 * Writes `<dir>/<name>.csv` and `<dir>/<name>.codebook.json` and returns what was injected.
 * Cost: O(rows), about 1 s per million rows; writes in 4 MB chunks, so memory stays flat.
 */
export function generateDelivery(opts: GenerateOptions): GeneratedDelivery {
  const rng = seededRandom(opts.seed ?? 20261201);
  const rows = opts.rows;
  const name = opts.name ?? `delivery-${rows}`;
  mkdirSync(opts.dir, { recursive: true });
  const csvPath = join(opts.dir, `${name}.csv`);
  const codebookPath = join(opts.dir, `${name}.codebook.json`);
  const cb = benchCodebook();
  writeFileSync(codebookPath, JSON.stringify(cb, null, 2) + '\n');
  const itemNames = (cb.items as Array<{ name: string }>).map((i) => i.name);
  const truth: Record<string, ItemTruth> = {};
  for (const n of itemNames) truth[n] = emptyTruth();
  const t = (n: string): ItemTruth => truth[n];
  const r = rng;
  const int = (lo: number, hi: number): number => lo + Math.floor(r() * (hi - lo + 1));

  /** A cell of a coded integer item with codes 1..k and the std missing set. */
  const coded = (item: string, k: number, withMissing: boolean, slip = (): string => String(k + 1 + int(0, 3))): string => {
    const u = r();
    if (u < 0.002) {
      t(item).notACode++;
      return slip(); // by default just above the scale: a keying slip
    }
    if (withMissing && u < 0.032) {
      t(item).missingCodes++;
      return String(-int(1, 2));
    }
    if (u < 0.042) {
      t(item).blank++;
      return '';
    }
    return String(int(1, k));
  };

  /** A numeric cell drawn by `draw`, with injected blanks, missing codes and bad values. */
  const numeric = (item: string, draw: () => string, o: { integer: boolean; max: number; missing: string | null }): string => {
    const u = r();
    if (u < 0.0005) {
      t(item).notANumber++;
      return 'n/k';
    }
    if (u < 0.001) {
      t(item).impossible++;
      return String(o.max * 2 + 1);
    }
    if (o.integer && u < 0.0015) {
      t(item).notAnInteger++;
      return String(int(2, 9) + 0.5);
    }
    if (o.missing !== null && u < 0.02) {
      t(item).missingCodes++;
      return o.missing;
    }
    if (u < 0.03) {
      t(item).blank++;
      return '';
    }
    return draw();
  };

  const village = (): string => {
    const u = r();
    let v = SYLLABLES[int(0, 9)] + SYLLABLES[int(0, 9)];
    v = v[0].toUpperCase() + v.slice(1);
    if (u < 0.005) return `"${v}, upper"`;
    if (u < 0.006) return `"${v}\nlower"`;
    if (u < 0.007) return `"${v} ""old"" town"`;
    return v;
  };

  let duplicateIds = 0;
  let answeredWhenSkipped = 0;
  const out = openLineWriter(csvPath);
  out.line(itemNames.join(','));
  const cells: string[] = new Array(itemNames.length);
  for (let i = 0; i < rows; i++) {
    let c = 0;
    // A re-keyed questionnaire: every 997th row repeats the previous identifier.
    const dup = i > 0 && i % 997 === 0;
    if (dup) duplicateIds++;
    cells[c++] = String(dup ? 100000 + i - 1 : 100000 + i);
    cells[c++] = coded('district', 6, false);
    cells[c++] = coded('team', 12, false);
    cells[c++] = coded('sex', 2, true);
    cells[c++] = coded('marital', 5, true);
    {
      const u = r();
      if (u < 0.002) {
        t('dwelling').notACode++;
        cells[c++] = 'stone';
      } else if (u < 0.01) {
        t('dwelling').blank++;
        cells[c++] = '';
      } else cells[c++] = ['brick', 'timber', 'mud', 'other'][int(0, 3)];
    }
    cells[c++] = coded('edu', 6, true);
    cells[c++] = coded('health', 5, true);
    {
      const u = r();
      if (u < 0.003) {
        t('trips').unbinned++;
        cells[c++] = String(int(6, 40)); // a raw count keyed instead of its bin code
      } else cells[c++] = coded('trips', 5, true, () => '-4'); // every count >= 0 lies in a bin
    }
    cells[c++] = numeric('hh_size', () => String(Math.min(30, 1 + Math.floor(-Math.log(1 - r()) * 3))), { integer: true, max: 30, missing: '-1' });
    const age = numeric('age', () => String(int(15, 92) + (r() < 0.01 ? 10 : 0)), { integer: true, max: 110, missing: '-2' });
    cells[c++] = age;
    cells[c++] = numeric('income', () => (r() * r() * 150000).toFixed(2), { integer: false, max: 1000000, missing: '-2' });
    cells[c++] = numeric('commute_min', () => (r() * 90).toFixed(1), { integer: false, max: 600, missing: '-1' });
    cells[c++] = numeric('temp_c', () => (12 + r() * 16).toFixed(1), { integer: false, max: 60, missing: '999' });
    cells[c++] = numeric('year_built', () => String(int(1920, 2025)), { integer: true, max: 2026, missing: '-1' });
    cells[c++] = (0.2 + r() * 5).toFixed(4);
    for (const lk of LIKERT_ITEMS) cells[c++] = coded(lk, 5, true);
    const employed = coded('employed', 2, true);
    cells[c++] = employed;
    {
      let v: string;
      if (employed === '1') v = numeric('hours_work', () => String(int(1, 70)), { integer: true, max: 120, missing: '-1' });
      else if (employed === '2') {
        if (r() < 0.002) {
          answeredWhenSkipped++;
          v = String(int(5, 40));
        } else v = r() < 0.5 ? '-3' : '';
      } else v = '-3';
      cells[c++] = v;
    }
    cells[c++] = village();
    cells[c++] = (5 + r() * 80).toFixed(1);
    out.line(cells.join(','));
  }
  const bytes = out.close();
  truth.hours_work.answeredWhenSkipped = answeredWhenSkipped;
  return {
    shape: 'mixed',
    csvPath,
    codebookPath,
    rows,
    bytes,
    items: itemNames,
    idItem: 'resp_id',
    truth,
    duplicateIds,
    answeredWhenSkipped,
    sql: {
      askedWhen: { hours_work: 'employed = 1' },
      rules: { 'young-worker': { test: 'age >= 16 OR employed = 2', variables: ['age', 'employed'] } },
    },
  };
}
