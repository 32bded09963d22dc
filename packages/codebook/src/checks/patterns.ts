import { compilePattern } from '../resolve.ts';
import { isUnsafePattern } from '../regex-safety.ts';
import type { CodebookCheck } from './context.ts';

/**
 * `pattern`: text items only; must compile as a JavaScript regular expression with the u flag;
 * must not be able to backtrack catastrophically, since it runs on every cell of a delivery.
 */
export const patterns: CodebookCheck = {
  name: 'patterns',
  run(ctx) {
    ctx.cb.items.forEach((it, i) => {
      if (it.pattern === undefined) return;
      const at = ['items', i, 'pattern'];
      if (it.type !== 'text') {
        ctx.report('pattern-type', at, `pattern applies to text items; "${it.name}" is ${it.type}`);
        return;
      }
      try {
        compilePattern(it.pattern);
      } catch (e) {
        const why = (e as Error).message.replace(/^Invalid regular expression: \/.*\/[a-z]*: /, '');
        ctx.report('pattern-invalid', at, `pattern does not compile as a regular expression (u flag): ${why}`);
        return;
      }
      if (isUnsafePattern(it.pattern)) {
        ctx.report('pattern-unsafe', at, 'pattern can backtrack catastrophically (a repetition inside a repetition, or alternatives under a repetition that can match the same text); rewrite it without nesting');
      }
    });
  },
};
