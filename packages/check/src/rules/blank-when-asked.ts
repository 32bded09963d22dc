import { defineRule } from './define.ts';

export const blankWhenAsked = defineRule<{ item: string; condition: string }>({
  code: 'blank-when-asked',
  severity: 'warning',
  message: (p) => `${p.item} should be asked here (${p.condition} is true) but the cell is blank.`,
});
