import { describe, it, expect } from 'vitest';
import { CodeweirError } from '@codeweir/core';
import { CodebookSchema, canonicalNumberText, compileCodebook, lookupCell, type Codebook, type CompiledCodebook } from '../src/index.ts';
import { household, lint } from './fixtures.ts';

function compiled(): CompiledCodebook {
  const r = lint(household());
  if (!r.ok) throw new Error(JSON.stringify(r.problems));
  return r.codebook;
}

describe('compiled codebook', () => {
  it('carries the header, items in column order and items by name', () => {
    const cb = compiled();
    expect([cb.id, cb.version, cb.title, cb.file]).toEqual(['lowmarsh-hh', '2026.1', 'Lowmarsh household panel, wave 1', 'test.codebook.json']);
    expect(cb.items.map((it) => it.name)).toEqual(['hh_id', 'district', 'visit_date', 'hh_size', 'water_trips', 'school_km', 'head_name', 'wt']);
    expect(cb.items.map((it) => it.index)).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
    for (const it of cb.items) expect(cb.byName.get(it.name)).toBe(it);
  });

  it('resolves the roles: id (unique by default), groups, weight', () => {
    const cb = compiled();
    expect(cb.idItem?.name).toBe('hh_id');
    expect(cb.idItem?.unique).toBe(true);
    expect(cb.groupItems.map((it) => it.name)).toEqual(['district']);
    expect(cb.weightItem?.name).toBe('wt');
    expect(cb.byName.get('hh_size')!.unique).toBe(false);
    expect(cb.byName.get('head_name')!.role).toBe('item');
    expect(cb.byName.get('head_name')!.level).toBeUndefined();
  });

  it('resolves named missing sets and keys missing codes by cell text', () => {
    const it = compiled().byName.get('hh_size')!;
    expect(it.missing.map((m) => [m.code, m.kind])).toEqual([
      [-9, 'refused'],
      [-8, 'dont-know'],
      [-7, 'not-applicable'],
    ]);
    expect(lookupCell(it.missingByText, '-9', true)?.kind).toBe('refused');
    // Numeric cells match by value: "-9.0" is the number -9.
    expect(lookupCell(it.missingByText, '-9.0', true)?.kind).toBe('refused');
    expect(lookupCell(it.missingByText, '9', true)).toBeUndefined();
  });

  it('codes in declared order, matched by cell text and, for numeric items, by number value', () => {
    const it = compiled().byName.get('district')!;
    expect(it.codes.map((c) => [c.index, c.code, c.text, c.label])).toEqual([
      [0, 1, '1', 'Fenwick'],
      [1, 2, '2', 'Saltreach'],
      [2, 3, '3', 'Upper Carrow'],
    ]);
    expect(it.codeByText.get('2')).toBe(1);
    for (const cell of ['3', '3.0', '03', '+3', '3.']) expect(lookupCell(it.codeByText, cell, true)).toBe(2);
    for (const cell of ['3e0', ' 3', '4', 'three']) expect(lookupCell(it.codeByText, cell, true)).toBeUndefined();
  });

  it('canonical number text is String(Number(x)) for plain decimals only', () => {
    expect(canonicalNumberText('1.50')).toBe('1.5');
    expect(canonicalNumberText('-0')).toBe('0');
    expect(canonicalNumberText('-0009.000')).toBe('-9');
    expect(canonicalNumberText('1e3')).toBeUndefined();
    expect(canonicalNumberText('')).toBeUndefined();
    expect(canonicalNumberText('.')).toBeUndefined();
  });

  it('text codes match only their exact text', () => {
    const cb = household();
    cb.items[6] = { name: 'roof', label: 'Roof', type: 'text', level: 'nominal', codes: [{ code: '01', label: 'thatch' }] };
    const r = lint(cb);
    expect(r.ok).toBe(true);
    const it = r.ok ? r.codebook.byName.get('roof')! : undefined;
    expect(lookupCell(it!.codeByText, '01', false)).toBe(0);
    expect(lookupCell(it!.codeByText, '1', false)).toBeUndefined();
  });

  it('binned items: bins sorted by min with open top bins as null', () => {
    const cb = household();
    cb.items[4].codes.reverse();
    const r = lint(cb);
    if (!r.ok) throw new Error('invalid');
    const it = r.codebook.byName.get('water_trips')!;
    expect(it.binned).toBe(true);
    expect(it.bins).toEqual([
      { index: 3, min: 0, max: 0 },
      { index: 2, min: 1, max: 3 },
      { index: 1, min: 4, max: 7 },
      { index: 0, min: 8, max: null },
    ]);
    expect(it.codes[0]!.bin).toEqual({ min: 8, max: null });
    expect(r.codebook.byName.get('district')!.binned).toBe(false);
    expect(r.codebook.byName.get('district')!.bins).toEqual([]);
  });

  it('patterns match the whole value', () => {
    const re = compiled().byName.get('hh_id')!.pattern!;
    expect(re.test('LM-00412')).toBe(true);
    expect(re.test('xLM-00412')).toBe(false);
    expect(re.test('LM-004123')).toBe(false);
  });

  it('routing and rules are compiled once and evaluate', () => {
    const cb = compiled();
    const asked = cb.byName.get('school_km')!.askedWhen!;
    expect(asked.evaluate({ hh_size: 2 })).toBe(true);
    expect(asked.evaluate({ hh_size: 1 })).toBe(false);
    const rule = cb.rules[0]!;
    expect([rule.id, rule.severity, rule.message]).toEqual(['trips-size', 'warning', 'Many trips for a one-person household.']);
    expect(rule.test.variables).toEqual(['water_trips', 'hh_size']);
    expect(rule.test.evaluate({ water_trips: 4, hh_size: 1 })).toBe(false);
    expect(rule.when!.evaluate({ district: 3 })).toBe(false);
  });

  it('compileCodebook compiles a parsed codebook, and throws CW_CODEBOOK_INVALID on a meaning error', () => {
    const data: Codebook = CodebookSchema.parse(household());
    expect(compileCodebook(data).items).toHaveLength(8);
    data.items[1]!.codes![1]!.code = 1;
    try {
      compileCodebook(data, 'hh.codebook.json');
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(CodeweirError);
      expect((e as CodeweirError).code).toBe('CW_CODEBOOK_INVALID');
      expect((e as CodeweirError).exitCode).toBe(1);
      expect((e as CodeweirError).path).toBe('/items/1/codes/1/code');
      expect((e as CodeweirError).message).toContain('hh.codebook.json /items/1/codes/1/code');
    }
  });

  it('warnings do not stop compiling', () => {
    const cb = household();
    cb.missingSets.spare = [];
    const r = lint(cb);
    expect(r.ok).toBe(true);
    expect(r.problems.map((p) => p.code)).toEqual(['unused-missing-set']);
  });
});
