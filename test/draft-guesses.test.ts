/**
 * Draft guesses on small inline deliveries. Each expected answer follows from the rule under
 * test, applied by hand to the data written out in the test (first principles); the rules
 * themselves are common practice, as stated in packages/draft/src/missing.ts and infer.ts.
 */
import { describe, it, expect } from 'vitest';
import { draftCodebook, draftDelivery, formatJson, type DraftItem, type DraftResult } from '../packages/draft/src/index.ts';
import { readDeliveryText } from '../packages/read/src/index.ts';

/** One column of data as rows of one cell. */
function column(name: string, values: Array<string | number>): DraftResult {
  return draftCodebook({ header: [name], rows: values.map((v) => [String(v)]) });
}

function item(r: DraftResult, name?: string): DraftItem {
  const it = name === undefined ? r.codebook.items[0] : r.codebook.items.find((i) => i.name === name);
  if (!it) throw new Error(`no item ${name}`);
  return it;
}

const range = (from: number, to: number): number[] => Array.from({ length: to - from + 1 }, (_, i) => from + i);
/** Repeats each value `times` times, so a column has enough cells per distinct value to look coded. */
const times = (values: number[], n: number): number[] => values.flatMap((v) => Array(n).fill(v) as number[]);

describe('draft: type', () => {
  it('reads whole numbers as integer, numbers with a decimal mark as decimal, ISO dates as date, the rest as text', () => {
    expect(item(column('n', range(1, 40))).type).toBe('integer');
    expect(item(column('x', range(1, 40).map((v) => `${v}.25`))).type).toBe('decimal');
    expect(item(column('d', range(1, 28).map((v) => `2026-02-${String(v).padStart(2, '0')}`))).type).toBe('date');
    expect(item(column('t', range(1, 40).map((v) => `note ${v}`))).type).toBe('text');
  });

  it('keeps a numeric type through typos up to 2% of cells, not beyond', () => {
    // 99 numbers and 1 word: 99/100 = 0.99 >= 0.98, so integer with the stray cell noted.
    const ok = item(column('n', [...range(1, 99), 'abc']));
    expect(ok.type).toBe('integer');
    expect(ok.label).toContain('"abc"');
    // 95 numbers and 5 words: 0.95 < 0.98, so text.
    expect(item(column('n', [...range(1, 95), 'a', 'b', 'c', 'd', 'e'])).type).toBe('text');
  });

  it('keeps integer through one fraction in 400 numbers (0.25% <= 0.5%), not through one in 100 (1%)', () => {
    expect(item(column('n', [...range(1, 399), '34.5'])).type).toBe('integer');
    expect(item(column('n', [...range(1, 99), '34.5'])).type).toBe('decimal');
  });

  it('reads a decimal comma only when asked', () => {
    const cells = range(1, 40).map((v) => `${v},5`);
    const rows = cells.map((c) => [c]);
    expect(item(draftCodebook({ header: ['x'], rows })).type).toBe('text');
    expect(item(draftCodebook({ header: ['x'], rows })).label).toContain('decimal comma');
    expect(item(draftCodebook({ header: ['x'], rows }, { decimalComma: true })).type).toBe('decimal');
  });
});

