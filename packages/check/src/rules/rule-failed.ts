import { defineRule } from './define.ts';

/** Severity comes from the codebook rule; `error` is only the default of the definition. */
export const ruleFailed = defineRule<{ rule: string; message: string }>({
  code: 'rule-failed',
  severity: 'error',
  message: (p) => p.message,
});
