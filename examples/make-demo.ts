/**
 * Writes the demo deliveries for the fictional Tellmark household survey
 * (`household.codebook.json`):
 *
 * - `demo-delivery.csv`: about 4,000 households, comma-delimited UTF-8, with planted faults;
 * - `demo-faults.json`: one entry per planted fault (`row` is the 1-based data row, header not
 *   counted; `item` is the column, or the rule id for `rule-failed`; `rule` is the finding rule
 *   a checker must report; `value` is the cell as delivered). Three planted cells carry spaces
 *   around the value (sex, age, water_src); a checker that trims them also reports one
 *   item-level `surrounding-space` warning (row 0) for each of those items, which is not listed;
 * - `demo-delivery-semicolon.csv`: a few hundred clean households, `;`-delimited, decimal comma,
 *   CRLF line ends, windows-1252 encoded (remarks name the accented districts).
 *
 * Everything is drawn from one seeded generator, so every run writes the same bytes.
 * Run: `npx tsx examples/make-demo.ts [--out-dir <dir>]`.
 */
import { join, resolve, dirname } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { writeFilesAtomic, CodeweirError, isCodeweirError, seededRandom } from '../packages/core/src/index.ts';
import type { FindingRule } from '../packages/check/src/types.ts';

const HERE = dirname(fileURLToPath(import.meta.url));

export interface DemoOptions {
  /** Folder to write into; default the folder of this script (`examples/`). */
  outDir?: string;
  /** Households in the main delivery; default 4000. */
  rows?: number;
  /** Households in the semicolon delivery; default 300. */
  semicolonRows?: number;
  /** PRNG seed; default 20260301. */
  seed?: number;
}

/** The finding rule a checker must report for a planted fault (names from the check contract). */
export type FaultRule = FindingRule;

export interface PlantedFault {
  /** 1-based data row (the header is not counted). */
  row: number;
  /** Column name; the rule id for `rule-failed`; null for `ragged-row`. */
  item: string | null;
  rule: FaultRule;
  severity: 'error' | 'warning';
  /** The cell as delivered; null for `ragged-row` and `rule-failed` (see `cells`). */
  value: string | null;
  /** For `unbinned-value`: the code of the bin the raw quantity belongs to, as the findings log writes it. */
  suggestion?: string;
  /** For `rule-failed`: the cells the rule reads, as delivered. */
  cells?: Record<string, string>;
  /** For `ragged-row`: how many fields the row has. */
  fields?: number;
}

export interface DemoContent {
  /** The main delivery as UTF-8 text. */
  delivery: string;
  faults: PlantedFault[];
  /** The semicolon delivery, already encoded as windows-1252 bytes. */
  semicolon: Uint8Array;
}

/** Column order of the codebook's `items`. */
export const COLUMNS = [
  'hh_id', 'district', 'team', 'int_date', 'weight', 'visit', 'hh_size', 'adults', 'children',
  'age', 'sex', 'edu', 'employed', 'work_hours', 'job_sector', 'school_kids', 'school_km',
  'water_src', 'water_km', 'market_trips', 'income', 'dwelling_year', 'life_rating',
  'sat_water', 'sat_health', 'sat_school', 'sat_roads', 'sat_safety', 'remarks',
] as const;
type Column = (typeof COLUMNS)[number];
const SAT = ['sat_water', 'sat_health', 'sat_school', 'sat_roads', 'sat_safety'] as const;


class Draw {
  private readonly u: () => number;
  constructor(seed: number) {
    this.u = seededRandom(seed);
  }
  uniform(): number {
    return this.u();
  }
  chance(p: number): boolean {
    return this.u() < p;
  }
  int(lo: number, hi: number): number {
    return lo + Math.floor(this.u() * (hi - lo + 1));
  }
  /** Standard normal by Box-Muller (one value per call; the partner is discarded for simplicity). */
  normal(): number {
    const u1 = 1 - this.u();
    return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * this.u());
  }
  /** Poisson by Knuth's product method (fine for the small means used here). */
  poisson(mean: number): number {
    const l = Math.exp(-mean);
    let k = 0;
    let p = 1;
    do {
      k++;
      p *= this.u();
    } while (p > l);
    return k - 1;
  }
  lognormal(median: number, sigma: number): number {
    return median * Math.exp(sigma * this.normal());
  }
  pick<T>(values: readonly T[], weights: readonly number[]): T {
    const total = weights.reduce((a, b) => a + b, 0);
    let r = this.u() * total;
    for (let i = 0; i < values.length; i++) {
      r -= weights[i];
      if (r < 0) return values[i];
    }
    return values[values.length - 1];
  }
}

