import { ExpressionContext, compileExpression } from '../cel.ts';
import { pointer } from '../json-scan.ts';
import type { CodebookCheck, CheckContext } from './context.ts';

function compileInto(ctx: CheckContext, cel: ExpressionContext, source: string, path: Array<string | number>): readonly string[] | undefined {
  const p = pointer(path);
  const r = compileExpression(cel, source, p);
  ctx.problems.push(...r.problems);
  if (!r.expression) return undefined;
  ctx.expressions.set(p, r.expression);
  return r.expression.variables;
}

/**
 * Every CEL expression (`askedWhen`, rule `test` and `when`) parses, type-checks against the
 * declared items and gives a bool; routing never depends on the item it routes.
 */
export const expressions: CodebookCheck = {
  name: 'CEL expressions',
  run(ctx) {
    const cel = new ExpressionContext(ctx.cb.items.map((it, index) => ({ index, name: it.name, type: it.type })));
    ctx.cb.items.forEach((it, i) => {
      if (it.askedWhen === undefined) return;
      const vars = compileInto(ctx, cel, it.askedWhen, ['items', i, 'askedWhen']);
      if (vars?.includes(it.name)) {
        ctx.report('asked-when-self', ['items', i, 'askedWhen'], `askedWhen of "${it.name}" reads "${it.name}" itself; routing must depend on other items`);
      }
    });
    (ctx.cb.rules ?? []).forEach((r, i) => {
      compileInto(ctx, cel, r.test, ['rules', i, 'test']);
      if (r.when !== undefined) compileInto(ctx, cel, r.when, ['rules', i, 'when']);
    });
  },
};
