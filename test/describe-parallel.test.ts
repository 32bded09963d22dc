/**
 * Describing on several threads must give exactly what one thread gives: the same items, the
 * same figures to the bit, the same conventions, in the same order. The expectation is the
 * single-thread `describe` itself (whose figures the demo and reference tests check against
 * outside oracles, the pairs' in packages/describe/test/pairs.test.ts against R reference
 * values), on the demo delivery with its weight item and items of every level (so every kind
 * of pair).
 */
import { describe as suite, it, expect, beforeAll } from 'vitest';
import { fileURLToPath } from 'node:url';
import { loadCodebookOrThrow, type CompiledCodebook } from '@codeweir/codebook';
import { checkFile, checkFileParallel, type CheckResult } from '@codeweir/check';
import { describe, describeParallel } from '@codeweir/describe';

const root = fileURLToPath(new URL('..', import.meta.url));
let codebook: CompiledCodebook;
let result: CheckResult;

beforeAll(async () => {
  codebook = await loadCodebookOrThrow(`${root}examples/household.codebook.json`);
  result = await checkFile(`${root}examples/demo-delivery.csv`, codebook);
});

suite('describeParallel', () => {
  it('equals describe when the worker threads describe every interval and ratio item (weighted figures included)', async () => {
    const one = describe(result, codebook, { percentiles: [10, 90] });
    // The demo has several interval and ratio items and a weight item: the workers' share is real work.
    const continuous = Object.values(one.items).filter((d) => d.level === 'interval' || d.level === 'ratio');
    expect(continuous.length).toBeGreaterThanOrEqual(4);
    expect(one.weight).toBeDefined();
    const all = await describeParallel(result, codebook, { percentiles: [10, 90] }, { threads: 3, minRows: 0, useCallingThread: false });
    expect(JSON.stringify(all)).toBe(JSON.stringify(one));
  }, 60_000);

  it('equals describe with the calling thread sharing the items, and with one thread', async () => {
    const one = describe(result, codebook, { quantileType: 6 });
    expect(JSON.stringify(await describeParallel(result, codebook, { quantileType: 6 }, { threads: 2, minRows: 0 }))).toBe(JSON.stringify(one));
    expect(JSON.stringify(await describeParallel(result, codebook, { quantileType: 6 }, { threads: 1 }))).toBe(JSON.stringify(one));
  }, 60_000);

  it('equals describe on the result of a threaded check', async () => {
    const threaded = await checkFileParallel(`${root}examples/demo-delivery.csv`, codebook, { threads: 2, minParallelBytes: 0 });
    const one = describe(threaded, codebook);
    expect(JSON.stringify(one)).toBe(JSON.stringify(describe(result, codebook)));
    expect(JSON.stringify(await describeParallel(threaded, codebook, {}, { threads: 2, minRows: 0, useCallingThread: false }))).toBe(JSON.stringify(one));
  }, 60_000);

  it('fails on a bad option before any thread starts, with the error describe gives', async () => {
    expect(() => describe(result, codebook, { weight: 'nope' })).toThrow(/--weight names "nope"/);
    await expect(describeParallel(result, codebook, { weight: 'nope' }, { threads: 2, minRows: 0 })).rejects.toThrow(/--weight names "nope"/);
  });
});

suite('describeParallel pairs', () => {
  it('equal the one-thread pairs with the calling thread sharing them, and with the workers taking them all', async () => {
    const one = describe(result, codebook, { pairs: 'all' });
    const kinds = new Set(one.pairs.map((p) => p.kind));
    expect([...kinds].sort()).toEqual(['categorical-categorical', 'categorical-continuous', 'continuous-continuous']);
    const expected = JSON.stringify(one);
    expect(JSON.stringify(await describeParallel(result, codebook, { pairs: 'all' }, { threads: 2, minRows: 0 }))).toBe(expected);
    expect(JSON.stringify(await describeParallel(result, codebook, { pairs: 'all' }, { threads: 3, minRows: 0, useCallingThread: false }))).toBe(expected);
    expect(JSON.stringify(await describeParallel(result, codebook, { pairs: 'all' }, { threads: 1 }))).toBe(expected);
  }, 120_000);

  it('equal the one-thread pairs listwise, with named pairs in the requested order', async () => {
    const continuous = codebook.items.filter((i) => i.role === 'item' && (i.level === 'interval' || i.level === 'ratio')).map((i) => i.name);
    const categorical = codebook.items.filter((i) => i.role !== 'id' && (i.level === 'nominal' || i.level === 'ordinal')).map((i) => i.name);
    const pairs: Array<[string, string]> = [
      [continuous[1]!, continuous[0]!],
      [continuous[0]!, categorical[0]!],
      [categorical[1]!, categorical[0]!],
      [continuous[2]!, continuous[1]!],
    ];
    const options = { pairs, listwise: true, quantileType: 6 as const };
    const one = describe(result, codebook, options);
    expect(one.pairs.map((p) => p.listwise)).toEqual([true, true, true, true]);
    expect(JSON.stringify(await describeParallel(result, codebook, options, { threads: 2, minRows: 0 }))).toBe(JSON.stringify(one));
  }, 120_000);

  it('fails on a bad pair before any thread starts, with the error describe gives', async () => {
    expect(() => describe(result, codebook, { pairs: [['nope', 'x']] })).toThrow(/names "nope"/);
    await expect(describeParallel(result, codebook, { pairs: [['nope', 'x']] }, { threads: 2, minRows: 0 })).rejects.toThrow(/names "nope"/);
  });
});
