import { codeKeys } from '../numbers.ts';
import type { CodebookCheck } from './context.ts';

const isNumeric = (type: string) => type === 'integer' || type === 'decimal';

/**
 * Codes of one item are distinct as cells see them: code 1 and code "1.0" of a numeric item
 * are the same cell value, so they are duplicates. Numeric items take number codes (integers
 * for integer items).
 */
export const codes: CodebookCheck = {
  name: 'codes',
  run(ctx) {
    ctx.cb.items.forEach((it, i) => {
      const seen = new Map<string, number>();
      (it.codes ?? []).forEach((c, j) => {
        const at = ['items', i, 'codes', j, 'code'];
        if (isNumeric(it.type) && typeof c.code !== 'number') {
          ctx.report('code-type', at, `${it.type} item "${it.name}" takes number codes, got the string ${JSON.stringify(c.code)}`);
        } else if (it.type === 'integer' && typeof c.code === 'number' && !Number.isInteger(c.code)) {
          ctx.report('code-type', at, `integer item "${it.name}" takes whole-number codes, got ${c.code}`);
        }
        const keys = codeKeys(c.code, isNumeric(it.type));
        const dup = keys.map((k) => seen.get(k)).find((x) => x !== undefined);
        if (dup !== undefined) {
          ctx.report('duplicate-code', at, `code ${JSON.stringify(c.code)} of item "${it.name}" is already declared at /items/${i}/codes/${dup}`);
          return;
        }
        for (const k of keys) seen.set(k, j);
      });
    });
  },
};
