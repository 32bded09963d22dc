import { defineRule, type CellParams } from './define.ts';

export const extreme = defineRule<CellParams & { lower: number; upper: number }>({
  code: 'extreme',
  severity: 'info',
  message: (p) => `${p.value} in ${p.item} is beyond the outer Tukey fences ${p.lower} and ${p.upper} (3 x IQR from the quartiles).`,
});
