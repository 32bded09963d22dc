import type { Bounds } from '../schema.ts';
import type { CodebookCheck } from './context.ts';

const show = (b: Bounds) => `${b.min ?? '-inf'} to ${b.max ?? 'inf'}`;

/**
 * Hard (`range`) and soft (`expect`) bounds: numeric items only; min not above max; the soft
 * bounds inside the hard ones, since a value outside `range` is already impossible.
 */
export const bounds: CodebookCheck = {
  name: 'range and expect',
  run(ctx) {
    ctx.cb.items.forEach((it, i) => {
      for (const key of ['range', 'expect'] as const) {
        const b = it[key];
        if (!b) continue;
        if (it.type !== 'integer' && it.type !== 'decimal') {
          ctx.report('range-type', ['items', i, key], `${key} applies to integer and decimal items; "${it.name}" is ${it.type}`);
          continue;
        }
        if (b.min !== undefined && b.max !== undefined && b.min > b.max) {
          ctx.report(key === 'range' ? 'range-inverted' : 'expect-inverted', ['items', i, key], `${key} of "${it.name}" has min ${b.min} above max ${b.max}`);
        }
      }
      const r = it.range;
      const e = it.expect;
      if (!r || !e || (it.type !== 'integer' && it.type !== 'decimal')) return;
      // An inverted range is already reported; comparing against it would only add noise.
      if (r.min !== undefined && r.max !== undefined && r.min > r.max) return;
      const outside = (v: number) => (r.min !== undefined && v < r.min) || (r.max !== undefined && v > r.max);
      for (const end of ['min', 'max'] as const) {
        const v = e[end];
        if (v !== undefined && outside(v)) {
          ctx.report('expect-outside-range', ['items', i, 'expect', end], `expect ${end} ${v} of "${it.name}" lies outside its range ${show(r)}; soft bounds belong inside the hard ones`);
        }
      }
    });
  },
};
