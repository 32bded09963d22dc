import { describe as suite, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtemp, readFile, readdir, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { cli } from './support/cli.ts';
import { referenceFile, surveyReference } from './reference/survey-design.ts';
import type { DescribeResult } from '../packages/describe/src/index.ts';
import { eliminated, feasibleBounds, type Equation } from '../packages/stats/test/lp-attacker.ts';

let dir = '';
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-design-'));
});
afterAll(() => rm(dir, { recursive: true, force: true }));

suite('describe with design options (CLI)', () => {
  // Oracle: R survey's apiclus1 with svydesign(id = ~dnum, weights = ~pw, fpc = ~fpc) and svyby
  // over stype (test/reference/survey-design.R).
  it('--by gives domain estimates as R svyby does; the JSON follows the contract', async () => {
    const r = await cli(['describe', referenceFile('survey-apiclus1.csv'), '--codebook', referenceFile('survey-apiclus1.codebook.json'), '--by', 'stype', '--json'], dir);
    expect(r.code).toBe(0);
    const out = JSON.parse(r.out) as DescribeResult;
    const ref = surveyReference.cases.find((c) => c.name.startsWith('apiclus1, one-stage clusters and population size'))!;
    const e = ref.estimates.find((x) => x.item === 'api00' && x.domain === 'H')!;
    const dom = out.items.api00!.domains!.H!;
    expect(Math.abs(dom.mean! - e.estimate)).toBeLessThan(1e-9 * e.estimate);
    expect(Math.abs((dom.se as number) - e.se)).toBeLessThan(1e-9 * e.se);
    expect(Object.keys(out.items.awards!.weighted!.percentSe!)).toEqual(['Yes', 'No']);
    expect(out.design).toMatchObject({ cluster: 'dnum', fpc: 'fpc', fpcAs: 'population count', clusters: 15 });
  });

  it('the text summary names the design and prints se, deff and the interval', async () => {
    const r = await cli(['describe', referenceFile('survey-nhanes-lonely.csv'), '--codebook', referenceFile('survey-nhanes.codebook.json')], dir);
    expect(r.out).toMatch(/design: strata stratum \(15\), clusters psu \(30\)/);
    expect(r.out).toMatch(/Stratum 75 has a single cluster/);
    expect(r.out).toMatch(/design: 1: [\d.]+%, se [\d.]+, deff [\d.]+, 95% CI/);
  });

  it('a design option naming an unknown item fails in one sentence with exit code 2', async () => {
    const r = await cli(['describe', referenceFile('survey-apistrat.csv'), '--codebook', referenceFile('survey-apistrat.codebook.json'), '--strata', 'school'], dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/--strata names "school", which is not an item of the codebook/);
  });
});

