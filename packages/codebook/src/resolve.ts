/** Small resolutions shared by the meaning checks and the compiler. */
import type { Codebook, MissingCode } from './schema.ts';

/** The missing codes an item declares: its inline list, or the named set (empty when unknown). */
export function resolveMissing(cb: Codebook, missing: string | MissingCode[] | undefined): MissingCode[] {
  if (missing === undefined) return [];
  if (typeof missing === 'string') return cb.missingSets && Object.hasOwn(cb.missingSets, missing) ? cb.missingSets[missing]! : [];
  return missing;
}

/** A pattern compiled to match a whole text value (anchored, u flag). Throws SyntaxError. */
export function compilePattern(pattern: string): RegExp {
  return new RegExp(`^(?:${pattern})$`, 'u');
}
