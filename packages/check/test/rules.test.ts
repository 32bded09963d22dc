/**
 * One small codebook and delivery per rule. Expected rows, items and severities follow from
 * the codebook contract's definitions (codebook.md, interface.md), stated beside each case.
 */
import { describe, it, expect } from 'vitest';
import { codebook, run, where, missingOf, idItem } from './helpers.ts';

const id = idItem;
const sex = {
  name: 'sex',
  label: 'Sex',
  type: 'integer',
  level: 'nominal',
  codes: [
    { code: 1, label: 'Male' },
    { code: 2, label: 'Female' },
  ],
  missing: [
    { code: -9, kind: 'refused' },
    { code: 'DK', kind: 'dont-know' },
  ],
};
const age = {
  name: 'age',
  label: 'Age',
  type: 'integer',
  level: 'ratio',
  range: { min: 15, max: 115 },
  expect: { min: 16, max: 95 },
  missing: [{ code: -9, kind: 'refused' }],
};

describe('cell rules', () => {
  const cb = codebook([id, sex, age]);

  it('not-a-code: a value that is neither a code nor a missing code (error)', async () => {
    const r = await run(cb, [['1', '3', '40'], ['2', '1', '40'], ['3', '-9', '40'], ['4', 'DK', '40'], ['5', 'x', '40']]);
    expect(where(r, 'not-a-code')).toEqual([[1, 'sex']]);
    expect(where(r, 'not-a-number')).toEqual([[5, 'sex']]);
    const f = r.findings.find((x) => x.rule === 'not-a-code')!;
    expect(f.severity).toBe('error');
    expect(f.id).toBe('1');
    expect(f.value).toBe('3');
    // -9 and DK are declared missing codes: counted by kind, not findings.
    expect(r.summary.items.sex!.missing).toEqual({ refused: 1, 'dont-know': 1 });
  });

  it('impossible outside range (error), implausible inside range but outside expect (warning, still valid)', async () => {
    const r = await run(cb, [['1', '1', '130'], ['2', '1', '14'], ['3', '1', '100'], ['4', '1', '15'], ['5', '1', '95']]);
    expect(where(r, 'impossible')).toEqual([[1, 'age'], [2, 'age']]);
    // 100 > expect.max 95; 15 < expect.min 16 but inside range; 95 is on the bound (inclusive).
    expect(where(r, 'implausible')).toEqual([[3, 'age'], [4, 'age']]);
    expect(r.findings.find((f) => f.rule === 'implausible')!.severity).toBe('warning');
    expect(r.summary.items.age).toMatchObject({ valid: 3, invalid: 2 });
  });

  it('not-a-number and not-an-integer in an integer item', async () => {
    const r = await run(cb, [['1', '1', 'forty'], ['2', '1', '34.5'], ['3', '1', '34.0']]);
    expect(where(r, 'not-a-number')).toEqual([[1, 'age']]);
    // 34.0 is a whole number written with a decimal point: valid; 34.5 has a fraction.
    expect(where(r, 'not-an-integer')).toEqual([[2, 'age']]);
    expect(r.summary.items.age!.valid).toBe(1);
  });

  it('a decimal comma is read only with decimalComma', async () => {
    const cbd = codebook([id, { name: 'km', label: 'Distance', type: 'decimal', level: 'ratio', range: { min: 0, max: 50 } }]);
    const rows = [['1', '2,5'], ['2', '60,0'], ['3', '1.5']];
    const plain = await run(cbd, rows);
    expect(where(plain, 'not-a-number')).toEqual([[1, 'km'], [2, 'km']]);
    const comma = await run(cbd, rows, { decimalComma: true });
    expect(where(comma, 'impossible')).toEqual([[2, 'km']]);
    // With a decimal comma a full stop is ambiguous (thousands separator), so 1.5 is not a number.
    expect(where(comma, 'not-a-number')).toEqual([[3, 'km']]);
    expect(comma.store.columns.km).toMatchObject({ kind: 'numeric' });
    const v = (comma.store.columns.km as { values: Float64Array }).values;
    expect(v[0]).toBe(2.5);
    expect(Number.isNaN(v[1]!)).toBe(true);
  });

  it('surrounding spaces are trimmed and counted once per item as a warning', async () => {
    const r = await run(cb, [['1', ' 1', '40 '], ['2', '2 ', '41'], ['3', '  ', '42']]);
    const sp = r.findings.filter((f) => f.rule === 'surrounding-space');
    expect(sp.map((f) => [f.row, f.item, f.value, f.severity])).toEqual([
      [0, 'sex', '3', 'warning'],
      [0, 'age', '1', 'warning'],
    ]);
    // A cell of spaces only is blank once trimmed.
    expect(r.summary.items.sex).toMatchObject({ valid: 2, missing: { blank: 1 }, trimmed: 3 });
    expect(r.summary.items.age!.valid).toBe(3);
  });

  it('pattern-mismatch on the whole value, and on over-long text without running the pattern', async () => {
    const cbp = codebook([{ name: 'code', label: 'Code', type: 'text', pattern: '[A-Z][0-9]{2}' }]);
    const r = await check2(cbp, [['A12'], ['A123'], ['xA12'], ['B'.repeat(50)]], { maxPatternLength: 20 });
    expect(where(r, 'pattern-mismatch')).toEqual([[2, 'code'], [3, 'code'], [4, 'code']]);
    expect(r.findings.at(-1)!.message).toContain('longer than 20 characters');
  });

  it('duplicate-id: every occurrence after the first, numeric ids compared as numbers', async () => {
    const r = await run(cb, [['7', '1', '40'], ['8', '1', '40'], ['7', '2', '40'], ['007', '1', '40'], ['9', '1', '40']]);
    // 007 is the integer 7 again.
    expect(where(r, 'duplicate-id')).toEqual([[3, 'id'], [4, 'id']]);
    expect(r.findings.filter((f) => f.rule === 'duplicate-id').map((f) => f.value)).toEqual(['7', '7']);
    // Duplicates stay valid values: the record is flagged, the id itself parses.
    expect(r.summary.items.id!.valid).toBe(5);
  });

  it('duplicate text ids and other unique items', async () => {
    const cbt = codebook([
      { name: 'hh', label: 'Household', role: 'id', type: 'text' },
      { name: 'phone', label: 'Phone', type: 'text', unique: true },
    ]);
    const r = await check2(cbt, [['a', '555'], ['b', '556'], ['a', '555'], ['c', '']]);
    expect(where(r, 'duplicate-id')).toEqual([[3, 'hh'], [3, 'phone']]);
    expect(r.findings.find((f) => f.item === 'phone')!.id).toBe('a');
  });

  it('valid + missing + invalid = rows for every item', async () => {
    const rows = [['1', '1', '40'], ['2', 'x', '-9'], ['3', '', '200'], ['x', '-9', 'DK'], ['5', 'DK', '']];
    const r = await run(cb, rows);
    for (const name of ['id', 'sex', 'age']) {
      const t = r.summary.items[name]!;
      expect(t.valid + t.invalid + missingOf(r, name)).toBe(rows.length);
    }
  });
});

