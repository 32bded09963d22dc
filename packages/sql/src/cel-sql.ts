/**
 * CEL to SQL for the subset codebooks use: literals, item variables, comparisons, arithmetic
 * (`+ - * / %`), `&&`, `||`, `!`, `? :`, `in` over a list of literals, `date("YYYY-MM-DD")`,
 * `double()`, `size()` of a string, `startsWith` / `endsWith` / `contains`, and comparisons
 * with `null` (the has-style missing test).
 *
 * Why SQL's logic keeps CEL's meaning: a CEL evaluation error (division by zero) becomes SQL
 * NULL, and SQL's three-valued AND / OR absorb NULL exactly as CEL's `&&` / `||` absorb an
 * error (`false && error` is false, `true || error` is true, in either order); the compiled
 * condition is wrapped in COALESCE(..., FALSE) because codeweir counts an erroring expression
 * as false. Variables are only read on rows where every item the expression names is valid
 * (otherwise the row is undetermined), so a variable is never NULL there: the has-style
 * missing test of a codebook is that undetermined outcome, counted per rule and routed item
 * (codeweir's CEL declares no null, so `x == null` does not type-check; should it reach here it
 * compiles to IS NULL, false on every row that is evaluated). Numbers are doubles: CEL ints are whole
 * doubles, exact up to 2^53, with integer division truncated toward zero.
 */
import { CodeweirError } from '@codeweir/core';
import { daysSinceEpoch, type ExpressionContext } from '@codeweir/codebook';
import type { ASTNode } from '@marcbachmann/cel-js';
import { lit, num, type Dialect } from './dialect.ts';

type Kind = 'num' | 'string' | 'bool' | 'null';

interface Sql {
  sql: string;
  kind: Kind;
}

/** Where an expression comes from, for the refusal message. */
export interface ExpressionSite {
  /** JSON pointer of the expression in the codebook (`/items/4/askedWhen`, `/rules/0/test`). */
  path: string;
  source: string;
}

/** The SQL of an item variable and its CEL kind. */
export type VariableSql = (name: string) => { sql: string; kind: 'num' | 'string' } | undefined;

function refuse(site: ExpressionSite, what: string, node: ASTNode | undefined, dialect: Dialect): never {
  const at = node && typeof (node as { pos?: number }).pos === 'number' ? ` at character ${(node as { pos: number }).pos + 1}` : '';
  throw new CodeweirError(
    'CW_USAGE',
    `${site.path}: ${what}${at} in ${JSON.stringify(site.source)} has no ${dialect.name} SQL form; check this codebook with the built-in engine, or rewrite the expression.`,
    { path: site.path },
  );
}

function literal(v: unknown): Sql | undefined {
  if (typeof v === 'bigint') {
    if (!Number.isSafeInteger(Number(v))) return undefined;
    return { sql: num(Number(v)), kind: 'num' };
  }
  if (typeof v === 'number') return Number.isFinite(v) ? { sql: num(v), kind: 'num' } : undefined;
  if (typeof v === 'string') return { sql: lit(v), kind: 'string' };
  if (typeof v === 'boolean') return { sql: v ? 'TRUE' : 'FALSE', kind: 'bool' };
  if (v === null) return { sql: 'NULL', kind: 'null' };
  return undefined;
}

const COMPARE = new Set(['<', '<=', '>', '>=']);
const ARITH = new Set(['+', '-', '*', '/', '%']);

/**
 * Translates a parsed CEL expression to a SQL boolean expression, wrapped in
 * COALESCE(..., FALSE). `vars` gives each item's SQL and kind; `intItems` names the variables
 * that are CEL ints (integer and date items), whose division truncates.
 * Cost: linear in the expression. Throws CodeweirError CW_USAGE naming the construct, its
 * character and the expression's codebook path when a construct has no SQL form.
 */
