import { defineRule } from './define.ts';

export const raggedRow = defineRule<{ fields: number; expected: number }>({
  code: 'ragged-row',
  severity: 'error',
  message: (p) =>
    `The row has ${p.fields} field${p.fields === 1 ? '' : 's'} where the header has ${p.expected}; ` +
    (p.fields < p.expected ? 'the absent cells count as invalid.' : 'the extra fields are not checked.'),
});
