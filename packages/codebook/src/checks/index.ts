/**
 * The registry of meaning checks, run in this order on a schema-valid codebook. Each check is
 * a small declaration in its own file; adding a check is adding it here.
 */
import type { CompiledExpression } from '../compiled.ts';
import type { Codebook } from '../schema.ts';
import type { CodebookProblem } from '../problems.ts';
import { CheckContext, type CodebookCheck } from './context.ts';
import { codesRequired, duplicateItems, duplicateRules, levels } from './items.ts';
import { roles } from './roles.ts';
import { codes } from './codes.ts';
import { bins } from './bins.ts';
import { missingCodes } from './missing.ts';
import { bounds } from './bounds.ts';
import { patterns } from './patterns.ts';
import { expressions } from './expressions.ts';
import { labels } from './labels.ts';
import { design } from './design.ts';

export const CHECKS: readonly CodebookCheck[] = [
  duplicateItems,
  levels,
  codesRequired,
  roles,
  codes,
  bins,
  missingCodes,
  bounds,
  patterns,
  expressions,
  duplicateRules,
  labels,
  design,
];

/**
 * Runs every meaning check. Returns the problems (in check order) and the compiled CEL of each
 * expression that type-checked, by the JSON pointer of its field. Never throws.
 */
export function analyseCodebook(cb: Codebook): { problems: CodebookProblem[]; expressions: Map<string, CompiledExpression> } {
  const ctx = new CheckContext(cb);
  for (const c of CHECKS) c.run(ctx);
  return { problems: ctx.problems, expressions: ctx.expressions };
}
