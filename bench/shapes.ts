/**
 * The benchmark's shapes of delivery, each a seeded synthetic delivery and its codebook written
 * at any row count, with every injected fault counted while it is written (so the counts are
 * known from construction and any checker can be compared against them):
 * - `mixed`: the original delivery of generate.ts (the default, so earlier figures compare);
 * - `coded`: mostly short ordinal items (21 four-point items sharing a missing set of 8 and 9),
 *   an id, a group, a 2-code item with missing codes, a binned item, a ratio item with a range,
 *   two decimals, a weight, a routing condition and one rule;
 * - `numeric`: mostly decimal and integer items with up to six decimal places, ranges from tens
 *   to tens of millions, interval and ratio, missing codes such as 99999998 outside the range;
 * - `text`: text identifiers, free text with quotes, commas and newlines, pattern-checked codes;
 * - `rules`: a dozen routed items (some routed on routed items) and seven cross-item rules.
 *
 * Routing conditions and rules are written once, in the small subset of CEL the shapes use
 * (item names, int and double literals, comparisons, `+`, `-`, `&&`, `||`, parentheses); the
 * SQL peer's text and the generator's own evaluation are derived from it mechanically.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import {
  codes,
  COUNT_BINS,
  DISTRICTS as MIXED_DISTRICTS,
  emptyTruth,
  generateDelivery,
  openLineWriter,
  seededRandom,
  type GeneratedDelivery,
  type GenerateOptions,
  type ItemTruth,
  type RuleTruth,
  WALL_CODES,
} from './generate.ts';
import type { PeerSqlExtras } from './duckdb-peer.ts';

export const SHAPES = ['mixed', 'coded', 'numeric', 'text', 'rules'] as const;
export type Shape = (typeof SHAPES)[number];

/** Parsed valid values of the row so far, by item name (absent: missing or invalid). */
type Values = Record<string, number | string | undefined>;

type Fault = 'not-a-code' | 'unbinned-value' | 'not-a-number' | 'not-an-integer' | 'impossible' | 'pattern-mismatch';

/** One written cell and what it is by construction. */
interface Drawn {
  text: string;
  /** The parsed value when the cell is valid. */
  value?: number | string;
  fault?: Fault;
  missing?: boolean;
  blank?: boolean;
}

interface Column {
  item: Record<string, unknown>;
  /** Draws the cell of data row `row` (0-based) as if the item were asked. */
  cell: (row: number, v: Values) => Drawn;
  /** For a routed item: the cell text of a valid skip besides blank (its not-applicable code). */
  skipCode?: string;
}

interface RuleSpec {
  id: string;
  test: string;
  when?: string;
  message: string;
}

interface ShapeSpec {
  title: string;
  missingSets: Record<string, Array<{ code: number | string; kind: string; label: string }>>;
  columns: Column[];
  rules: RuleSpec[];
  /** The id item's duplicates written (every 997th row repeats the previous id). */
  idItem: string;
}

const FAULT_FIELD: Record<Fault, keyof ItemTruth> = {
  'not-a-code': 'notACode',
  'unbinned-value': 'unbinned',
  'not-a-number': 'notANumber',
  'not-an-integer': 'notAnInteger',
  impossible: 'impossible',
  'pattern-mismatch': 'patternMismatch',
};

/* ------------------------------------------------------------------ CEL subset */

const TOKEN = /\s*(?:(\d+\.\d+|\d+)|([A-Za-z_][A-Za-z0-9_]*)|(==|!=|<=|>=|&&|\|\||[<>+\-()]))/y;

/** Splits an expression of the subset into tokens; throws on anything outside it. */
function tokens(expr: string): Array<{ kind: 'num' | 'name' | 'op'; text: string }> {
  const out: Array<{ kind: 'num' | 'name' | 'op'; text: string }> = [];
  TOKEN.lastIndex = 0;
  let at = 0;
  while (at < expr.length) {
    if (/^\s*$/.test(expr.slice(at))) break;
    TOKEN.lastIndex = at;
    const m = TOKEN.exec(expr);
    if (!m) throw new Error(`bench shapes: "${expr}" leaves the CEL subset at character ${at + 1}`);
    out.push(m[1] ? { kind: 'num', text: m[1] } : m[2] ? { kind: 'name', text: m[2] } : { kind: 'op', text: m[3]! });
    at = TOKEN.lastIndex;
  }
  return out;
}

