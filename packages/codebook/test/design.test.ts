import { describe, it, expect } from 'vitest';
import { household, lint, codesAndPaths } from './fixtures.ts';

// The design block names items; each part has a fitting role and level (first principles: a
// weight and an fpc are quantities, strata and clusters are labels kept per record).
describe('design lint', () => {
  it('accepts a design of existing items and compiles it with the disclosure setting and confidential items', () => {
    const cb = household();
    cb.design = { weight: 'wt', strata: 'district' };
    cb.disclosure = { minCell: 10 };
    cb.items.find((i: { name: string }) => i.name === 'head_name').confidential = true;
    const r = lint(cb);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.codebook.design).toEqual({ weight: 'wt', strata: 'district' });
    expect(r.codebook.minCell).toBe(10);
    expect(r.codebook.byName.get('head_name')!.confidential).toBe(true);
    expect(r.codebook.byName.get('district')!.confidential).toBeUndefined();
  });

  it('reports unknown items, repeated items and misfitting roles or levels at the design path', () => {
    const cb = household();
    cb.design = { weight: 'hh_size', strata: 'nope', cluster: 'visit_date', fpc: 'wt' };
    const r = lint(cb);
    const got = codesAndPaths(r.problems);
    expect(got).toContain('design-unknown-item /design/strata');
    expect(got).toContain('design-item-type /design/cluster');
    // hh_size is ratio and integer: a usable weight.
    expect(got.filter((p) => p.endsWith('/design/weight'))).toEqual([]);
    cb.design = { strata: 'district', cluster: 'district' };
    expect(codesAndPaths(lint(cb).problems)).toContain('design-item-repeated /design/cluster');
    cb.design = { weight: 'district' };
    expect(codesAndPaths(lint(cb).problems)).toContain('design-item-type /design/weight');
    cb.design = { cluster: 'head_name' };
    const msg = lint(cb).problems.find((p) => p.code === 'design-item-type')!.message;
    expect(msg).toMatch(/needs codes or role "group"/);
    cb.design = { cluster: 'hh_id' };
    expect(lint(cb).problems.find((p) => p.code === 'design-item-type')!.message).toMatch(/id item/);
  });

  it('rejects unknown design fields and a minimum cell below 1 in the schema', () => {
    const cb = household();
    cb.design = { weights: 'wt' };
    expect(lint(cb).ok).toBe(false);
    const cb2 = household();
    cb2.disclosure = { minCell: 0 };
    expect(lint(cb2).ok).toBe(false);
  });
});
