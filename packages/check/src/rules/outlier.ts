import { defineRule, type CellParams } from './define.ts';

export const outlier = defineRule<CellParams & { lower: number; upper: number }>({
  code: 'outlier',
  severity: 'info',
  message: (p) => `${p.value} in ${p.item} is beyond the inner Tukey fences ${p.lower} and ${p.upper} (1.5 x IQR from the quartiles).`,
});
