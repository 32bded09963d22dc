import { defineRule, type CellParams } from './define.ts';

export const notADate = defineRule<CellParams>({
  code: 'not-a-date',
  severity: 'error',
  message: (p) => `"${p.value}" in ${p.item} is not a calendar date written YYYY-MM-DD nor a declared missing code.`,
});