const clamp = (x: number, lo: number, hi: number): number => Math.min(hi, Math.max(lo, x));

/** A household as numbers and codes; missing codes are stored as the code itself. */
interface Household {
  cells: Record<Column, string>;
  employed: number;
  children: number;
  adults: number;
  hhSize: number;
  age: number;
  edu: number;
}

const DISTRICT_SHARE = [0.2, 0.18, 0.16, 0.16, 0.15, 0.15];
/** Multiplier on every missing-code rate by field team: teams 7 and 10 are much worse. */
const TEAM_QUALITY = [1, 0.8, 0.5, 1.2, 1, 1.4, 3, 1, 0.9, 2.5, 1.1, 0.7];
const WEIGHT_BASE = [180, 240, 310, 420, 520, 760];
const CHILD_MEAN = [1.2, 1.5, 2.6, 1.9, 2.2, 2.4];
const TRIP_MEAN = [2.5, 4, 6, 3, 8, 5];
const INCOME_MEDIAN = [11000, 9500, 6000, 8000, 7000, 5200];
const LIFE_SHIFT = [0.6, 0.3, -0.5, 0, 0.2, -0.4];
const EDU_SHIFT = [0.5, 0.3, -0.6, 0, -0.1, -0.4];
const WATER_SOURCES = ['PIPE', 'TAP', 'WELL', 'RAIN', 'RIVER', 'VEND'] as const;
const WATER_SHARE = [
  [0.55, 0.25, 0.1, 0.03, 0.02, 0.05],
  [0.4, 0.3, 0.15, 0.05, 0.05, 0.05],
  [0.1, 0.2, 0.35, 0.1, 0.2, 0.05],
  [0.25, 0.3, 0.25, 0.1, 0.05, 0.05],
  [0.3, 0.2, 0.2, 0.15, 0.05, 0.1],
  [0.05, 0.15, 0.4, 0.15, 0.2, 0.05],
];
const SECTOR_SHARE = [
  [0.15, 0.3, 0.15, 0.2, 0.2],
  [0.25, 0.25, 0.2, 0.15, 0.15],
  [0.55, 0.15, 0.15, 0.08, 0.07],
  [0.35, 0.2, 0.2, 0.12, 0.13],
  [0.4, 0.25, 0.15, 0.1, 0.1],
  [0.6, 0.12, 0.12, 0.08, 0.08],
];
const DISTRICT_NAMES = ['Aldersée', 'Brønnvik', 'Castañar', 'Dûnmoor', 'Eskdal', 'Fjällby'];
const REMARKS = [
  'Dog at the gate, interview held in the yard',
  'Respondent busy; second visit arranged',
  'Neighbour translated some answers',
  'Respondent asked what "household" means here',
  'Shared compound with two other households',
  'Respondent is the sister of the household head',
  'Radio loud during interview',
];
const PLACE_REMARKS = [
  'Road to {d} flooded, came back next day',
  'Market day in {d}, many households away',
  'Household moved here from {d} last year',
];
/** The first interview day: 2 March 2026 (UTC). */
const FIELDWORK_START = Date.UTC(2026, 2, 2);
const FIELDWORK_DAYS = 88;

function tripsCode(count: number): number {
  if (count === 0) return 1;
  if (count <= 3) return 2;
  if (count <= 7) return 3;
  if (count <= 14) return 4;
  return 5;
}

interface Formats {
  decimal: (x: number, places: number) => string;
}

