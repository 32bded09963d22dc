import { seeded } from './oracle.ts';

/**
 * Seeded doubles that stress an ordering: many ties (a few whole and half values repeat),
 * negatives, -0 and +0, both infinities, subnormals and magnitudes from 1e-300 to 1e300.
 */
export function awkwardDoubles(seed: number, n: number): number[] {
  const rnd = seeded(seed);
  const specials = [-0, 0, Infinity, -Infinity, 5e-324, -5e-324, 2.2e-308, -1e-310, 1e300, -1e300];
  return Array.from({ length: n }, () => {
    const r = rnd();
    if (r < 0.1) return specials[Math.floor(rnd() * specials.length)]!;
    if (r < 0.5) return Math.floor(rnd() * 21 - 10) / 2;
    return (rnd() - 0.5) * 10 ** Math.floor(rnd() * 600 - 300);
  });
}

/** The values as text that tells -0 from +0, for comparisons to the sign of a zero. */
export function signed(values: ArrayLike<number>): string[] {
  return Array.from(values, (v) => (Object.is(v, -0) ? '-0' : String(v)));
}
