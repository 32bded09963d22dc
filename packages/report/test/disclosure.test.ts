import { fileURLToPath } from 'node:url';
import { describe as suite, it, expect } from 'vitest';
import { loadCodebookOrThrow, type CompiledCodebook } from '@codeweir/codebook';
import { checkFile, KINDS, type CheckResult, type GroupItemTally } from '@codeweir/check';
import { describe, type DescribeResult } from '@codeweir/describe';
import { discloseReportInput, disclosureSection } from '../src/disclosure.ts';
import { eliminated, feasibleBounds, type Equation } from '../../stats/test/lp-attacker.ts';

// The invented demo delivery of the Tellmark household survey (examples/), with the income item
// marked confidential for the test.
const at = (f: string): string => fileURLToPath(new URL(`../../../examples/${f}`, import.meta.url));
const base = await loadCodebookOrThrow(at('household.codebook.json'));
const codebook: CompiledCodebook = { ...base, items: base.items.map((i) => (i.name === 'income' ? { ...i, confidential: true as const } : i)) };
const check: CheckResult = await checkFile(at('demo-delivery.csv'), codebook, { threads: 1 });
const described: DescribeResult = describe(check, codebook, { pairs: [['sex', 'edu'], ['team', 'age'], ['age', 'hh_size']] });
const K = 5;
const { input, note } = discloseReportInput({ check, describe: described, codebook }, { minCell: K, withhold: new Set(['income', 'hh_id']), withholdIds: true });

const small = (v: number): boolean => v >= 1 && v < K;
const cellsOf = (t: GroupItemTally): number[] => [t.valid, t.invalid, ...KINDS.map((k) => t.missing[k] ?? 0)];

