/**
 * The small cell syntax of the spreadsheet variable list, read and written here only.
 *
 * A list cell holds entries separated by `;` (or a line break): `code=label` for codes, with an
 * optional bin `[min..max]` or `[min..]` after the label (`3=4 to 7 trips [4..7]`), and
 * `code=label (kind)` for missing codes (`-9=Refused (refused)`; `-9 (refused)` without a label).
 * A code or label holding `;`, `=`, a quote, a line break, spaces at either end or text that
 * would read as a bin or kind is written in double quotes, a quote inside doubled (`""`).
 * A bounds cell is `min..max`, `min..` or `..max` (`0 to 20` and `0-20` are read too).
 */
import { MISSING_KINDS, type MissingKind } from '@codeweir/codebook';

/** One entry of a list cell as written: texts, not yet typed by the item's type. */
export interface CellEntry {
  code: string;
  /** Undefined when the entry has no `=` (no label given). */
  label?: string;
  bin?: { min: number; max?: number };
  kind?: MissingKind;
  /** The code was written in quotes. */
  quoted: boolean;
}

const NUM = '[+-]?(?:\\d+(?:\\.\\d*)?|\\.\\d+)(?:[eE][+-]?\\d+)?';
const BIN_SUFFIX = new RegExp(`\\s*\\[\\s*(${NUM})\\s*(?:\\.\\.|to)\\s*(${NUM})?\\s*\\]$`);
const KIND_SUFFIX = new RegExp(`\\s*\\((${MISSING_KINDS.join('|')})\\)$`);

/** Splits `text` at `sep` characters outside double quotes. */
function splitOutside(text: string, isSep: (c: string) => boolean, max = Infinity): string[] {
  const out: string[] = [];
  let cur = '';
  let inQuote = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i]!;
    if (c === '"') inQuote = !inQuote;
    if (!inQuote && out.length < max - 1 && isSep(c)) {
      out.push(cur);
      cur = '';
    } else cur += c;
  }
  out.push(cur);
  return out;
}

/** A token that may be quoted: its text and the rest after a closing quote. */
function unquote(token: string): { text: string; quoted: boolean; rest: string } {
  const t = token.trimStart();
  if (!t.startsWith('"')) return { text: token.trim(), quoted: false, rest: '' };
  let text = '';
  for (let i = 1; i < t.length; i++) {
    const c = t[i]!;
    if (c === '"') {
      if (t[i + 1] === '"') {
        text += '"';
        i++;
      } else return { text, quoted: true, rest: t.slice(i + 1) };
    } else text += c;
  }
  return { text, quoted: true, rest: '' };
}

/** Strips a trailing `(kind)` and then a trailing `[a..b]` from `rest`, as `opts` allows. */
function suffixes(text: string, opts: { kinds?: boolean; bins?: boolean }): { rest: string; found: Pick<CellEntry, 'kind' | 'bin'> } {
  let rest = text;
  const found: Pick<CellEntry, 'kind' | 'bin'> = {};
  const k = opts.kinds ? KIND_SUFFIX.exec(rest) : null;
  if (k) {
    found.kind = k[1] as MissingKind;
    rest = rest.slice(0, k.index);
  }
  const b = opts.bins ? BIN_SUFFIX.exec(rest) : null;
  if (b) {
    found.bin = b[2] === undefined ? { min: Number(b[1]) } : { min: Number(b[1]), max: Number(b[2]) };
    rest = rest.slice(0, b.index);
  }
  return { rest, found };
}

/**
 * Reads a list cell (codes or missing codes) into entries. `kinds` says whether a trailing
 * `(kind)` is read (missing cells) and `bins` whether a trailing `[a..b]` is (codes cells).
 * Pure; O(length of the cell).
 */
export function parseListCell(cell: string, opts: { kinds?: boolean; bins?: boolean }): CellEntry[] {
  const out: CellEntry[] = [];
  for (const raw of splitOutside(cell, (c) => c === ';' || c === '\n' || c === '\r')) {
    if (raw.trim() === '') continue;
    const [codePart, labelPart] = splitOutside(raw, (c) => c === '=', 2) as [string, string | undefined];
    let entry: CellEntry;
    if (labelPart === undefined) {
      // No "=": a code alone, perhaps with its kind or bin after it.
      const c = unquote(codePart);
      const t = suffixes(c.quoted ? c.rest : codePart.trim(), opts);
      entry = { code: c.quoted ? c.text : t.rest.trim(), quoted: c.quoted, ...t.found };
    } else {
      const code = unquote(codePart);
      const q = unquote(labelPart.trim());
      const t = suffixes(q.quoted ? q.rest.trim() : labelPart.trim(), opts);
      entry = { code: code.text, label: q.quoted ? q.text : t.rest.trim(), quoted: code.quoted, ...t.found };
    }
    out.push(entry);
  }
  return out;
}

/** Quotes a token when it would not read back as itself. */
export function quoteToken(text: string, role: 'code' | 'label'): string {
  const risky =
    text === '' ||
    /[;"\n\r]/.test(text) ||
    text.trim() !== text ||
    (role === 'code' && text.includes('=')) ||
    BIN_SUFFIX.test(text) ||
    KIND_SUFFIX.test(text) ||
    (role === 'code' && /\(|\[/.test(text));
  return risky ? `"${text.replaceAll('"', '""')}"` : text;
}

function binText(b: { min: number; max?: number }): string {
  return `[${b.min}..${b.max ?? ''}]`;
}

/** Writes one entry in the syntax {@link parseListCell} reads. */
export function formatEntry(e: { code: string | number; label?: string; bin?: { min: number; max?: number }; kind?: MissingKind }): string {
  const code = quoteToken(String(e.code), 'code');
  const label = e.label === undefined ? '' : `=${quoteToken(e.label, 'label')}`;
  const bin = e.bin ? ` ${binText(e.bin)}` : '';
  const kind = e.kind ? ` (${e.kind})` : '';
  return `${code}${label}${bin}${kind}`;
}

/** Joins entries into one cell. */
export function formatListCell(entries: readonly string[]): string {
  return entries.join('; ');
}

/**
 * Reads a bounds cell: `min..max`, `min..`, `..max`, `min to max`, `min-max`. Returns
 * undefined for an empty cell and null for a cell that is none of these. Pure.
 */
export function parseBounds(cell: string): { min?: number; max?: number } | undefined | null {
  const t = cell.trim();
  if (t === '') return undefined;
  const m =
    new RegExp(`^(${NUM})?\\s*(?:\\.\\.|to)\\s*(${NUM})?$`).exec(t) ??
    new RegExp(`^(${NUM})\\s*-\\s*(${NUM})$`).exec(t);
  if (!m || (m[1] === undefined && m[2] === undefined)) return null;
  const out: { min?: number; max?: number } = {};
  if (m[1] !== undefined) out.min = Number(m[1]);
  if (m[2] !== undefined) out.max = Number(m[2]);
  return out;
}

/** Writes bounds as `min..max` (either end may be empty). */
export function formatBounds(b: { min?: number; max?: number } | undefined): string {
  if (!b || (b.min === undefined && b.max === undefined)) return '';
  return `${b.min ?? ''}..${b.max ?? ''}`;
}