/** The item names an expression of the subset reads, in first-use order. Cost: O(length). Throws outside the subset. */
export function variablesOf(expr: string): string[] {
  return [...new Set(tokens(expr).filter((t) => t.kind === 'name').map((t) => t.text))];
}

/**
 * The expression as DuckDB SQL over item names (the peer reads each as the item's valid value):
 * CEL's ==, !=, && and || become =, <>, AND and OR, whose precedence is the same. Cost: O(length).
 * Throws outside the subset.
 */
export function celToSql(expr: string): string {
  const op: Record<string, string> = { '==': '=', '!=': '<>', '&&': 'AND', '||': 'OR' };
  return tokens(expr)
    .map((t) => (t.kind === 'op' ? (op[t.text] ?? t.text) : t.text))
    .join(' ');
}

/** The expression as a JavaScript function of the row's values (called only when every variable is valid). */
function celToJs(expr: string): (v: Values) => boolean {
  const op: Record<string, string> = { '==': '===', '!=': '!==' };
  const body = tokens(expr)
    .map((t) => (t.kind === 'name' ? `v[${JSON.stringify(t.text)}]` : t.kind === 'op' ? (op[t.text] ?? t.text) : t.text))
    .join(' ');
  return new Function('v', `return (${body});`) as (v: Values) => boolean;
}

/* ------------------------------------------------------------------ cell makers */

type Rng = () => number;

function makers(r: Rng) {
  const int = (lo: number, hi: number): number => lo + Math.floor(r() * (hi - lo + 1));
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(r() * xs.length)]!;

  /** Codes from..from+k-1; 0.2 % not a code, 3 % missing codes (when given), 1 % blank. */
  const coded =
    (k: number, missing: readonly number[] = [], from = 1, below = false) =>
    (): Drawn => {
      const u = r();
      if (u < 0.002) {
        // A keying slip just above the scale (below it for a binned item, whose bins take every count >= 0).
        let slip = below ? -4 - int(0, 2) : from + k + int(0, 2);
        while (missing.includes(slip)) slip += below ? -1 : 1;
        return { text: String(slip), fault: 'not-a-code' };
      }
      if (missing.length && u < 0.032) return { text: String(pick(missing)), missing: true };
      if (u < 0.042) return { text: '', blank: true };
      const c = int(from, from + k - 1);
      return { text: String(c), value: c };
    };

  /** A text code from `codes`; 0.2 % a word that is not one, 1 % blank. */
  const textCoded =
    (codes: readonly string[], slip: string) =>
    (): Drawn => {
      const u = r();
      if (u < 0.002) return { text: slip, fault: 'not-a-code' };
      if (u < 0.012) return { text: '', blank: true };
      const c = pick(codes);
      return { text: c, value: c };
    };

  interface NumericOptions {
    draw: () => number;
    places: number;
    min: number;
    max: number;
    missing?: readonly number[];
  }
  /** A number drawn by `draw` with `places` decimals; bad values, missing codes and blanks injected. */
  const numeric =
    (o: NumericOptions) =>
    (): Drawn => {
      const u = r();
      if (u < 0.0005) return { text: pick(['n/k', '?', '--']), fault: 'not-a-number' };
      if (u < 0.001) {
        const beyond = o.min < 0 && r() < 0.5 ? o.min * 2 - 1 : o.max * 2 + 1;
        return { text: String(beyond), fault: 'impossible' };
      }
      if (o.places === 0 && u < 0.0015) return { text: String(int(2, 9) + 0.5), fault: 'not-an-integer' };
      if (o.missing?.length && u < 0.02) return { text: String(pick(o.missing)), missing: true };
      if (u < 0.03) return { text: '', blank: true };
      const x = Math.min(o.max, Math.max(o.min, o.draw()));
      const text = x.toFixed(o.places);
      return { text, value: Number(text) };
    };

  /** A pattern-checked text: 0.3 % a value that breaks the pattern, 1 % blank. */
  const patterned =
    (good: () => string, bad: () => string) =>
    (): Drawn => {
      const u = r();
      if (u < 0.003) return { text: bad(), fault: 'pattern-mismatch' };
      if (u < 0.013) return { text: '', blank: true };
      const t = good();
      return { text: t, value: t };
    };

  const SYL = ['ka', 'ren', 'tol', 'mir', 'sa', 'vel', 'dor', 'un', 'bri', 'ost', 'lé', 'hø'];
  const word = (): string => pick(SYL) + pick(SYL) + (r() < 0.3 ? pick(SYL) : '');
  /** Free text of 1 to `words` words with commas, doubled quotes and line breaks now and then. */
  const freeText =
    (words: number, blankShare: number, missing: readonly string[] = []) =>
    (): Drawn => {
      const u = r();
      if (u < blankShare) return { text: '', blank: true };
      if (missing.length && u < blankShare + 0.02) return { text: pick(missing), missing: true };
      const n = int(1, words);
      const parts: string[] = [];
      for (let i = 0; i < n; i++) {
        let w = word();
        if (i === 0) w = w[0]!.toUpperCase() + w.slice(1);
        const v = r();
        if (v < 0.06 && i < n - 1) w += ',';
        else if (v < 0.08) w = `"${w}"`;
        else if (v < 0.09 && i < n - 1) w += '\n';
        parts.push(w);
      }
      const t = parts.join(' ').replaceAll('\n ', '\n');
      return { text: t, value: t };
    };

  return { int, pick, coded, textCoded, numeric, patterned, freeText };
}