suite('report disclosure: the rewritten input', () => {
  it('no count from 1 to k - 1 is left in any table the report draws from', () => {
    const left: string[] = [];
    for (const [name, t] of Object.entries(input.check.summary.items)) cellsOf(t).forEach((v, j) => small(v) && left.push(`items.${name}[${j}] = ${v}`));
    for (const [g, byKey] of Object.entries(input.check.summary.groups)) {
      for (const [code, perItem] of Object.entries(byKey)) for (const [name, t] of Object.entries(perItem)) cellsOf(t).forEach((v, j) => small(v) && left.push(`${g}.${code}.${name}[${j}] = ${v}`));
    }
    for (const [name, d] of Object.entries(input.describe.items)) {
      for (const f of d.frequencies ?? []) if (small(f.count)) left.push(`${name} code ${f.code} = ${f.count}`);
      for (const c of d.histogram?.counts ?? []) if (small(c)) left.push(`${name} histogram bin ${c}`);
      if (small(d.n)) left.push(`${name} n ${d.n}`);
    }
    for (const p of input.describe.pairs) {
      if (p.kind === 'categorical-categorical') p.table.flat().forEach((v) => small(v) && left.push(`${p.x} x ${p.y}: ${v}`));
      if (p.kind === 'categorical-continuous') p.groups.forEach((g) => small(g.n) && left.push(`${p.x} x ${p.y} group ${g.code}: ${g.n}`));
    }
    (input.check.summary.recordMissing ?? []).forEach((v, k) => small(v) && left.push(`records with ${k} missing: ${v}`));
    expect(left).toEqual([]);
    expect(note.suppressed).toBeGreaterThan(0);
  });

  it('no suppressed frequency can be recovered from the item n and the other counts', () => {
    for (const [name, d] of Object.entries(input.describe.items)) {
      const f = d.frequencies ?? [];
      if (!f.some((x) => Number.isNaN(x.count))) continue;
      const eq: Equation = { terms: [], rhs: 0 };
      f.forEach((x) => (Number.isNaN(x.count) ? eq.terms.push([`${name}:${x.code}`, 1]) : (eq.rhs -= x.count)));
      const eqs = [eq];
      if (Number.isNaN(d.n)) {
        eq.terms.push([`${name}:n`, -1]);
        // n is the item's valid count: with the rest of its missingness line it adds up to the rows.
        const line = cellsOf(input.check.summary.items[name]!);
        const known = line.slice(1).reduce((a, v) => (Number.isNaN(v) ? a : a + v), 0);
        eqs.push({ terms: [[`${name}:n`, 1], ...line.slice(1).flatMap((v, j): Array<[string, number]> => (Number.isNaN(v) ? [[`${name}:line${j}`, 1]] : []))], rhs: check.summary.rows - known });
      } else eq.rhs += d.n;
      expect([...eliminated(eqs)]).toEqual([]);
      for (const [cell, [lo, hi]] of feasibleBounds(eqs)) expect(hi - lo, `${cell} in [${lo}, ${hi}]`).toBeGreaterThanOrEqual(1);
    }
  });

  it('no suppressed cell of a cross-table can be recovered from its row and column totals', () => {
    const p = input.describe.pairs.find((x) => x.kind === 'categorical-categorical')!;
    if (p.kind !== 'categorical-categorical') throw new Error('pair kind');
    const original = described.pairs.find((x) => x.x === p.x && x.y === p.y)!;
    if (original.kind !== 'categorical-categorical') throw new Error('pair kind');
    const eqs: Equation[] = [];
    const rows = original.table.map((r) => r.reduce((a, b) => a + b, 0));
    const cols = original.table[0]!.map((_, j) => original.table.reduce((a, r) => a + r[j]!, 0));
    p.table.forEach((r, i) => eqs.push({ terms: r.flatMap((v, j): Array<[string, number]> => (Number.isNaN(v) ? [[`${i},${j}`, 1]] : [])), rhs: rows[i]! - r.reduce((a, v) => (Number.isNaN(v) ? a : a + v), 0) }));
    cols.forEach((c, j) => eqs.push({ terms: p.table.flatMap((r, i): Array<[string, number]> => (Number.isNaN(r[j]!) ? [[`${i},${j}`, 1]] : [])), rhs: c - p.table.reduce((a, r) => (Number.isNaN(r[j]!) ? a : a + r[j]!), 0) }));
    const live = eqs.filter((e) => e.terms.length > 0);
    expect([...eliminated(live)]).toEqual([]);
    for (const [cell, [lo, hi]] of feasibleBounds(live)) expect(hi - lo, `${cell}`).toBeGreaterThanOrEqual(1);
  });

  it('withholds the confidential item, record ids and scatter points; the input itself is unchanged', () => {
    const income = input.describe.items.income!;
    expect(income.max).toBeUndefined();
    expect(income.withheld.values).toMatch(/confidential/);
    // Under suppression no finding is listed; withheld values and ids are seen without it.
    const withheld = discloseReportInput({ check, describe: described, codebook }, { minCell: 1, withhold: new Set(['income', 'hh_id']), withholdIds: true }).input;
    expect(withheld.check.findings.length).toBe(check.findings.length);
    expect(withheld.check.findings.filter((f) => f.id !== '').every((f) => f.id === '[withheld]')).toBe(true);
    expect(withheld.check.findings.filter((f) => f.item === 'income' && f.value !== '').every((f) => f.value === '[withheld]')).toBe(true);
    // The fences of an outlier come from income's quartiles: no number of income's is left in the messages.
    const outliers = withheld.check.findings.filter((f) => f.item === 'income' && (f.rule === 'outlier' || f.rule === 'extreme'));
    expect(outliers.length).toBeGreaterThan(0);
    for (const f of outliers) expect(f.message).not.toMatch(/\d/);
    const scatter = input.describe.pairs.find((x) => x.kind === 'continuous-continuous');
    expect(scatter && 'sample' in scatter ? scatter.sample : undefined).toBeUndefined();
    expect(described.items.income!.max).toBeGreaterThan(0);
    expect(check.findings.some((f) => f.id !== '' && f.id !== '[withheld]')).toBe(true);
  });

  it('the legend says what the marks mean', () => {
    const html = disclosureSection(note);
    expect(html).toMatch(/Counts from 1 to 4 are suppressed/);
    expect(html).toMatch(/<code>income<\/code>/);
    expect(disclosureSection({ minCell: 1, suppressed: 0, withheld: [], unprotected: 0 })).toBe('');
  });
});

