/**
 * Records by id, for telling between two deliveries which households were added, removed or
 * changed: per record one 32-bit hash of each item's cell (so a change can be put to its items)
 * and the record's group codes (so each field team sees its own changes). The file's content
 * hash tells a delivery already in the ledger.
 */
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import type { CompiledCodebook, CompiledItem } from '@codeweir/codebook';
import type { Delivery } from '@codeweir/read';
import { CodeweirError } from '@codeweir/core';

/** The group code of a record whose group cell is blank or a missing code, as the check names it. */
export const GROUP_MISSING = '(missing)';
/** The group code of a record whose group cell is not a code of the group item. */
export const GROUP_INVALID = '(invalid)';

export interface RecordSet {
  /** The id item's name. */
  idItem: string;
  /** Items whose cells are hashed, in codebook order (the id item and items without a column are not among them). */
  items: string[];
  /** Record ids (trimmed id cells), first occurrence of each; blank ids are left out. */
  ids: string[];
  /** ids.length x items.length: FNV-1a 32-bit hash of each trimmed cell. */
  cells: Uint32Array;
  /** Group items present, and per group item each record's group code. */
  groupItems: string[];
  groups: string[][];
  /** Rows whose id repeats an earlier row's (only the first is kept) and rows with a blank id. */
  duplicates: number;
  unidentified: number;
}

/**
 * FNV-1a, 32 bits, over the UTF-16 code units of `s`. Collisions between two different cells of
 * one item in one record are about 1 in 4 billion, so a changed cell goes unseen that rarely.
 */
export function fnv1a(s: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < s.length; i++) {
    h ^= s.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

/**
 * A 64-bit hash (16 hex digits) of record `r`'s cell hashes: two FNV-1a variants over the
 * cells' 32-bit words with different starting values. Cost: O(items). Throws nothing.
 */
export function rowHash(set: RecordSet, r: number): string {
  const w = set.items.length;
  let a = 0x811c9dc5;
  let b = 0x01234567;
  for (let k = r * w; k < (r + 1) * w; k++) {
    const v = set.cells[k]!;
    for (let s = 0; s < 32; s += 8) {
      const byte = (v >>> s) & 0xff;
      a = Math.imul(a ^ byte, 0x01000193);
      b = Math.imul(b ^ byte, 0x01000193) ^ (b >>> 15);
    }
  }
  return (a >>> 0).toString(16).padStart(8, '0') + (b >>> 0).toString(16).padStart(8, '0');
}

/** The group code of a cell as the check counts it: the code's text, or (missing) / (invalid). */
function groupCode(item: CompiledItem, cell: string): string {
  const t = cell.trim();
  const idx = item.codeByText.get(t);
  if (idx !== undefined) return item.codes[idx]!.text;
  if (t === '' || item.missingByText.has(t)) return GROUP_MISSING;
  return GROUP_INVALID;
}

/**
 * Reads the records of a delivery: for each row with a non-blank id (first occurrence of each
 * id) the hash of every item's trimmed cell and the row's group codes. Returns null when the
 * codebook has no id item or the delivery has no id column.
 * Cost: one streaming pass; memory 4 bytes x items per record plus the id strings
 * (1,000,000 records x 30 items: about 120 MB of hashes). Throws what the reader throws.
 */
export async function readRecords(delivery: Delivery, codebook: CompiledCodebook): Promise<RecordSet | null> {
  const idItem = codebook.idItem;
  if (idItem === undefined) return null;
  const col = new Map<string, number>();
  delivery.header.forEach((h, i) => {
    if (!col.has(h)) col.set(h, i);
  });
  const idCol = col.get(idItem.name);
  if (idCol === undefined) return null;
  const hashed = codebook.items.filter((it) => it !== idItem && col.has(it.name));
  const pos = hashed.map((it) => col.get(it.name)!);
  const groupItems = codebook.groupItems.filter((g) => col.has(g.name));
  const groupPos = groupItems.map((g) => col.get(g.name)!);
  const w = hashed.length;
  const ids: string[] = [];
  const seen = new Set<string>();
  const groups: string[][] = groupItems.map(() => []);
  let cells = new Uint32Array(Math.max(1, 1024 * w));
  let duplicates = 0;
  let unidentified = 0;
  for await (const b of delivery.batches()) {
    for (let r = 0; r < b.count; r++) {
      const start = b.offsets[r]!;
      const nf = b.offsets[r + 1]! - start;
      const id = idCol < nf ? b.fields[start + idCol]!.trim() : '';
      if (id === '') {
        unidentified++;
        continue;
      }
      if (seen.has(id)) {
        duplicates++;
        continue;
      }
      seen.add(id);
      const at = ids.length * w;
      if (at + w > cells.length) {
        const grown = new Uint32Array(cells.length * 2 + w);
        grown.set(cells);
        cells = grown;
      }
      for (let k = 0; k < w; k++) cells[at + k] = fnv1a(pos[k]! < nf ? b.fields[start + pos[k]!]!.trim() : '');
      for (let g = 0; g < groupItems.length; g++) groups[g]!.push(groupCode(groupItems[g]!, groupPos[g]! < nf ? b.fields[start + groupPos[g]!]! : ''));
      ids.push(id);
    }
  }
  return {
    idItem: idItem.name,
    items: hashed.map((it) => it.name),
    ids,
    cells: cells.slice(0, ids.length * w),
    groupItems: groupItems.map((g) => g.name),
    groups,
    duplicates,
    unidentified,
  };
}

/**
 * sha256 of a file's bytes, as 64 hex digits: the content hash that tells the ledger a delivery
 * it has seen before, whatever the file is called. Cost: one streaming read. Throws CodeweirError
 * CW_FILE_UNREADABLE when the file cannot be read.
 */
export async function fileHash(path: string): Promise<string> {
  const h = createHash('sha256');
  try {
    for await (const chunk of createReadStream(path)) h.update(chunk as Buffer);
  } catch (e) {
    throw new CodeweirError('CW_FILE_UNREADABLE', `cannot read ${path} to hash it: ${(e as Error).message}.`, { file: path, cause: e });
  }
  return h.digest('hex');
}
