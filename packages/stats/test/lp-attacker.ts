/**
 * An attacker on suppressed tables, for tests: from linear equations over unknown counts (all
 * >= 0) it (1) fills any equation with a single unknown, again and again, and (2) bounds every
 * unknown by linear programming with HiGHS, a solver from outside the project.
 */
import highsLoader from 'highs';

type Solver = { solve(lp: string): { Status: string; ObjectiveValue: number } };
const highs = await (highsLoader as unknown as () => Promise<Solver>)();

/** sum of coefficient x unknown (by name) = rhs. */
export interface Equation {
  terms: Array<[string, number]>;
  rhs: number;
}

/** The unknowns that repeated single-unknown elimination determines. Cost: O(rounds x equations). */
export function eliminated(equations: readonly Equation[]): Set<string> {
  const known = new Map<string, number>();
  for (let changed = true; changed; ) {
    changed = false;
    for (const eq of equations) {
      const open = eq.terms.filter(([v]) => !known.has(v));
      if (open.length !== 1) continue;
      const rest = eq.terms.reduce((s, [v, c]) => (known.has(v) ? s + c * known.get(v)! : s), 0);
      known.set(open[0]![0], (eq.rhs - rest) / open[0]![1]);
      changed = true;
    }
  }
  return new Set(known.keys());
}

/** Smallest and largest feasible value of each unknown (all unknowns >= 0). Two LPs per unknown. */
export function feasibleBounds(equations: readonly Equation[]): Map<string, [number, number]> {
  const names = [...new Set(equations.flatMap((e) => e.terms.map(([v]) => v)))];
  const safe = new Map(names.map((v, i) => [v, `x${i}`]));
  const rows = equations.map((e, i) => ` c${i}: ${e.terms.map(([v, c]) => `${c >= 0 ? '+' : '-'} ${Math.abs(c)} ${safe.get(v)}`).join(' ')} = ${e.rhs}`);
  const bounds = names.map((v) => ` ${safe.get(v)} >= 0`).join('\n');
  const out = new Map<string, [number, number]>();
  for (const v of names) {
    const solve = (sense: string): number => {
      const r = highs.solve(`${sense}\n obj: ${safe.get(v)}\nSubject To\n${rows.join('\n')}\nBounds\n${bounds}\nEnd\n`);
      // Nothing bounds the unknown from above: it cannot be recovered.
      if (r.Status === 'Unbounded' && sense === 'Maximize') return Number.POSITIVE_INFINITY;
      if (r.Status !== 'Optimal') throw new Error(`attacker LP ${r.Status}`);
      return r.ObjectiveValue;
    };
    out.set(v, [solve('Minimize'), solve('Maximize')]);
  }
  return out;
}
