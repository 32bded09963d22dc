/**
 * First occurrences of the values of a unique item, with their 1-based row, in row order.
 * Numeric values live in an open-addressing hash over a Float64Array (12 bytes per distinct
 * value plus the slot table, at most two thirds full), text values in the same kind of table
 * keeping each text's hash; both keep entries in insertion order so parts of a split pass can be
 * merged in row order.
 */
import { Grow } from './grow.ts';

/** Plain (structured-cloneable) form of a table, as a pass hands it over. */
export type UniqueEntries =
  | { kind: 'number'; keys: Float64Array; rows: Uint32Array; ids?: string[] }
  | { kind: 'text'; keys: string[]; rows: Uint32Array; ids?: string[]; /** {@link hashText} of each key, when the table kept them. */ hashes?: Uint32Array };

const f64 = new Float64Array(1);
const u32 = new Uint32Array(f64.buffer);

function hashNumber(v: number): number {
  f64[0] = v;
  return Math.imul(u32[0]! ^ Math.imul(u32[1]!, 0x9e3779b1), 0x85ebca6b);
}

/** Slots of a table for `expected` values: a power of two, at least 1024, at most two thirds full. */
function slotCount(expected: number): number {
  let size = 1024;
  while (size * 2 < expected * 3 + 3) size *= 2;
  return size;
}

/** A slot table of `size` (a power of two) holding entries 0..count-1 by their hash, linear probing. */
function slotsFor(size: number, count: number, hashAt: (i: number) => number): Int32Array {
  const slots = new Int32Array(size);
  const mask = size - 1;
  for (let i = 0; i < count; i++) {
    let h = hashAt(i) & mask;
    while (slots[h] !== 0) h = (h + 1) & mask;
    slots[h] = i + 1;
  }
  return slots;
}

export class NumberFirsts {
  readonly keys: Grow<Float64Array>;
  readonly rows: Grow<Uint32Array>;
  /** Id text of each entry, kept only when the unique item is not the id item. */
  readonly ids: string[] | undefined;
  private slots: Int32Array;
  private mask: number;

  /**
   * `expected`: about how many distinct values will come (e.g. the entries of the parts being
   * merged); the arrays are sized for them at once, so they are never copied while growing.
   */
  constructor(keepIds: boolean, expected = 0) {
    this.ids = keepIds ? [] : undefined;
    this.keys = new Grow(Float64Array, Math.max(1024, expected));
    this.rows = new Grow(Uint32Array, Math.max(1024, expected));
    this.slots = new Int32Array(slotCount(expected));
    this.mask = this.slots.length - 1;
  }

  /** Adds `v` first seen at `row`; false when it was there already. */
  add(v: number, row: number, id: string): boolean {
    const x = v + 0;
    let h = hashNumber(x) & this.mask;
    const keys = this.keys.data;
    for (;;) {
      const s = this.slots[h]!;
      if (s === 0) break;
      if (keys[s - 1] === x) return false;
      h = (h + 1) & this.mask;
    }
    const n = this.keys.length;
    this.keys.reserve(1)[n] = x;
    this.keys.length = n + 1;
    this.rows.reserve(1)[n] = row;
    this.rows.length = n + 1;
    this.ids?.push(id);
    this.slots[h] = n + 1;
    if ((n + 1) * 3 > (this.mask + 1) * 2) this.rehash();
    return true;
  }

  private rehash(): void {
    const keys = this.keys.data;
    this.slots = slotsFor((this.mask + 1) * 2, this.keys.length, (i) => hashNumber(keys[i]!));
    this.mask = this.slots.length - 1;
  }

  entries(): UniqueEntries {
    return { kind: 'number', keys: this.keys.trimmed(), rows: this.rows.trimmed(), ids: this.ids };
  }
}

/**
 * Hash of a text (32-bit FNV-1a over its UTF-16 units, then a murmur3 finaliser so the low bits,
 * which pick the slot, depend on every unit). Computed once per value where it is first read
 * and handed on with the entries, so a merge of the parts' tables never hashes a text again.
 */
export function hashText(s: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < s.length; i++) h = Math.imul(h ^ s.charCodeAt(i), 0x01000193);
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  return (h ^ (h >>> 16)) >>> 0;
}

/**
 * Text values in an open-addressing hash (linear probing, at most two thirds full) whose
 * entries keep their hash, so that the table can be rebuilt, or merged into another, without
 * hashing any text again; equal hashes are confirmed by comparing the texts.
 */
export class TextFirsts {
  private readonly keys: string[] = [];
  private readonly hashes: Grow<Uint32Array>;
  readonly rows: Grow<Uint32Array>;
  readonly ids: string[] | undefined;
  private slots: Int32Array;
  private mask: number;

  /** `expected`: about how many distinct values will come; the table is sized for them at once. */
  constructor(keepIds: boolean, expected = 0) {
    this.ids = keepIds ? [] : undefined;
    this.hashes = new Grow(Uint32Array, Math.max(1024, expected));
    this.rows = new Grow(Uint32Array, Math.max(1024, expected));
    this.slots = new Int32Array(slotCount(expected));
    this.mask = this.slots.length - 1;
  }

  /** Adds `v` first seen at `row`; false when it was there already. `hash`: {@link hashText} of `v`, when known. */
  add(v: string, row: number, id: string, hash = hashText(v)): boolean {
    let h = hash & this.mask;
    const hashes = this.hashes.data;
    for (;;) {
      const s = this.slots[h]!;
      if (s === 0) break;
      if (hashes[s - 1] === hash && this.keys[s - 1] === v) return false;
      h = (h + 1) & this.mask;
    }
    const n = this.keys.length;
    this.keys.push(v);
    this.hashes.reserve(1)[n] = hash;
    this.hashes.length = n + 1;
    this.rows.reserve(1)[n] = row;
    this.rows.length = n + 1;
    this.ids?.push(id);
    this.slots[h] = n + 1;
    if ((n + 1) * 3 > (this.mask + 1) * 2) this.rehash();
    return true;
  }

  private rehash(): void {
    const hashes = this.hashes.data;
    this.slots = slotsFor((this.mask + 1) * 2, this.keys.length, (i) => hashes[i]!);
    this.mask = this.slots.length - 1;
  }

  entries(): UniqueEntries {
    return { kind: 'text', keys: this.keys, rows: this.rows.trimmed(), ids: this.ids, hashes: this.hashes.trimmed() };
  }
}

export type Firsts = NumberFirsts | TextFirsts;