suite('report disclosure: the counts of findings', () => {
  // First principles: the findings by rule add up to the total, by severity likewise, and each
  // rule's count is the sum of its items' counts and of the findings that name no item; the
  // attacker (HiGHS) solves those equations for every suppressed count.
  it('no count of findings from 1 to k - 1 is left, none suppressed can be recovered, the findings are not listed', () => {
    const f = input.check.summary.findings;
    const left: string[] = [];
    for (const [r, v] of Object.entries(f.byRule)) if (small(v!)) left.push(`byRule ${r} = ${v}`);
    for (const [sv, v] of Object.entries(f.bySeverity)) if (small(v!)) left.push(`bySeverity ${sv} = ${v}`);
    for (const [name, t] of Object.entries(input.check.summary.items)) for (const [r, v] of Object.entries(t.findings)) if (small(v!)) left.push(`${name} ${r} = ${v}`);
    for (const [id, res] of Object.entries(input.check.summary.rules)) for (const [c, v] of Object.entries(res)) if (small(v as number)) left.push(`rule ${id} ${c} = ${v}`);
    for (const groups of note.findings!.groups.values()) for (const [code, c] of groups) for (const [sv, v] of Object.entries(c)) if (small(v)) left.push(`group ${code} ${sv} = ${v}`);
    expect(left).toEqual([]);
    expect(input.check.findings).toEqual([]);
    expect(input.check.summary.accepted).toBe(false);
    const raw = check.summary;
    const rules = Object.keys(raw.findings.byRule).filter((r) => (raw.findings.byRule[r as keyof typeof raw.findings.byRule] ?? 0) > 0) as Array<keyof typeof raw.findings.byRule>;
    expect(rules.some((r) => Number.isNaN(f.byRule[r]!))).toBe(true);
    const eqs: Equation[] = [];
    const term = (v: number, name: string, terms: Array<[string, number]>): number => (Number.isNaN(v) ? (terms.push([name, 1]), 0) : v);
    // By rule and by severity against the total (each rule but the cross-item rules has one severity).
    {
      const terms: Array<[string, number]> = [];
      const known = rules.reduce((a, r) => a + term(f.byRule[r]!, `rule:${r}`, terms), 0);
      eqs.push({ terms, rhs: raw.findings.total - known });
    }
    // Each rule: its items' counts, plus the findings of no item (an unknown of their own).
    for (const r of rules) {
      const terms: Array<[string, number]> = [[`rest:${r}`, 1]];
      let known = 0;
      for (const [name, t] of Object.entries(input.check.summary.items)) if (t.findings[r] !== undefined) known += term(t.findings[r]!, `${name}:${r}`, terms);
      if (Number.isNaN(f.byRule[r]!)) terms.push([`rule:${r}`, -1]);
      else known -= f.byRule[r]!;
      eqs.push({ terms, rhs: -known });
    }
    const live = eqs.filter((e) => e.terms.length > 0);
    const suppressedNames = new Set(live.flatMap((e) => e.terms.map(([n]) => n)).filter((n) => !n.startsWith('rest:')));
    expect([...eliminated(live)].filter((n) => suppressedNames.has(n))).toEqual([]);
    for (const [cell, [lo, hi]] of feasibleBounds(live)) if (suppressedNames.has(cell)) expect(hi - lo, `${cell} in [${lo}, ${hi}]`).toBeGreaterThanOrEqual(1);
  });
});
