import { defineRule, type CellParams } from './define.ts';

export const unbinnedValue = defineRule<CellParams & { code: string; bin: string }>({
  code: 'unbinned-value',
  severity: 'error',
  message: (p) => `${p.item} is binned but holds the raw quantity ${p.value}; it falls in the bin ${p.bin}, code ${p.code}.`,
});