suite('check --min-cell and --show-values (CLI)', () => {
  async function delivery(): Promise<[string, string]> {
    const codebook = {
      codebook: 'disclosure-cli',
      version: '1',
      title: 'Invented household listing',
      items: [
        { name: 'hh', label: 'Household', role: 'id', type: 'text' },
        { name: 'team', label: 'Team', role: 'group', type: 'integer', level: 'nominal', codes: [{ code: 1, label: 'North' }, { code: 2, label: 'South' }] },
        { name: 'phone', label: 'Phone number', type: 'text', confidential: true, pattern: '[0-9]{7}' },
        { name: 'rooms', label: 'Rooms', type: 'integer', level: 'ratio', missing: [{ code: -9, kind: 'refused' }] },
      ],
    };
    const rows = ['hh,team,phone,rooms'];
    for (let i = 0; i < 60; i++) rows.push(`H${i},${1 + (i % 2)},${i % 13 === 0 ? 'ask' : '5550' + String(100 + i)},${i % 17 === 0 ? '-9' : i % 19 === 0 ? '' : 1 + (i % 4)}`);
    const cb = join(dir, 'disclosure.codebook.json');
    const data = join(dir, 'disclosure.csv');
    await writeFile(cb, JSON.stringify(codebook));
    await writeFile(data, rows.join('\n') + '\n');
    return [cb, data];
  }

  it('suppresses small counts in the missingness tables and team folders, withholds ids and confidential values', async () => {
    const [cb, data] = await delivery();
    const out = join(dir, 'out-k');
    const r = await cli(['check', data, '--codebook', cb, '--out', out, '--split-by', 'team', '--min-cell', '5'], dir);
    expect(r.code).toBe(1);
    const miss = await readFile(join(out, 'missingness.csv'), 'utf8');
    expect(miss).toContain('[s]');
    for (const team of await readdir(join(out, 'by-team'))) {
      const findings = await readFile(join(out, 'by-team', team, 'findings.csv'), 'utf8');
      expect(findings).not.toMatch(/\bH\d+\b|\bask\b/);
    }
    const shown = join(dir, 'out-show');
    await cli(['check', data, '--codebook', cb, '--out', shown, '--split-by', 'team', '--show-values'], dir);
    expect(await readFile(join(shown, 'by-team', '1', 'findings.csv'), 'utf8')).toMatch(/\bask\b/);
    // Without --min-cell the confidential item's values and the ids are withheld all the same.
    const plain = join(dir, 'out-plain');
    await cli(['check', data, '--codebook', cb, '--out', plain, '--split-by', 'team'], dir);
    const f = await readFile(join(plain, 'by-team', '1', 'findings.csv'), 'utf8');
    expect(f).not.toMatch(/\bask\b/);
    expect(f).not.toMatch(/\bH\d+\b/);
    expect(await readFile(join(plain, 'missingness.csv'), 'utf8')).not.toContain('[s]');
  });

  // First principles: the delivery above writes household H<i> on data row i + 1 (the header
  // not counted), so every finding's id gives its row, and the withheld id must leave the row.
  it('ids are withheld from the team folders by default, the row stays; --show-values shows them; the top-level log keeps them', async () => {
    const [cb, data] = await delivery();
    const plain = join(dir, 'ids-plain');
    await cli(['check', data, '--codebook', cb, '--out', plain, '--split-by', 'team'], dir);
    const top = (await readFile(join(plain, 'findings.csv'), 'utf8')).split('\r\n').slice(1).filter(Boolean);
    const withIds = top.filter((l) => /^\d+,H\d+,/.test(l));
    expect(withIds.length).toBeGreaterThan(0);
    for (const l of withIds) {
      const [row, id] = l.split(',');
      expect(id).toBe(`H${Number(row) - 1}`);
    }
    const teamLines: string[] = [];
    for (const team of ['1', '2']) teamLines.push(...(await readFile(join(plain, 'by-team', team, 'findings.csv'), 'utf8')).split('\r\n').slice(1).filter(Boolean));
    expect(teamLines.length).toBe(top.filter((l) => /^[1-9]/.test(l)).length);
    const rowsWithIds = new Set(withIds.map((l) => l.split(',')[0]));
    for (const l of teamLines) {
      const [row, id] = l.split(',');
      expect(id).toBe('[withheld]');
      expect(Number(row)).toBeGreaterThan(0);
      rowsWithIds.delete(row);
    }
    expect(rowsWithIds.size).toBe(0);
    const shown = join(dir, 'ids-show');
    await cli(['check', data, '--codebook', cb, '--out', shown, '--split-by', 'team', '--show-values'], dir);
    expect(await readFile(join(shown, 'by-team', '1', 'findings.csv'), 'utf8')).toMatch(/^\d+,H\d+,/m);
    // The data manager's own log is the same with and without --show-values.
    expect(await readFile(join(shown, 'findings.csv'), 'utf8')).toBe(await readFile(join(plain, 'findings.csv'), 'utf8'));
    expect(await readFile(join(shown, 'findings.jsonl'), 'utf8')).toBe(await readFile(join(plain, 'findings.jsonl'), 'utf8'));
  });

  it('the report and its team pages withhold ids by default and keep the row; --show-values shows them', async () => {
    const [cb, data] = await delivery();
    const out = join(dir, 'ids-report.html');
    await cli(['report', data, '--codebook', cb, '-o', out, '--split-by', 'team', '--quiet'], dir);
    const pages = [await readFile(out, 'utf8'), ...(await Promise.all((await readdir(join(dir, 'ids-report-team'))).map((f) => readFile(join(dir, 'ids-report-team', f), 'utf8'))))];
    for (const html of pages) expect(html).not.toMatch(/<code>H\d+<\/code>/);
    // A team page's rows to fix: the row number, then the withheld id.
    expect(pages.some((html) => /<td[^>]*>\d+<\/td><td[^>]*><code>\[withheld\]<\/code><\/td>/.test(html))).toBe(true);
    const shown = join(dir, 'ids-report-shown.html');
    await cli(['report', data, '--codebook', cb, '-o', shown, '--split-by', 'team', '--show-values', '--quiet'], dir);
    expect(await readFile(shown, 'utf8')).toMatch(/<code>H\d+<\/code>/);
  }, 120_000);

  it('--min-cell takes a whole number', async () => {
    const [cb, data] = await delivery();
    const r = await cli(['check', data, '--codebook', cb, '--out', join(dir, 'bad'), '--min-cell', 'few'], dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/--min-cell takes a whole number of at least 1, got "few"/);
  });
});

