import { defineRule } from './define.ts';

export const weightNotPositive = defineRule<{ item: string; value: string }>({
  code: 'weight-not-positive',
  severity: 'warning',
  message: (p) =>
    p.value === ''
      ? `The weight ${p.item} is missing or not a number on this record, which design-based estimates therefore leave out.`
      : `The weight ${p.item} is ${p.value}, not above 0, so design-based estimates leave this record out.`,
});
