/** Eta squared: the share of a continuous variable's variation explained by a grouping. */

/**
 * Eta squared = SS between / SS total for a one-way layout, one array of values per group.
 *
 * Convention: sums of squares about the grand mean (the same as anova's sums of squares of a
 * one-factor linear model); a descriptive effect size, no bias correction (not omega squared).
 * Empty groups contribute nothing. Null when there are no values or all values are equal.
 * Cost: two linear passes over all values, O(k) extra memory. Throws nothing.
 *
 * @example etaSquared([[1, 2, 3], [4, 5, 6]]) // 0.771...
 */
export function etaSquared(groups: ReadonlyArray<ArrayLike<number>>): number | null {
  let n = 0;
  let sum = 0;
  for (const g of groups) {
    for (let i = 0; i < g.length; i++) sum += g[i];
    n += g.length;
  }
  if (n === 0) return null;
  const grand = sum / n;
  let between = 0;
  let total = 0;
  for (const g of groups) {
    if (g.length === 0) continue;
    let gs = 0;
    for (let i = 0; i < g.length; i++) gs += g[i];
    const gm = gs / g.length;
    between += g.length * (gm - grand) ** 2;
    for (let i = 0; i < g.length; i++) total += (g[i] - grand) ** 2;
  }
  if (!(total > 0)) return null;
  return Math.min(1, between / total);
}