describe('draft: missing codes (sentinel shape, at an end, apart from the other values)', () => {
  it('takes 8 and 9 above a 1-5 scale: 8 - 5 = 3 > 1 leaves 6 and 7 unused', () => {
    const it = item(column('q', [...times(range(1, 5), 20), 8, 8, 9, 9, 9]));
    expect(it.codes?.map((c) => c.code)).toEqual([1, 2, 3, 4, 5]);
    expect(it.missing).toEqual([
      { code: 8, kind: 'dont-know', label: 'dont know (to confirm)' },
      { code: 9, kind: 'refused', label: 'refused (to confirm)' },
    ]);
  });

  it('takes nothing from 1-9 with no gap: 9 - 8 = 1 is not more than 1', () => {
    const it = item(column('q', times(range(1, 9), 10)));
    expect(it.missing).toBeUndefined();
    expect(it.codes).toHaveLength(9);
  });

  it('takes only 9 from 1-7 plus 9: 7 and 6 have the shape but touch the values below', () => {
    const it = item(column('q', [...times(range(1, 7), 10), 9, 9]));
    expect(it.missing).toEqual([{ code: 9, kind: 'refused', label: 'refused (to confirm)' }]);
    expect(it.codes?.map((c) => c.code)).toEqual(range(1, 7));
  });

  it('takes 98 and 99 above ages 18-70 and reads the kinds from the last digit', () => {
    const it = item(column('age', [...range(18, 70), 98, 99, 99]));
    expect(it.missing).toEqual([
      { code: 98, kind: 'dont-know', label: 'dont know (to confirm)' },
      { code: 99, kind: 'refused', label: 'refused (to confirm)' },
    ]);
    expect(it.level).toBe('ratio');
  });

  it('takes negative sentinels below values that are all 0 or more', () => {
    const it = item(column('income', [...range(0, 60).map((v) => v * 100), -7, -8, -9]));
    expect(it.missing).toEqual([
      { code: -9, kind: 'refused', label: 'refused (to confirm)' },
      { code: -8, kind: 'dont-know', label: 'dont know (to confirm)' },
      { code: -7, kind: 'not-applicable', label: 'not applicable (to confirm)' },
    ]);
  });

  it('takes no negative sentinel from a column that is negative anyway (-20 to 20)', () => {
    // Each value twice: an all-different first column would be taken as the id.
    const it = item(column('temp', times(range(-20, 20), 2)));
    expect(it.missing).toBeUndefined();
    // Negative values: no true zero, interval.
    expect(it.level).toBe('interval');
  });

  it('takes conventional tokens of a text column as missing (DK, REF), not as codes', () => {
    const it = item(column('src', [...Array(10).fill('WELL'), ...Array(10).fill('TAP'), 'DK', 'DK', 'REF']));
    expect(it.type).toBe('text');
    expect(it.codes?.map((c) => c.code)).toEqual(['TAP', 'WELL']);
    expect(it.missing).toEqual([
      { code: 'DK', kind: 'dont-know', label: 'dont know (to confirm)' },
      { code: 'REF', kind: 'refused', label: 'refused (to confirm)' },
    ]);
  });

  it('names a missing list shared by two items once, in missingSets', () => {
    const rows = range(0, 39).map((v) => [String(v % 7 === 0 ? -9 : v), String(v % 5 === 0 ? -9 : v + 100)]);
    const r = draftCodebook({ header: ['a', 'b'], rows });
    expect(r.codebook.missingSets).toEqual({ set1: [{ code: -9, kind: 'refused', label: 'refused (to confirm)' }] });
    expect(r.codebook.items.map((i) => i.missing)).toEqual(['set1', 'set1']);
  });
});