suite('report --min-cell and --show-values (CLI)', () => {
  // The invented demo delivery (examples/), its first 400 records, with income marked confidential.
  async function demo(): Promise<[string, string]> {
    const cbText = await readFile(new URL('../examples/household.codebook.json', import.meta.url), 'utf8');
    const cb = JSON.parse(cbText) as { $schema?: string; items: Array<Record<string, unknown>> };
    delete cb.$schema;
    for (const it of cb.items) if (it.name === 'income') it.confidential = true;
    const lines = (await readFile(new URL('../examples/demo-delivery.csv', import.meta.url), 'utf8')).split('\n').slice(0, 401);
    const cbPath = join(dir, 'demo.codebook.json');
    const dataPath = join(dir, 'demo400.csv');
    await writeFile(cbPath, JSON.stringify(cb));
    await writeFile(dataPath, lines.join('\n') + '\n');
    return [cbPath, dataPath];
  }

  it('suppresses small counts in the frequency tables, explains the marks, withholds income', async () => {
    const [cb, data] = await demo();
    const out = join(dir, 'report-k.html');
    const r = await cli(['report', data, '--codebook', cb, '-o', out, '--min-cell', '5', '--quiet'], dir);
    expect([0, 1]).toContain(r.code);
    const html = await readFile(out, 'utf8');
    expect(html).toContain('id="disclosure"');
    expect(html).toMatch(/Counts from 1 to 4 are suppressed/);
    expect(html).not.toContain('NaN');
    // Every count column of every frequency table: '-' (suppressed), 0 or at least 5.
    const tables = [...html.matchAll(/<caption class="note">Percent of [^<]* valid cells[^<]*<\/caption><thead>(.*?)<\/thead><tbody>(.*?)<\/tbody>/g)];
    expect(tables.length).toBeGreaterThan(5);
    let dashes = 0;
    for (const [, head, body] of tables) {
      const heads = [...head!.matchAll(/<th[^>]*>(.*?)<\/th>/g)].map((m) => m[1]);
      const at = heads.indexOf('count');
      for (const row of body!.split('</tr>').filter((x) => x.includes('<td'))) {
        const cell = [...row.matchAll(/<td[^>]*>(.*?)<\/td>/g)].map((m) => m[1]!)[at]!;
        if (cell === '-') dashes++;
        else expect(Number(cell.replace(/,/g, '')) === 0 || Number(cell.replace(/,/g, '')) >= 5, `count ${cell}`).toBe(true);
      }
    }
    expect(dashes).toBeGreaterThan(0);
    expect(html).toContain('confidential item: its values are withheld');
    const plain = join(dir, 'report-plain.html');
    await cli(['report', data, '--codebook', cb, '-o', plain, '--show-values', '--quiet'], dir);
    expect(await readFile(plain, 'utf8')).not.toContain('id="disclosure"');
  }, 120_000);

  // First principles: a team page's counts of a code add up, over the team pages, to the main
  // page's count, and a team's counts add up to its valid n; the attacker solves those
  // equations (HiGHS) for every suppressed cell.
  it('--min-cell with --split-by: the team pages share the main page\'s suppression, none can be recovered by adding them up', async () => {
    const [cb, data] = await demo();
    const out = join(dir, 'split-k.html');
    const r = await cli(['report', data, '--codebook', cb, '-o', out, '--split-by', 'team', '--min-cell', '5', '--quiet'], dir);
    expect([0, 1]).toContain(r.code);
    const mainHtml = await readFile(out, 'utf8');
    const main = frequencyTables(mainHtml);
    // The findings are not listed; the teams' counts of errors and warnings are '-', 0 or at least 5.
    expect(mainHtml).not.toContain('Rows of each rule');
    expect(mainHtml).toContain('the findings are not listed one by one');
    const teamTable = /<section id="teams".*?<\/section>/s.exec(mainHtml)![0];
    for (const row of teamTable.split('</tr>').filter((x) => x.includes('<td'))) {
      for (const cell of [...row.matchAll(/<td[^>]*>(.*?)<\/td>/g)].map((x) => x[1]!.replace(/<[^>]+>/g, '')).slice(2, 4)) {
        expect(cell === '-' || cell === '0' || Number(cell.replace(/[,≥ ]/g, '')) >= 5, `team table cell ${cell}`).toBe(true);
      }
    }
    const teamDir = join(dir, 'split-k-team');
    const teams = new Map<string, Map<string, FrequencyTable>>();
    for (const f of (await readdir(teamDir)).filter((x) => x !== 'index.html')) {
      const html = await readFile(join(teamDir, f), 'utf8');
      expect(html).toMatch(/Counts from 1 to 4 are suppressed/);
      teams.set(f, frequencyTables(html));
    }
    expect(teams.size).toBeGreaterThan(5);
    let attacked = 0;
    for (const [item, whole] of main) {
      const eqs: Equation[] = [];
      const cell = (v: number | null, name: string): { known: number } | { name: string } => (v === null ? { name } : { known: v });
      const add = (parts: Array<{ known: number } | { name: string }>, total: { known: number } | { name: string }): void => {
        let rhs = 0;
        const terms: Array<[string, number]> = [];
        for (const p of parts) 'known' in p ? (rhs -= p.known) : terms.push([p.name, 1]);
        'known' in total ? (rhs += total.known) : terms.push([total.name, -1]);
        if (terms.length > 0) eqs.push({ terms, rhs });
      };
      add(whole.counts.map((v, c) => cell(v, `main:${c}`)), cell(whole.n, 'main:n'));
      const byCode: Array<Array<{ known: number } | { name: string }>> = whole.counts.map(() => []);
      for (const [team, tables] of teams) {
        const t = tables.get(item);
        if (!t) continue;
        for (const v of t.counts) expect(v === null || v === 0 || v >= 5, `${team} ${item} count ${v}`).toBe(true);
        add(t.counts.map((v, c) => cell(v, `${team}:${c}`)), cell(t.n, `${team}:n`));
        t.counts.forEach((v, c) => byCode[c]!.push(cell(v, `${team}:${c}`)));
      }
      byCode.forEach((parts, c) => add(parts, cell(whole.counts[c]!, `main:${c}`)));
      if (eqs.length === 0) continue;
      attacked++;
      expect([...eliminated(eqs)], item).toEqual([]);
      for (const [name, [lo, hi]] of feasibleBounds(eqs)) expect(hi - lo, `${item} ${name} in [${lo}, ${hi}]`).toBeGreaterThanOrEqual(1);
    }
    expect(attacked).toBeGreaterThan(0);
  }, 240_000);
});

