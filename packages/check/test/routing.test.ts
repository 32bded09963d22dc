/**
 * Routing (askedWhen) and cross-item rules. The expected outcomes follow the codebook
 * contract: a skipped item must be blank or carry a not-applicable code; an expression whose
 * variable is missing or invalid on a row is undetermined there (counted, not a finding).
 */
import { describe, it, expect } from 'vitest';
import { codebook, run, where, idItem, employedItem } from './helpers.ts';

const items = [
  idItem,
  employedItem,
  {
    name: 'hours',
    label: 'Hours worked',
    type: 'integer',
    level: 'ratio',
    range: { min: 0, max: 168 },
    askedWhen: 'employed == 1',
    missing: [
      { code: -7, kind: 'not-applicable' },
      { code: -8, kind: 'dont-know' },
    ],
  },
];

describe('routing', () => {
  const cb = codebook(items);

  it('answered-when-skipped, blank-when-asked, and what is correct on a skipped item', async () => {
    const r = await run(cb, [
      ['1', '1', '40'], // asked, answered
      ['2', '2', '35'], // skipped, answered: error, and the cell becomes invalid
      ['3', '2', ''], // skipped, blank: correct
      ['4', '2', '-7'], // skipped, not-applicable: correct
      ['5', '1', ''], // asked, blank: warning
      ['6', '2', '-8'], // skipped, dont-know: missing of that kind, and a warning (blank or not-applicable belongs there)
    ]);
    expect(where(r, 'answered-when-skipped')).toEqual([[2, 'hours']]);
    expect(where(r, 'blank-when-asked')).toEqual([[5, 'hours']]);
    expect(r.findings.find((f) => f.rule === 'blank-when-asked')!.severity).toBe('warning');
    expect(where(r, 'missing-code-when-skipped')).toEqual([[6, 'hours']]);
    expect(r.findings.find((f) => f.rule === 'missing-code-when-skipped')).toMatchObject({ severity: 'warning', value: '-8' });
    expect(r.summary.items.hours).toMatchObject({
      valid: 1,
      invalid: 1,
      missing: { blank: 2, 'not-applicable': 1, 'dont-know': 1 },
      routing: { asked: 2, skipped: 4, undetermined: 0 },
    });
    // The invalid answer is not retained for describing.
    const v = (r.store.columns.hours as { values: Float64Array }).values;
    expect(Number.isNaN(v[1]!)).toBe(true);
    expect(v[0]).toBe(40);
  });

  it('is undetermined (counted, no finding) where the controlling item is missing or invalid', async () => {
    const r = await run(cb, [
      ['1', '-9', '40'], // employed refused
      ['2', 'x', '40'], // employed invalid
      ['3', '', ''], // employed blank
    ]);
    expect(where(r, 'answered-when-skipped')).toEqual([]);
    expect(where(r, 'blank-when-asked')).toEqual([]);
    expect(r.summary.items.hours!.routing).toEqual({ asked: 0, skipped: 0, undetermined: 3 });
    expect(r.summary.items.hours!.valid).toBe(2);
  });

  it('is undetermined on every row when the controlling column is absent', async () => {
    const r = await run(cb, [['1', '40']].map(([a, b]) => ({ id: a!, hours: b! })) as never);
    expect(r.summary.items.hours!.routing).toEqual({ asked: 0, skipped: 0, undetermined: 1 });
    expect(where(r, 'missing-column')).toEqual([[0, 'employed']]);
  });
});

describe('cross-item rules', () => {
  const cb = codebook(
    [
      idItem,
      { name: 'size', label: 'Household size', type: 'integer', level: 'ratio', missing: [{ code: -9, kind: 'refused' }] },
      { name: 'kids', label: 'Children', type: 'integer', level: 'ratio', missing: [{ code: -9, kind: 'refused' }] },
      { name: 'pupils', label: 'Children at school', type: 'integer', level: 'ratio' },
    ],
    {
      rules: [
        { id: 'kids-fit', test: 'kids < size', severity: 'error', message: 'More children than household members.' },
        { id: 'pupils-fit', when: 'kids > 0', test: 'pupils <= kids', severity: 'warning', message: 'More pupils than children.' },
      ],
    },
  );

  it('reports a failed test with the rule id as item and the rule severity; counts passed, failed, undetermined, skipped', async () => {
    const r = await run(cb, [
      ['1', '4', '2', '1'], // both pass
      ['2', '2', '3', '3'], // kids-fit fails; pupils-fit passes
      ['3', '-9', '1', '2'], // kids-fit undetermined (size refused); pupils-fit fails
      ['4', '3', '0', '0'], // kids-fit passes; pupils-fit skipped (when false)
      ['5', '3', '-9', '0'], // kids-fit undetermined; pupils-fit undetermined (when needs kids)
      ['6', '3', '1', ''], // kids-fit passes; pupils-fit undetermined (pupils blank)
    ]);
    expect(r.findings.filter((f) => f.rule === 'rule-failed').map((f) => [f.row, f.item, f.severity, f.message])).toEqual([
      [2, 'kids-fit', 'error', 'More children than household members.'],
      [3, 'pupils-fit', 'warning', 'More pupils than children.'],
    ]);
    expect(r.summary.rules).toEqual({
      'kids-fit': { passed: 3, failed: 1, undetermined: 2, skipped: 0 },
      'pupils-fit': { passed: 2, failed: 1, undetermined: 2, skipped: 1 },
    });
  });
});
