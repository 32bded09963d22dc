import { defineRule, type CellParams } from './define.ts';

/**
 * Routing said skip, and the cell carries a declared missing code of another kind than
 * `not-applicable` (for example `refused`): the codebook says a skipped item is blank or a
 * valid skip, so the question was probably asked where it should not have been. The cell stays
 * missing of its kind; the finding is a warning.
 */
export const missingCodeWhenSkipped = defineRule<CellParams & { condition: string; kind: string }>({
  code: 'missing-code-when-skipped',
  severity: 'warning',
  message: (p) =>
    `${p.item} is asked only when ${p.condition}, which is false on this row, yet it holds ${p.value} (${p.kind}) where a blank or a valid-skip code belongs.`,
});