/** Draws one clean household: consistent with routing, rules, ranges and soft bounds. */
function household(d: Draw, i: number, n: number, serials: number[], fmt: Formats, placeRemarkRate: number): Household {
  const district = d.pick([1, 2, 3, 4, 5, 6], DISTRICT_SHARE);
  const k = district - 1;
  const team = 2 * district - 1 + (d.chance(0.5) ? 0 : 1);
  const q = TEAM_QUALITY[team - 1];
  serials[k] += d.int(1, 3);
  const id = `D${district}-${String(serials[k]).padStart(5, '0')}`;
  const day = clamp(Math.floor((i / n) * FIELDWORK_DAYS) + d.int(-2, 2), 0, FIELDWORK_DAYS);
  const date = new Date(FIELDWORK_START + day * 86_400_000).toISOString().slice(0, 10);
  const weight = clamp(d.lognormal(WEIGHT_BASE[k], 0.25), 25, 1900);
  const visit = d.chance(0.006 * q) ? -5 : d.pick([1, 2, 3], [0.74, 0.19, 0.07]);

  const adults = clamp(1 + d.poisson(1.1), 1, 8);
  const children = clamp(d.poisson(CHILD_MEAN[k]), 0, 7);
  const hhSize = adults + children + (d.chance(0.03) ? 1 : 0);
  const hhSizeCell = d.chance(0.002 * q) ? -8 : hhSize;
  const adultsCell = d.chance(0.002 * q) ? -8 : adults;
  const childrenCell = d.chance(0.002 * q) ? -8 : children;

  let age = clamp(Math.round(44 + 15 * d.normal()), 16, 92);
  const ageCell = d.chance(0.004 * q) ? -9 : d.chance(0.003 * q) ? -8 : age;
  const sex = d.chance(0.002 * q) ? -9 : d.chance(0.47) ? 1 : 2;
  const eduLatent = d.normal() + EDU_SHIFT[k] - (age - 40) / 30;
  let edu = eduLatent < -1.2 ? 0 : eduLatent < -0.4 ? 1 : eduLatent < 0.5 ? 2 : eduLatent < 1.3 ? 3 : 4;
  if (edu === 4 && age < 18) edu = 3;
  const eduCell = d.chance(0.004 * q) ? -8 : d.chance(0.002 * q) ? -9 : edu;
  if (ageCell < 0) age = ageCell;
  const employed = d.chance(0.003 * q) ? -8 : d.chance(0.003 * q) ? -9 : d.chance(age > 65 ? 0.3 : 0.62) ? 1 : 2;

  const asked = employed === 1;
  const workHours = asked ? (d.chance(0.02 * q) ? -8 : d.chance(0.005 * q) ? -9 : clamp(Math.round(42 + 12 * d.normal()), 4, 80)) : -7;
  const jobSector = asked ? (d.chance(0.01 * q) ? -8 : d.pick([1, 2, 3, 4, 5], SECTOR_SHARE[k])) : -7;

  const routedToSchool = childrenCell > 0;
  let pupils = 0;
  for (let c = 0; c < children; c++) if (d.chance(0.82)) pupils++;
  const schoolKids = routedToSchool ? (d.chance(0.01 * q) ? -8 : pupils) : -7;
  const schoolKmValue = clamp(d.lognormal(1.6, 0.75), 0.1, 19.5);
  const schoolKm = routedToSchool ? (d.chance(0.03 * q) ? -8 : schoolKmValue) : -7;

  const src = d.chance(0.004 * q) ? 'DK' : d.chance(0.002 * q) ? 'NR' : d.pick(WATER_SOURCES, WATER_SHARE[k]);
  let waterKmValue: number;
  switch (src) {
    case 'PIPE':
    case 'RAIN':
      waterKmValue = 0;
      break;
    case 'TAP':
      waterKmValue = 0.05 + 0.85 * d.uniform();
      break;
    case 'WELL':
      waterKmValue = d.lognormal(0.6, 0.6);
      break;
    case 'RIVER':
      waterKmValue = d.lognormal(1.8, 0.6);
      break;
    case 'VEND':
      waterKmValue = 0.5 * d.uniform();
      break;
    default:
      waterKmValue = d.lognormal(0.8, 0.8);
  }
  const waterKm = d.chance(0.01 * q) ? -8 : clamp(waterKmValue, 0, 7.9);

  const trips = d.poisson(TRIP_MEAN[k] * Math.exp(0.5 * d.normal()));
  const tripsCell = d.chance(0.01 * q) ? -8 : tripsCode(trips);

  const incomeValue = d.chance(0.02) ? 0 : Math.round(clamp(d.lognormal(INCOME_MEDIAN[k], 0.7), 50, 59000) / 10) * 10;
  const income = d.chance(0.03 * q) ? -9 : d.chance(0.025 * q) ? -8 : incomeValue;

  const built = clamp(2026 - Math.floor(-25 * Math.log(1 - d.uniform())), 1921, 2026);
  const dwellingYear = d.chance(0.08 * q) ? 9998 : d.chance(0.005 * q) ? 9999 : built;
  const life = d.chance(0.015 * q) ? -8 : d.chance(0.005 * q) ? -9 : clamp(Math.round(5.6 + LIFE_SHIFT[k] + 2 * d.normal()), 0, 10);

  const latent = d.normal();
  const sat: number[] = SAT.map((_, j) => {
    const v = clamp(Math.round(3.2 + 0.8 * latent + 0.7 * d.normal() + [-0.3, 0, 0.2, -0.6, 0.3][j]), 1, 5);
    return d.chance(0.02 * q) ? 8 : d.chance(0.007 * q) ? 9 : d.chance(0.004 * q) ? 6 : v;
  });
  // Team 8 sometimes skipped the whole satisfaction module; a cut-short interview leaves its tail unreached.
  if (d.chance(team === 8 ? 0.15 : 0.01)) sat.fill(7);
  else if (d.chance(0.006 * q)) sat.fill(0, 5 - d.int(1, 3));

  let remarks = '';
  if (d.chance(placeRemarkRate)) remarks = PLACE_REMARKS[d.int(0, PLACE_REMARKS.length - 1)].replace('{d}', DISTRICT_NAMES[d.int(0, 5)]);
  else if (d.chance(0.05)) remarks = REMARKS[d.int(0, REMARKS.length - 1)];

  const num = (v: number, places: number): string => (v < 0 ? String(v) : fmt.decimal(v, places));
  const cells: Record<Column, string> = {
    hh_id: id,
    district: String(district),
    team: String(team),
    int_date: date,
    weight: fmt.decimal(weight, 2),
    visit: String(visit),
    hh_size: String(hhSizeCell),
    adults: String(adultsCell),
    children: String(childrenCell),
    age: String(ageCell),
    sex: String(sex),
    edu: String(eduCell),
    employed: String(employed),
    work_hours: String(workHours),
    job_sector: String(jobSector),
    school_kids: String(schoolKids),
    school_km: num(schoolKm, 1),
    water_src: src,
    water_km: num(waterKm, 2),
    market_trips: String(tripsCell),
    income: num(income, 2),
    dwelling_year: String(dwellingYear),
    life_rating: String(life),
    sat_water: String(sat[0]),
    sat_health: String(sat[1]),
    sat_school: String(sat[2]),
    sat_roads: String(sat[3]),
    sat_safety: String(sat[4]),
    remarks,
  };
  return { cells, employed, children: childrenCell, adults: adultsCell, hhSize: hhSizeCell, age: ageCell, edu: eduCell };
}

