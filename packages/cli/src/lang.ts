import { CodeweirError } from '@codeweir/core';

/** The `--lang` option of commands that quote labels. */
export const LANG_OPTION = {
  type: 'string',
  describe: 'language of the labels (a BCP 47 tag such as en or fr; default the codebook\'s first language)',
} as const;

/**
 * Normalises `--lang`: undefined when absent, else a well-formed BCP 47 tag as given.
 * Throws CodeweirError CW_USAGE (exit 2) with the bad value for anything else.
 */
export function langOption(v: unknown): string | undefined {
  if (v === undefined) return undefined;
  const tag = String(v);
  let ok = false;
  try {
    ok = tag.length > 0 && Intl.getCanonicalLocales(tag).length === 1;
  } catch {
    ok = false;
  }
  if (!ok) throw new CodeweirError('CW_USAGE', `--lang takes a BCP 47 language tag such as en or fr, got ${JSON.stringify(tag)}.`);
  return tag;
}
