/**
 * From a column profile to a draft codebook item. Every decision is a guess that a person must
 * confirm, so each one is recorded (field, value, reason) and summarised in the item's label as
 * a `[check: ...]` suffix.
 */
import type { ItemType, Level, MissingKind, Role } from '@codeweir/codebook';
import type { ColumnProfile } from './profile.ts';
import { numericMissingCandidates, textMissingCandidates, type MissingGuess } from './missing.ts';

export type GuessField = 'name' | 'type' | 'role' | 'level' | 'codes' | 'missing' | 'pattern';

/** One guess about one item, for a person to confirm. */
export interface DraftGuess {
  item: string;
  field: GuessField;
  value: unknown;
  reason: string;
}

export interface DraftCode {
  code: number | string;
  label: string;
}

export interface DraftMissingCode {
  code: number | string;
  kind: MissingKind;
  label: string;
}

/** A draft item: the codebook format's item fields that a draft can fill. */
export interface DraftItem {
  name: string;
  label: string;
  role?: Role;
  type: ItemType;
  level?: Level;
  codes?: DraftCode[];
  missing?: string | DraftMissingCode[];
  pattern?: string;
}

export interface InferOptions {
  /** Most distinct values for a column to get a code list; default 12. */
  maxCodes: number;
  /** Most distinct values for a group-named column (team, district, ...) to get a code list; default 60. */
  maxGroupCodes: number;
}

/**
 * Share of non-blank cells that must be numbers (or dates) for a numeric (date) type: the rest
 * are taken as typing errors a check will report. Our own threshold: a column with 2 in 100
 * cells of text is far more often a numeric column with typos than a text column.
 */
export const TYPE_SHARE = 0.98;
/** Largest share of numbers written with a decimal mark that still makes an integer column (typos such as 34.5). */
export const FRACTION_SHARE = 0.005;
/** Largest share of repeated values in an identifier column (a few duplicated ids are a finding, not a reason to drop the role). */
export const REPEAT_SHARE = 0.01;

const CODE_LABEL = 'to confirm';
/** Names that suggest a record identifier. */
export const ID_NAME = /(^|[^a-z])id([^a-z]|$)/i;
const GROUP_NAME = /(^|[^a-z])(team|district|region|site|province|county|cluster|area|zone|village|ward|interviewer|enumerator|stratum|psu)s?([^a-z]|$)/i;
const WEIGHT_NAME = /(^|[^a-z])(weight|wgt|wt)s?([^a-z]|$)/i;
const COMMA_DECIMAL = /^[+-]?\d+,\d+$/;

/** Up to three example values, most frequent first, quoted for a label. */
function examples(values: ReadonlyMap<string, number> | readonly string[]): string {
  const list = Array.isArray(values)
    ? [...values]
    : [...(values as ReadonlyMap<string, number>).entries()].sort((a, b) => b[1] - a[1]).map(([v]) => v);
  return list
    .slice(0, 3)
    .map((v) => JSON.stringify(v))
    .join(', ');
}

function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

/** A whole-value pattern from a text shape: runs of digits and letters become classes with counts. */
export function patternFromShape(shape: string): string {
  let out = '^';
  for (let i = 0; i < shape.length; ) {
    const ch = shape[i];
    let j = i;
    while (j < shape.length && shape[j] === ch) j++;
    const n = j - i;
    const cls = ch === '9' ? '[0-9]' : ch === 'A' ? '[A-Z]' : ch === 'a' ? '[a-z]' : ch.replace(/[\\^$.*+?()[\]{}|/]/g, '\\$&');
    out += n === 1 ? cls : `${cls}{${n}}`;
    i = j;
  }
  return out + '$';
}

interface TypeGuess {
  type: ItemType;
  reason: string;
}