/** A CSV field: quoted when it holds a delimiter, a quote or a line break. */
const field = (t: string): string => (/[",\n\r]/.test(t) ? `"${t.replaceAll('"', '""')}"` : t);

const DISTRICTS = [...MIXED_DISTRICTS, 'Marrow Point', 'Sallowmere'];
const YES_NO = ['Yes', 'No'];
const STD89 = [
  { code: 8, kind: 'dont-know', label: "Don't know" },
  { code: 9, kind: 'refused', label: 'Refused' },
];
const STD = [
  { code: -1, kind: 'dont-know', label: "Don't know" },
  { code: -2, kind: 'refused', label: 'Refused' },
  { code: -3, kind: 'not-applicable', label: 'Valid skip' },
];

/** An integer id column: 100000 + row, every 997th row repeating the previous one. */
const idColumn = (name: string): Column => ({
  item: { name, label: 'Respondent identifier', role: 'id', type: 'integer' },
  cell: (row) => {
    const id = 100000 + (row > 0 && row % 997 === 0 ? row - 1 : row);
    return { text: String(id), value: id };
  },
});

const weightColumn = (r: Rng): Column => ({
  item: { name: 'weight', label: 'Sampling weight', role: 'weight', type: 'decimal', level: 'ratio', range: { min: 0.01, max: 100 } },
  cell: () => {
    const t = (0.2 + r() * 5).toFixed(4);
    return { text: t, value: Number(t) };
  },
});

/* ------------------------------------------------------------------ the shapes */

function codedShape(r: Rng): ShapeSpec {
  const m = makers(r);
  const four = ['Not at all', 'A little', 'Quite a lot', 'Very much'];
  const columns: Column[] = [
    idColumn('resp_id'),
    { item: { name: 'district', label: 'District', role: 'group', type: 'integer', level: 'nominal', codes: codes(DISTRICTS) }, cell: m.coded(8) },
    { item: { name: 'employed', label: 'Worked for pay last week', type: 'integer', level: 'nominal', codes: codes(YES_NO), missing: 'std89' }, cell: m.coded(2, [8, 9]) },
    {
      item: {
        name: 'visits',
        label: 'Visits to the health post last year',
        type: 'integer',
        level: 'ordinal',
        codes: COUNT_BINS,
        missing: [
          { code: -8, kind: 'dont-know', label: "Don't know" },
          { code: -9, kind: 'refused', label: 'Refused' },
        ],
      },
      cell: ((inner) => (): Drawn => (r() < 0.003 ? { text: String(m.int(6, 40)), fault: 'unbinned-value' } : inner()))(m.coded(5, [-8, -9], 1, true)),
    },
    {
      item: { name: 'hh_size', label: 'Household size', type: 'integer', level: 'ratio', unit: 'persons', range: { min: 1, max: 30 }, missing: [{ code: 98, kind: 'dont-know' }, { code: 99, kind: 'refused' }] },
      cell: m.numeric({ draw: () => 1 + Math.floor(-Math.log(1 - r()) * 3), places: 0, min: 1, max: 30, missing: [98, 99] }),
    },
    {
      item: {
        name: 'hours',
        label: 'Hours worked last week',
        type: 'integer',
        level: 'ratio',
        unit: 'hours',
        range: { min: 0, max: 100 },
        expect: { max: 80 },
        askedWhen: 'employed == 1',
        missing: [{ code: -7, kind: 'not-applicable', label: 'Valid skip' }, { code: -8, kind: 'dont-know' }, { code: -9, kind: 'refused' }],
      },
      cell: m.numeric({ draw: () => m.int(1, 70), places: 0, min: 0, max: 100, missing: [-8, -9] }),
      skipCode: '-7',
    },
    {
      item: { name: 'income', label: 'Household income last month', type: 'decimal', level: 'ratio', unit: 'crowns', range: { min: 0, max: 1000000 }, expect: { max: 200000 }, missing: [{ code: -8, kind: 'dont-know' }, { code: -9, kind: 'refused' }] },
      cell: m.numeric({ draw: () => r() * r() * 150000, places: 2, min: 0, max: 1000000, missing: [-8, -9] }),
    },
    {
      item: { name: 'dist_km', label: 'Distance to the market', type: 'decimal', level: 'ratio', unit: 'km', range: { min: 0, max: 500 } },
      cell: m.numeric({ draw: () => r() * 40, places: 1, min: 0, max: 500 }),
    },
    weightColumn(r),
    ...Array.from({ length: 21 }, (_, i): Column => ({
      item: { name: `q${String(i + 1).padStart(2, '0')}`, label: `Wellbeing statement ${i + 1}`, type: 'integer', level: 'ordinal', codes: codes(four), missing: 'std89' },
      cell: m.coded(4, [8, 9]),
    })),
  ];
  return {
    title: 'Synthetic benchmark delivery: mostly coded items (generated)',
    missingSets: { std89: STD89 },
    columns,
    rules: [{ id: 'statement-spread', test: 'q01 - q02 <= 2 && q02 - q01 <= 2', message: 'Statements 1 and 2 lie at opposite ends of the scale.' }],
    idItem: 'resp_id',
  };
}

function numericShape(r: Rng): ShapeSpec {
  const m = makers(r);
  const columns: Column[] = [idColumn('resp_id'), { item: { name: 'district', label: 'District', role: 'group', type: 'integer', level: 'nominal', codes: codes(DISTRICTS.slice(0, 6)) }, cell: m.coded(6) }, weightColumn(r)];
  for (let i = 0; i < 27; i++) {
    const integer = i % 3 === 0;
    const interval = i % 2 === 1;
    const scale = 10 ** (1 + (i % 7)); // 10 .. 10,000,000
    const places = integer ? 0 : 1 + (i % 6);
    const min = interval ? -scale : 0;
    // Missing codes just past the range's digits, as survey files write them: 998 for a range to 100.
    const big = 10 ** (String(scale).length + 1) - 2;
    const missing = i % 4 === 3 ? [] : [big, big + 1];
    const item: Record<string, unknown> = {
      name: `m${String(i + 1).padStart(2, '0')}`,
      label: `Measurement ${i + 1}`,
      type: integer ? 'integer' : 'decimal',
      level: interval ? 'interval' : 'ratio',
      range: { min, max: scale },
    };
    if (i % 5 === 0) item.expect = { max: scale * 0.9 };
    if (missing.length) item.missing = [{ code: missing[0], kind: 'dont-know' }, { code: missing[1], kind: 'refused' }];
    const draw = interval ? () => scale * 0.8 * (2 * r() - 1) : () => scale * r() * r();
    columns.push({ item, cell: m.numeric({ draw, places, min, max: scale, missing }) });
  }
  return { title: 'Synthetic benchmark delivery: mostly numeric items (generated)', missingSets: {}, columns, rules: [], idItem: 'resp_id' };
}

function textShape(r: Rng): ShapeSpec {
  const m = makers(r);
  const upper = (n: number): string => {
    let t = '';
    for (let i = 0; i < n; i++) t += String.fromCharCode(65 + m.int(0, 25));
    return t;
  };
  const digits = (n: number): string => String(Math.floor(r() * 10 ** n)).padStart(n, '0');
  const coord = (): string => `${m.int(-60, 60)}.${digits(5)},${m.int(-170, 170)}.${digits(5)}`;
  const districts = ['AMB', 'COR', 'DUN', 'FAL', 'GRY', 'HOL'];
  const columns: Column[] = [
    {
      item: { name: 'case_id', label: 'Case identifier', role: 'id', type: 'text', pattern: 'HH-[0-9]{8}' },
      cell: (row) => {
        const t = `HH-${String(row > 0 && row % 997 === 0 ? row - 1 : row).padStart(8, '0')}`;
        return { text: t, value: t };
      },
    },
    {
      item: { name: 'district', label: 'District', role: 'group', type: 'text', level: 'nominal', codes: districts.map((c, i) => ({ code: c, label: DISTRICTS[i]! })) },
      cell: m.textCoded(districts, 'XXX'),
    },
    { item: { name: 'interviewer', label: 'Interviewer code', type: 'text', pattern: '[A-Z]{2}[0-9]{3}' }, cell: m.patterned(() => upper(2) + digits(3), () => m.pick([upper(2).toLowerCase() + digits(3), upper(2) + digits(2)])) },
    { item: { name: 'postcode', label: 'Postcode', type: 'text', pattern: '[0-9]{4} [A-Z]{2}' }, cell: m.patterned(() => `${digits(4)} ${upper(2)}`, () => digits(4) + upper(2)) },
    { item: { name: 'phone', label: 'Contact telephone', type: 'text', pattern: '0[0-9]{2}-[0-9]{7}' }, cell: m.patterned(() => `0${digits(2)}-${digits(7)}`, () => `${digits(2)}-${digits(7)}`) },
    { item: { name: 'gps', label: 'Position of the dwelling', type: 'text', pattern: '-?[0-9]{1,2}\\.[0-9]{5},-?[0-9]{1,3}\\.[0-9]{5}' }, cell: m.patterned(coord, () => coord().replace(',', ';')) },
    { item: { name: 'sample_code', label: 'Sample point code', type: 'text', pattern: '[A-Z]{3}-[0-9]{2}-[A-Z]' }, cell: m.patterned(() => `${m.pick(districts)}-${digits(2)}-${upper(1)}`, () => `${m.pick(districts)}${digits(2)}`) },
    {
      item: {
        name: 'dwelling',
        label: 'Main wall material',
        type: 'text',
        level: 'nominal',
        codes: WALL_CODES,
      },
      cell: m.textCoded(WALL_CODES.map((c) => c.code), 'stone'),
    },
    { item: { name: 'sex', label: 'Sex of respondent', type: 'integer', level: 'nominal', codes: codes(['Female', 'Male']), missing: 'std' }, cell: m.coded(2, [-1, -2]) },
    { item: { name: 'age', label: 'Age of respondent', type: 'integer', level: 'ratio', unit: 'years', range: { min: 15, max: 110 }, missing: 'std' }, cell: m.numeric({ draw: () => m.int(15, 92), places: 0, min: 15, max: 110, missing: [-1, -2] }) },
    { item: { name: 'village', label: 'Village name as told', type: 'text' }, cell: m.freeText(2, 0.01) },
    { item: { name: 'address', label: 'Address as told', type: 'text' }, cell: m.freeText(5, 0.02) },
    { item: { name: 'landmark', label: 'Nearest landmark', type: 'text' }, cell: m.freeText(4, 0.1) },
    ...Array.from({ length: 8 }, (_, i): Column => ({
      item: {
        name: `note${i + 1}`,
        label: `Interviewer note ${i + 1}`,
        type: 'text',
        ...(i % 2 === 0 ? { missing: [{ code: '-8', kind: 'dont-know' }, { code: '-9', kind: 'refused' }] } : {}),
      },
      cell: m.freeText(8, 0.2 + i * 0.05, i % 2 === 0 ? ['-8', '-9'] : []),
    })),
    { item: { name: 'other_specify', label: 'Other material, specified', type: 'text' }, cell: m.freeText(3, 0.9) },
  ];
  return { title: 'Synthetic benchmark delivery: text-heavy (generated)', missingSets: { std: STD }, columns, rules: [], idItem: 'case_id' };
}

function rulesShape(r: Rng): ShapeSpec {
  const m = makers(r);
  const std = [-1, -2];
  const int = (name: string, label: string, min: number, max: number, draw: () => number, askedWhen?: string): Column => ({
    item: { name, label, type: 'integer', level: 'ratio', range: { min, max }, missing: 'std', ...(askedWhen ? { askedWhen } : {}) },
    cell: m.numeric({ draw, places: 0, min, max, missing: std }),
    skipCode: '-3',
  });
  const dec = (name: string, label: string, max: number, draw: () => number, askedWhen?: string): Column => ({
    item: { name, label, type: 'decimal', level: 'ratio', range: { min: 0, max }, missing: 'std', ...(askedWhen ? { askedWhen } : {}) },
    cell: m.numeric({ draw, places: 2, min: 0, max, missing: std }),
    skipCode: '-3',
  });
  const cat = (name: string, label: string, labels: string[], level: 'nominal' | 'ordinal', askedWhen?: string): Column => ({
    item: { name, label, type: 'integer', level, codes: codes(labels), missing: 'std', ...(askedWhen ? { askedWhen } : {}) },
    cell: m.coded(labels.length, std),
    skipCode: '-3',
  });
  const married = 'married == 2 || married == 3';
  const columns: Column[] = [
    idColumn('resp_id'),
    { item: { name: 'district', label: 'District', role: 'group', type: 'integer', level: 'nominal', codes: codes(DISTRICTS.slice(0, 6)) }, cell: m.coded(6) },
    weightColumn(r),
    int('age', 'Age of respondent', 15, 99, () => m.int(15, 90)),
    cat('sex', 'Sex of respondent', ['Female', 'Male'], 'nominal'),
    cat('employed', 'Worked for pay last week', YES_NO, 'nominal'),
    int('hours', 'Hours worked last week', 0, 100, () => m.int(1, 90), 'employed == 1'),
    cat('sector', 'Sector of main work', ['Farming', 'Fishing', 'Trade', 'Building', 'Transport', 'Teaching', 'Health', 'Other'], 'nominal', 'employed == 1'),
    int('job_years', 'Years in the present work', 0, 70, () => m.int(0, 40), 'employed == 1 && sector != 8'),
    cat('seeks_work', 'Looked for work last month', YES_NO, 'nominal', 'employed == 2'),
    int('children', 'Children in the household', 0, 15, () => Math.min(15, Math.floor(-Math.log(1 - r()) * 1.5))),
    cat('child_care', 'Who looks after the children', ['Parent', 'Relative', 'Neighbour', 'Paid carer'], 'nominal', 'children > 0'),
    int('youngest_age', 'Age of the youngest child', 0, 17, () => m.int(0, 17), 'children > 0'),
    cat('school', 'Highest schooling completed', ['None', 'Some primary', 'Primary', 'Lower secondary', 'Upper secondary', 'Tertiary'], 'ordinal'),
    int('school_years', 'Years of schooling', 0, 25, () => m.int(0, 18), 'school >= 2'),
    cat('married', 'Marital status', ['Never married', 'Married', 'Cohabiting', 'Separated', 'Widowed'], 'nominal'),
    int('spouse_age', 'Age of spouse or partner', 15, 99, () => m.int(15, 90), married),
    cat('spouse_works', 'Spouse or partner works for pay', YES_NO, 'nominal', married),
    cat('owns_land', 'Household owns farm land', YES_NO, 'nominal'),
    dec('land_ha', 'Farm land owned', 1000, () => r() * r() * 20, 'owns_land == 1'),
    int('livestock', 'Head of livestock', 0, 500, () => Math.floor(r() * r() * 60), 'owns_land == 1'),
    dec('income', 'Household income last month', 1000000, () => r() * r() * 150000),
    cat('remit', 'Received money from abroad', YES_NO, 'nominal'),
    dec('remit_amount', 'Money received from abroad', 1000000, () => r() * r() * 60000, 'remit == 1'),
    cat('health', 'Self-rated health', ['Very poor', 'Poor', 'Fair', 'Good', 'Very good'], 'ordinal'),
    int('clinic_visits', 'Clinic visits last year', 0, 50, () => m.int(0, 20), 'health <= 2'),
    ...Array.from({ length: 4 }, (_, i) => cat(`trust${i + 1}`, `Trust statement ${i + 1}`, ['Not at all', 'A little', 'Somewhat', 'Much', 'Completely'], 'ordinal')),
  ];
  return {
    title: 'Synthetic benchmark delivery: many routing conditions and rules (generated)',
    missingSets: { std: STD },
    columns,
    rules: [
      { id: 'working-age', test: 'age >= 16', when: 'employed == 1', message: 'A respondent aged 15 is reported as working for pay.' },
      { id: 'hours-cap', test: 'hours <= 84', message: 'More than 84 hours of work in one week.' },
      { id: 'spouse-age-gap', test: 'spouse_age - age <= 30 && age - spouse_age <= 30', message: 'Spouse and respondent more than 30 years apart.' },
      { id: 'youngest-child', test: 'age - youngest_age >= 14', message: 'The youngest child is less than 14 years younger than the respondent.' },
      { id: 'schooling-age', test: 'school_years <= age - 4', message: 'More years of schooling than the age allows.' },
      { id: 'land-livestock', test: 'land_ha > 0.0 || livestock == 0', when: 'owns_land == 1', message: 'Livestock on no land.' },
      { id: 'remit-income', test: 'remit_amount <= income', message: 'Money from abroad larger than the household income.' },
    ],
    idItem: 'resp_id',
  };
}

const BUILDERS: Record<Exclude<Shape, 'mixed'>, (r: Rng) => ShapeSpec> = { coded: codedShape, numeric: numericShape, text: textShape, rules: rulesShape };

/** The shape's codebook (the codebook contract), as written beside its delivery. */
function codebookOf(shape: string, spec: ShapeSpec): Record<string, unknown> {
  return {
    codebook: `bench-${shape}`,
    version: '1.0.0',
    title: spec.title,
    ...(Object.keys(spec.missingSets).length ? { missingSets: spec.missingSets } : {}),
    items: spec.columns.map((c) => c.item),
    ...(spec.rules.length ? { rules: spec.rules.map((x) => ({ id: x.id, test: x.test, ...(x.when ? { when: x.when } : {}), severity: 'warning', message: x.message })) } : {}),
  };
}

/**
 * Writes `<dir>/<name>.csv` and `<dir>/<name>.codebook.json` for `shape` and returns what was
 * injected, with the SQL peer's routing and rule text. `mixed` is generate.ts's delivery.
 * Cost: O(rows x items), memory flat (4 MB write chunks).
 */
export function generateShape(shape: Shape, opts: GenerateOptions): GeneratedDelivery {
  if (shape === 'mixed') return generateDelivery(opts);
  const rng = seededRandom(opts.seed ?? 20261201);
  const spec = BUILDERS[shape](rng);
  const name = opts.name ?? `${shape}-${opts.rows}`;
  mkdirSync(opts.dir, { recursive: true });
  const csvPath = join(opts.dir, `${name}.csv`);
  const codebookPath = join(opts.dir, `${name}.codebook.json`);
  writeFileSync(codebookPath, JSON.stringify(codebookOf(shape, spec), null, 2) + '\n');

  const names = spec.columns.map((c) => String(c.item.name));
  const truth: Record<string, ItemTruth> = Object.fromEntries(names.map((n) => [n, emptyTruth()]));
  const routes = spec.columns.map((c, at) => {
    const cond = c.item.askedWhen as string | undefined;
    if (!cond) return undefined;
    const vars = variablesOf(cond);
    // The row is drawn left to right, so a condition may read only items before its own.
    for (const x of vars) if (!names.slice(0, at).includes(x)) throw new Error(`bench shapes: ${String(c.item.name)} is routed on ${x}, which is not an earlier item`);
    return { vars, test: celToJs(cond) };
  });
  const rules = spec.rules.map((x) => ({
    id: x.id,
    testVars: variablesOf(x.test),
    test: celToJs(x.test),
    whenVars: x.when ? variablesOf(x.when) : [],
    when: x.when ? celToJs(x.when) : undefined,
  }));
  const ruleTruth: Record<string, RuleTruth> = Object.fromEntries(spec.rules.map((x) => [x.id, { passed: 0, failed: 0, undetermined: 0, skipped: 0 }]));
  const allValid = (vars: string[], v: Values): boolean => vars.every((n) => v[n] !== undefined);

  const out = openLineWriter(csvPath);
  out.line(names.join(','));
  const cells: string[] = new Array(names.length);
  let duplicateIds = 0;
  // One values object for every row: each column overwrites its own entry before anything later reads it.
  const v: Values = Object.fromEntries(names.map((n) => [n, undefined]));
  for (let row = 0; row < opts.rows; row++) {
    if (row > 0 && row % 997 === 0) duplicateIds++;
    for (let c = 0; c < spec.columns.length; c++) {
      const col = spec.columns[c]!;
      const t = truth[names[c]!]!;
      const route = routes[c];
      // Routing: a condition that is determined and false means skip: blank or the not-applicable
      // code, and 0.2 % of the time an answer anyway (answered-when-skipped when it is valid).
      let d: Drawn;
      let answeredWhenSkipped = false;
      if (route && allValid(route.vars, v) && !route.test(v)) {
        const u = rng();
        if (u < 0.002) {
          d = col.cell(row, v);
          answeredWhenSkipped = d.value !== undefined;
        } else if (u < 0.5 || !col.skipCode) d = { text: '', blank: true };
        else d = { text: col.skipCode, missing: true };
      } else d = col.cell(row, v);
      if (d.fault) t[FAULT_FIELD[d.fault]]++;
      else if (d.blank) t.blank++;
      else if (d.missing) t.missingCodes++;
      if (answeredWhenSkipped) t.answeredWhenSkipped++;
      // Later conditions and rules read the cell's own classification (an answer where routing
      // said skip is still a valid value of its item there), as the codebook's rules do.
      v[names[c]!] = d.value;
      cells[c] = field(d.text);
    }
    for (const x of rules) {
      const rt = ruleTruth[x.id]!;
      if (x.when) {
        if (!allValid(x.whenVars, v)) {
          rt.undetermined++;
          continue;
        }
        if (!x.when(v)) {
          rt.skipped++;
          continue;
        }
      }
      if (!allValid(x.testVars, v)) rt.undetermined++;
      else if (x.test(v)) rt.passed++;
      else rt.failed++;
    }
    out.line(cells.join(','));
  }
  const bytes = out.close();

  const sql: PeerSqlExtras = { askedWhen: {}, rules: {} };
  for (const c of spec.columns) if (c.item.askedWhen) sql.askedWhen[String(c.item.name)] = celToSql(String(c.item.askedWhen));
  for (const x of spec.rules) {
    sql.rules[x.id] = { test: celToSql(x.test), variables: variablesOf(x.test), ...(x.when ? { when: celToSql(x.when), whenVariables: variablesOf(x.when) } : {}) };
  }
  return {
    shape,
    csvPath,
    codebookPath,
    rows: opts.rows,
    bytes,
    items: names,
    idItem: spec.idItem,
    truth,
    duplicateIds,
    answeredWhenSkipped: Object.values(truth).reduce((s, t) => s + t.answeredWhenSkipped, 0),
    rules: ruleTruth,
    sql,
  };
}

/** Parses `--shapes`: `all` or a comma-separated list of shape names. */
export function parseShapes(text: string): Shape[] {
  if (text === 'all') return [...SHAPES];
  const list = text.split(',').map((s) => s.trim()).filter(Boolean);
  for (const s of list) if (!(SHAPES as readonly string[]).includes(s)) throw new Error(`unknown shape ${s}; the shapes are ${SHAPES.join(', ')} (or all)`);
  if (!list.length) throw new Error(`--shapes takes all or a list of ${SHAPES.join(', ')}`);
  return [...new Set(list)] as Shape[];
}
