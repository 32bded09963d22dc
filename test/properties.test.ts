/**
 * Property-based tests (fast-check) of promises that hold for any delivery: every item's cells
 * are classified exactly once (valid + missing + invalid = rows), and the same input gives
 * byte-identical JSON.
 */
import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { parseCodebook, type CompiledCodebook } from '@codeweir/codebook';
import { check } from '@codeweir/check';
import { corpusCodebook, HEADER } from './adversarial/corpus.ts';

function compiled(): CompiledCodebook {
  const r = parseCodebook(JSON.stringify(corpusCodebook), 'corpus.codebook.json');
  if (!r.ok) throw new Error(JSON.stringify(r.problems));
  return r.codebook;
}

// Cells drawn from what deliveries hold: valid codes, declared missing codes, blanks, spaces,
// out-of-range numbers, fractions and arbitrary text.
const cell = fc.oneof(
  fc.constantFrom('1', '2', '3', '-9', '', ' ', ' 2 ', 'Seeweg', 'Mühlental', '0', '31', '2.5', '1e3', 'NaN', '-0'),
  fc.integer({ min: -100, max: 100 }).map(String),
  fc.string({ maxLength: 6 }),
);
const row = fc.array(cell, { minLength: HEADER.length, maxLength: HEADER.length });
const table = fc.array(row, { minLength: 0, maxLength: 60 });

describe('properties of check', () => {
  const cb = compiled();

  it('for every item, valid + missing + invalid = rows', async () => {
    await fc.assert(
      fc.asyncProperty(table, async (rows) => {
        const r = await check(rows, cb);
        expect(r.summary.rows).toBe(rows.length);
        for (const name of HEADER) {
          const t = r.summary.items[name];
          const missing = Object.values(t.missing).reduce((a, b) => a + (b ?? 0), 0);
          expect(t.valid + missing + t.invalid).toBe(rows.length);
        }
      }),
      { numRuns: 150, seed: 20261201 },
    );
  });

  it('the same input gives byte-identical JSON', async () => {
    await fc.assert(
      fc.asyncProperty(table, async (rows) => {
        const a = await check(rows, cb);
        const b = await check(rows.map((r) => [...r]), cb);
        expect(JSON.stringify(b.summary)).toBe(JSON.stringify(a.summary));
        expect(JSON.stringify(b.findings)).toBe(JSON.stringify(a.findings));
      }),
      { numRuns: 60, seed: 7 },
    );
  });
});
