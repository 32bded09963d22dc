import type { CodebookCheck } from './context.ts';

/**
 * Roles: at most one id and one weight item; an id or group item is integer or text, a weight
 * item is numeric and, when it states a level, ratio.
 */
export const roles: CodebookCheck = {
  name: 'item roles',
  run(ctx) {
    let idAt: number | undefined;
    let weightAt: number | undefined;
    ctx.cb.items.forEach((it, i) => {
      const at = ['items', i, 'role'];
      if (it.role === 'id') {
        if (idAt !== undefined) ctx.report('multiple-id', at, `item "${it.name}" is a second id item (the first is /items/${idAt}); a codebook has at most one`);
        else idAt = i;
        if (it.type !== 'integer' && it.type !== 'text') ctx.report('role-type', ['items', i, 'type'], `id item "${it.name}" must be integer or text, not ${it.type}`);
      } else if (it.role === 'weight') {
        if (weightAt !== undefined) ctx.report('multiple-weight', at, `item "${it.name}" is a second weight item (the first is /items/${weightAt}); a codebook has at most one`);
        else weightAt = i;
        if (it.type !== 'integer' && it.type !== 'decimal') ctx.report('role-type', ['items', i, 'type'], `weight item "${it.name}" must be integer or decimal, not ${it.type}`);
        else if (it.level !== undefined && it.level !== 'ratio') ctx.report('role-type', ['items', i, 'level'], `weight item "${it.name}" must be ratio, not ${it.level}`);
      } else if (it.role === 'group') {
        if (it.type !== 'integer' && it.type !== 'text') ctx.report('role-type', ['items', i, 'type'], `group item "${it.name}" must be integer or text (a breakdown into categories), not ${it.type}`);
        else if (it.level === 'interval' || it.level === 'ratio') ctx.report('role-type', ['items', i, 'level'], `group item "${it.name}" must be nominal or ordinal, not ${it.level}`);
      }
    });
  },
};
