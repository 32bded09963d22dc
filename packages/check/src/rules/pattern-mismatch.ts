import { defineRule, type CellParams } from './define.ts';

export const patternMismatch = defineRule<CellParams & { pattern: string; tooLong?: number }>({
  code: 'pattern-mismatch',
  severity: 'error',
  message: (p) =>
    p.tooLong !== undefined
      ? `The value of ${p.item} is longer than ${p.tooLong} characters, so it is not matched against /${p.pattern}/.`
      : `"${p.value}" in ${p.item} does not match the pattern /${p.pattern}/.`,
});
