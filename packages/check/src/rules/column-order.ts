import { defineRule } from './define.ts';

export const columnOrder = defineRule<{ first: string }>({
  code: 'column-order',
  severity: 'warning',
  message: (p) => `The columns are not in codebook order (first out of place: "${p.first}"); columns are matched by name.`,
});
