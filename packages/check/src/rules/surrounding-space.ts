import { defineRule } from './define.ts';

export const surroundingSpace = defineRule<{ item: string; count: number }>({
  code: 'surrounding-space',
  severity: 'warning',
  message: (p) =>
    `${p.count} cell${p.count === 1 ? '' : 's'} of ${p.item} had spaces around the value; they were trimmed before checking.`,
});