describe('binned items', () => {
  const trips = {
    name: 'trips',
    label: 'Trips to market last month',
    type: 'integer',
    level: 'ordinal',
    codes: [
      { code: 1, label: 'None', bin: { min: 0, max: 0 } },
      { code: 2, label: '1 to 3', bin: { min: 1, max: 3 } },
      { code: 3, label: '4 to 7', bin: { min: 4, max: 7 } },
      { code: 4, label: '8 or more', bin: { min: 8 } },
    ],
    missing: [{ code: -9, kind: 'refused' }],
  };
  const cb = codebook([id, trips]);

  it('unbinned-value: a number in a bin but not a code is an error with the bin code as suggestion', async () => {
    const r = await run(cb, [['1', '2'], ['2', '6'], ['3', '25'], ['4', '0'], ['5', '-9'], ['6', '-3'], ['7', '1'], ['8', '4'], ['9', '3']]);
    const u = r.findings.filter((f) => f.rule === 'unbinned-value');
    // 6 lies in [4, 7] (code 3), 25 in the open top bin [8, inf) (code 4), 0 in [0, 0] (code 1).
    expect(u.map((f) => [f.row, f.item, f.suggestion, f.severity])).toEqual([
      [2, 'trips', '3', 'error'],
      [3, 'trips', '4', 'error'],
      [4, 'trips', '1', 'error'],
    ]);
    // -3 is in no bin and no code: not-a-code. -9 is a missing code.
    expect(where(r, 'not-a-code')).toEqual([[6, 'trips']]);
    // 3 raw quantities of 8 answered cells: not most of the column.
    expect(where(r, 'unbinned-column')).toEqual([]);
  });

  it('unbinned-column: most answered cells are raw quantities', async () => {
    const r = await run(cb, [['1', '5'], ['2', '12'], ['3', '9'], ['4', '2'], ['5', '']]);
    // 3 raw quantities (5, 12, 9) of 4 answered cells: more than half.
    const f = r.findings.filter((x) => x.rule === 'unbinned-column');
    expect(f.map((x) => [x.row, x.item, x.severity])).toEqual([[0, 'trips', 'warning']]);
  });
});

describe('dates and text codes', () => {
  it('not-a-date for a cell that is not YYYY-MM-DD, text codes matched exactly', async () => {
    const cb = codebook([
      { name: 'd', label: 'Date', type: 'date', level: 'interval', missing: [{ code: '9999-99-99', kind: 'not-reached' }] },
      { name: 'w', label: 'Water', type: 'text', level: 'nominal', codes: [{ code: 'PIPE', label: 'Piped' }, { code: 'WELL', label: 'Well' }] },
    ]);
    const r = await check2(cb, [['2026-03-14', 'PIPE'], ['14/03/2026', 'pipe'], ['9999-99-99', 'WELL'], ['2026-02-30', '']]);
    expect(where(r, 'not-a-date')).toEqual([[2, 'd'], [4, 'd']]);
    expect(where(r, 'not-a-code')).toEqual([[2, 'w']]);
    expect(r.summary.items.d!.missing).toEqual({ 'not-reached': 1 });
    const codes = (r.store.columns.w as { codes: Uint16Array }).codes;
    // Coded columns retain 1 + code index, 0 where not valid.
    expect(Array.from(codes)).toEqual([1, 0, 2, 0]);
  });
});

async function check2(cb: ReturnType<typeof codebook>, rows: string[][], options = {}) {
  return run(cb, rows, options);
}
