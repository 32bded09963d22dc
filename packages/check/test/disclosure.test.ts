import { mkdtemp, readFile, readdir, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, it, expect } from 'vitest';
import { parse } from 'csv-parse/sync';
import { seededRandom } from '@codeweir/core';
import { check, writeCheckOutputs, KINDS, SUPPRESSED_MARK, WITHHELD_MARK } from '../src/index.ts';
import { codebook } from './helpers.ts';
import { eliminated, feasibleBounds, type Equation } from '../../stats/test/lp-attacker.ts';

const dir = await mkdtemp(join(tmpdir(), 'cw-disclosure-'));
afterAll(() => rm(dir, { recursive: true, force: true }));

const miss = [
  { code: -9, kind: 'refused' },
  { code: -8, kind: 'dont-know' },
  { code: -7, kind: 'not-applicable' },
];
const cb = codebook([
  { name: 'id', label: 'Record', role: 'id', type: 'text' },
  { name: 'team', label: 'Field team', role: 'group', type: 'integer', level: 'nominal', codes: [1, 2, 3, 4, 5].map((c) => ({ code: c, label: `Team ${c}` })) },
  { name: 'age', label: 'Age', type: 'integer', level: 'ratio', range: { min: 0, max: 110 }, missing: miss },
  { name: 'owns', label: 'Owns land', type: 'integer', level: 'nominal', codes: [{ code: 1, label: 'Yes' }, { code: 2, label: 'No' }], missing: miss },
  { name: 'head', label: 'Name of the head', type: 'text', confidential: true, pattern: '[A-Z][a-z]+' },
]);

/** Invented deliveries: team 5 is small, rare missing kinds and bad values scattered. */
function delivery(seed: number, n: number): string[][] {
  const rand = seededRandom(seed);
  const cell = (ok: () => string): string => {
    const u = rand();
    return u < 0.04 ? '-9' : u < 0.07 ? '-8' : u < 0.09 ? '' : u < 0.1 ? 'x' : u < 0.12 ? '-7' : ok();
  };
  return Array.from({ length: n }, (_, r) => [
    `HH-${1000 + r}`,
    r % 37 === 0 ? '5' : String(1 + Math.floor(rand() * 4)),
    cell(() => String(18 + Math.floor(rand() * 60))),
    cell(() => (rand() < 0.5 ? '1' : '2')),
    rand() < 0.05 ? 'bad name 7' : 'Amsel',
  ]);
}

// The missing kind "invalid" (a declared missing code) shares its header with the count of
// invalid cells; the test reads it as "kind:invalid".
const KIND_COLUMNS = KINDS.map((k) => (k === 'invalid' ? 'kind:invalid' : k));
const COUNT_COLUMNS = ['rows', 'valid', 'invalid', ...KIND_COLUMNS, 'missing'];
type Line = Record<string, string>;
const read = async (p: string): Promise<Line[]> =>
  parse(await readFile(p, 'utf8'), {
    bom: true,
    columns: (head: string[]) => head.map((h, i) => (h === 'invalid' && head.indexOf('invalid') !== i ? 'kind:invalid' : h)),
  }) as Line[];

/** Every equation the written missingness tables give together (overall, by group, per team). */
function equationsOf(rows: number, overall: Line[], byGroup: Line[]): Equation[] {
  const eqs: Equation[] = [];
  const value = (line: Line, col: string, name: string): { known: number } | { name: string } =>
    line[col] === SUPPRESSED_MARK ? { name } : { known: Number(line[col]) };
  const add = (parts: Array<[{ known: number } | { name: string }, number]>, rhs = 0): void => {
    let r = rhs;
    const terms: Array<[string, number]> = [];
    for (const [p, c] of parts) {
      if ('known' in p) r -= c * p.known;
      else terms.push([p.name, c]);
    }
    if (terms.length > 0) eqs.push({ terms, rhs: r });
  };
  const lineEquations = (line: Line, key: string, size: { known: number } | { name: string }): void => {
    const cells = ['valid', 'invalid', ...KIND_COLUMNS].map((c) => [value(line, c, `${key}:${c}`), 1] as [{ known: number } | { name: string }, number]);
    add([...cells, [size, -1]]);
    add([...cells.slice(2), [value(line, 'missing', `${key}:missing`), -1]]);
  };
  for (const line of overall) lineEquations(line, `all:${line.item}`, { known: rows });
  for (const line of byGroup) {
    const size = value(line, 'rows', `size:${line.group}`);
    lineEquations(line, `${line.group}:${line.item}`, size);
  }
  // Each count by group adds up to the overall count.
  for (const o of overall) {
    for (const c of ['valid', 'invalid', ...KIND_COLUMNS, 'missing']) {
      const parts = byGroup.filter((l) => l.item === o.item).map((l) => [value(l, c, `${l.group}:${l.item}:${c}`), 1] as [{ known: number } | { name: string }, number]);
      add([...parts, [value(o, c, `all:${o.item}:${c}`), -1]]);
    }
  }
  return eqs;
}

