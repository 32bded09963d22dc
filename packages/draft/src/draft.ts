/**
 * Drafting a first codebook from a delivery: one pass over the rows profiles every column, then
 * each column becomes an item of guesses (type, level, role, codes, missing codes, pattern)
 * for a person to confirm. Lists of missing codes shared by several items become named
 * `missingSets`.
 */
import type { Delivery } from '@codeweir/read';
import { CodeweirError } from '@codeweir/core';
import { ColumnProfile } from './profile.ts';
import { ID_NAME, inferItem, missingLabel, type DraftGuess, type DraftItem, type DraftMissingCode } from './infer.ts';
import type { MissingGuess } from './missing.ts';

export interface DraftOptions {
  /** Identifier of the drafted codebook (a slug); default from `source`, else "draft". */
  codebook?: string;
  /** Title; default "Draft codebook for <source>". */
  title?: string;
  /** Default "0.1.0". */
  version?: string;
  /** Name of the data the draft comes from (a file name), for the identifier and title. */
  source?: string;
  /** Most distinct values for a column to get a code list; default 12. */
  maxCodes?: number;
  /** Most distinct values for a group-named column to get a code list; default 60. */
  maxGroupCodes?: number;
  /** Read "3,5" as 3.5 (and a full stop as text), as check does with its decimal-comma option. */
  decimalComma?: boolean;
}

/** The drafted codebook, in the codebook format (valid against the shipped schema). */
export interface DraftCodebook {
  codebook: string;
  version: string;
  title: string;
  missingSets?: Record<string, DraftMissingCode[]>;
  items: DraftItem[];
}

export interface DraftResult {
  codebook: DraftCodebook;
  /** Every guess, item by item, with its reason: what a person must confirm. */
  guesses: DraftGuess[];
  /** Data rows read (header excluded). */
  rows: number;
  /** Rows with more or fewer fields than the header (extra fields ignored, absent ones blank). */
  raggedRows: number;
}

export interface RowsInput {
  header: readonly string[];
  rows: Iterable<readonly string[]>;
}

function normalizeOptions(o: DraftOptions): Required<Omit<DraftOptions, 'source' | 'codebook' | 'title'>> & DraftOptions {
  const count = (v: number | undefined, name: string, dflt: number): number => {
    if (v === undefined) return dflt;
    if (!Number.isInteger(v) || v < 1 || v > 1000) {
      throw new CodeweirError('CW_USAGE', `${name} takes a whole number from 1 to 1000, got ${String(v)}.`);
    }
    return v;
  };
  if (o.codebook !== undefined && !/^[A-Za-z0-9][A-Za-z0-9._-]*$/.test(o.codebook)) {
    throw new CodeweirError('CW_USAGE', `A codebook identifier takes letters, digits, dot, underscore and hyphen, got ${JSON.stringify(o.codebook)}.`);
  }
  return {
    ...o,
    version: o.version ?? '0.1.0',
    maxCodes: count(o.maxCodes, 'maxCodes', 12),
    maxGroupCodes: count(o.maxGroupCodes, 'maxGroupCodes', 60),
    decimalComma: o.decimalComma ?? false,
  };
}

/** A slug for the identifier: the source's base name without extension, lower-cased. */
function slugOf(source: string | undefined): string {
  const base = (source ?? '').split(/[\\/]/).pop() ?? '';
  const stem = base.replace(/\.[^.]*$/, '').toLowerCase().replace(/[^a-z0-9._-]+/g, '-').replace(/^[^a-z0-9]+/, '');
  return stem.length > 0 ? stem : 'draft';
}

/** Item names from header cells: trimmed, empty ones numbered, repeats suffixed. */
function itemNames(header: readonly string[]): { names: string[]; renamed: DraftGuess[] } {
  const names: string[] = [];
  const renamed: DraftGuess[] = [];
  const used = new Set<string>();
  header.forEach((h, i) => {
    let name = h.trim();
    let why = '';
    if (name.length === 0) {
      name = `column_${i + 1}`;
      why = `the header of column ${i + 1} is empty`;
    }
    if (used.has(name)) {
      let k = 2;
      while (used.has(`${name}_${k}`)) k++;
      why = `the header ${JSON.stringify(name)} repeats (column ${i + 1})`;
      name = `${name}_${k}`;
    }
    used.add(name);
    names.push(name);
    if (why) renamed.push({ item: name, field: 'name', value: name, reason: `${why}: renamed; a delivery must use this name` });
  });
  return { names, renamed };
}

/** The streaming part of a draft: feed rows, then finish. */
export class Drafter {
  private readonly profiles: ColumnProfile[];
  private readonly renamed: DraftGuess[];
  private readonly options: ReturnType<typeof normalizeOptions>;
  rows = 0;
  raggedRows = 0;

