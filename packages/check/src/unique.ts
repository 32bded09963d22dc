/**
 * First occurrences of the values of a unique item, with their 1-based row, in row order.
 * Numeric values live in an open-addressing hash over a Float64Array (12 bytes per distinct
 * value plus the slot table, at most two thirds full), text values in a Map; both keep entries in insertion order so parts
 * of a split pass can be merged in row order.
 */
import { Grow } from './grow.ts';

/** Plain (structured-cloneable) form of a table, as a pass hands it over. */
export type UniqueEntries =
  | { kind: 'number'; keys: Float64Array; rows: Uint32Array; ids?: string[] }
  | { kind: 'text'; keys: string[]; rows: Uint32Array; ids?: string[] };

const f64 = new Float64Array(1);
const u32 = new Uint32Array(f64.buffer);

function hashNumber(v: number): number {
  f64[0] = v;
  return Math.imul(u32[0]! ^ Math.imul(u32[1]!, 0x9e3779b1), 0x85ebca6b);
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
    let size = 1024;
    while (size * 2 < expected * 3 + 3) size *= 2;
    this.slots = new Int32Array(size);
    this.mask = size - 1;
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
    const size = (this.mask + 1) * 2;
    this.slots = new Int32Array(size);
    this.mask = size - 1;
    const keys = this.keys.data;
    for (let i = 0; i < this.keys.length; i++) {
      let h = hashNumber(keys[i]!) & this.mask;
      while (this.slots[h] !== 0) h = (h + 1) & this.mask;
      this.slots[h] = i + 1;
    }
  }

  entries(): UniqueEntries {
    return { kind: 'number', keys: this.keys.trimmed(), rows: this.rows.trimmed(), ids: this.ids };
  }
}

export class TextFirsts {
  private readonly map = new Map<string, number>();
  readonly rows = new Grow(Uint32Array);
  readonly ids: string[] | undefined;

  constructor(keepIds: boolean) {
    this.ids = keepIds ? [] : undefined;
  }

  add(v: string, row: number, id: string): boolean {
    if (this.map.has(v)) return false;
    const n = this.rows.length;
    this.map.set(v, n);
    this.rows.reserve(1)[n] = row;
    this.rows.length = n + 1;
    this.ids?.push(id);
    return true;
  }

  entries(): UniqueEntries {
    return { kind: 'text', keys: [...this.map.keys()], rows: this.rows.trimmed(), ids: this.ids };
  }
}

export type Firsts = NumberFirsts | TextFirsts;
