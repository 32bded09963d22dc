import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { Chunked, Grow } from '../src/grow.ts';

// First principles throughout: a growable array must hand back exactly the values put in, in
// order, however the appends were split; the plain JavaScript array built alongside is the oracle.

/** Batches of values, with batch sizes that cross the 1024-value first chunk and later chunks. */
const batches = fc.array(fc.array(fc.integer({ min: 0, max: 65535 }), { maxLength: 3000, size: 'max' }), { maxLength: 12, size: 'max' });

describe('Chunked', () => {
  it('returns every committed value in order, whatever the batch sizes and the expected count', () => {
    fc.assert(
      fc.property(batches, fc.option(fc.integer({ min: 1, max: 5000 }), { nil: undefined }), (bs, expected) => {
        const c = new Chunked(Uint16Array, expected);
        const plain: number[] = [];
        for (const b of bs) {
          const w = c.reserve(b.length);
          expect(w.length >= b.length).toBe(true);
          b.forEach((v, i) => (w[i] = v));
          // A value written past the committed count is not kept.
          if (w.length > b.length) w[b.length] = 7;
          c.commit(b.length);
          plain.push(...b);
        }
        const out = c.trimmed();
        expect(c.length).toBe(plain.length);
        expect(Array.from(out)).toEqual(plain);
        // Trimming again (joined chunks replaced by the result) gives the same values.
        expect(Array.from(c.trimmed())).toEqual(plain);
      }),
      { numRuns: 40 },
    );
  });

  it('keeps values committed after a trim', () => {
    const c = new Chunked(Float64Array, 2);
    c.reserve(3).set([1, 2, 3]);
    c.commit(3);
    c.reserve(2).set([4, 5]);
    c.commit(2);
    expect(Array.from(c.trimmed())).toEqual([1, 2, 3, 4, 5]);
    c.reserve(1)[0] = 6;
    c.commit(1);
    expect(Array.from(c.trimmed())).toEqual([1, 2, 3, 4, 5, 6]);
  });

  it('gives an empty array when nothing was committed', () => {
    expect(new Chunked(Uint32Array).trimmed().length).toBe(0);
  });
});

describe('Grow', () => {
  it('holds every value in order and trims to a view of exactly that length', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ noNaN: true }), { maxLength: 5000, size: 'max' }), (xs) => {
        const g = new Grow(Float64Array, 3);
        for (const x of xs) {
          g.reserve(1)[g.length] = x;
          g.length++;
        }
        const t = g.trimmed();
        expect(t.length).toBe(xs.length);
        expect(Array.from(t)).toEqual(xs);
        expect(t.buffer).toBe(g.data.buffer);
      }),
      { numRuns: 20 },
    );
  });
});
