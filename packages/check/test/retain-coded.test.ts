/**
 * `retainCoded: false` (what `codeweir check` uses) keeps no per-row memory for coded items and
 * changes nothing else: the summary and findings equal those of a pass that retains them.
 */
import { describe, it, expect } from 'vitest';
import { check } from '../src/index.ts';
import { codebook, idItem, employedItem } from './helpers.ts';

const cb = codebook([
  idItem,
  employedItem,
  { name: 'team', label: 'Team', role: 'group', type: 'integer', level: 'nominal', codes: [1, 2].map((c) => ({ code: c, label: `Team ${c}` })) },
  { name: 'hours', label: 'Hours', type: 'integer', level: 'ratio', range: { min: 0, max: 168 } },
]);

// Deterministic rows: codes, missing codes, invalid codes and numbers in turn.
const rows = Array.from({ length: 300 }, (_, i) => [String(i), ['1', '2', '-9', 'x'][i % 4]!, ['1', '2', '7'][i % 3]!, String((i * 7) % 200)]);

describe('retainCoded', () => {
  it('false: no coded column in the store, every count and finding unchanged', async () => {
    const kept = await check(rows, cb);
    const lean = await check(rows, cb, { retainCoded: false });
    expect(Object.keys(kept.store.columns).sort()).toEqual(['employed', 'hours', 'team']);
    expect(Object.keys(lean.store.columns)).toEqual(['hours']);
    expect(JSON.stringify(lean.summary)).toBe(JSON.stringify(kept.summary));
    expect(JSON.stringify(lean.findings)).toBe(JSON.stringify(kept.findings));
  });

  it('refuses a value that is not true or false', async () => {
    await expect(check(rows, cb, { retainCoded: 'no' })).rejects.toThrow(/retainCoded is true or false/);
  });
});
