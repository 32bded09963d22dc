/**
 * Growable typed arrays. {@link Chunked}: per-row retained values, stored as a list of chunks: a new chunk is
 * added when the last is full, and nothing already written is ever copied while rows come in.
 * A doubling array would hold up to twice the rows, three times while it grows, and an exact
 * copy at the end on top; here the held memory is the rows plus the unused end of the last
 * chunk, and the one copy is made at the end, column by column, each column's chunks freed as
 * soon as it is joined (peak: the rows plus one column). A caller that knows about how many
 * rows are coming sizes the first chunk from that, and then usually never adds another.
 */
type TypedCtor<T> = { new (n: number): T };

/** First chunk when no row count is expected: small, since many passes (tests, ranges) are short. */
const FIRST_CHUNK = 1024;
/** Largest chunk after the first: 2^20 values (8 MiB of Float64), so the tail left unused stays small. */
const MAX_CHUNK = 1 << 20;

export class Chunked<T extends Float64Array | Uint16Array | Uint32Array> {
  /** Values committed so far. */
  length = 0;
  private readonly ctor: TypedCtor<T>;
  /** Full (or, for the last, partly filled) chunks; `used` values of the last are committed. */
  private chunks: T[] = [];
  private used = 0;
  private readonly first: number;

  /** `expected`: about how many values will come (e.g. a row estimate); sizes the first chunk. */
  constructor(ctor: TypedCtor<T>, expected = FIRST_CHUNK) {
    this.ctor = ctor;
    this.first = Math.max(1, Math.ceil(expected));
  }

  /**
   * A window of at least `extra` free values, indexed from 0, where the caller writes the next
   * values before {@link commit}ting them. Cost: O(1), an allocation only when a chunk is added.
   */
  reserve(extra: number): T {
    const last = this.chunks[this.chunks.length - 1];
    if (last === undefined || last.length - this.used < extra) {
      if (last !== undefined) this.chunks[this.chunks.length - 1] = last.subarray(0, this.used) as T;
      const size = last === undefined ? this.first : Math.min(MAX_CHUNK, Math.max(this.length, FIRST_CHUNK));
      this.chunks.push(new this.ctor(Math.max(size, extra)));
      this.used = 0;
    }
    const chunk = this.chunks[this.chunks.length - 1]!;
    return chunk.subarray(this.used) as T;
  }

  /** Keeps the first `count` values written into the last {@link reserve}d window. */
  commit(count: number): void {
    this.used += count;
    this.length += count;
  }

  /**
   * All committed values as one exact-length array. One chunk: a view on it, no copy. Several:
   * joined into a new array, and the chunks are released (the result replaces them). Each Grow
   * owns its buffers alone, so the result can be transferred to another thread.
   */
  trimmed(): T {
    const last = this.chunks.length - 1;
    if (last < 0) return new this.ctor(0);
    if (last === 0) return this.chunks[0]!.subarray(0, this.used) as T;
    const out = new this.ctor(this.length);
    let at = 0;
    this.chunks.forEach((c, k) => {
      const part = k === last ? c.subarray(0, this.used) : c;
      out.set(part as never, at);
      at += part.length;
    });
    this.chunks = [out];
    this.used = this.length;
    return out;
  }
}

/**
 * A growable typed array with random access to what it holds (`data`), for tables that look up
 * their own values while growing. Growth is by half the capacity (1.5x), not doubling, so the
 * unused tail stays under a third of what is held and the moment of growing (old and new array
 * both alive) costs 2.5x the old capacity, not 3x; n values still take O(log n) allocations.
 * `trimmed()` is a view, not a copy.
 */
export class Grow<T extends Float64Array | Uint16Array | Uint32Array> {
  data: T;
  length = 0;
  private readonly ctor: TypedCtor<T>;

  constructor(ctor: TypedCtor<T>, capacity = FIRST_CHUNK) {
    this.ctor = ctor;
    this.data = new ctor(Math.max(1, Math.ceil(capacity)));
  }

  /** Makes room for `extra` more values; returns the (possibly new) backing array. */
  reserve(extra: number): T {
    const need = this.length + extra;
    if (need > this.data.length) {
      let cap = this.data.length;
      while (cap < need) cap = Math.ceil(cap * 1.5) + 16;
      const next = new this.ctor(cap);
      next.set(this.data.subarray(0, this.length) as never);
      this.data = next;
    }
    return this.data;
  }

  /**
   * The first `length` values as a view on the backing array (no copy). Values already held
   * are never rewritten by the callers, so the view stays valid if more are added later; the
   * buffer belongs to this Grow alone, so the view can be transferred to another thread.
   */
  trimmed(): T {
    return this.data.subarray(0, this.length) as T;
  }
}