  /** Throws CodeweirError CW_USAGE for bad options. */
  constructor(header: readonly string[], options: DraftOptions = {}) {
    this.options = normalizeOptions(options);
    const { names, renamed } = itemNames(header);
    this.renamed = renamed;
    // Only the first column and id-named ones can become the id, so only they pay for counting repeats.
    this.profiles = names.map((n, i) => new ColumnProfile(n, this.options.decimalComma, i === 0 || ID_NAME.test(n)));
  }

  /** Adds one row given as `fields[start] .. fields[end - 1]` (a flat batch slice). */
  addFields(fields: readonly string[], start: number, end: number): void {
    this.rows++;
    const width = end - start;
    if (width !== this.profiles.length) this.raggedRows++;
    for (let c = 0; c < this.profiles.length; c++) this.profiles[c].add(c < width ? fields[start + c] : '');
  }

  addRow(row: readonly string[]): void {
    this.addFields(row, 0, row.length);
  }

  finish(): DraftResult {
    const o = this.options;
    const guesses: DraftGuess[] = [...this.renamed];
    const items: DraftItem[] = [];
    const lists: Array<MissingGuess[]> = [];
    let idTaken = false;
    this.profiles.forEach((p, i) => {
      const r = inferItem(p, { maxCodes: o.maxCodes, maxGroupCodes: o.maxGroupCodes }, i === 0, idTaken);
      if (r.item.role === 'id') idTaken = true;
      items.push(r.item);
      lists.push(r.missing);
      guesses.push(...r.guesses);
    });

    // Identical lists used by two or more items become one named set, as a person would write it.
    const keyOf = (m: MissingGuess[]): string => m.map((g) => `${typeof g.code}:${g.code}:${g.kind}`).join('|');
    const uses = new Map<string, number>();
    for (const m of lists) if (m.length > 0) uses.set(keyOf(m), (uses.get(keyOf(m)) ?? 0) + 1);
    const setNames = new Map<string, string>();
    const missingSets: Record<string, DraftMissingCode[]> = {};
    const declared = (m: MissingGuess[]): DraftMissingCode[] => m.map((g) => ({ code: g.code, kind: g.kind, label: missingLabel(g.kind) }));
    lists.forEach((m, i) => {
      if (m.length === 0) return;
      const key = keyOf(m);
      if ((uses.get(key) ?? 0) < 2) {
        items[i].missing = declared(m);
        return;
      }
      let name = setNames.get(key);
      if (name === undefined) {
        name = `set${setNames.size + 1}`;
        setNames.set(key, name);
        missingSets[name] = declared(m);
      }
      items[i].missing = name;
    });

    const slug = o.codebook ?? slugOf(o.source);
    const codebook: DraftCodebook = {
      codebook: slug,
      version: o.version,
      title: o.title ?? `Draft codebook for ${o.source ?? 'a delivery'} (to confirm)`,
      ...(setNames.size > 0 ? { missingSets } : {}),
      items,
    };
    return { codebook, guesses, rows: this.rows, raggedRows: this.raggedRows };
  }
}

/**
 * Drafts a codebook from rows in memory: `header` names the columns, each row is an array of
 * cells. Cells are profiled trimmed, as a check reads them. Rules of each guess: see
 * `missing.ts` (missing codes, common practice) and `infer.ts` (type shares, codes, level,
 * role, pattern). Cost: one pass; memory at most 1,000 distinct values per column plus, for
 * the first column and id-named ones, every distinct value (up to 1,000,000) for the id guess. Throws CodeweirError
 * CW_USAGE for bad options.
 * @example draftCodebook({ header: ['sex'], rows: [['1'], ['2'], ['1']] }).codebook.items[0].codes
 */
export function draftCodebook(input: RowsInput, options: DraftOptions = {}): DraftResult {
  const d = new Drafter(input.header, options);
  for (const row of input.rows) d.addRow(row);
  return d.finish();
}

/**
 * Drafts a codebook from a delivery (see `openDelivery` / `readDeliveryText` in
 * @codeweir/read), streaming its batches. `source` defaults to the delivery's file name.
 * Cost and guesses as {@link draftCodebook}. Throws what reading the delivery throws
 * (CodeweirError CW_CSV_*), and CW_USAGE for bad options.
 */
export async function draftDelivery(delivery: Delivery, options: DraftOptions = {}): Promise<DraftResult> {
  const d = new Drafter(delivery.header, { source: delivery.file, ...options });
  for await (const b of delivery.batches()) {
    for (let r = 0; r < b.count; r++) d.addFields(b.fields, b.offsets[r], b.offsets[r + 1]);
  }
  return d.finish();
}
