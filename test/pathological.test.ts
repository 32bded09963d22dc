/**
 * Pathological deliveries stay within memory by design: findings are capped per rule in memory
 * while every count stays exact, and unique ids are tracked without keeping a finding each.
 * (Peak memory at 1M and 10M rows is shown by `pnpm bench`, not by a timed or sized test.)
 */
import { describe, it, expect } from 'vitest';
import { parseCodebook, type CompiledCodebook } from '@codeweir/codebook';
import { check } from '@codeweir/check';

const N = 200_000;

function compiled(): CompiledCodebook {
  const r = parseCodebook(
    JSON.stringify({
      codebook: 'pathological',
      version: '1',
      title: 'Pathological deliveries',
      items: [
        { name: 'rid', label: 'Record id', role: 'id', type: 'text' },
        { name: 'kind', label: 'Dwelling kind', type: 'text', level: 'nominal', codes: [{ code: 'house', label: 'House' }, { code: 'flat', label: 'Flat' }] },
      ],
    }),
  );
  if (!r.ok) throw new Error(JSON.stringify(r.problems));
  return r.codebook;
}

function* rows(idOf: (i: number) => string): Generator<string[]> {
  // Every value of the coded item is a distinct string that is not a code.
  for (let i = 0; i < N; i++) yield [idOf(i), `kind-${i.toString(36)}`];
}

describe('pathological deliveries', () => {
  const cb = compiled();

  it(`${N.toLocaleString('en')} distinct strings in a coded item: counts exact, the log capped`, async () => {
    const cap = 250;
    const r = await check(rows((i) => `R${i}`), cb, { maxFindingsPerRule: cap });
    // First principles: every one of the N cells is neither a code nor a missing code.
    expect(r.summary.rows).toBe(N);
    expect(r.summary.items.kind.invalid).toBe(N);
    expect(r.summary.items.kind.findings['not-a-code']).toBe(N);
    expect(r.summary.findings.byRule['not-a-code']).toBe(N);
    const logged = r.findings.filter((f) => f.rule === 'not-a-code');
    expect(logged).toHaveLength(cap);
    // The first `cap` in row order are the ones kept.
    expect(logged.map((f) => f.row)).toEqual(Array.from({ length: cap }, (_, i) => i + 1));
    expect(r.summary.items.rid.valid).toBe(N);
    expect(r.summary.findings.byRule['duplicate-id']).toBeUndefined();
  });

  it('every id repeated once: each repeat counted, only the cap logged', async () => {
    const cap = 100;
    // Row i carries id floor(i / 2): rows 2, 4, 6, ... (1-based) repeat the row before them.
    const r = await check(rows((i) => `R${i >> 1}`), cb, { maxFindingsPerRule: cap });
    expect(r.summary.findings.byRule['duplicate-id']).toBe(N / 2);
    const logged = r.findings.filter((f) => f.rule === 'duplicate-id');
    expect(logged).toHaveLength(cap);
    expect(logged.map((f) => f.row)).toEqual(Array.from({ length: cap }, (_, i) => 2 * (i + 1)));
  });
});
