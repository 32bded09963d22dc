/**
 * Labels in several languages. A label is one string (the same in every language) or an object
 * keyed by BCP 47 tag. Everything downstream of the codebook (check, describe, report) sees
 * plain strings: a codebook is resolved to one language when it is compiled, so no consumer has
 * to know about languages at all.
 */
import type { Codebook, Label, MissingCode } from './schema.ts';

/**
 * The languages of a codebook: its declared `languages`, else every tag used in a label object,
 * in first-use order (empty when every label is a plain string). Pure; O(labels).
 */
export function codebookLanguages(cb: Codebook): string[] {
  if (cb.languages && cb.languages.length > 0) return [...cb.languages];
  const seen = new Set<string>();
  const add = (l: Label | undefined) => {
    if (l !== undefined && typeof l !== 'string') for (const k of Object.keys(l)) seen.add(k);
  };
  const addMissing = (list: readonly MissingCode[]) => list.forEach((m) => add(m.label));
  for (const list of Object.values(cb.missingSets ?? {})) addMissing(list);
  for (const it of cb.items) {
    add(it.label);
    for (const c of it.codes ?? []) add(c.label);
    if (Array.isArray(it.missing)) addMissing(it.missing);
  }
  return [...seen];
}

/** Finds the key of `label` equal to `lang` ignoring case (BCP 47 tags are case-insensitive). */
function keyFor(label: Record<string, string>, lang: string): string | undefined {
  if (Object.hasOwn(label, lang)) return lang;
  const l = lang.toLowerCase();
  return Object.keys(label).find((k) => k.toLowerCase() === l);
}

/**
 * The text of a label in `lang`: a plain string as it is; an object's entry for `lang`, else for
 * the first of `fallbacks` it has, else its first entry. Pure; O(languages).
 */
export function labelText(label: Label, lang: string | undefined, fallbacks: readonly string[] = []): string {
  if (typeof label === 'string') return label;
  for (const want of lang === undefined ? fallbacks : [lang, ...fallbacks]) {
    const k = keyFor(label, want);
    if (k !== undefined) return label[k]!;
  }
  const first = Object.keys(label)[0];
  return first === undefined ? '' : label[first]!;
}

/** True when `label` has its own text for `lang` (a plain string counts for every language). */
export function labelHas(label: Label, lang: string): boolean {
  return typeof label === 'string' || keyFor(label, lang) !== undefined;
}

/**
 * A copy of the codebook with every label (item, code, missing code) a plain string in `lang`,
 * falling back to the declared languages in order, then to a label's first entry. `lang`
 * undefined means the default language: the first declared one. The copy drops nothing else
 * and keeps `languages`. Pure; O(size of the codebook).
 */
export function resolveLabels(cb: Codebook, lang?: string): Codebook {
  const fallbacks = cb.languages ?? [];
  const text = (l: Label) => labelText(l, lang, fallbacks);
  const missing = (list: readonly MissingCode[]): MissingCode[] =>
    list.map((m) => (m.label === undefined ? { ...m } : { ...m, label: text(m.label) }));
  const out: Codebook = {
    ...cb,
    items: cb.items.map((it) => ({
      ...it,
      label: text(it.label),
      ...(it.codes ? { codes: it.codes.map((c) => ({ ...c, label: text(c.label) })) } : {}),
      ...(Array.isArray(it.missing) ? { missing: missing(it.missing) } : {}),
    })),
  };
  if (cb.missingSets) out.missingSets = Object.fromEntries(Object.entries(cb.missingSets).map(([k, v]) => [k, missing(v)]));
  return out;
}
