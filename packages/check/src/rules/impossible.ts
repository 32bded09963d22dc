import { defineRule, describeBounds, type CellParams } from './define.ts';

export const impossible = defineRule<CellParams & { min?: number; max?: number }>({
  code: 'impossible',
  severity: 'error',
  message: (p) => `${p.value} is outside the possible range of ${p.item} (${describeBounds(p.min, p.max)}).`,
});
