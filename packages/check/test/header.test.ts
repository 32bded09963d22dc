import { describe, it, expect } from 'vitest';
import { check } from '../src/index.ts';
import { readDeliveryText } from '@codeweir/read';
import { checkDelivery } from '../src/index.ts';
import { codebook, where, idItem } from './helpers.ts';

const cb = codebook([
  idItem,
  { name: 'a', label: 'A', type: 'integer', level: 'ratio' },
  { name: 'b', label: 'B', type: 'integer', level: 'ratio' },
]);

describe('header against codebook', () => {
  it('missing (error, item absent), unexpected (warning), duplicate (error); checking goes on', async () => {
    const r = await check([{ id: '1', b: 'x', extra: '5' }], cb);
    expect(r.summary.header).toMatchObject({ missing: ['a'], unexpected: ['extra'], duplicate: [] });
    expect(where(r, 'missing-column')).toEqual([[0, 'a']]);
    expect(r.findings.find((f) => f.rule === 'unexpected-column')!.severity).toBe('warning');
    expect(r.summary.items.a).toMatchObject({ absent: true, valid: 0, invalid: 0 });
    // The columns that are there are still checked.
    expect(where(r, 'not-a-number')).toEqual([[1, 'b']]);
  });

  it('a repeated column is an error and its first occurrence is checked', async () => {
    const d = await readDeliveryText('id,a,b,a\n1,2,3,x\n', {});
    const r = await checkDelivery(d, cb);
    expect(r.summary.header.duplicate).toEqual(['a']);
    expect(r.findings.find((f) => f.rule === 'duplicate-column')!.severity).toBe('error');
    expect(r.summary.items.a!.valid).toBe(1);
  });

  it('another column order is fine: one column-order warning, cells matched by name', async () => {
    const d = await readDeliveryText('b,id,a\n5,1,x\n', {});
    const r = await checkDelivery(d, cb);
    expect(r.findings.filter((f) => f.rule === 'column-order').map((f) => f.severity)).toEqual(['warning']);
    expect(where(r, 'not-a-number')).toEqual([[1, 'a']]);
    expect(r.summary.items.b!.valid).toBe(1);
  });

  it('a header and no rows: a no-rows warning, accepted', async () => {
    const d = await readDeliveryText('id,a,b\n', {});
    const r = await checkDelivery(d, cb);
    expect(r.summary.rows).toBe(0);
    expect(r.findings.map((f) => [f.rule, f.severity])).toEqual([['no-rows', 'warning']]);
    expect(r.summary.accepted).toBe(true);
  });

  it('ragged rows: present fields are checked, absent cells count as invalid, extra fields ignored', async () => {
    const d = await readDeliveryText('id,a,b\n1,2,3\n2,x\n3,4,5,6\n', {});
    const r = await checkDelivery(d, cb);
    expect(where(r, 'ragged-row')).toEqual([[2, ''], [3, '']]);
    expect(where(r, 'not-a-number')).toEqual([[2, 'a']]);
    // Row 2 has no b: invalid without a cell finding of its own.
    expect(r.summary.items.b).toMatchObject({ valid: 2, invalid: 1 });
    expect(r.summary.items.id!.valid).toBe(3);
  });
});