const valid = (x: number): boolean => x >= 0;

/** One kind of planted fault: where it may go (`fits`) and what it writes (`plant`). */
interface FaultSpec {
  rule: FaultRule;
  item: Column | string;
  severity: 'error' | 'warning';
  fits: (h: Household) => boolean;
  /** Changes the household's cells; returns the cell value as delivered, or null. */
  plant: (h: Household) => string | null;
  suggestion?: number;
  /** For rule-failed: the cells the rule reads. */
  reads?: Column[];
}

const anyRow = (): boolean => true;
/** Writes a fixed value into the spec's item. */
function cell(rule: FaultRule, item: Column, value: string, fits: (h: Household) => boolean = anyRow, suggestion?: number): FaultSpec {
  const severity = rule === 'implausible' || rule === 'blank-when-asked' ? 'warning' : 'error';
  return {
    rule, item, severity, fits, suggestion,
    plant: (h) => {
      h.cells[item] = value;
      return value;
    },
  };
}

// A changed age must not meet `edu == 4` (the college-age rule) on the same row.
const notCollege = (h: Household): boolean => h.edu !== 4;
const isEmployed = (h: Household): boolean => h.employed === 1 && valid(Number(h.cells.work_hours));
const notEmployed = (h: Household): boolean => h.employed === 2;
const hasChildren = (h: Household): boolean => h.children > 0 && valid(Number(h.cells.school_kids)) && valid(Number(h.cells.school_km));
const noChildren = (h: Household): boolean => h.children === 0;

