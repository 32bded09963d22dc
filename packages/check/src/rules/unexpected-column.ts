import { defineRule } from './define.ts';

export const unexpectedColumn = defineRule<{ column: string; position: number }>({
  code: 'unexpected-column',
  severity: 'warning',
  message: (p) => `Column ${p.position} "${p.column}" is not an item of the codebook; it is not checked.`,
});
