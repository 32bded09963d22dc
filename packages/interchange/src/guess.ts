/**
 * What an import could not read for certain: each guess is recorded (item, field, value,
 * reason) and marked in the item's label as a `[check: ...]` suffix, the way `codeweir draft`
 * marks its guesses, so that a person confirms every one before the codebook is used.
 */
import type { ItemType, Label, Level, MissingKind } from '@codeweir/codebook';

/** One guess about one item (or, with `item` empty, about the codebook), for a person to confirm. */
export interface ImportGuess {
  item: string;
  field: string;
  value: unknown;
  reason: string;
}

/** Kinds of missingness recognised from a missing code's label (common practice wording). */
const KIND_WORDS: ReadonlyArray<[RegExp, MissingKind]> = [
  [/\b(don'?t know|do not know|dk|does not know|not known)\b/i, 'dont-know'],
  [/\b(refus\w*|declined|no answer given by choice)\b/i, 'refused'],
  [/\b(not applicable|n\/a|inapplicable|valid skip|skipped)\b/i, 'not-applicable'],
  [/\b(not administered|not asked)\b/i, 'not-administered'],
  [/\b(not reached|interview ended|break-?off)\b/i, 'not-reached'],
  [/\b(invalid|two boxes|multiple (answers|boxes))\b/i, 'invalid'],
  [/\b(omitted|no answer|no response|missing|blank)\b/i, 'omitted'],
];

/**
 * The kind of missingness a label's wording suggests, or undefined when none fits. The first
 * matching wording wins, in the order above. Pure.
 */
export function kindFromLabel(label: string | undefined): MissingKind | undefined {
  if (label === undefined) return undefined;
  for (const [re, kind] of KIND_WORDS) if (re.test(label)) return kind;
  return undefined;
}

/** Words a variable list may use for a type, read as our types. */
export const TYPE_WORDS: Readonly<Record<string, { type: ItemType; exact: boolean }>> = {
  integer: { type: 'integer', exact: true },
  decimal: { type: 'decimal', exact: true },
  text: { type: 'text', exact: true },
  date: { type: 'date', exact: true },
  int: { type: 'integer', exact: false },
  whole: { type: 'integer', exact: false },
  count: { type: 'integer', exact: false },
  number: { type: 'decimal', exact: false },
  numeric: { type: 'decimal', exact: false },
  float: { type: 'decimal', exact: false },
  double: { type: 'decimal', exact: false },
  real: { type: 'decimal', exact: false },
  string: { type: 'text', exact: false },
  character: { type: 'text', exact: false },
  char: { type: 'text', exact: false },
};

/** Words a variable list may use for a level of measurement, read as our levels. */
export const LEVEL_WORDS: Readonly<Record<string, { level: Level; exact: boolean }>> = {
  nominal: { level: 'nominal', exact: true },
  ordinal: { level: 'ordinal', exact: true },
  interval: { level: 'interval', exact: true },
  ratio: { level: 'ratio', exact: true },
  categorical: { level: 'nominal', exact: false },
  scale: { level: 'ratio', exact: false },
  continuous: { level: 'ratio', exact: false },
  metric: { level: 'ratio', exact: false },
  percent: { level: 'ratio', exact: false },
};

/**
 * Collects guesses and writes the `[check: ...]` marks into labels at the end. A label given
 * in several languages gets the mark in each.
 */
export class Guesses {
  readonly list: ImportGuess[] = [];
  private readonly notes = new Map<string, string[]>();

  add(item: string, field: string, value: unknown, reason: string, note: string): void {
    this.list.push({ item, field, value, reason });
    const n = this.notes.get(item) ?? [];
    n.push(note);
    this.notes.set(item, n);
  }

  /** The label with this item's marks appended (unchanged when there are none). */
  mark(item: string, label: Label): Label {
    const n = this.notes.get(item);
    if (!n || n.length === 0) return label;
    const suffix = ` [check: ${n.join('; ')}]`;
    if (typeof label === 'string') return `${label}${suffix}`;
    return Object.fromEntries(Object.entries(label).map(([k, v]) => [k, `${v}${suffix}`]));
  }

  /** Marks gathered for an item (the codebook's own under ''). */
  marksOf(item: string): readonly string[] {
    return this.notes.get(item) ?? [];
  }
}