/** Rules whose findings make a cell invalid (first principles: each such cell is one finding and counts as invalid). */
const INVALIDATING = new Set(['not-a-number', 'not-an-integer', 'not-a-date', 'not-a-code', 'unbinned-value', 'impossible', 'pattern-mismatch', 'answered-when-skipped']);

/**
 * The equations summary.json's counts of findings give: by rule adds up to the total, by
 * severity too, each rule is its items' counts plus findings of no item (unknowns of their own),
 * an item's invalidating findings add up to its invalid count (missingness.csv), and each
 * cross-item rule's counts add up to the rows. A null is an unknown.
 */
function findingEquations(summary: Record<string, any>, overall: Line[]): Equation[] {
  const eqs: Equation[] = [];
  const sum = (parts: Array<[unknown, string, number]>, rhs: number): void => {
    const terms: Array<[string, number]> = [];
    let r = rhs;
    for (const [v, name, c] of parts) (v === null ? terms.push([name, c]) : (r -= c * Number(v)));
    if (terms.length > 0) eqs.push({ terms, rhs: r });
  };
  const f = summary.findings;
  const rules = Object.keys(f.byRule);
  sum([...rules.map((r): [unknown, string, number] => [f.byRule[r], `rule:${r}`, 1]), [f.total, 'total', -1]], 0);
  sum([...Object.keys(f.bySeverity).map((s): [unknown, string, number] => [f.bySeverity[s], `severity:${s}`, 1]), [f.total, 'total', -1]], 0);
  for (const r of rules) {
    const parts: Array<[unknown, string, number]> = [[null, `rest:${r}`, 1], [f.byRule[r], `rule:${r}`, -1]];
    for (const [name, t] of Object.entries<any>(summary.items)) if (t.findings[r] !== undefined) parts.push([t.findings[r], `${name}:${r}`, 1]);
    sum(parts, 0);
  }
  for (const line of overall) {
    const t = summary.items[line.item!];
    const parts: Array<[unknown, string, number]> = Object.keys(t.findings).filter((r) => INVALIDATING.has(r)).map((r) => [t.findings[r], `${line.item}:${r}`, 1]);
    if (parts.length > 0) sum([...parts, [line.invalid === SUPPRESSED_MARK ? null : line.invalid, `all:${line.item}:invalid`, -1]], 0);
  }
  for (const [id, res] of Object.entries<any>(summary.rules)) sum(Object.entries(res).map(([c, v]): [unknown, string, number] => [v, `cross:${id}:${c}`, 1]), summary.rows);
  return eqs;
}

