import { defineRule, type CellParams } from './define.ts';

export const duplicateId = defineRule<CellParams>({
  code: 'duplicate-id',
  severity: 'error',
  message: (p) => `${p.item} must be unique; ${p.value} occurs on an earlier row.`,
});
