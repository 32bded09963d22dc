import { defineRule, type CellParams } from './define.ts';

export const notANumber = defineRule<CellParams>({
  code: 'not-a-number',
  severity: 'error',
  message: (p) => `"${p.value}" in ${p.item} is not a number nor a declared missing code.`,
});
