import { defineRule } from './define.ts';

export const unbinnedColumn = defineRule<{ item: string; count: number; of: number }>({
  code: 'unbinned-column',
  severity: 'warning',
  message: (p) =>
    `${p.count} of ${p.of} answered cells of ${p.item} are raw quantities, not bin codes: the column looks delivered unbinned.`,
});
