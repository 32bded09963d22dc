import { describe, it, expect } from 'vitest';
import { closest, editDistance, PROBLEM_SEVERITY } from '../src/index.ts';

describe('edit distance and suggestions', () => {
  it('matches the textbook examples', () => {
    // kitten -> sitting needs 3 edits (classic example, recalled from memory).
    expect(editDistance('kitten', 'sitting')).toBe(3);
    // Optimal string alignment counts an adjacent swap as one edit but never edits a
    // substring twice: "ca" -> "abc" is 3 (unrestricted Damerau distance would be 2).
    expect(editDistance('ca', 'abc')).toBe(3);
    expect(editDistance('lable', 'label')).toBe(1);
    expect(editDistance('', 'abc')).toBe(3);
  });

  it('suggests only plausible typos', () => {
    expect(closest('lable', ['name', 'label', 'text'])).toBe('label');
    expect(closest('Label', ['name', 'label'])).toBe('label');
    expect(closest('colour', ['name', 'label', 'text'])).toBeUndefined();
  });

  it('warnings are exactly the advisory checks', () => {
    // A missing code inside a range is advisory: the declared missing code wins (docs/codebook.md).
    expect(Object.entries(PROBLEM_SEVERITY).filter(([, s]) => s === 'warning').map(([c]) => c)).toEqual([
      'bins-gap', 'unused-missing-set', 'missing-in-range', 'label-language-missing', 'label-language-undeclared',
    ]);
  });
});