function guessType(p: ColumnProfile, textMissing: number): TypeGuess {
  const filled = p.filled - textMissing;
  if (filled === 0) return { type: 'text', reason: 'the column is empty' };
  const stray = (n: number, what: string, shown: string): string => (n === 0 ? '' : `; ${plural(n, 'cell')} ${what} (${shown})`);
  if (p.dates >= TYPE_SHARE * filled) {
    return { type: 'date', reason: `YYYY-MM-DD dates${stray(filled - p.dates, 'not dates', examples(p.texts))}` };
  }
  if (p.numbers > 0 && p.numbers >= TYPE_SHARE * filled) {
    const notNumbers = stray(filled - p.numbers, 'not numbers', examples(p.texts));
    if (p.fractional <= FRACTION_SHARE * p.numbers) {
      return { type: 'integer', reason: `whole numbers${notNumbers}${stray(p.fractional, 'with a fraction', examples(p.fractionExamples))}` };
    }
    return { type: 'decimal', reason: `numbers with a decimal part${notNumbers}` };
  }
  let comma = 0;
  for (const [t, n] of p.texts) if (COMMA_DECIMAL.test(t)) comma += n;
  if (!p.decimalComma && comma > 0 && comma + p.numbers >= TYPE_SHARE * filled) {
    return { type: 'text', reason: 'numbers written with a decimal comma: draft again with the decimal comma option' };
  }
  return { type: 'text', reason: 'values are not numbers or dates' };
}

export interface Inferred {
  item: DraftItem;
  guesses: DraftGuess[];
  missing: MissingGuess[];
}

/**
 * Guesses one item from its profile. `isFirst` and `idTaken` steer the id-role guess (one id,
 * preferably the first column or one named like an id). Cost: O(distinct values) of the column.
 * Throws nothing.
 */
