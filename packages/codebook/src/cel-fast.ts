/**
 * A fast path for the CEL expressions routing and rules mostly are: comparisons, `in` over a
 * list of literals, `!`, `&&`, `||` and `? :` over item values and literals. Such an already
 * type-checked expression is translated to one JavaScript function over plain numbers and
 * strings, which is many times faster than walking the tree with BigInt ints.
 *
 * Why the translation keeps CEL's meaning: after a successful type check, `==` and `!=` only
 * meet operands of one type (CEL has no int/double equality), and within the subset nothing
 * can raise an error, so CEL's error-absorbing `&&`/`||` reduce to JavaScript's short-circuit
 * operators. Ordering comparisons are translated for numbers only (int and double compare
 * numerically in both languages); string ordering stays with the library, because CEL orders
 * strings by code point and JavaScript by UTF-16 unit. Int literals outside the safe-integer
 * range, calls, macros, arithmetic and anything else make the expression ineligible, and it is
 * evaluated by the library alone. At run time a value of an unexpected JS type (a fraction for
 * an int item, a string for a number) also goes to the library, which decides as before.
 */
import type { ASTNode } from '@marcbachmann/cel-js';

type Kind = 'int' | 'double' | 'string' | 'bool';

/** JS source of a literal, with its CEL kind, or undefined when not in the subset. */
function literal(v: unknown): { src: string; kind: Kind } | undefined {
  if (typeof v === 'bigint') return Number.isSafeInteger(Number(v)) ? { src: String(v), kind: 'int' } : undefined;
  if (typeof v === 'number') return Number.isFinite(v) ? { src: String(v), kind: 'double' } : undefined;
  if (typeof v === 'string') return { src: JSON.stringify(v), kind: 'string' };
  if (typeof v === 'boolean') return { src: String(v), kind: 'bool' };
  return undefined;
}

/** A literal, or a negated numeric literal (the parser keeps `-1` as minus applied to 1). */
function literalNode(n: ASTNode): Translation | undefined {
  if (n.op === 'value') return literal(n.args);
  if (n.op !== '-_' || (n.args as ASTNode).op !== 'value') return undefined;
  const lit = literal((n.args as ASTNode).args);
  return lit && (lit.kind === 'int' || lit.kind === 'double') ? { src: `(-${lit.src})`, kind: lit.kind } : undefined;
}

const COMPARE = new Set(['<', '<=', '>', '>=']);

interface Translation {
  src: string;
  kind: Kind;
}

/**
 * Translates a checked AST to JS source over locals named by `local(name)`, or undefined when
 * some node is outside the subset. `kinds` gives each variable's CEL kind. Recursion depth is
 * bounded by the expression depth limit applied before this is called.
 */
function translate(node: ASTNode, kinds: ReadonlyMap<string, Kind>, local: (name: string) => string): Translation | undefined {
  const t = (n: unknown) => translate(n as ASTNode, kinds, local);
  switch (node.op) {
    case 'value':
      return literal(node.args);
    case 'id': {
      const k = kinds.get(node.args as string);
      return k === undefined ? undefined : { src: local(node.args as string), kind: k };
    }
    case '-_':
      return literalNode(node);
    case '!_': {
      const a = t(node.args);
      return a && a.kind === 'bool' ? { src: `(!${a.src})`, kind: 'bool' } : undefined;
    }
    case '&&':
    case '||': {
      const [l, r] = (node.args as [ASTNode, ASTNode]).map(t);
      return l && r && l.kind === 'bool' && r.kind === 'bool' ? { src: `(${l.src} ${node.op} ${r.src})`, kind: 'bool' } : undefined;
    }
    case '?:': {
      const [c, a, b] = (node.args as [ASTNode, ASTNode, ASTNode]).map(t);
      return c && a && b && c.kind === 'bool' && a.kind === 'bool' && b.kind === 'bool' ? { src: `(${c.src} ? ${a.src} : ${b.src})`, kind: 'bool' } : undefined;
    }
    case '==':
    case '!=': {
      const [l, r] = (node.args as [ASTNode, ASTNode]).map(t);
      if (!l || !r || l.kind !== r.kind) return undefined;
      return { src: `(${l.src} ${node.op === '==' ? '===' : '!=='} ${r.src})`, kind: 'bool' };
    }
    case 'in': {
      const [x, list] = node.args as [ASTNode, ASTNode];
      const l = t(x);
      if (!l || list.op !== 'list') return undefined;
      const items = (list.args as ASTNode[]).map(literalNode);
      if (items.some((i) => !i || i.kind !== l.kind)) return undefined;
      if (items.length === 0) return { src: 'false', kind: 'bool' };
      return { src: `(${items.map((i) => `${l.src} === ${i!.src}`).join(' || ')})`, kind: 'bool' };
    }
    default: {
      if (!COMPARE.has(node.op)) return undefined;
      const [l, r] = (node.args as [ASTNode, ASTNode]).map(t);
      const numeric = (k: Kind) => k === 'int' || k === 'double';
      if (!l || !r || !numeric(l.kind) || !numeric(r.kind)) return undefined;
      return { src: `(${l.src} ${node.op} ${r.src})`, kind: 'bool' };
    }
  }
}

/**
 * A direct JS evaluator for a type-checked expression in the fast subset, or undefined. The
 * returned function reads `variables` from the row, checks each has the JS type its CEL kind
 * needs (int: safe integer number; double: number; string: string), and otherwise calls
 * `fallback` with the row, so every row gets the library's answer when the fast path cannot
 * give the same one.
 */
export function fastEvaluator(
  ast: ASTNode,
  variables: readonly string[],
  celTypes: readonly string[],
  fallback: (vars: Record<string, unknown>) => boolean,
): ((vars: Record<string, unknown>) => boolean) | undefined {
  const kinds = new Map<string, Kind>();
  variables.forEach((v, k) => kinds.set(v, celTypes[k] as Kind));
  const locals = new Map(variables.map((v, k) => [v, `v${k}`]));
  const body = translate(ast, kinds, (name) => locals.get(name)!);
  if (!body || body.kind !== 'bool') return undefined;
  const guards = variables.map((v, k) => {
    const get = `const v${k} = vars[${JSON.stringify(v)}];`;
    const kind = kinds.get(v)!;
    const ok = kind === 'int' ? `Number.isSafeInteger(v${k})` : kind === 'double' ? `typeof v${k} === 'number'` : kind === 'string' ? `typeof v${k} === 'string'` : `typeof v${k} === 'boolean'`;
    return `${get} if (!(${ok})) return fallback(vars);`;
  });
  // Variable names and literals reach the source only through JSON.stringify and String(number),
  // so no item name or string literal can change the generated code's structure.
  const src = `return (vars) => { ${guards.join(' ')} return ${body.src} === true; };`;
  return new Function('fallback', src)(fallback) as (vars: Record<string, unknown>) => boolean;
}
