/**
 * A pass split into parts (as worker threads would run it on byte ranges) and merged must give
 * exactly what one pass over all rows gives: same summary, same findings log, same retained
 * columns. The expectation is the single pass itself, so the test needs no other oracle.
 */
import { describe, it, expect } from 'vitest';
import type { RowBatch } from '@codeweir/read';
import { createPass, mergePartials, finalize, detachPartial, attachPartial } from '../src/index.ts';
import { codebook, idItem, employedItem } from './helpers.ts';

const cb = codebook(
  [
    idItem,
    { name: 'team', label: 'Team', role: 'group', type: 'integer', level: 'nominal', codes: [1, 2, 3].map((c) => ({ code: c, label: `Team ${c}` })) },
    { name: 'zone', label: 'Zone', role: 'group', type: 'text' },
    employedItem,
    { name: 'hours', label: 'Hours', type: 'integer', level: 'ratio', range: { min: 0, max: 168 }, expect: { max: 80 }, askedWhen: 'employed == 1', missing: [{ code: -7, kind: 'not-applicable' }] },
    { name: 'phone', label: 'Phone', type: 'text', unique: true },
    { name: 'w', label: 'Weight', role: 'weight', type: 'decimal', level: 'ratio', range: { min: 0 } },
  ],
  { rules: [{ id: 'hours-if-working', when: 'employed == 1', test: 'hours > 0', severity: 'warning', message: 'Working but no hours.' }] },
);

/** Deterministic rows with every kind of finding, including duplicates that straddle the split. */
function makeRows(n: number): string[][] {
  const rows: string[][] = [];
  for (let i = 0; i < n; i++) {
    const emp = i % 7 === 0 ? '-9' : i % 3 === 0 ? '2' : '1';
    const hours = emp === '1' ? String((i * 13) % 90) : i % 11 === 0 ? '12' : '-7';
    const id = i % 17 === 5 ? String(i - 5) : String(i); // repeats an earlier id
    const phone = i % 19 === 3 ? `p${i % 4}` : `p${i}`;
    const team = i % 23 === 0 ? '9' : String((i % 3) + 1);
    const zone = i % 29 === 0 ? '' : `z${i % 2}`;
    const w = i % 31 === 0 ? 'x' : String(100 + ((i * 37) % 400) / 4);
    rows.push([id, team, zone, emp, i % 41 === 0 ? ' 4.5' : hours, phone, i % 53 === 0 ? '9000' : w]);
  }
  return rows;
}

function batchesOf(rows: string[][], size: number, ragged = true): RowBatch[] {
  const out: RowBatch[] = [];
  for (let s = 0; s < rows.length; s += size) {
    const chunk = rows.slice(s, s + size).map((r, k) => (ragged && (s + k) % 47 === 46 ? r.slice(0, 5) : r));
    const fields = chunk.flat();
    const offsets = new Uint32Array(chunk.length + 1);
    chunk.forEach((r, k) => (offsets[k + 1] = offsets[k]! + r.length));
    out.push({ count: chunk.length, firstRow: s + 1, fields, offsets, lines: new Uint32Array(chunk.length) });
  }
  return out;
}

const header = cb.items.map((i) => i.name);

function single(batches: RowBatch[], options = {}) {
  const p = createPass(cb, header, options);
  for (const b of batches) p.push(b);
  return finalize(p.finish());
}

function split(rows: string[][], cuts: number[], options = {}, release = false) {
  const bounds = [0, ...cuts, rows.length];
  const parts = [];
  for (let k = 0; k + 1 < bounds.length; k++) {
    const p = createPass(cb, header, options);
    // Each part sees its rows as 1..n (a worker does not know what came before).
    const local = batchesOf(rows.slice(bounds[k]!, bounds[k + 1]!), 64, false);
    for (const b of local) p.push(b);
    // Round-trip through the cloneable form, as postMessage would.
    parts.push(attachPartial(structuredClone(detachPartial(p.finish())), cb));
  }
  const merged = mergePartials(parts, bounds.slice(0, -1), { release });
  if (release) {
    // A spent part holds no per-row arrays any more: that is what keeps the merge's memory down.
    for (const p of parts) {
      expect(p.columns.every((c) => c === null)).toBe(true);
      expect(p.unique.every((u) => u === null)).toBe(true);
      expect(p.groups.every((g) => g.rowKeys.length === 0)).toBe(true);
    }
  }
  return finalize(merged);
}

function comparable(r: ReturnType<typeof single>) {
  return {
    summary: JSON.stringify(r.summary),
    findings: JSON.stringify(r.findings),
    columns: Object.fromEntries(Object.entries(r.store.columns).map(([k, c]) => [k, Array.from(c.kind === 'coded' ? c.codes : c.values)])),
  };
}

