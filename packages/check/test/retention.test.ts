/**
 * Retained columns over many batches: the values kept per row must be the cells' parsed values
 * (NaN for a cell that is not valid), whatever the batch size and whatever row count the pass
 * was told to expect. The oracle is first principles: Number() of each generated cell, and the
 * codes' positions in the codebook for a coded item.
 */
import { describe, it, expect } from 'vitest';
import type { RowBatch } from '@codeweir/read';
import { createPass, finalize } from '../src/index.ts';
import { codebook, idItem } from './helpers.ts';

const cb = codebook([
  idItem,
  { name: 'team', label: 'Team', role: 'group', type: 'integer', level: 'nominal', codes: [1, 2, 3].map((c) => ({ code: c, label: `Team ${c}` })) },
  { name: 'w', label: 'Weight', type: 'decimal', level: 'ratio', range: { min: 0 } },
]);
const header = cb.items.map((i) => i.name);

/** 5,000 rows: more than the first chunk (1,024 values) and than several later ones. */
const ROWS = 5000;
const cells = Array.from({ length: ROWS }, (_, i) => [String(i + 1), String((i % 3) + 1), i % 31 === 0 ? 'x' : String(100 + ((i * 37) % 400) / 4)]);

function batches(size: number): RowBatch[] {
  const out: RowBatch[] = [];
  for (let s = 0; s < ROWS; s += size) {
    const chunk = cells.slice(s, s + size);
    const offsets = new Uint32Array(chunk.length + 1);
    chunk.forEach((r, k) => (offsets[k + 1] = offsets[k]! + r.length));
    out.push({ count: chunk.length, firstRow: s + 1, fields: chunk.flat(), offsets, lines: new Uint32Array(chunk.length) });
  }
  return out;
}

function checkWith(size: number, expectedRows?: number) {
  const p = createPass(cb, header, {}, expectedRows);
  for (const b of batches(size)) p.push(b);
  return finalize(p.finish());
}

describe('retained columns across batches and chunk sizes', () => {
  for (const [size, expectedRows] of [[700, undefined], [700, 1], [1, 3], [4999, ROWS], [64, 20_000]] as const) {
    it(`batches of ${size}, expecting ${expectedRows ?? 'nothing'}`, () => {
      const r = checkWith(size, expectedRows);
      const w = r.store.columns.w!;
      const team = r.store.columns.team!;
      const values = w.kind === 'numeric' ? Array.from(w.values) : [];
      const codes = team.kind === 'coded' ? Array.from(team.codes) : [];
      // Number('x') is NaN: exactly the cells that are not valid decimals.
      expect(values).toEqual(cells.map((c) => Number(c[2])));
      // Coded columns keep 1 + the code's position: code c is at position c - 1.
      expect(codes).toEqual(cells.map((c) => Number(c[1])));
    });
  }

  it('gives the same summary and findings whatever row count is expected', () => {
    const plain = checkWith(700);
    const sized = checkWith(700, ROWS);
    expect(JSON.stringify(sized.summary)).toBe(JSON.stringify(plain.summary));
    expect(JSON.stringify(sized.findings)).toBe(JSON.stringify(plain.findings));
  });
});
