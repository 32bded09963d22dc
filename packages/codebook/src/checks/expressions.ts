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
 * Routing must not go round in a circle (a asked when b, b asked when a): no order of asking
 * could then satisfy it. Reports each cycle once, at the item where the search closes it.
 * Iterative depth-first search.
 */
function reportRoutingCycles(ctx: CheckContext, routing: ReadonlyMap<number, number[]>): void {
  const state = new Map<number, 1 | 2>();
  const names = ctx.cb.items.map((it) => it.name);
  for (const start of routing.keys()) {
    if (state.has(start)) continue;
    const path: number[] = [];
    const stack: Array<[number, number]> = [[start, 0]];
    while (stack.length > 0) {
      const top = stack[stack.length - 1]!;
      const [node, k] = top;
      if (k === 0) {
        state.set(node, 1);
        path.push(node);
      }
      const next = routing.get(node)?.[k];
      if (next === undefined) {
        state.set(node, 2);
        path.pop();
        stack.pop();
        continue;
      }
      top[1] = k + 1;
      if (state.get(next) === 1) {
        const cycle = [...path.slice(path.indexOf(next)), next].map((n) => `"${names[n]}"`);
        ctx.report('asked-when-cycle', ['items', node, 'askedWhen'], `routing goes round in a circle: ${cycle.join(' -> ')} (each askedWhen reads the next item)`);
      } else if (!state.has(next)) stack.push([next, 0]);
    }
  }
}

/**
 * Every CEL expression (`askedWhen`, rule `test` and `when`) parses, type-checks against the
 * declared items and gives a bool; routing never depends on the item it routes.
 */
export const expressions: CodebookCheck = {
  name: 'CEL expressions',
  run(ctx) {
    const cel = new ExpressionContext(ctx.cb.items.map((it, index) => ({ index, name: it.name, type: it.type })));
    // Item index -> indices of the other items its routing reads.
    const routing = new Map<number, number[]>();
    const indexOf = new Map(ctx.cb.items.map((it, i) => [it.name, i]));
    ctx.cb.items.forEach((it, i) => {
      if (it.askedWhen === undefined) return;
      const vars = compileInto(ctx, cel, it.askedWhen, ['items', i, 'askedWhen']);
      if (vars) routing.set(i, vars.filter((v) => v !== it.name).map((v) => indexOf.get(v)!));
      if (vars?.includes(it.name)) {
        ctx.report('asked-when-self', ['items', i, 'askedWhen'], `askedWhen of "${it.name}" reads "${it.name}" itself; routing must depend on other items`);
      }
    });
    reportRoutingCycles(ctx, routing);
    (ctx.cb.rules ?? []).forEach((r, i) => {
      compileInto(ctx, cel, r.test, ['rules', i, 'test']);
      if (r.when !== undefined) compileInto(ctx, cel, r.when, ['rules', i, 'when']);
    });
  },
};
