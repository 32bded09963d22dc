import { defineRule, describeBounds, type CellParams } from './define.ts';

export const implausible = defineRule<CellParams & { min?: number; max?: number }>({
  code: 'implausible',
  severity: 'warning',
  message: (p) => `${p.value} is possible but outside the expected range of ${p.item} (${describeBounds(p.min, p.max)}).`,
});