/** The planted faults, in the order they are placed. Values are chosen so trimming surrounding spaces or not gives the same rule. */
const FAULTS: FaultSpec[] = [
  cell('not-a-code', 'sex', '3'),
  cell('not-a-code', 'sex', ' 3 '),
  cell('not-a-code', 'sex', '0'),
  cell('not-a-code', 'edu', '5'),
  cell('not-a-code', 'edu', '9'),
  cell('not-a-code', 'visit', '4'),
  cell('not-a-code', 'team', '13'),
  cell('not-a-code', 'job_sector', '6', isEmployed),
  cell('not-a-code', 'water_src', 'pipe'),
  cell('not-a-code', 'water_src', ' BORE'),
  cell('not-a-code', 'sat_health', '10'),
  cell('not-a-code', 'sat_roads', '-1'),
  cell('not-a-number', 'income', '12k'),
  cell('not-a-number', 'age', '  forty ', notCollege),
  cell('not-a-number', 'water_km', 'n/a'),
  cell('not-a-number', 'life_rating', 'six'),
  cell('not-a-number', 'weight', 'NA'),
  cell('not-a-number', 'dwelling_year', '1990s'),
  cell('not-a-date', 'int_date', '14/03/2026'),
  cell('not-an-integer', 'age', '34.5', notCollege),
  cell('not-an-integer', 'dwelling_year', '1987.5'),
  cell('not-an-integer', 'life_rating', '7.5'),
  cell('not-an-integer', 'hh_size', '4.5'),
  cell('not-an-integer', 'work_hours', '37.5', isEmployed),
  cell('unbinned-value', 'market_trips', '6', anyRow, 3),
  cell('unbinned-value', 'market_trips', '10', anyRow, 4),
  cell('unbinned-value', 'market_trips', '12', anyRow, 4),
  cell('unbinned-value', 'market_trips', '9', anyRow, 4),
  cell('unbinned-value', 'market_trips', '15', anyRow, 5),
  cell('unbinned-value', 'market_trips', '22', anyRow, 5),
  cell('impossible', 'age', '7', notCollege),
  cell('impossible', 'age', '130', notCollege),
  cell('impossible', 'water_km', '75'),
  cell('impossible', 'work_hours', '200', isEmployed),
  cell('impossible', 'dwelling_year', '2031'),
  cell('impossible', 'income', '-500'),
  cell('impossible', 'school_km', '140.0', hasChildren),
  cell('impossible', 'weight', '-3.20'),
  cell('implausible', 'age', '101', notCollege),
  cell('implausible', 'weight', '2600.00'),
  cell('implausible', 'water_km', '12.5'),
  cell('implausible', 'school_km', '35.0', hasChildren),
  cell('implausible', 'income', '250000.00'),
  cell('implausible', 'hh_size', '19', (h) => valid(h.hhSize) && valid(h.adults) && valid(h.children)),
  cell('implausible', 'dwelling_year', '1890'),
  cell('implausible', 'work_hours', '96', isEmployed),
  cell('answered-when-skipped', 'work_hours', '38', notEmployed),
  cell('answered-when-skipped', 'work_hours', '45', notEmployed),
  cell('answered-when-skipped', 'job_sector', '2', notEmployed),
  cell('answered-when-skipped', 'school_kids', '1', noChildren),
  cell('answered-when-skipped', 'school_km', '2.5', noChildren),
  cell('blank-when-asked', 'work_hours', '', isEmployed),
  cell('blank-when-asked', 'job_sector', '', isEmployed),
  cell('blank-when-asked', 'school_kids', '', hasChildren),
  cell('blank-when-asked', 'school_km', '', hasChildren),
  ...(['lower', 'drop', 'space', 'digit'] as const).map(
    (how): FaultSpec => ({
      rule: 'pattern-mismatch', item: 'hh_id', severity: 'error', fits: anyRow,
      plant: (h) => {
        const id = h.cells.hh_id;
        const bad =
          how === 'lower' ? id.toLowerCase() : how === 'drop' ? id.slice(0, 3) + id.slice(4) : how === 'space' ? id.replace('-', ' ') : `D7${id.slice(2)}`;
        h.cells.hh_id = bad;
        return bad;
      },
    }),
  ),
  ...[0, 1].flatMap((): FaultSpec[] => [
    {
      rule: 'rule-failed', item: 'size-covers-members', severity: 'error', reads: ['hh_size', 'adults', 'children'],
      fits: (h) => valid(h.hhSize) && valid(h.adults) && valid(h.children) && h.adults + h.children >= 2,
      plant: (h) => {
        h.cells.hh_size = String(h.adults + h.children - 1);
        return null;
      },
    },
    {
      rule: 'rule-failed', item: 'pupils-within-children', severity: 'error', reads: ['children', 'school_kids'],
      fits: hasChildren,
      plant: (h) => {
        h.cells.school_kids = String(h.children + 1);
        return null;
      },
    },
    {
      rule: 'rule-failed', item: 'college-age', severity: 'warning', reads: ['edu', 'age'],
      fits: (h) => valid(h.age) && valid(h.edu),
      plant: (h) => {
        h.cells.edu = '4';
        h.cells.age = '17';
        return null;
      },
    },
    {
      rule: 'rule-failed', item: 'workers-work-hours', severity: 'warning', reads: ['employed', 'work_hours'],
      fits: isEmployed,
      plant: (h) => {
        h.cells.work_hours = '0';
        return null;
      },
    },
  ]),
];
const DUPLICATE_IDS = 4;

