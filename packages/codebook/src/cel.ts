/**
 * CEL (Common Expression Language) for routing (`askedWhen`) and rules (`test`, `when`).
 *
 * Types of item variables: `integer` items are CEL `int`, `decimal` items `double`, `text`
 * items `string`, and `date` items `int` counting days since 1970-01-01 (so dates compare and
 * subtract as whole days). The function `date("YYYY-MM-DD")` gives that same day number, for
 * comparisons with a fixed day: `visit_date >= date("2026-03-01")`.
 *
 * Each expression is parsed and type-checked once at load. Expressions made of comparisons and
 * logic run as generated JavaScript (`cel-fast.ts`); the rest run in the library, with plain JS
 * numbers converted to its `int` representation (BigInt) for int variables.
 */
import { Environment, ParseError, type ASTNode } from '@marcbachmann/cel-js';
import type { CompiledExpression, ItemType } from './compiled.ts';
import { didYouMean, problem, type CodebookProblem } from './problems.ts';
import { fastEvaluator } from './cel-fast.ts';

/** Deepest expression tree accepted; far beyond any hand-written condition. */
export const MAX_EXPRESSION_DEPTH = 100;

const CEL_TYPE: Record<ItemType, string> = { integer: 'int', decimal: 'double', text: 'string', date: 'int' };

const DAY_MS = 86_400_000;
const ISO_DAY = /^(\d{4})-(\d{2})-(\d{2})$/;

/**
 * Days since 1970-01-01 (proleptic Gregorian calendar, UTC) of a `YYYY-MM-DD` date, or
 * undefined when the text is not a real calendar day (2026-02-30 is not). Pure; O(1).
 */
export function daysSinceEpoch(text: string): number | undefined {
  const m = ISO_DAY.exec(text);
  if (!m) return undefined;
  const y = Number(m[1]);
  const mo = Number(m[2]);
  const d = Number(m[3]);
  const t = Date.UTC(y, mo - 1, d);
  const back = new Date(t);
  if (back.getUTCFullYear() !== y || back.getUTCMonth() !== mo - 1 || back.getUTCDate() !== d) return undefined;
  return t / DAY_MS;
}

/** The items an expression may read: name and type, with their position in the codebook. */
export interface ExpressionItem {
  index: number;
  name: string;
  type: ItemType;
}

/** One CEL environment per codebook: every item declared with its CEL type. */
export class ExpressionContext {
  readonly env: Environment;
  readonly byName: ReadonlyMap<string, ExpressionItem>;

  constructor(items: readonly ExpressionItem[]) {
    const env = new Environment({ limits: { maxDepth: MAX_EXPRESSION_DEPTH, maxAstNodes: 20_000 } });
    env.registerFunction('date(string): int', (s: string) => {
      const days = daysSinceEpoch(s);
      if (days === undefined) throw new Error(`date() takes a YYYY-MM-DD calendar day, got "${s}"`);
      return BigInt(days);
    });
    const byName = new Map<string, ExpressionItem>();
    for (const it of items) {
      if (byName.has(it.name)) continue;
      try {
        env.registerVariable(it.name, CEL_TYPE[it.type]);
        byName.set(it.name, it);
      } catch {
        // A name CEL cannot declare cannot be referenced either; an expression that tries gets
        // an unknown-item problem, which is the useful report.
      }
    }
    this.env = env;
    this.byName = byName;
  }
}

function isNode(x: unknown): x is ASTNode {
  return typeof x === 'object' && x !== null && 'op' in x && 'args' in x;
}

/** Depth of the tree and the item names read (`id` nodes), in source order. Iterative. */
function inspect(root: ASTNode): { depth: number; ids: Array<{ name: string; start: number }>; dates: Array<{ text: string; start: number }> } {
  const ids: Array<{ name: string; start: number }> = [];
  const dates: Array<{ text: string; start: number }> = [];
  let depth = 0;
  const stack: Array<[unknown, number]> = [[root, 1]];
  while (stack.length > 0) {
    const [x, d] = stack.pop()!;
    if (Array.isArray(x)) {
      for (const y of x) stack.push([y, d]);
      continue;
    }
    if (!isNode(x)) continue;
    depth = Math.max(depth, d);
    if (x.op === 'id') ids.push({ name: x.args as string, start: x.start });
    else if (x.op !== 'value') stack.push([x.args, d + 1]);
    if (x.op === 'call') {
      const [fn, args] = x.args as [string, ASTNode[]];
      const a = args[0];
      if (fn === 'date' && args.length === 1 && a && a.op === 'value' && typeof a.args === 'string') dates.push({ text: a.args, start: a.start });
    }
  }
  ids.sort((a, b) => a.start - b.start);
  dates.sort((a, b) => a.start - b.start);
  return { depth, ids, dates };
}

function position(err: unknown): number | undefined {
  const r = (err as { range?: { start: number } }).range;
  return r && typeof r.start === 'number' ? r.start : undefined;
}

function at(pos: number | undefined): string {
  return pos === undefined ? '' : ` at character ${pos + 1}`;
}

function withChar(p: CodebookProblem, pos: number | undefined): CodebookProblem {
  if (pos !== undefined) p.charIndex = pos;
  return p;
}

