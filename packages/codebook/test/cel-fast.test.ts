import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { Environment } from '@marcbachmann/cel-js';
import { ExpressionContext, compileExpression } from '../src/index.ts';
import { fastEvaluator } from '../src/cel-fast.ts';

// The reference: the CEL library itself, evaluating with ints as BigInt, an error counting as
// false, as the CompiledExpression contract says.
const oracleEnv = new Environment().registerVariable('a', 'int').registerVariable('b', 'int').registerVariable('d', 'double').registerVariable('s', 'string');
function oracle(src: string, row: Record<string, unknown>): boolean {
  const c: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(row)) c[k] = (k === 'a' || k === 'b') && typeof v === 'number' && Number.isInteger(v) ? BigInt(v) : v;
  try {
    return oracleEnv.evaluate(src, c) === true;
  } catch {
    return false;
  }
}

const ctx = new ExpressionContext([
  { index: 0, name: 'a', type: 'integer' },
  { index: 1, name: 'b', type: 'integer' },
  { index: 2, name: 'd', type: 'decimal' },
  { index: 3, name: 's', type: 'text' },
]);

const intTerm = fc.oneof(fc.constantFrom('a', 'b'), fc.integer({ min: -3, max: 3 }).map(String));
const dblTerm = fc.oneof(fc.constant('d'), fc.constantFrom('2.5', '-1.5', '0.0', '1.0'));
const numTerm = fc.oneof(intTerm, dblTerm);
const strTerm = fc.oneof(fc.constant('s'), fc.constantFrom('""', '"a"', '"b"', '"\u00e9"'));

const boolExpr: fc.Arbitrary<string> = fc.letrec<{ e: string }>((tie) => ({
  e: fc.oneof(
    { depthSize: 'small', withCrossShrink: true },
    fc.tuple(numTerm, fc.constantFrom('<', '<=', '>', '>='), numTerm).map(([l, op, r]) => `${l} ${op} ${r}`),
    fc.tuple(intTerm, fc.constantFrom('==', '!='), intTerm).map(([l, op, r]) => `${l} ${op} ${r}`),
    fc.tuple(dblTerm, fc.constantFrom('==', '!='), dblTerm).map(([l, op, r]) => `${l} ${op} ${r}`),
    fc.tuple(strTerm, fc.constantFrom('==', '!='), strTerm).map(([l, op, r]) => `${l} ${op} ${r}`),
    fc.tuple(intTerm, fc.array(fc.integer({ min: -2, max: 2 }), { maxLength: 3 })).map(([x, l]) => `${x} in [${l.join(', ')}]`),
    fc.tuple(strTerm, fc.array(fc.constantFrom('"a"', '"b"'), { maxLength: 2 })).map(([x, l]) => `${x} in [${l.join(', ')}]`),
    fc.constantFrom('true', 'false'),
    tie('e').map((x) => `!(${x})`),
    fc.tuple(tie('e'), fc.constantFrom('&&', '||'), tie('e')).map(([l, op, r]) => `(${l}) ${op} (${r})`),
    fc.tuple(tie('e'), tie('e'), tie('e')).map(([c, x, y]) => `(${c}) ? (${x}) : (${y})`),
  ),
})).e;

const validRow = fc.record({
  a: fc.integer({ min: -3, max: 3 }),
  b: fc.integer({ min: -3, max: 3 }),
  d: fc.constantFrom(-1.5, 0, 1, 2.5, Number.NaN),
  s: fc.constantFrom('', 'a', 'b', '\u00e9'),
});
// Rows with values of the wrong JS type, which must reach the library's answer too.
const oddRow = fc.record({
  a: fc.constantFrom(2.5, '1', undefined, 1),
  b: fc.integer({ min: -3, max: 3 }),
  d: fc.constantFrom('x', 1, undefined),
  s: fc.constantFrom(3, 'a', undefined),
});

describe('CEL fast path', () => {
  it('gives the library answer on random comparison-and-logic expressions', () => {
    fc.assert(
      fc.property(boolExpr, fc.array(validRow, { minLength: 1, maxLength: 6 }), fc.array(oddRow, { maxLength: 3 }), (src, rows, odd) => {
        const r = compileExpression(ctx, src, '/rules/0/test');
        expect(r.problems).toEqual([]);
        const e = r.expression!;
        const parsed = ctx.env.parse(src);
        const types = e.variables.map((v) => (v === 'd' ? 'double' : v === 's' ? 'string' : 'int'));
        // Every expression of this grammar is in the fast subset: the fast path answers valid rows itself.
        const fast = fastEvaluator(parsed.ast, e.variables, types, () => {
          throw new Error('fallback used on a valid row');
        })!;
        expect(fast).toBeTypeOf('function');
        for (const row of rows) {
          expect(fast(row)).toBe(oracle(src, row));
          expect(e.evaluate(row)).toBe(oracle(src, row));
        }
        for (const row of odd) expect(e.evaluate(row)).toBe(oracle(src, row));
      }),
      { seed: 42, numRuns: 400 },
    );
  });

  it('leaves calls, arithmetic, string ordering and large int literals to the library', () => {
    for (const src of ['s.startsWith("a")', 'a + 1 > 2', 's < "b"', 'a < 9007199254740993', 'size(s) > 0']) {
      const r = compileExpression(ctx, src, '/x');
      expect(r.problems).toEqual([]);
      const parsed = ctx.env.parse(src);
      expect(fastEvaluator(parsed.ast, r.expression!.variables, r.expression!.variables.map((v) => (v === 's' ? 'string' : 'int')), () => false)).toBeUndefined();
      for (const row of [{ a: 2, s: 'a' }, { a: 0, s: '' }]) expect(r.expression!.evaluate(row)).toBe(oracle(src, row));
    }
  });
});