export function celToSql(ctx: ExpressionContext, site: ExpressionSite, vars: VariableSql, intItems: ReadonlySet<string>, dialect: Dialect): string {
  let ast: ASTNode;
  try {
    ast = ctx.env.parse(site.source).ast;
  } catch (e) {
    return refuse(site, `the expression does not parse (${(e as Error).message.split('\n')[0]})`, undefined, dialect);
  }
  /** Whether a numeric subtree is a CEL int (for division): literals without a fraction and int items. */
  const isInt = (n: ASTNode): boolean => {
    if (n.op === 'value') return typeof n.args === 'bigint';
    if (n.op === 'id') return intItems.has(n.args as string);
    if (n.op === '-_') return isInt(n.args as ASTNode);
    if (ARITH.has(n.op)) return (n.args as ASTNode[]).every(isInt);
    if (n.op === 'call') return ['date', 'size'].includes((n.args as unknown as [string])[0]);
    return false;
  };
  const t = (n: ASTNode): Sql => {
    switch (n.op) {
      case 'value': {
        const l = literal(n.args);
        return l ?? refuse(site, `the literal ${String(n.args)}`, n, dialect);
      }
      case 'id': {
        const v = vars(n.args as string);
        return v ?? refuse(site, `the name ${n.args as string}`, n, dialect);
      }
      case '-_': {
        const a = t(n.args as ASTNode);
        if (a.kind !== 'num') refuse(site, 'minus on a non-number', n, dialect);
        return { sql: `(-${a.sql})`, kind: 'num' };
      }
      case '!_': {
        const a = t(n.args as ASTNode);
        if (a.kind !== 'bool') refuse(site, '! on a non-boolean', n, dialect);
        return { sql: `(NOT ${a.sql})`, kind: 'bool' };
      }
      case '&&':
      case '||': {
        const [l, r] = (n.args as [ASTNode, ASTNode]).map(t) as [Sql, Sql];
        if (l.kind !== 'bool' || r.kind !== 'bool') refuse(site, `${n.op} on a non-boolean`, n, dialect);
        return { sql: `(${l.sql} ${n.op === '&&' ? 'AND' : 'OR'} ${r.sql})`, kind: 'bool' };
      }
      case '?:': {
        const [c, a, b] = (n.args as [ASTNode, ASTNode, ASTNode]).map(t) as [Sql, Sql, Sql];
        if (c.kind !== 'bool') refuse(site, '? : with a non-boolean condition', n, dialect);
        // An erroring condition makes the whole choice an error (NULL), not the else branch.
        return { sql: `(CASE WHEN ${c.sql} THEN ${a.sql} WHEN NOT ${c.sql} THEN ${b.sql} END)`, kind: a.kind === 'null' ? b.kind : a.kind };
      }
      case '==':
      case '!=': {
        const [l, r] = (n.args as [ASTNode, ASTNode]).map(t) as [Sql, Sql];
        if (l.kind === 'null' || r.kind === 'null') {
          const other = l.kind === 'null' ? r : l;
          if (other.kind === 'null') return { sql: n.op === '==' ? 'TRUE' : 'FALSE', kind: 'bool' };
          return { sql: `(${other.sql} IS ${n.op === '==' ? '' : 'NOT '}NULL)`, kind: 'bool' };
        }
        if (l.kind !== r.kind) refuse(site, `${n.op} between a ${l.kind} and a ${r.kind}`, n, dialect);
        return { sql: `(${l.sql} ${n.op === '==' ? '=' : '<>'} ${r.sql})`, kind: 'bool' };
      }
      case 'in': {
        const [x, list] = n.args as [ASTNode, ASTNode];
        const l = t(x);
        if (list.op !== 'list') return refuse(site, '`in` over something other than a list of literals', list, dialect);
        const items = (list.args as ASTNode[]).map((e) => {
          const v = e.op === '-_' && (e.args as ASTNode).op === 'value' ? literal((e.args as ASTNode).args) : e.op === 'value' ? literal(e.args) : undefined;
          if (v === undefined || v.kind !== l.kind) return refuse(site, '`in` over a list that is not literals of the same type', e, dialect);
          return e.op === '-_' ? `(-${v.sql})` : v.sql;
        });
        if (items.length === 0) return { sql: 'FALSE', kind: 'bool' };
        return { sql: `(${l.sql} IN (${items.join(', ')}))`, kind: 'bool' };
      }
      case 'call': {
        const [fn, args] = n.args as [string, ASTNode[]];
        if (fn === 'date' && args.length === 1 && args[0]!.op === 'value' && typeof args[0]!.args === 'string') {
          const days = daysSinceEpoch(args[0]!.args);
          if (days === undefined) return refuse(site, `date(${JSON.stringify(args[0]!.args)})`, n, dialect);
          return { sql: num(days), kind: 'num' };
        }
        if (fn === 'double' && args.length === 1) {
          const a = t(args[0]!);
          if (a.kind === 'num') return a;
        }
        if (fn === 'size' && args.length === 1) {
          const a = t(args[0]!);
          if (a.kind === 'string') return { sql: `LENGTH(${a.sql})`, kind: 'num' };
        }
        return refuse(site, `the function ${fn}()`, n, dialect);
      }
      case 'rcall': {
        const [fn, recv, args] = n.args as [string, ASTNode, ASTNode[]];
        const s = t(recv);
        const a = args.length === 1 ? t(args[0]!) : undefined;
        if (s.kind === 'string' && a?.kind === 'string') {
          if (fn === 'startsWith') return { sql: `(SUBSTRING(${s.sql}, 1, LENGTH(${a.sql})) = ${a.sql})`, kind: 'bool' };
          if (fn === 'endsWith') return { sql: `(LENGTH(${s.sql}) >= LENGTH(${a.sql}) AND SUBSTRING(${s.sql}, LENGTH(${s.sql}) - LENGTH(${a.sql}) + 1) = ${a.sql})`, kind: 'bool' };
          if (fn === 'contains') return { sql: `(POSITION(${a.sql} IN ${s.sql}) > 0)`, kind: 'bool' };
        }
        return refuse(site, `the method .${fn}()`, n, dialect);
      }
      default: {
        if (COMPARE.has(n.op)) {
          const [l, r] = (n.args as [ASTNode, ASTNode]).map(t) as [Sql, Sql];
          if (l.kind === 'num' && r.kind === 'num') return { sql: `(${l.sql} ${n.op} ${r.sql})`, kind: 'bool' };
          if (l.kind === 'string' && r.kind === 'string' && dialect.stringOrder) return { sql: dialect.stringOrder(l.sql, n.op, r.sql), kind: 'bool' };
          return refuse(site, `${n.op} between ${l.kind === 'string' ? 'strings (code point order)' : `a ${l.kind} and a ${r.kind}`}`, n, dialect);
        }
        if (ARITH.has(n.op)) {
          const [ln, rn] = n.args as [ASTNode, ASTNode];
          const [l, r] = [t(ln), t(rn)];
          if (n.op === '+' && l.kind === 'string' && r.kind === 'string') return { sql: `(${l.sql} || ${r.sql})`, kind: 'string' };
          if (l.kind !== 'num' || r.kind !== 'num') return refuse(site, `${n.op} on a non-number`, n, dialect);
          const ints = isInt(ln) && isInt(rn);
          if (n.op === '/') {
            // CEL: int division truncates toward zero and fails on zero; double division by zero is
            // infinite in CEL, which SQL engines do not represent alike, so it is an error (NULL) here.
            const q = `(${l.sql} / CASE WHEN ${r.sql} = 0 THEN NULL ELSE ${r.sql} END)`;
            return { sql: ints ? `(SIGN(${q}) * FLOOR(ABS(${q})))` : q, kind: 'num' };
          }
          if (n.op === '%') {
            if (!ints) return refuse(site, '% on doubles', n, dialect);
            return { sql: `CAST(MOD(CAST(${l.sql} AS BIGINT), CAST(CASE WHEN ${r.sql} = 0 THEN NULL ELSE ${r.sql} END AS BIGINT)) AS ${dialect.double})`, kind: 'num' };
          }
          return { sql: `(${l.sql} ${n.op} ${r.sql})`, kind: 'num' };
        }
        return refuse(site, `the construct ${n.op}`, n, dialect);
      }
    }
  };
  const out = t(ast);
  if (out.kind !== 'bool') refuse(site, 'an expression that is not true or false', ast, dialect);
  return `COALESCE(${out.sql}, FALSE)`;
}