describe('mergePartials', () => {
  const rows = makeRows(900);
  for (const cuts of [[450], [1], [899], [200, 201, 650]]) {
    it(`parts cut at ${cuts.join(', ')} merge to the single pass exactly`, () => {
      const one = single(batchesOf(rows, 100, false));
      const many = split(rows, cuts);
      expect(one.summary.findings.byRule['duplicate-id']).toBeGreaterThan(10);
      expect(one.summary.findings.byRule['answered-when-skipped']).toBeGreaterThan(10);
      expect(comparable(many)).toEqual(comparable(one));
    });
  }

  it('releasing the parts while merging gives the same result', () => {
    const one = single(batchesOf(rows, 100, false));
    expect(comparable(split(rows, [200, 201, 650], {}, true))).toEqual(comparable(one));
    expect(comparable(split(rows, [450], {}, true))).toEqual(comparable(one));
  });

  it('one pass finished and pushed again for each part (as a thread reuses it) merges to the single pass exactly', () => {
    const one = single(batchesOf(rows, 100, false));
    const bounds = [0, 200, 201, 650, rows.length];
    const p = createPass(cb, header, {});
    const parts = [];
    for (let k = 0; k + 1 < bounds.length; k++) {
      for (const b of batchesOf(rows.slice(bounds[k]!, bounds[k + 1]!), 64, false)) p.push(b);
      const part = p.finish();
      expect(part.rows).toBe(bounds[k + 1]! - bounds[k]!);
      // Moved as a worker moves it: every typed array but the header's is transferred (detached
      // here), so the pass must not read or write any of them for the next part.
      const { codebook: _cb, header: _h, ...moved } = part;
      const buffers = new Set<ArrayBuffer>();
      const collect = (v: unknown): void => {
        if (ArrayBuffer.isView(v)) buffers.add(v.buffer as ArrayBuffer);
        else if (Array.isArray(v)) v.forEach(collect);
        else if (v !== null && typeof v === 'object' && !(v instanceof Map)) Object.values(v).forEach(collect);
      };
      collect(moved);
      parts.push(attachPartial(structuredClone(detachPartial(part), { transfer: [...buffers] }), cb));
    }
    expect(comparable(finalize(mergePartials(parts, bounds.slice(0, -1))))).toEqual(comparable(one));
  });

  it('still equal when findings are capped per rule', () => {
    const opts = { maxFindingsPerRule: 5 };
    const one = single(batchesOf(rows, 100, false), opts);
    const many = split(rows, [333, 600], opts);
    expect(one.findings.filter((f) => f.rule === 'duplicate-id')).toHaveLength(5);
    expect(comparable(many)).toEqual(comparable(one));
  });

  it('batch size does not change the result, and ragged rows are counted', () => {
    const a = single(batchesOf(rows, 1000));
    const b = single(batchesOf(rows, 7));
    expect(comparable(b)).toEqual(comparable(a));
    expect(a.summary.findings.byRule['ragged-row']).toBe(Math.floor(900 / 47));
  });

  it('records the group codes of each finding row', () => {
    const one = single(batchesOf(rows, 100, false));
    const f = one.findings.find((x) => x.row === 24)!; // row 24 is i = 23: team 9 (not a code)
    expect(f.rule).toBe('not-a-code');
    expect(f.groups).toEqual({ team: '(invalid)', zone: 'z1' });
    expect(Object.keys(one.summary.groups.team!).sort()).toEqual(['(invalid)', '1', '2', '3']);
    expect(Object.keys(one.summary.groups.zone!).sort()).toEqual(['(missing)', 'z0', 'z1']);
  });
});

describe('mergePartials, property-based (fast-check)', () => {
  it('any cut of any prefix of the rows, with any cap, merges to the single pass exactly', async () => {
    const { default: fc } = await import('fast-check');
    const all = makeRows(400);
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: all.length }),
        fc.uniqueArray(fc.integer({ min: 1, max: all.length - 1 }), { maxLength: 4 }),
        fc.integer({ min: 1, max: 50 }),
        (n, rawCuts, cap) => {
          const rows = all.slice(0, n);
          const cuts = rawCuts.filter((c) => c < n).sort((a, b) => a - b);
          const opts = { maxFindingsPerRule: cap };
          expect(comparable(split(rows, cuts, opts))).toEqual(comparable(single(batchesOf(rows, 37, false), opts)));
        },
      ),
      { numRuns: 60, seed: 20261202 },
    );
  });
});
