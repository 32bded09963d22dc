import { defineRule } from './define.ts';

export const duplicateColumn = defineRule<{ column: string; count: number }>({
  code: 'duplicate-column',
  severity: 'error',
  message: (p) => `The column "${p.column}" appears ${p.count} times in the header; only the first is checked.`,
});
