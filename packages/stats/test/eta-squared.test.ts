import { describe, it, expect } from 'vitest';
import { etaSquared } from '../src/eta-squared.ts';
import { RB } from './bivariate-oracle.ts';

describe('etaSquared', () => {
  it('matches R on a one-way layout of four groups', () => {
    const { group, y } = RB.etaSquared;
    const groups = [1, 2, 3, 4].map((g) => y.filter((_, i) => group[i] === g));
    // R 4.2.2: a <- anova(lm(y ~ factor(g))); a[1, "Sum Sq"] / sum(a[, "Sum Sq"])
    expect(etaSquared(groups)).toBeCloseTo(RB.etaSquared.etaSquared, 12);
  });

  it('a small layout worked by hand', () => {
    // First principles: groups (1, 2, 3) and (4, 5, 6), grand mean 3.5; SS between = 3 (1.5^2) 2 = 13.5,
    // SS total = 2 (2.5^2 + 1.5^2 + 0.5^2) = 17.5.
    expect(etaSquared([[1, 2, 3], [4, 5, 6], []])).toBeCloseTo(13.5 / 17.5, 14);
  });

  it('is null without variation or without values', () => {
    expect(etaSquared([[2, 2], [2]])).toBeNull();
    expect(etaSquared([[], []])).toBeNull();
  });
});