function csvField(value: string, delimiter: string): string {
  return value.includes(delimiter) || value.includes('"') || value.includes('\n') || value.includes('\r')
    ? `"${value.replaceAll('"', '""')}"`
    : value;
}

function csvLine(values: readonly string[], delimiter: string): string {
  return values.map((v) => csvField(v, delimiter)).join(delimiter);
}

/** windows-1252 agrees with Unicode on U+00A0..U+00FF and ASCII; the demo text uses nothing else. */
function encodeWindows1252(text: string): Uint8Array {
  const out = new Uint8Array(text.length);
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c > 0xff || (c >= 0x80 && c < 0xa0)) {
      throw new CodeweirError('CW_ENCODING', `The semicolon demo holds a character (U+${c.toString(16)}) this encoder does not map to windows-1252.`);
    }
    out[i] = c;
  }
  return out;
}

/**
 * Builds the demo files in memory (no file access). Deterministic: the same options give the
 * same strings and bytes. Cost: linear in the row counts (4,300 households by default).
 * Throws CodeweirError CW_USAGE when the main delivery is too small to hold the planted faults.
 */
export function buildDemo(options: DemoOptions = {}): DemoContent {
  const n = options.rows ?? 4000;
  const seed = options.seed ?? 20260301;
  const needed = FAULTS.length + 2 * DUPLICATE_IDS + 2;
  if (!Number.isInteger(n) || n < needed * 4) {
    throw new CodeweirError('CW_USAGE', `The demo needs at least ${needed * 4} rows to spread its planted faults, got ${n}.`);
  }
  const d = new Draw(seed);
  const point: Formats = { decimal: (x, p) => x.toFixed(p) };
  const serials = [100, 100, 100, 100, 100, 100];
  const rows: Household[] = [];
  for (let i = 0; i < n; i++) rows.push(household(d, i, n, serials, point, 0.015));

  // Every fault gets its own row, so no two faults share a row and none can trip another.
  const used = new Set<number>();
  const faults: PlantedFault[] = [];
  const freeRow = (fits: (h: Household) => boolean): number => {
    for (;;) {
      const r = d.int(0, n - 1);
      if (!used.has(r) && fits(rows[r])) {
        used.add(r);
        return r;
      }
    }
  };
  for (const spec of FAULTS) {
    const r = freeRow(spec.fits);
    const h = rows[r];
    const value = spec.plant(h);
    const f: PlantedFault = { row: r + 1, item: spec.item, rule: spec.rule, severity: spec.severity, value };
    if (spec.suggestion !== undefined) f.suggestion = String(spec.suggestion);
    if (spec.reads) f.cells = Object.fromEntries(spec.reads.map((c) => [c, h.cells[c]]));
    faults.push(f);
  }
  for (let k = 0; k < DUPLICATE_IDS; k++) {
    // A repeated listing number: a later household carries an earlier household's id.
    const a = freeRow(anyRow);
    const b = freeRow(anyRow);
    const [first, later] = a < b ? [a, b] : [b, a];
    rows[later].cells.hh_id = rows[first].cells.hh_id;
    faults.push({ row: later + 1, item: 'hh_id', rule: 'duplicate-id', severity: 'error', value: rows[first].cells.hh_id });
  }

  const lines = [csvLine(COLUMNS, ',')];
  for (const h of rows) lines.push(csvLine(COLUMNS.map((c) => h.cells[c]), ','));
  // Ragged rows: one where a remark's comma went out unquoted, one that lost its last field.
  const long = freeRow(anyRow);
  lines[long + 1] = COLUMNS.map((c) => (c === 'remarks' ? 'Rain, interview moved indoors' : csvField(rows[long].cells[c], ','))).join(',');
  faults.push({ row: long + 1, item: null, rule: 'ragged-row', severity: 'error', value: null, fields: COLUMNS.length + 1 });
  const short = freeRow(anyRow);
  lines[short + 1] = csvLine(COLUMNS.slice(0, -1).map((c) => rows[short].cells[c]), ',');
  faults.push({ row: short + 1, item: null, rule: 'ragged-row', severity: 'error', value: null, fields: COLUMNS.length - 1 });
  faults.sort((x, y) => x.row - y.row);

  const comma: Formats = { decimal: (x, p) => x.toFixed(p).replace('.', ',') };
  const m = options.semicolonRows ?? 300;
  const semiSerials = [100, 100, 100, 100, 100, 100];
  const semiLines = [csvLine(COLUMNS, ';')];
  for (let i = 0; i < m; i++) {
    const h = household(d, i, m, semiSerials, comma, 0.15);
    semiLines.push(csvLine(COLUMNS.map((c) => h.cells[c]), ';'));
  }

  return {
    delivery: lines.join('\n') + '\n',
    faults,
    semicolon: encodeWindows1252(semiLines.join('\r\n') + '\r\n'),
  };
}

