import type { CodebookCheck } from './context.ts';
import type { Item } from '../schema.ts';

/** What each design part needs of its item, as one sentence, or nothing when it fits. */
function misfit(part: 'weight' | 'strata' | 'cluster' | 'fpc', it: Item): string | undefined {
  const numeric = it.type === 'integer' || it.type === 'decimal';
  const role = it.role ?? 'item';
  if (role === 'id') return `the id item "${it.name}" cannot be the design's ${part}`;
  if (part === 'weight' || part === 'fpc') {
    if (!numeric) return `the design's ${part} "${it.name}" must be integer or decimal, not ${it.type}`;
    if (it.level !== undefined && it.level !== 'ratio') return `the design's ${part} "${it.name}" must be ratio, not ${it.level}`;
    return undefined;
  }
  if (it.type !== 'integer' && it.type !== 'text') return `the design's ${part} "${it.name}" must be integer or text (a label per record), not ${it.type}`;
  if (it.level === 'interval' || it.level === 'ratio') return `the design's ${part} "${it.name}" must be nominal or ordinal, not ${it.level}`;
  // Values are kept per row only for items with codes or group items (see check's column store).
  if ((it.codes === undefined || it.codes.length === 0) && role !== 'group') {
    return `the design's ${part} "${it.name}" needs codes or role "group", so that its value is kept for every record`;
  }
  return undefined;
}

/**
 * The sample design (`design`): every part names an item of the codebook, no item takes two
 * parts, the weight and fpc are numeric (ratio when a level is given), strata and cluster are
 * integer or text, nominal or ordinal, with codes or role group.
 */
export const design: CodebookCheck = {
  name: 'sample design',
  run(ctx) {
    const d = ctx.cb.design;
    if (!d) return;
    const byName = new Map(ctx.cb.items.map((it) => [it.name, it]));
    const taken = new Map<string, string>();
    for (const part of ['weight', 'strata', 'cluster', 'fpc'] as const) {
      const name = d[part];
      if (name === undefined) continue;
      const at = ['design', part];
      const it = byName.get(name);
      if (!it) {
        ctx.report('design-unknown-item', at, `the design's ${part} names "${name}", which is not an item of the codebook`);
        continue;
      }
      const before = taken.get(name);
      if (before !== undefined) ctx.report('design-item-repeated', at, `item "${name}" is already the design's ${before}; each part needs its own item`);
      taken.set(name, part);
      const why = misfit(part, it);
      if (why !== undefined) ctx.report('design-item-type', at, why);
    }
  },
};
