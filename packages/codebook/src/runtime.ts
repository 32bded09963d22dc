/**
 * Everything the package exports except the zod schema (`schema.ts`): what loading, linting,
 * compiling and evaluating codebooks needs. The CLI bundle resolves `@codeweir/codebook` to
 * this module, so that a command reading a valid codebook never evaluates zod (`structure.ts`
 * loads it only for a codebook the shipped JSON Schema rejects).
 */
export * from './compiled.ts';
export { parseCodebook, loadCodebook, loadCodebookOrThrow } from './load.ts';
export type { LoadOptions } from './load.ts';
export type { CompileOptions } from './compile.ts';
export { codebookLanguages, labelText, labelHas, resolveLabels } from './labels.ts';
export { compileCodebook, buildCompiled } from './compile.ts';
export { compilePattern, resolveMissing } from './resolve.ts';
export { analyseCodebook, CHECKS } from './checks/index.ts';
export type { CodebookCheck } from './checks/context.ts';
export { PROBLEM_SEVERITY, problem, hasErrors, editDistance, closest, didYouMean } from './problems.ts';
export type { ProblemCode, CodebookProblem } from './problems.ts';
export { canonicalNumberText, codeKeys, lookupCell } from './numbers.ts';
export { ExpressionContext, compileExpression, daysSinceEpoch, MAX_EXPRESSION_DEPTH } from './cel.ts';
export type { ExpressionItem, ExpressionResult } from './cel.ts';
export { isUnsafePattern, ambiguousRepetition } from './regex-safety.ts';
export { scanJson, lineColumn, pointer, escapePointerToken } from './json-scan.ts';
export type { JsonScan, JsonSyntaxError } from './json-scan.ts';
export { validateWithShippedSchema, SCHEMA_FILE_URL } from './json-schema.ts';