/** The manifest text: a JSON array, one fault a line, so diffs stay readable. */
export function faultsJson(faults: readonly PlantedFault[]): string {
  return '[\n' + faults.map((f) => '  ' + JSON.stringify(f)).join(',\n') + '\n]\n';
}

export const DEMO_FILES = {
  delivery: 'demo-delivery.csv',
  faults: 'demo-faults.json',
  semicolon: 'demo-delivery-semicolon.csv',
} as const;

/**
 * Builds the demo files and writes them together into `outDir` (atomically: all or none).
 * Resolves to the paths written. Throws CodeweirError CW_USAGE (bad options) or
 * CW_WRITE_FAILED (the folder cannot be written).
 */
export async function makeDemo(options: DemoOptions = {}): Promise<string[]> {
  const outDir = resolve(options.outDir ?? HERE);
  const c = buildDemo(options);
  const files: Array<[string, string | Uint8Array]> = [
    [join(outDir, DEMO_FILES.delivery), c.delivery],
    [join(outDir, DEMO_FILES.faults), faultsJson(c.faults)],
    [join(outDir, DEMO_FILES.semicolon), c.semicolon],
  ];
  await writeFilesAtomic(files);
  return files.map(([p]) => p);
}

function parseArgs(argv: string[]): DemoOptions {
  const o: DemoOptions = {};
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--out-dir' && argv[i + 1] !== undefined) o.outDir = argv[++i];
    else if (a.startsWith('--out-dir=')) o.outDir = a.slice('--out-dir='.length);
    else throw new CodeweirError('CW_USAGE', `make-demo takes only --out-dir <folder>, got ${JSON.stringify(a)}.`);
  }
  return o;
}

async function main(): Promise<void> {
  try {
    const written = await makeDemo(parseArgs(process.argv.slice(2)));
    for (const p of written) process.stderr.write(`wrote ${p}\n`);
  } catch (e) {
    process.stderr.write(`make-demo: ${isCodeweirError(e) ? e.message : (e as Error).message}\n`);
    process.exitCode = isCodeweirError(e) ? e.exitCode : 2;
  }
}

// No top-level await, so the module also loads where it is required rather than imported.
if (process.argv[1] && import.meta.url === pathToFileURL(resolve(process.argv[1])).href) void main();
