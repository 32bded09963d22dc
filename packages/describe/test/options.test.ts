import { describe as suite, it, expect } from 'vitest';
import { CodeweirError } from '@codeweir/core';
import { normalizeDescribeOptions } from '../src/options.ts';

function usage(fn: () => unknown): CodeweirError {
  try {
    fn();
  } catch (e) {
    if (e instanceof CodeweirError) return e;
    throw e;
  }
  throw new Error('expected a CodeweirError');
}

suite('normalizeDescribeOptions', () => {
  it('fills defaults: type 7, no pairs, pairwise, no percentiles', () => {
    expect(normalizeDescribeOptions()).toEqual({ quantileType: 7, weight: undefined, pairs: [], listwise: false, percentiles: [] });
  });
  it('accepts CLI text forms', () => {
    const o = normalizeDescribeOptions({ quantileType: '6', percentiles: '90,10,10', pairs: ['a:b', ['c', 'd']], listwise: true });
    expect(o.quantileType).toBe(6);
    expect(o.percentiles).toEqual([10, 90]);
    expect(o.pairs).toEqual([['a', 'b'], ['c', 'd']]);
    expect(normalizeDescribeOptions({ pairs: 'all' }).pairs).toBe('all');
  });
  it('fails fast with the bad value in the message (CW_USAGE, exit 2)', () => {
    const e = usage(() => normalizeDescribeOptions({ quantileType: 12 }));
    expect(e.code).toBe('CW_USAGE');
    expect(e.exitCode).toBe(2);
    expect(e.message).toBe('--quantiles takes 1 to 9, got 12.');
    expect(usage(() => normalizeDescribeOptions({ quantileType: '2.5' })).message).toMatch(/got 2\.5/);
    expect(usage(() => normalizeDescribeOptions({ percentiles: '10,abc' })).message).toMatch(/--percentiles .*"abc"/);
    expect(usage(() => normalizeDescribeOptions({ percentiles: [101] })).message).toMatch(/101/);
    expect(usage(() => normalizeDescribeOptions({ pairs: ['age'] })).message).toMatch(/--pair takes two item names as x:y, got "age"/);
    expect(usage(() => normalizeDescribeOptions({ weight: '' })).message).toMatch(/--weight/);
    expect(usage(() => normalizeDescribeOptions({ listwise: 'yes' })).message).toMatch(/--listwise/);
  });
});