export function inferItem(p: ColumnProfile, o: InferOptions, isFirst: boolean, idTaken: boolean): Inferred {
  const guesses: DraftGuess[] = [];
  const notes: string[] = [];
  const guess = (field: GuessField, value: unknown, reason: string, note: string): void => {
    guesses.push({ item: p.name, field, value, reason });
    notes.push(note);
  };

  const textTokens = textMissingCandidates(p);
  const textMissingCells = textTokens.reduce((a, g) => a + g.count, 0);
  const { type, reason } = guessType(p, textMissingCells);
  guess('type', type, reason, `${type}: ${reason}`);
  const numeric = type === 'integer' || type === 'decimal';
  const missing = numeric ? numericMissingCandidates(p) : type === 'text' ? textTokens : [];
  const missingKeys = new Set(missing.map((m) => String(m.code)));

  // Valid distinct values: the remembered distinct cells minus missing codes and stray cells.
  let values: Array<number | string> | undefined;
  if (p.distinct) {
    if (type === 'integer') {
      const nums = new Set<number>();
      for (const t of p.distinct.keys()) {
        if (!/^[+-]?\d+$/.test(t)) continue;
        const v = Number(t);
        if (!missingKeys.has(String(v))) nums.add(v);
      }
      values = [...nums].sort((a, b) => a - b);
    } else if (type === 'text') {
      values = [...p.distinct.keys()].filter((t) => !missingKeys.has(t)).sort();
    }
  }
  const validCells = p.filled - missing.reduce((a, g) => a + g.count, 0);
  const groupNamed = GROUP_NAME.test(p.name) && (type === 'integer' || type === 'text');
  const cap = groupNamed ? o.maxGroupCodes : o.maxCodes;
  const coded = values !== undefined && values.length > 0 && values.length <= cap && validCells >= 2 * values.length;

  let role: Role = 'item';
  const fewRepeats = p.repeatsKnown && p.filled > 0 && p.repeats <= REPEAT_SHARE * p.filled && p.blank <= REPEAT_SHARE * p.cells;
  if (!idTaken && !coded && (type === 'text' || type === 'integer') && fewRepeats && p.filled > o.maxCodes && (isFirst || ID_NAME.test(p.name))) {
    role = 'id';
    const why = p.repeats === 0 ? 'every value is different' : `values almost never repeat (${plural(p.repeats, 'repeat')})`;
    guess('role', 'id', `${why} and the column is ${isFirst ? 'the first' : 'named like an identifier'}`, `id: ${why}`);
  } else if (groupNamed && coded) {
    role = 'group';
    guess('role', 'group', 'the name suggests a breakdown such as team, district or site', 'group: by its name');
  } else if (numeric && WEIGHT_NAME.test(p.name)) {
    role = 'weight';
    guess('role', 'weight', 'the name suggests a survey weight', 'weight: by its name');
  }

  const item: DraftItem = { name: p.name, label: '', type };
  if (role !== 'item') item.role = role;

  if (coded && values && role !== 'id' && role !== 'weight') {
    item.level = 'nominal';
    item.codes = values.map((code) => ({ code, label: CODE_LABEL }));
    const span = values.length <= 6 ? `codes ${values.map((v) => JSON.stringify(v)).join(', ')}` : plural(values.length, 'code');
    guess('codes', values, `${plural(values.length, 'distinct value')} (at most ${cap}): a closed list`, `${span} from the data, labels to write`);
    guess('level', 'nominal', 'few distinct values: unordered codes until a person says they are ordered', 'nominal; ordinal if the codes are a scale, ratio if they are counts');
  } else if (numeric && role !== 'id') {
    const min = p.low.find(([v]) => !missingKeys.has(String(v)))?.[0];
    const max = p.high.find(([v]) => !missingKeys.has(String(v)))?.[0];
    const negatives = p.negatives - missing.reduce((a, g) => a + (Number(g.code) < 0 ? g.count : 0), 0);
    if (type === 'integer' && min !== undefined && max !== undefined && min >= 1800 && max <= 2100 && role === 'item') {
      item.level = 'interval';
      guess('level', 'interval', `values ${min} to ${max} look like calendar years, which have no true zero`, 'interval: looks like years');
    } else if (min !== undefined && negatives <= FRACTION_SHARE * p.numbers) {
      // A stray negative (a typo a check reports as impossible) does not make an amount interval.
      item.level = 'ratio';
      const stray = negatives === 0 ? 'no value is negative' : `only ${plural(negatives, 'value')} below 0`;
      guess('level', 'ratio', `${stray} (${min} to ${max}): a count or amount with a true zero`, `ratio: counts or amounts${negatives ? `; ${plural(negatives, 'negative value')}` : ''}`);
    } else {
      item.level = 'interval';
      guess('level', 'interval', min === undefined ? 'no valid value to judge by' : `negative values occur (from ${min}): no true zero`, 'interval');
    }
  } else if (type === 'date') {
    item.level = 'interval';
    guess('level', 'interval', 'calendar dates have no true zero', 'interval');
  }

  if (missing.length > 0) {
    const list = missing.map((m) => `${m.code} ${m.kind}`).join(', ');
    const why = numeric
      ? 'conventional sentinel values sitting apart at the end of the column (common practice)'
      : 'conventional missing-answer tokens';
    guess('missing', missing.map((m) => ({ code: m.code, kind: m.kind })), why, `missing ${list}`);
  }

  if (type === 'text' && !coded && p.otherText + p.dates > 0) {
    const cells = p.filled - textMissingCells;
    let best: [string, number] | undefined;
    for (const e of p.shapes) if (!best || e[1] > best[1]) best = e;
    // A fixed layout shared by nearly every value (ids, area codes) becomes a pattern.
    if (best && best[0].length > 1 && best[1] >= (1 - REPEAT_SHARE) * cells && /[9Aa]/.test(best[0])) {
      item.pattern = patternFromShape(best[0]);
      const off = cells - best[1];
      guess('pattern', item.pattern, `${best[1]} of ${cells} values share this layout`, `pattern from the data${off ? `, ${plural(off, 'value')} off it` : ''}`);
    }
  }

  if (p.spaced > 0) notes.push(`${plural(p.spaced, 'cell')} with spaces around the value`);
  item.label = `${p.name} [check: ${notes.join('; ')}]`;
  return { item, guesses, missing };
}

/** The label a drafted missing code gets: its kind in words. */
export function missingLabel(kind: MissingKind): string {
  return `${kind.replaceAll('-', ' ')} (to confirm)`;
}

