/**
 * Growable typed arrays for per-row retained values: amortised doubling, so a pass over n rows
 * allocates O(log n) times, and `trimmed()` returns an exact-length copy for the ColumnStore.
 */
type TypedCtor<T> = { new (n: number): T };

export class Grow<T extends Float64Array | Uint16Array | Uint32Array> {
  data: T;
  length = 0;
  private readonly ctor: TypedCtor<T>;

  constructor(ctor: TypedCtor<T>, capacity = 1024) {
    this.ctor = ctor;
    this.data = new ctor(capacity);
  }

  /** Makes room for `extra` more values; returns the (possibly new) backing array. */
  reserve(extra: number): T {
    const need = this.length + extra;
    if (need > this.data.length) {
      let cap = this.data.length * 2;
      while (cap < need) cap *= 2;
      const next = new this.ctor(cap);
      next.set(this.data.subarray(0, this.length) as never);
      this.data = next;
    }
    return this.data;
  }

  trimmed(): T {
    return this.data.slice(0, this.length) as T;
  }
}
