import { defineRule, type CellParams } from './define.ts';

export const answeredWhenSkipped = defineRule<CellParams & { condition: string }>({
  code: 'answered-when-skipped',
  severity: 'error',
  message: (p) => `${p.item} is asked only when ${p.condition}, which is false on this row, yet it holds the answer ${p.value}.`,
});
