import type { Label } from '../schema.ts';
import type { CodebookCheck } from './context.ts';

function wellFormed(tag: string): boolean {
  try {
    return Intl.getCanonicalLocales(tag).length === 1;
  } catch {
    return false;
  }
}

/**
 * Labels in several languages: every tag (in `languages` and as a label key) must be a
 * well-formed BCP 47 tag; when the codebook declares `languages`, every label object must give
 * each of them (a warning: the first declared language that is there stands in), and a label
 * object's languages should all be declared. A plain string label is the same in every language.
 */
export const labels: CodebookCheck = {
  name: 'labels and languages',
  run(ctx) {
    const declared = ctx.cb.languages;
    const lower = new Set((declared ?? []).map((l) => l.toLowerCase()));
    (declared ?? []).forEach((tag, i) => {
      if (!wellFormed(tag)) ctx.report('language-tag', ['languages', i], `"${tag}" is not a well-formed BCP 47 language tag (such as en, fr or pt-BR)`);
    });
    const checkLabel = (label: Label | undefined, at: ReadonlyArray<string | number>, what: string) => {
      if (label === undefined || typeof label === 'string') return;
      const keys = Object.keys(label);
      for (const k of keys) {
        if (!wellFormed(k)) ctx.report('language-tag', at, `${what} has "${k}", which is not a well-formed BCP 47 language tag`);
        else if (declared && !lower.has(k.toLowerCase())) {
          ctx.report('label-language-undeclared', at, `${what} is given in "${k}", which the codebook's languages (${declared.join(', ')}) do not list`);
        }
      }
      if (!declared) return;
      const have = new Set(keys.map((k) => k.toLowerCase()));
      const lacking = declared.filter((l) => !have.has(l.toLowerCase()));
      if (lacking.length > 0) {
        ctx.report('label-language-missing', at, `${what} has no ${lacking.join(', ')} text (the codebook declares ${declared.join(', ')}); the first declared language it has stands in`);
      }
    };
    for (const [name, list] of Object.entries(ctx.cb.missingSets ?? {})) {
      list.forEach((m, j) => checkLabel(m.label, ['missingSets', name, j, 'label'], `the label of missing code ${JSON.stringify(m.code)} in set "${name}"`));
    }
    ctx.cb.items.forEach((it, i) => {
      checkLabel(it.label, ['items', i, 'label'], `the label of item "${it.name}"`);
      (it.codes ?? []).forEach((c, j) => checkLabel(c.label, ['items', i, 'codes', j, 'label'], `the label of code ${JSON.stringify(c.code)} of item "${it.name}"`));
      if (Array.isArray(it.missing)) {
        it.missing.forEach((m, j) => checkLabel(m.label, ['items', i, 'missing', j, 'label'], `the label of missing code ${JSON.stringify(m.code)} of item "${it.name}"`));
      }
    });
  },
};
