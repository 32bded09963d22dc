import { defineRule } from './define.ts';

export const noRows = defineRule<{ file: string }>({
  code: 'no-rows',
  severity: 'warning',
  message: (p) => `${p.file} has a header but no data rows.`,
});