describe('draft: codes, level and role', () => {
  it('gives up to 12 distinct values a code list (nominal), 13 or more a numeric level', () => {
    const twelve = item(column('c', times(range(1, 12), 3)));
    expect(twelve.level).toBe('nominal');
    expect(twelve.codes?.map((c) => c.code)).toEqual(range(1, 12));
    expect(twelve.codes?.every((c) => c.label === 'to confirm')).toBe(true);
    const thirteen = item(column('c', times(range(1, 13), 3)));
    expect(thirteen.codes).toBeUndefined();
    expect(thirteen.level).toBe('ratio');
  });

  it('gives no code list when values barely repeat (fewer than two cells per distinct value)', () => {
    // 10 cells, 10 distinct values: 10 < 2 x 10.
    expect(item(column('c', range(1, 10))).codes).toBeUndefined();
  });

  it('reads non-negative amounts as ratio, calendar years as interval, dates as interval', () => {
    // Values repeat so the first column is not taken as an all-different id.
    expect(item(column('km', times(range(0, 30), 2).map((v) => `${v}.5`))).level).toBe('ratio');
    expect(item(column('built', times(range(1950, 2020), 2))).level).toBe('interval');
    expect(item(column('d', range(1, 28).map((v) => `2026-02-${String(v).padStart(2, '0')}`))).level).toBe('interval');
  });

  it('takes an all-different first column as the id, with a pattern from its layout', () => {
    const rows = range(1, 30).map((v) => [`H-${String(v).padStart(4, '0')}`, String(v % 3)]);
    const r = draftCodebook({ header: ['key', 'x'], rows });
    const id = item(r, 'key');
    expect(id.role).toBe('id');
    expect(id.level).toBeUndefined();
    // "H-0001": one capital, a hyphen, four digits.
    expect(id.pattern).toBe('^[A-Z]-[0-9]{4}$');
    expect(new RegExp(id.pattern ?? '', 'u').test('H-0001')).toBe(true);
    expect(item(r, 'x').role).toBeUndefined();
  });

  it('takes a team column with 20 codes as a group, a weight-named decimal as the weight', () => {
    const rows = range(1, 100).map((v) => [String(v), String((v % 20) + 1), `${100 + v}.5`]);
    const r = draftCodebook({ header: ['n', 'team', 'weight'], rows });
    expect(item(r, 'team').role).toBe('group');
    expect(item(r, 'team').codes).toHaveLength(20);
    expect(item(r, 'weight').role).toBe('weight');
    expect(item(r, 'weight').level).toBe('ratio');
  });

  it('marks every guessed item for a person to confirm', () => {
    const r = draftCodebook({ header: ['a', 'b'], rows: range(1, 30).map((v) => [String(v), String(v % 2)]) });
    for (const it of r.codebook.items) expect(it.label).toMatch(/\[check: .+\]$/);
    expect(r.guesses.filter((g) => g.item === 'b').map((g) => g.field)).toEqual(['type', 'codes', 'level']);
  });
});

describe('draft: header and rows', () => {
  it('renames empty and repeated header cells and says so', () => {
    const r = draftCodebook({ header: ['a', '', 'a'], rows: [['1', '2', '3']] });
    expect(r.codebook.items.map((i) => i.name)).toEqual(['a', 'column_2', 'a_2']);
    expect(r.guesses.filter((g) => g.field === 'name').map((g) => g.item)).toEqual(['column_2', 'a_2']);
  });

  it('counts ragged rows and reads absent fields as blank', () => {
    const r = draftCodebook({ header: ['a', 'b'], rows: [['1', '2'], ['3'], ['4', '5', '6']] });
    expect(r.rows).toBe(3);
    expect(r.raggedRows).toBe(2);
  });

  it('drafts the same from a delivery stream as from rows', async () => {
    const rows = range(1, 60).map((v) => [`R${v}`, String(v % 4 === 0 ? -9 : v % 3), `${v * 1.5}`]);
    const csv = ['id,grp,amount', ...rows.map((r) => r.join(','))].join('\n') + '\n';
    const streamed = await draftDelivery(readDeliveryText(csv, { name: 'mini.csv' }));
    const direct = draftCodebook({ header: ['id', 'grp', 'amount'], rows }, { source: 'mini.csv' });
    expect(streamed).toEqual(direct);
    expect(direct.codebook.codebook).toBe('mini');
  });

  it('formats JSON that parses back to the same codebook', () => {
    const r = draftCodebook({ header: ['a', 'b'], rows: range(1, 30).map((v) => [String(v), String(v % 2)]) });
    expect(JSON.parse(formatJson(r.codebook))).toEqual(r.codebook);
  });

  it('rejects a bad option with a sentence naming it', () => {
    expect(() => draftCodebook({ header: ['a'], rows: [] }, { maxCodes: 0 })).toThrow(/maxCodes takes a whole number from 1 to 1000, got 0/);
    expect(() => draftCodebook({ header: ['a'], rows: [] }, { codebook: 'no spaces' })).toThrow(/identifier/);
  });
});
