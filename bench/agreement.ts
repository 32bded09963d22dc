/**
 * The benchmark's agreement check: codeweir's `check --json` summary, the SQL peer's tallies and
 * the generator's counts from construction must tell the same story (rows, every item's invalid
 * count and the injected faults behind it, duplicate ids, routing and rule outcomes), so a fast
 * wrong answer shows beside its time.
 */
import { invalidOf, type GeneratedDelivery, type ItemTruth } from './generate.ts';
import type { PeerResult } from './duckdb-peer.ts';

/** The parts of the `check --json` document the comparison reads. */
export interface CheckedSummary {
  rows: number;
  items: Record<string, { valid: number; invalid: number; findings?: Record<string, number | undefined> }>;
  rules?: Record<string, { passed: number; failed: number; undetermined: number; skipped?: number }>;
}

/** Finding rule -> the generator's tally of the faults that produce it. */
const FAULTS: Array<[string, keyof ItemTruth]> = [
  ['not-a-code', 'notACode'],
  ['unbinned-value', 'unbinned'],
  ['not-a-number', 'notANumber'],
  ['not-an-integer', 'notAnInteger'],
  ['impossible', 'impossible'],
  ['pattern-mismatch', 'patternMismatch'],
  ['answered-when-skipped', 'answeredWhenSkipped'],
];

/**
 * Every disagreement between the three, one sentence each; empty when all agree.
 * Cost: O(items x finding rules).
 */
export function agreement(summary: CheckedSummary, peer: PeerResult, g: GeneratedDelivery): string[] {
  const out: string[] = [];
  if (summary.rows !== g.rows || peer.rows !== g.rows) out.push(`rows: written ${g.rows}, codeweir ${summary.rows}, DuckDB ${peer.rows}`);
  for (const name of g.items) {
    const c = summary.items?.[name];
    const p = peer.items[name];
    const t = g.truth[name]!;
    if (!c || !p) {
      out.push(`${name}: missing from ${!c ? "codeweir's summary" : "the peer's result"}`);
      continue;
    }
    const written = invalidOf(t);
    if (c.invalid !== written || p.invalid !== written) out.push(`${name}: invalid written ${written}, codeweir ${c.invalid}, DuckDB ${p.invalid}`);
    if (c.valid !== p.valid) out.push(`${name}: valid codeweir ${c.valid}, DuckDB ${p.valid}`);
    for (const [rule, field] of FAULTS) {
      const cw = c.findings?.[rule] ?? 0;
      const pr = p.findings[rule] ?? 0;
      if (cw !== t[field] || pr !== t[field]) out.push(`${name} ${rule}: written ${t[field]}, codeweir ${cw}, DuckDB ${pr}`);
    }
  }
  const dupCw = summary.items[g.idItem]?.findings?.['duplicate-id'] ?? 0;
  if (dupCw !== g.duplicateIds || peer.duplicateIds !== g.duplicateIds) out.push(`duplicate ids: written ${g.duplicateIds}, codeweir ${dupCw}, DuckDB ${peer.duplicateIds}`);
  for (const [id, p] of Object.entries(peer.rules)) {
    const c = summary.rules?.[id];
    const t = g.rules?.[id];
    const show = (o: { passed: number; failed: number; undetermined: number; skipped?: number } | undefined): string =>
      o ? `${o.passed}/${o.failed}/${o.undetermined}/${o.skipped ?? 0}` : 'absent';
    const same = (a: typeof c, b: typeof c): boolean =>
      !!a && !!b && a.passed === b.passed && a.failed === b.failed && a.undetermined === b.undetermined && (a.skipped ?? 0) === (b.skipped ?? 0);
    if (!same(c, p) || (t && !same(t, p))) out.push(`rule ${id} passed/failed/undetermined/skipped: ${t ? `written ${show(t)}, ` : ''}codeweir ${show(c)}, DuckDB ${show(p)}`);
  }
  return out;
}