suite('describe --min-cell (CLI)', () => {
  // First principles: the frequencies of an item add up to its valid n, the weighted n and the
  // records left out of it to the valid n as well; counts below k must not be printed.
  it('suppresses counts below k in the JSON (null, listed in the disclosure block) and in the text', async () => {
    const lines = (await readFile(new URL('../examples/demo-delivery.csv', import.meta.url), 'utf8')).split('\n').slice(0, 401);
    const data = join(dir, 'describe400.csv');
    await writeFile(data, lines.join('\n') + '\n');
    const cb = fileURLToPath(new URL('../examples/household.codebook.json', import.meta.url));
    const r = await cli(['describe', data, '--codebook', cb, '--min-cell', '5', '--json'], dir);
    const out = JSON.parse(r.out) as DescribeResult & { disclosure: { minCell: number; suppressed: string[] } };
    expect(out.disclosure.minCell).toBe(5);
    expect(out.disclosure.suppressed.length).toBeGreaterThan(0);
    for (const [name, d] of Object.entries(out.items)) {
      const counts = [d.n, d.invalid, ...Object.values(d.missing), ...(d.frequencies ?? []).map((f) => f.count), ...(d.histogram?.counts ?? []), ...(d.weighted ? [d.weighted.n, d.weighted.excluded] : [])];
      for (const v of counts) expect(v === null || v === 0 || (v as number) >= 5, `${name}: ${v}`).toBe(true);
      const f = (d.frequencies ?? []).filter((x) => x.count !== null);
      // A shown frequency row never lets a single suppressed one be worked out from n.
      if (d.n !== null && d.frequencies && f.length === d.frequencies.length - 1) throw new Error(`${name}: one suppressed row`);
    }
    for (const path of out.disclosure.suppressed) {
      const v = path.split('.').reduce<unknown>((x, k) => (x as Record<string, unknown>)[k], out);
      expect(v, path).toBeNull();
    }
    const text = await cli(['describe', data, '--codebook', cb, '--min-cell', '5'], dir);
    expect(text.out).toMatch(/Disclosure control: counts from 1 to 4 are suppressed/);
    expect(text.out).not.toContain('NaN');
    const help = await cli(['describe', '--help'], dir);
    expect(help.out).toMatch(/--min-cell/);
  }, 120_000);
});

