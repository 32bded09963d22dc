import { defineRule, type CellParams } from './define.ts';

export const notAnInteger = defineRule<CellParams>({
  code: 'not-an-integer',
  severity: 'error',
  message: (p) => `${p.item} holds whole numbers; "${p.value}" has a fraction.`,
});
