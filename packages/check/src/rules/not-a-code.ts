import { defineRule, type CellParams } from './define.ts';

export const notACode = defineRule<CellParams & { codes: string }>({
  code: 'not-a-code',
  severity: 'error',
  message: (p) => `"${p.value}" is not a code of ${p.item} (codes: ${p.codes}) nor a declared missing code.`,
});
