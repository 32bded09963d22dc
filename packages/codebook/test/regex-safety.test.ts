import { describe, it, expect } from 'vitest';
import safeRegex from 'safe-regex2';
import { ambiguousRepetition, isUnsafePattern } from '../src/index.ts';

describe('pattern safety', () => {
  // Textbook catastrophic-backtracking shapes (recalled from memory): nested repetition and
  // alternatives that can match the same text under a repetition.
  const unsafe = ['(a+)+', '(a*)*', '([a-z]+)*$', '(x+x+)+y', '(a|a)*', '(a|aa)+', '(\\d|[0-9])+', '(a|)*', '(.|x)*'];
  const safe = ['LM-[0-9]{5}', '[A-Z]{2}-\\d{4}', '(yes|no)+', '(a|b|c)+', '(\\.|,)+', '[a-z]+@[a-z]+\\.[a-z]{2,}', 'x{1,3}y'];

  it.each(unsafe)('%s is unsafe', (p) => expect(isUnsafePattern(p)).toBe(true));
  it.each(safe)('%s is safe', (p) => expect(isUnsafePattern(p)).toBe(false));

  it('covers the alternation cases the star-height check alone lets through', () => {
    for (const p of ['(a|a)*', '(a|aa)+', '(\\d|[0-9])+']) {
      expect(safeRegex(p)).toBe(true);
      expect(ambiguousRepetition(p)).toBe(true);
    }
  });
});