function isStackOverflow(e: unknown): boolean {
  return e instanceof RangeError || (e instanceof Error && /call stack/i.test(e.message));
}

/**
 * int conversion of whole numbers. Anything else is passed as it is, so the library raises its
 * type error only if the expression actually reads the value (`false && a > 1` stays false).
 */
const toInt = (v: unknown): unknown => (Number.isInteger(v) ? BigInt(v as number) : v);

/**
 * A function that copies the expression's variables out of a row's values into a fresh context
 * object, converting int variables. Generated as straight-line code with a fixed object shape
 * because the evaluator reads the context once per variable per row: a dictionary-shaped object
 * built in a loop made evaluation about twice as slow. Keys are JSON-quoted, so any item name is
 * safe here.
 */
function contextBuilder(variables: readonly string[], asInt: readonly boolean[]): (vars: Record<string, unknown>) => Record<string, unknown> {
  const fields = variables.map((v, k) => `${JSON.stringify(v)}: ${asInt[k] ? 'I' : ''}(v[${JSON.stringify(v)}])`);
  return new Function('I', `return (v) => ({ ${fields.join(', ')} });`)(toInt) as (vars: Record<string, unknown>) => Record<string, unknown>;
}

export interface ExpressionResult {
  expression?: CompiledExpression;
  problems: CodebookProblem[];
}

/**
 * Parses, type-checks and compiles one CEL expression. Problems carry `path` (the JSON pointer
 * of the expression's field) and name the character position (1-based) where the library gives
 * one. A result type other than `bool` is a problem. Never throws: an expression nested too
 * deeply (thousands of parentheses or `!`) is a `cel-too-deep` problem.
 * Cost: linear in the expression's length.
 */
export function compileExpression(ctx: ExpressionContext, source: string, path: string): ExpressionResult {
  const tooDeep = () => ({
    problems: [problem('cel-too-deep', path, `expression is nested too deeply (more than ${MAX_EXPRESSION_DEPTH} levels); split it or simplify it`)],
  });
  let parsed: ReturnType<Environment['parse']>;
  try {
    parsed = ctx.env.parse(source);
  } catch (e) {
    if (isStackOverflow(e)) return tooDeep();
    if (e instanceof ParseError && e.code === 'limit_exceeded') return tooDeep();
    const summary = e instanceof ParseError ? e.summary : (e as Error).message.split('\n')[0]!;
    return { problems: [withChar(problem('cel-syntax', path, `CEL syntax error${at(position(e))}: ${summary}`), position(e))] };
  }
  const { depth, ids, dates } = inspect(parsed.ast);
  if (depth > MAX_EXPRESSION_DEPTH) return tooDeep();
  // A fixed day that is not a calendar day would make every evaluation an error (false).
  const badDate = dates.find((d) => daysSinceEpoch(d.text) === undefined);
  if (badDate) {
    return { problems: [withChar(problem('cel-bad-date', path, `date(${JSON.stringify(badDate.text)})${at(badDate.start)} is not a YYYY-MM-DD calendar day`), badDate.start)] };
  }
  let result: ReturnType<ReturnType<Environment['parse']>['check']>;
  try {
    result = parsed.check();
  } catch (e) {
    if (isStackOverflow(e)) return tooDeep();
    throw e;
  }
  if (!result.valid) {
    const err = result.error!;
    if (isStackOverflow(err)) return tooDeep();
    const pos = position(err);
    if (err.code === 'unknown_variable') {
      const name = /Unknown variable: (.*)$/.exec(err.summary)?.[1] ?? source.slice(pos ?? 0).match(/^\w+/)?.[0] ?? '';
      return {
        problems: [withChar(problem('cel-unknown-item', path, `unknown item "${name}"${at(pos)}${didYouMean(name, ctx.byName.keys())}`), pos)],
      };
    }
    return { problems: [withChar(problem('cel-type', path, `CEL type error${at(pos)}: ${err.summary}`), pos)] };
  }
  if (result.type !== 'bool') {
    return { problems: [problem('cel-not-boolean', path, `expression gives a ${result.type}, not a bool (true or false)`)] };
  }

  const variables: string[] = [];
  for (const { name } of ids) if (ctx.byName.has(name) && !variables.includes(name)) variables.push(name);
  const items = variables.map((v) => ctx.byName.get(v)!);
  const asInt = items.map((it) => CEL_TYPE[it.type] === 'int');
  const fn = parsed as (c: Record<string, unknown>) => unknown;
  const build = contextBuilder(variables, asInt);
  const slow = (vars: Record<string, unknown>): boolean => {
    try {
      return fn(build(vars)) === true;
    } catch {
      // An evaluation error (a fraction given for an int, division by zero) counts as false.
      return false;
    }
  };
  const fast = fastEvaluator(
    parsed.ast,
    variables,
    items.map((it) => CEL_TYPE[it.type]),
    slow,
  );
  const expression: CompiledExpression = {
    source,
    variables,
    variableIndices: items.map((it) => it.index),
    evaluate: fast ?? slow,
  };
  return { expression, problems: [] };
}
