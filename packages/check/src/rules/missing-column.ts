import { defineRule } from './define.ts';

export const missingColumn = defineRule<{ item: string }>({
  code: 'missing-column',
  severity: 'error',
  message: (p) => `The codebook item "${p.item}" has no column in the delivery.`,
});
