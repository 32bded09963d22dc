import type { CodebookCheck } from './context.ts';

const show = (min: number, max: number | undefined) => (max === undefined ? `${min} or more` : `${min} to ${max}`);

/**
 * Binned (grouped-count) items. Bins are closed intervals [min, max] of the underlying
 * quantity; `max` omitted is an open top bin. When every bound is a whole number the quantity
 * is a count, so [0, 3] and [4, 7] are adjacent; otherwise any space between one bin's max and
 * the next bin's min is a gap. Overlaps are errors, gaps warnings, and a binned item is ordinal.
 */
export const bins: CodebookCheck = {
  name: 'bins',
  run(ctx) {
    ctx.cb.items.forEach((it, i) => {
      const list = it.codes ?? [];
      const withBin = list.filter((c) => c.bin !== undefined).length;
      if (withBin === 0) return;
      if (withBin < list.length) {
        list.forEach((c, j) => {
          if (!c.bin) ctx.report('bin-missing', ['items', i, 'codes', j], `code ${JSON.stringify(c.code)} has no bin, but other codes of binned item "${it.name}" do; every code of a binned item needs a bin`);
        });
      }
      if (it.level !== 'ordinal') {
        ctx.report('binned-not-ordinal', ['items', i, 'level'], `binned item "${it.name}" must be ordinal${it.level ? `, not ${it.level}` : ''}: its codes stand for ordered ranges`);
      }
      const sorted = list
        .map((c, j) => ({ j, code: c.code, min: c.bin?.min, max: c.bin?.max }))
        .filter((b): b is { j: number; code: number | string; min: number; max: number | undefined } => b.min !== undefined)
        .sort((a, b) => a.min - b.min);
      for (const b of sorted) {
        if (b.max !== undefined && b.max < b.min) ctx.report('bin-inverted', ['items', i, 'codes', b.j, 'bin'], `bin of code ${JSON.stringify(b.code)} has max ${b.max} below min ${b.min}`);
      }
      const counts = sorted.every((b) => Number.isInteger(b.min) && (b.max === undefined || Number.isInteger(b.max)));
      for (let k = 1; k < sorted.length; k++) {
        const a = sorted[k - 1]!;
        const b = sorted[k]!;
        const at = ['items', i, 'codes', b.j, 'bin'];
        if (a.max === undefined || b.min <= a.max) {
          ctx.report('bins-overlap', at, `bin ${show(b.min, b.max)} of code ${JSON.stringify(b.code)} overlaps bin ${show(a.min, a.max)} of code ${JSON.stringify(a.code)}`);
        } else if (counts ? b.min > a.max + 1 : b.min > a.max) {
          const gap = counts ? (b.min - 1 === a.max + 1 ? `${a.max + 1}` : `${a.max + 1} to ${b.min - 1}`) : `between ${a.max} and ${b.min}`;
          ctx.report('bins-gap', at, `values ${gap} fall in no bin (between code ${JSON.stringify(a.code)} and code ${JSON.stringify(b.code)})`);
        }
      }
    });
  },
};
