/**
 * What every meaning check receives: the schema-valid codebook and a place to report problems.
 * Checks are small declarations registered in `index.ts`; adding a check is adding a file.
 */
import type { CompiledExpression } from '../compiled.ts';
import type { Codebook } from '../schema.ts';
import { pointer } from '../json-scan.ts';
import { problem, type CodebookProblem, type ProblemCode } from '../problems.ts';

export class CheckContext {
  readonly problems: CodebookProblem[] = [];
  /** Compiled CEL by the JSON pointer of its field; filled by the expression check. */
  readonly expressions = new Map<string, CompiledExpression>();

  constructor(readonly cb: Codebook) {}

  report(code: ProblemCode, path: ReadonlyArray<string | number>, message: string): void {
    this.problems.push(problem(code, pointer(path), message));
  }
}

export interface CodebookCheck {
  /** What the check looks at, for readers of the registry. */
  name: string;
  run(ctx: CheckContext): void;
}