interface FrequencyTable {
  n: number | null;
  counts: Array<number | null>;
}

/** The frequency table of every item card of a report page: its valid n and each code's count (null: suppressed). */
function frequencyTables(html: string): Map<string, FrequencyTable> {
  const out = new Map<string, FrequencyTable>();
  const value = (t: string): number | null => (t === '-' ? null : Number(t.replace(/,/g, '')));
  for (const card of html.split('<article class="card" aria-labelledby="item-').slice(1)) {
    const name = /<code>([^<]+)<\/code><\/h3>/.exec(card)?.[1];
    const m = /<caption class="note">Percent of ([^ ]+) valid cells[^<]*<\/caption><thead>(.*?)<\/thead><tbody>(.*?)<\/tbody>/.exec(card.split('</article>')[0]!);
    if (!name || !m) continue;
    const heads = [...m[2]!.matchAll(/<th[^>]*>(.*?)<\/th>/g)].map((x) => x[1]);
    const at = heads.indexOf('count');
    const counts = m[3]!.split('</tr>').filter((x) => x.includes('<td')).map((row) => value([...row.matchAll(/<td[^>]*>(.*?)<\/td>/g)].map((x) => x[1]!)[at]!));
    out.set(name, { n: value(m[1]!), counts });
  }
  return out;
}