describe('disclosure control of check outputs', () => {
  for (const [seed, n] of [[1, 150], [2, 90], [3, 240]] as const) {
    it(`delivery ${seed} (${n} rows): no count below 5 is written, and none suppressed can be recovered`, async () => {
      const r = await check(delivery(seed, n), cb);
      const out = join(dir, `d${seed}`);
      await writeCheckOutputs(r, out, { splitBy: 'team', disclosure: { minCell: 5, withhold: new Set(['head', 'id']), withholdIds: true } });
      const overall = await read(join(out, 'missingness.csv'));
      const byGroup = (await read(join(out, 'missingness-by-group.csv'))).filter((l) => l.group_item === 'team');
      const perTeam: Line[] = [];
      for (const folder of await readdir(join(out, 'by-team'))) {
        for (const l of await read(join(out, 'by-team', folder, 'missingness.csv'))) perTeam.push({ ...l, group: folder });
        // The per-team findings name no record id and no value of the confidential item.
        for (const f of await read(join(out, 'by-team', folder, 'findings.csv'))) {
          expect(f.id).toBe(WITHHELD_MARK);
          if (f.item === 'head') expect(f.value).toBe(WITHHELD_MARK);
          expect(f.message).not.toMatch(/bad name 7|HH-\d+/);
        }
      }
      // No count from 1 to 4 survives anywhere.
      for (const line of [...overall, ...byGroup, ...perTeam]) {
        for (const c of COUNT_COLUMNS) {
          const v = line[c]!;
          if (v === SUPPRESSED_MARK) continue;
          expect(Number(v) === 0 || Number(v) >= 5, `${c} = ${v} in ${JSON.stringify(line)}`).toBe(true);
        }
      }
      const suppressed = [...overall, ...byGroup].reduce((s, l) => s + Object.values(l).filter((v) => v === SUPPRESSED_MARK).length, 0);
      expect(suppressed).toBeGreaterThan(0);
      // The per-team files show what missingness-by-group shows for that team.
      for (const l of perTeam) {
        const same = byGroup.find((b) => b.group === l.group && b.item === l.item)!;
        for (const c of COUNT_COLUMNS) expect(l[c]).toBe(same[c]);
      }
      // summary.json: no count from 1 to 4 in a count position, the item tallies suppressed
      // exactly where missingness.csv has them, every null listed in its disclosure block.
      const summary = JSON.parse(await readFile(join(out, 'summary.json'), 'utf8')) as Record<string, any>;
      expect(summary.disclosure.minCell).toBe(5);
      const nulls: string[] = [];
      const walk = (x: unknown, path: string): void => {
        if (x === null) nulls.push(path);
        else if (typeof x === 'number') expect(x === 0 || x >= 5, `${path} = ${x}`).toBe(true);
        else if (typeof x === 'object') for (const [k, v] of Object.entries(x as object)) walk(v, path === '' ? k : `${path}.${k}`);
      };
      for (const [k, v] of Object.entries(summary)) if (!['rows', 'header', 'fences', 'quantileType', 'codebook', 'disclosure', 'file'].includes(k)) walk(v, k);
      expect(nulls.sort()).toEqual([...summary.disclosure.suppressed].sort());
      for (const line of overall) {
        const t = summary.items[line.item!];
        expect(t.valid === null, `${line.item} valid`).toBe(line.valid === SUPPRESSED_MARK);
        expect(t.invalid === null, `${line.item} invalid`).toBe(line.invalid === SUPPRESSED_MARK);
      }
      // The attacker, with every file at once, summary.json's counts of findings included.
      const eqs = equationsOf(r.summary.rows, overall, byGroup);
      eqs.push(...findingEquations(summary, overall));
      // A line's missing total follows from its rows, valid and invalid when those are shown: not a count kept back.
      const counted = (cell: string): boolean => !cell.endsWith(':missing') && !cell.startsWith('rest:');
      expect([...eliminated(eqs)].filter(counted)).toEqual([]);
      for (const [cell, [lo, hi]] of feasibleBounds(eqs)) if (counted(cell)) expect(hi - lo, `${cell} in [${lo}, ${hi}]`).toBeGreaterThanOrEqual(1);
    });
  }

  it('without disclosure options the files are as before (ids and values shown, nothing suppressed)', async () => {
    const r = await check(delivery(1, 150), cb);
    const out = join(dir, 'plain');
    await writeCheckOutputs(r, out, { splitBy: 'team' });
    expect(await readFile(join(out, 'summary.json'), 'utf8')).toBe(JSON.stringify(r.summary, null, 2) + '\n');
    const k1 = join(dir, 'plain-k1');
    await writeCheckOutputs(r, k1, { splitBy: 'team', disclosure: { minCell: 1, withhold: new Set(), withholdIds: false } });
    expect(await readFile(join(k1, 'summary.json'), 'utf8')).toBe(JSON.stringify(r.summary, null, 2) + '\n');
    const text = await readFile(join(out, 'missingness.csv'), 'utf8');
    expect(text).not.toContain(SUPPRESSED_MARK);
    const f = await read(join(out, 'by-team', '1', 'findings.csv'));
    expect(f.some((x) => /^HH-/.test(x.id!))).toBe(true);
  });
});
