import { describe, it, expect } from 'vitest';
import { ExpressionContext, compileExpression, daysSinceEpoch, type ExpressionItem } from '../src/index.ts';

const items: ExpressionItem[] = [
  { index: 0, name: 'hh_size', type: 'integer' },
  { index: 1, name: 'school_km', type: 'decimal' },
  { index: 2, name: 'head_name', type: 'text' },
  { index: 3, name: 'visit_date', type: 'date' },
  { index: 4, name: 'district', type: 'integer' },
];
const ctx = new ExpressionContext(items);

function compiled(source: string) {
  const r = compileExpression(ctx, source, '/rules/0/test');
  expect(r.problems).toEqual([]);
  return r.expression!;
}

describe('CEL types of items', () => {
  it('integer items are int: plain JS numbers are converted', () => {
    const e = compiled('hh_size > 2 && district == 1');
    expect(e.evaluate({ hh_size: 3, district: 1 })).toBe(true);
    expect(e.evaluate({ hh_size: 2, district: 1 })).toBe(false);
    expect(e.evaluate({ hh_size: 3, district: 2 })).toBe(false);
  });

  it('decimal items are double, text items string', () => {
    expect(compiled('school_km >= 2.5').evaluate({ school_km: 2.5 })).toBe(true);
    // A decimal that happens to be whole is still a double.
    expect(compiled('school_km >= 2.5').evaluate({ school_km: 3 })).toBe(true);
    expect(compiled('head_name.startsWith("A")').evaluate({ head_name: 'Ayo' })).toBe(true);
  });

  it('date items are int days since 1970-01-01, and date() gives the same day numbers', () => {
    // First principles: 1970 to 1999 are 30 years of 365 days plus 7 leap days
    // (1972, 76, 80, 84, 88, 92, 96), so 2000-01-01 is day 10957.
    expect(daysSinceEpoch('2000-01-01')).toBe(10957);
    expect(daysSinceEpoch('1970-01-01')).toBe(0);
    // 2000 is a leap year (divisible by 400): Feb 29 exists and is day 31 + 28 after Jan 1.
    expect(daysSinceEpoch('2000-02-29')).toBe(10957 + 59);
    expect(daysSinceEpoch('2026-02-30')).toBeUndefined();
    expect(daysSinceEpoch('2026-2-3')).toBeUndefined();
    const e = compiled('visit_date >= date("2000-01-01")');
    expect(e.evaluate({ visit_date: 10957 })).toBe(true);
    expect(e.evaluate({ visit_date: 10956 })).toBe(false);
  });

  it('an evaluation error or a value that cannot be the declared type counts as false', () => {
    expect(compiled('hh_size / (district - 1) > 0').evaluate({ hh_size: 3, district: 1 })).toBe(false);
    expect(compiled('hh_size > 0').evaluate({ hh_size: 2.5 })).toBe(false);
    expect(compiled('visit_date > date(head_name)').evaluate({ visit_date: 1, head_name: 'not a day' })).toBe(false);
    expect(compiled('visit_date > date(head_name)').evaluate({ visit_date: 1, head_name: '1969-12-31' })).toBe(true);
  });

  it('lists the variables read, in first-use order, with their item indices', () => {
    const e = compiled('district == 2 && (hh_size > 1 || district == 3) && [1, 2].exists(x, x == hh_size)');
    expect(e.variables).toEqual(['district', 'hh_size']);
    expect(e.variableIndices).toEqual([4, 0]);
    expect(e.source).toBe('district == 2 && (hh_size > 1 || district == 3) && [1, 2].exists(x, x == hh_size)');
  });
});

describe('CEL problems', () => {
  const problemOf = (source: string) => {
    const r = compileExpression(ctx, source, '/items/1/askedWhen');
    expect(r.expression).toBeUndefined();
    expect(r.problems).toHaveLength(1);
    return r.problems[0]!;
  };

  it('an int compared with a double is a type error (CEL has no implicit int/double equality)', () => {
    const p = problemOf('hh_size == 1.0');
    expect(p.code).toBe('cel-type');
    expect(p.path).toBe('/items/1/askedWhen');
  });

  it('adding text to a number is a type error at the operator', () => {
    const p = problemOf('head_name + hh_size == "x"');
    expect(p.code).toBe('cel-type');
    expect(p.message).toContain('string + int');
  });

  it('unknown items name the item and its position', () => {
    const p = problemOf('hh_size > 1 && distric == 2');
    expect(p).toMatchObject({ code: 'cel-unknown-item', charIndex: 15 });
    expect(p.message).toBe('unknown item "distric" at character 16 (did you mean "district"?)');
  });

  it('a result that is not bool', () => {
    expect(problemOf('school_km * 2.0').message).toBe('expression gives a double, not a bool (true or false)');
    expect(problemOf('head_name').code).toBe('cel-not-boolean');
  });

  it('syntax errors carry the position', () => {
    const p = problemOf('hh_size > ');
    expect(p.code).toBe('cel-syntax');
    expect(p.message).toMatch(/^CEL syntax error at character \d+: /);
  });

  it('a fixed day that is not a calendar day', () => {
    const p = problemOf('visit_date > date("2026-13-01")');
    expect(p).toMatchObject({ code: 'cel-bad-date', charIndex: 18 });
  });

  it('deep nesting never crashes', () => {
    for (const s of ['('.repeat(5000) + '1 > 0' + ')'.repeat(5000), '!'.repeat(5000) + 'true', '[' .repeat(3000) + ']'.repeat(3000) + ' == []']) {
      expect(problemOf(s).code).toBe('cel-too-deep');
    }
  });
});
