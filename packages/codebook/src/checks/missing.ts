import { canonicalNumberText, codeKeys } from '../numbers.ts';
import { didYouMean } from '../problems.ts';
import { resolveMissing } from '../resolve.ts';
import type { CodebookCheck } from './context.ts';

const isNumeric = (type: string) => type === 'integer' || type === 'decimal';

function numericValue(code: number | string): number | undefined {
  if (typeof code === 'number') return code;
  const c = canonicalNumberText(code);
  return c === undefined ? undefined : Number(c);
}

/**
 * Missing codes: a named set must exist; codes within one list are distinct. The precedence
 * rule is that a declared missing code always wins: a cell holding it is missing of its kind,
 * whatever `range` says. So a missing code inside the range (income 9999998 with min 0, the
 * way many codebooks are written) is a warning: a genuine value equal to it would be read as
 * missing. Two overlaps stay errors, because there the declaration itself cannot decide the
 * cell: a missing code that is also a valid code of the item (the codebook says both), and a
 * missing code inside a bin of a binned item (a delivery of raw quantities, which the
 * `unbinned-value` and `unbinned-column` findings exist for, would hold the same number as a
 * quantity of that bin).
 */
export const missingCodes: CodebookCheck = {
  name: 'missing codes',
  run(ctx) {
    const sets = ctx.cb.missingSets ?? {};
    const used = new Set<string>();
    for (const [name, list] of Object.entries(sets)) {
      const seen = new Set<string>();
      list.forEach((m, j) => {
        const k = String(m.code);
        if (seen.has(k)) ctx.report('duplicate-missing-code', ['missingSets', name, j, 'code'], `missing code ${JSON.stringify(m.code)} appears twice in set "${name}"`);
        seen.add(k);
      });
    }
    ctx.cb.items.forEach((it, i) => {
      if (it.missing === undefined) return;
      const numeric = isNumeric(it.type);
      if (typeof it.missing === 'string') {
        used.add(it.missing);
        if (!Object.hasOwn(sets, it.missing)) {
          const names = Object.keys(sets);
          ctx.report(
            'unknown-missing-set',
            ['items', i, 'missing'],
            `no missing set named "${it.missing}"${didYouMean(it.missing, names) || (names.length ? `; defined sets are ${names.join(', ')}` : '; the codebook defines no missingSets')}`,
          );
          return;
        }
      }
      const inline = Array.isArray(it.missing);
      const at = (j: number) => (inline ? ['items', i, 'missing', j, 'code'] : ['items', i, 'missing']);
      const from = inline ? '' : ` (from set "${it.missing as string}")`;
      const validKeys = new Map<string, number | string>();
      for (const c of it.codes ?? []) for (const k of codeKeys(c.code, numeric)) validKeys.set(k, c.code);
      const seen = new Set<string>();
      resolveMissing(ctx.cb, it.missing).forEach((m, j) => {
        const keys = codeKeys(m.code, numeric);
        if (inline && keys.some((k) => seen.has(k))) {
          ctx.report('duplicate-missing-code', at(j), `missing code ${JSON.stringify(m.code)} appears twice in item "${it.name}"`);
        }
        for (const k of keys) seen.add(k);
        const hit = keys.find((k) => validKeys.has(k));
        if (hit !== undefined) {
          ctx.report('missing-collides', at(j), `missing code ${JSON.stringify(m.code)}${from} is also a valid code of item "${it.name}": a cell ${JSON.stringify(String(m.code))} would be both a valid answer and missing, so the codebook cannot say which; drop one of them`);
          return;
        }
        const v = numeric ? numericValue(m.code) : undefined;
        if (v === undefined) return;
        const bin = (it.codes ?? []).find((c) => c.bin !== undefined && v >= c.bin.min && (c.bin.max === undefined || v <= c.bin.max));
        if (bin?.bin) {
          const b = bin.bin;
          ctx.report(
            'missing-in-bin',
            at(j),
            `missing code ${JSON.stringify(m.code)}${from} of item "${it.name}" lies inside the bin ${b.min}${b.max === undefined ? ' or more' : ` to ${b.max}`} of code ${JSON.stringify(bin.code)}: in a delivery of raw quantities the cell ${JSON.stringify(String(m.code))} could be that missing code or a quantity of the bin, so renumber the missing code or the bin`,
          );
          return;
        }
        const r = it.range;
        if (r && (r.min !== undefined || r.max !== undefined) && (r.min === undefined || v >= r.min) && (r.max === undefined || v <= r.max)) {
          ctx.report(
            'missing-in-range',
            at(j),
            `missing code ${JSON.stringify(m.code)} (${m.kind})${from} of item "${it.name}" lies inside its range ${rangeText(r.min, r.max)}: a cell ${JSON.stringify(String(m.code))} is read as that missing code, never as a value`,
          );
        }
      });
    });
    for (const name of Object.keys(sets)) {
      if (!used.has(name)) ctx.report('unused-missing-set', ['missingSets', name], `missing set "${name}" is not used by any item`);
    }
  },
};

/** A range in words: "0 to 20", "0 or more", "20 or less". */
function rangeText(min: number | undefined, max: number | undefined): string {
  if (min !== undefined && max !== undefined) return `${min} to ${max}`;
  if (min !== undefined) return `${min} or more`;
  if (max !== undefined) return `${max} or less`;
  return 'with no bounds';
}
