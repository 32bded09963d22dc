/**
 * A fieldwork season end to end, in-process: `compare` of two deliveries (its JSON contract,
 * its drift values against R), `check --ledger` delivery after delivery (a file seen before is
 * not counted twice; the check's own outputs are unchanged by --ledger), `history`, and the
 * per-team change files of `--split-by`.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtemp, rm, writeFile, readFile, readdir } from 'node:fs/promises';
import { readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { cli } from './support/cli.ts';

interface Sample { region: number[]; income: number[] }
// R 4.2.2: chisq.test(rbind(previous, current), correct = FALSE) on the region counts,
// ks.test(previous income, current income), PSI from its definition; test/reference/drift.R.
const R = JSON.parse(readFileSync(resolve(import.meta.dirname, 'reference/drift.json'), 'utf8')).delivery as {
  previous: Sample;
  current: Sample;
  region: { statistic: number; df: number; p: number };
  income: { statistic: number; p: number; method: string };
  incomePsi: number;
  regionPsi: number;
};

const codebook = {
  codebook: 'season-test',
  version: '1',
  title: 'Season test: invented household panel of Tellmark',
  items: [
    { name: 'hh', label: 'Household', role: 'id', type: 'text' },
    { name: 'team', label: 'Field team', role: 'group', type: 'integer', level: 'nominal', codes: [{ code: 1, label: 'Team 1' }, { code: 2, label: 'Team 2' }] },
    { name: 'region', label: 'Region', type: 'integer', level: 'nominal', codes: [1, 2, 3, 4, 5].map((c) => ({ code: c, label: `Region ${c}` })) },
    { name: 'income', label: 'Monthly income', type: 'integer', level: 'ratio', range: { min: 0 }, missing: [{ code: -9, kind: 'refused' }] },
  ],
};

interface Row { hh: string; team: number; region: number; income: number | string }

/** Households of a delivery: ids from `first`, team by parity, region and income from R's sample. */
function rows(s: Sample, first: number): Row[] {
  return s.region.map((region, i) => ({ hh: `H${String(first + i).padStart(4, '0')}`, team: 1 + ((first + i) % 2), region, income: s.income[i]! }));
}

function csv(rs: Row[]): string {
  return 'hh,team,region,income\n' + rs.map((r) => `${r.hh},${r.team},${r.region},${r.income}`).join('\n') + '\n';
}

let dir = '';
let prev: Row[] = [];
let cur: Row[] = [];
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-season-'));
  await writeFile(join(dir, 'cb.json'), JSON.stringify(codebook));
  // Previous: ids 1 to 240; current: ids 21 to 280 (20 gone, 40 new, 220 in both).
  prev = rows(R.previous, 1);
  cur = rows(R.current, 21);
  await writeFile(join(dir, 'week1.csv'), csv(prev));
  await writeFile(join(dir, 'week2.csv'), csv(cur));
  // week 3: week 2 again with team 2's income refused more often, and one new region code.
  const w3 = cur.map((r, i) => ({ ...r, income: r.team === 2 && i % 3 === 0 ? -9 : r.income, region: i === 5 ? 5 : r.region }));
  await writeFile(join(dir, 'week3.csv'), csv(w3));
  await writeFile(join(dir, 'week2-copy.csv'), csv(cur));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('codeweir compare', () => {
  it('prints the JSON contract: records, items, groups', async () => {
    const r = await cli(['compare', 'week1.csv', 'week2.csv', '--codebook', 'cb.json', '--json', '--threads', '1'], dir);
    expect(r.code, r.err).toBe(0);
    const j = JSON.parse(r.out);
    // First principles: the ids in both files, and how many of them differ in a cell.
    const before = new Map(prev.map((x) => [x.hh, x]));
    const both = cur.filter((x) => before.has(x.hh));
    const differs = both.filter((x) => JSON.stringify({ ...before.get(x.hh)! }) !== JSON.stringify({ ...x }));
    expect(j.records).toMatchObject({ idItem: 'hh', added: cur.length - both.length, removed: prev.length - both.length, changed: differs.length, unchanged: both.length - differs.length });
    expect(j.records.byItem.income).toBe(both.filter((x) => before.get(x.hh)!.income !== x.income).length);
    expect(j.records.byItem.team).toBeUndefined();

    const region = j.items.region;
    expect(region.newCodes).toEqual([]);
    expect(region.goneCodes).toEqual([]);
    // R chisq.test(rbind(previous, current), correct = FALSE): statistic, parameter, p.value (code 5 unused on both sides is left out).
    expect(region.drift.test).toBe('chi-square');
    expect(region.drift.statistic).toBeCloseTo(R.region.statistic, 10);
    expect(region.drift.df).toBe(R.region.df);
    expect(region.drift.p).toBeCloseTo(R.region.p, 10);
    expect(region.drift.psi).toBeCloseTo(R.regionPsi, 10);
    expect(region.drift.flagged).toBe(false);

    const income = j.items.income;
    // R ks.test(previous, current): 240 x 260 pairs, so R (and codeweir) take the asymptotic p.
    expect(income.missing).toEqual({});
    expect(income.drift.test).toBe('kolmogorov-smirnov');
    expect(income.drift.df).toBeNull();
    expect(income.drift.method).toBe(R.income.method.startsWith('Asymptotic') ? 'asymptotic' : 'exact');
    expect(income.drift.n).toEqual({ previous: 240, current: 260 });
    expect(income.drift.statistic).toBeCloseTo(R.income.statistic, 12);
    // R's asymptotic series stops at a tolerance of 1e-6.
    expect(Math.abs(income.drift.p - R.income.p)).toBeLessThan(2e-6);
    // PSI computed in R from its definition over the previous delivery's deciles.
    expect(income.drift.psi).toBeCloseTo(R.incomePsi, 10);
    // p 0.005 < 0.01 and PSI 0.20 >= 0.1: flagged by the defaults.
    expect(income.drift.flagged).toBe(true);

    // Per team: missing percent of cells and cells with an error finding, before and after.
    expect(Object.keys(j.groups).sort()).toEqual(['1', '2']);
    expect(j.groups['1'].rows).toEqual({ previous: prev.filter((x) => x.team === 1).length, current: cur.filter((x) => x.team === 1).length });
    expect(j.groups['1'].missingPercent).toEqual({ previous: 0, current: 0 });
    expect(j.groups['1'].errors).toEqual({ previous: 0, current: 0 });
    expect(j.groups['2'].records).toEqual({
      added: cur.filter((x) => x.team === 2 && !before.has(x.hh)).length,
      removed: prev.filter((x) => x.team === 2 && !cur.some((y) => y.hh === x.hh)).length,
      changed: differs.filter((x) => x.team === 2).length,
    });
    expect(j.conventions.pThreshold).toBe(0.01);
  });

  it('thresholds are the user\'s: a looser p flags region', async () => {
    const r = await cli(['compare', 'week1.csv', 'week2.csv', '--codebook', 'cb.json', '--json', '--drift-p', '0.05', '--drift-psi', '0.05', '--threads', '1'], dir);
    const j = JSON.parse(r.out);
    // R: p = 0.0434 < 0.05 and PSI 0.066 >= 0.05.
    expect(j.items.region.drift.flagged).toBe(true);
    const bad = await cli(['compare', 'week1.csv', 'week2.csv', '--codebook', 'cb.json', '--drift-p', '2'], dir);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/--drift-p takes a probability between 0 and 1, got 2/);
  });

  it('--out writes compare.json and records.csv with the ids', async () => {
    const r = await cli(['compare', 'week1.csv', 'week2.csv', '--codebook', 'cb.json', '--out', 'cmp', '--threads', '1'], dir);
    expect(r.code, r.err).toBe(0);
    expect(r.out).toMatch(/Records by hh: 40 added, 20 removed/);
    const lines = (await readFile(join(dir, 'cmp', 'records.csv'), 'utf8')).replace(/^\ufeff/, '').trim().split('\r\n');
    expect(lines[0]).toBe('id,change,items,team');
    const removed = lines.filter((l) => l.split(',')[1] === 'removed').map((l) => l.split(',')[0]);
    expect(removed).toEqual(prev.slice(0, 20).map((x) => x.hh));
    const j = JSON.parse(await readFile(join(dir, 'cmp', 'compare.json'), 'utf8'));
    expect(j.records.added).toBe(lines.filter((l) => l.split(',')[1] === 'added').length);
  });

  it('a missing file: exit 2, one sentence', async () => {
    const r = await cli(['compare', 'nope.csv', 'week2.csv', '--codebook', 'cb.json'], dir);
    expect(r.code).toBe(2);
    expect(r.err.trim().split('\n')).toHaveLength(1);
    expect(r.err).toMatch(/nope\.csv/);
  });
});

describe('check --ledger, history, --split-by', () => {
  it('records deliveries, recognises a file seen before, and leaves the check\'s outputs unchanged', async () => {
    const plain = await cli(['check', 'week1.csv', '--codebook', 'cb.json', '--out', 'plain', '--json', '--threads', '1'], dir);
    const first = await cli(['check', 'week1.csv', '--codebook', 'cb.json', '--ledger', 'season.duckdb', '--out', 'led', '--json', '--threads', '1'], dir);
    expect(first.code, first.err).toBe(0);
    const j1 = JSON.parse(first.out);
    expect(j1.ledger).toMatchObject({ delivery: 1, duplicate: false, deliveries: 1, previous: null });
    // The check's own files are the same bytes with and without --ledger.
    for (const f of await readdir(join(dir, 'plain'))) {
      expect((await readFile(join(dir, 'led', f))).equals(await readFile(join(dir, 'plain', f))), f).toBe(true);
    }
    const { ledger: _l, ...summary } = j1;
    expect(summary).toEqual(JSON.parse(plain.out));

    const second = await cli(['check', 'week2.csv', '--codebook', 'cb.json', '--ledger', 'season.duckdb', '--threads', '1'], dir);
    expect(second.code, second.err).toBe(0);
    expect(second.out).toMatch(/recorded as delivery 2 of 2; since delivery 1 \(week1\.csv\): 40 records added, 20 removed/);

    const again = await cli(['check', 'week2-copy.csv', '--codebook', 'cb.json', '--ledger', 'season.duckdb', '--json', '--threads', '1'], dir);
    expect(again.code, again.err).toBe(0);
    // Same bytes under another name: the same content hash, not counted again.
    expect(JSON.parse(again.out).ledger).toMatchObject({ delivery: 2, duplicate: true, deliveries: 2 });

    const third = await cli(['check', 'week3.csv', '--codebook', 'cb.json', '--ledger', 'season.duckdb', '--out', 'w3', '--split-by', 'team', '--json', '--threads', '1'], dir);
    expect(third.code, third.err).toBe(0);
    const j3 = JSON.parse(third.out).ledger;
    expect(j3).toMatchObject({ delivery: 3, previous: 2, newCodes: { region: ['5'] } });
    // First principles: week 3 changed the income of every third team-2 household and one region.
    const incomeRows = cur.map((r, i) => (r.team === 2 && i % 3 === 0 ? i : -1)).filter((i) => i >= 0);
    expect(j3.records.byItem).toEqual({ region: 1, income: incomeRows.length });
    expect(j3.records.changed).toBe(new Set([...incomeRows, 5]).size);

    const team2 = JSON.parse(await readFile(join(dir, 'w3', 'by-team', '2', 'changes.json'), 'utf8'));
    expect(team2.records.changed).toBe(new Set([...incomeRows, ...(cur[5]!.team === 2 ? [5] : [])]).size);
    expect(team2.trend.map((p: { delivery: number }) => p.delivery)).toEqual([1, 2, 3]);
    expect(team2.items.income.missing.refused).toEqual({ previous: 0, current: incomeRows.length });
    const team2csv = (await readFile(join(dir, 'w3', 'by-team', '2', 'changes.csv'), 'utf8')).trim().split('\r\n');
    expect(team2csv.length - 1).toBe(team2.records.changed);

    const h = await cli(['history', '--ledger', 'season.duckdb', '--item', 'income', '--group', 'team', '--json'], dir);
    expect(h.code, h.err).toBe(0);
    const hj = JSON.parse(h.out);
    expect(hj.deliveries.map((d: { file: string }) => d.file)).toEqual(['week1.csv', 'week2.csv', 'week3.csv']);
    expect(hj.schemaVersion).toBe(2);
    expect(hj.groups['2']).toHaveLength(3);
    // First principles: week 3's refusals are all team 2's; 4 cells a row.
    const refused3 = cur.filter((r, i) => r.team === 2 && i % 3 === 0).length;
    expect(hj.groups['2'].map((p: { missingPercent: number }) => p.missingPercent)).toEqual([0, 0, (100 * refused3) / (cur.filter((x) => x.team === 2).length * 4)]);
    expect(hj.groups['1'].map((p: { missingPercent: number }) => p.missingPercent)).toEqual([0, 0, 0]);
    expect(hj.item.points.map((p: { missing: { refused?: number } }) => p.missing.refused ?? 0)).toEqual([0, 0, refused3]);
    expect(hj.item.points[0].drift).toBeNull();
    expect(hj.item.points[1].drift.test).toBe('kolmogorov-smirnov');
    const human = await cli(['history', '--ledger', 'season.duckdb'], dir);
    expect(human.out).toMatch(/3 deliveries \(ledger schema 2\)/);
  });

  it('check --previous: the same comparison without a ledger, and each team folder gets its changes', async () => {
    const r = await cli(['check', 'week2.csv', '--codebook', 'cb.json', '--previous', 'week1.csv', '--out', 'prev', '--split-by', 'team', '--json', '--threads', '1'], dir);
    expect(r.code, r.err).toBe(0);
    const j = JSON.parse(r.out);
    const c = JSON.parse((await cli(['compare', 'week1.csv', 'week2.csv', '--codebook', 'cb.json', '--group', 'team', '--json', '--threads', '1'], dir)).out);
    expect(j.previous.records).toEqual(c.records);
    expect(j.previous.driftFlagged).toEqual(['income']);
    for (const team of ['1', '2']) {
      const t = JSON.parse(await readFile(join(dir, 'prev', 'by-team', team, 'changes.json'), 'utf8'));
      expect(t.records).toEqual(c.groups[team].records);
      expect(t.trend).toHaveLength(2);
    }
    const both = await cli(['check', 'week2.csv', '--codebook', 'cb.json', '--previous', 'week1.csv', '--ledger', 'x.duckdb'], dir);
    expect(both.code).toBe(2);
    expect(both.err).toMatch(/not both/);
  });

  it('a ledger named in the project file codeweir.json beside the codebook', async () => {
    const { mkdir } = await import('node:fs/promises');
    await mkdir(join(dir, 'project'), { recursive: true });
    await writeFile(join(dir, 'project', 'cb.json'), JSON.stringify(codebook));
    await writeFile(join(dir, 'project', 'codeweir.json'), JSON.stringify({ ledger: 'ledger/season.duckdb' }));
    const r = await cli(['check', 'week1.csv', '--codebook', 'project/cb.json', '--json', '--threads', '1'], dir);
    expect(r.code, r.err).toBe(0);
    expect(JSON.parse(r.out).ledger).toMatchObject({ delivery: 1, duplicate: false });
    // The path is taken from the project file's folder.
    const h = await cli(['history', '--ledger', 'project/ledger/season.duckdb', '--json'], dir);
    expect(JSON.parse(h.out).deliveries.map((d: { file: string }) => d.file)).toEqual(['week1.csv']);
    await writeFile(join(dir, 'project', 'codeweir.json'), JSON.stringify({ ledgr: 'x.duckdb' }));
    const bad = await cli(['check', 'week1.csv', '--codebook', 'project/cb.json', '--threads', '1'], dir);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/codeweir\.json has a field "ledgr"; the project file knows only "ledger"/);
    expect(bad.err.trim().split('\n')).toHaveLength(1);
  });

  it('history of a file that is not there, or not a ledger: exit 2, one sentence', async () => {
    const r = await cli(['history', '--ledger', 'missing.duckdb'], dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/there is no ledger at .*missing\.duckdb/);
    const notLedger = await cli(['history', '--ledger', 'week1.csv'], dir);
    expect(notLedger.code).toBe(2);
    expect(notLedger.err).toMatch(/not a codeweir ledger/);
    expect(notLedger.err.trim().split('\n')).toHaveLength(1);
  });
});

describe('report --previous / --ledger', () => {
  it('adds "Since the previous delivery" with the record counts and per-team small multiples, self-contained', async () => {
    const r = await cli(['report', 'week2.csv', '--codebook', 'cb.json', '-o', 'rep.html', '--previous', 'week1.csv', '--threads', '1'], dir);
    expect(r.code, r.err).toBe(0);
    const html = await readFile(join(dir, 'rep.html'), 'utf8');
    const section = html.slice(html.indexOf('<section id="season"'), html.indexOf('</section>', html.indexOf('<section id="season"')));
    expect(section).toMatch(/Since the previous delivery/);
    // First principles as in compare: 40 ids new, 20 gone.
    expect(section).toMatch(/<strong>40<\/strong> added, <strong>20<\/strong> removed/);
    // income drifts beyond the default thresholds (R: p 0.005, PSI 0.20); it is listed and flagged.
    expect(section).toMatch(/<code>income<\/code>[^]*flagged/);
    // Two trend charts of small multiples, inline SVG, one panel per team code.
    const svgs = section.match(/<svg[^]*?<\/svg>/g) ?? [];
    expect(svgs).toHaveLength(2);
    for (const svg of svgs) expect(svg).not.toMatch(/<image|href="http/);
    expect(html).not.toMatch(/<script/i);
    const plain = await cli(['report', 'week2.csv', '--codebook', 'cb.json', '-o', 'plain.html', '--threads', '1'], dir);
    expect(plain.code, plain.err).toBe(0);
    expect(await readFile(join(dir, 'plain.html'), 'utf8')).not.toMatch(/id="season"/);
  });

  it('with --split-by each team page shows its own records and trend', async () => {
    const r = await cli(['report', 'week2.csv', '--codebook', 'cb.json', '-o', 'split/rep.html', '--previous', 'week1.csv', '--split-by', 'team', '--threads', '1'], dir);
    expect(r.code, r.err).toBe(0);
    const c = JSON.parse((await cli(['compare', 'week1.csv', 'week2.csv', '--codebook', 'cb.json', '--group', 'team', '--json', '--threads', '1'], dir)).out);
    const page = await readFile(join(dir, 'split', 'rep-team', 'team-2.html'), 'utf8');
    const g = c.groups['2'].records;
    expect(page).toContain(`Records of this team: <strong>${g.added}</strong> added, <strong>${g.removed}</strong> removed, <strong>${g.changed}</strong> changed.`);
    expect(page.match(/<section id="season"[^]*?<\/section>/)![0]).toMatch(/<svg/);
  });

  it('with a ledger: the delivery recorded before this one, the trend over the season', async () => {
    // The ledger of the test above holds weeks 1 to 3; week 3 is in it, so week 2 is its previous.
    const r = await cli(['report', 'week3.csv', '--codebook', 'cb.json', '-o', 'rep3.html', '--ledger', 'season.duckdb', '--threads', '1'], dir);
    expect(r.code, r.err).toBe(0);
    const html = await readFile(join(dir, 'rep3.html'), 'utf8');
    expect(html).toMatch(/Compared with delivery 2, <code>week2\.csv<\/code>/);
    expect(html).toMatch(/Deliveries: 1: week1\.csv; 2: week2\.csv; 3: week3\.csv\./);
    const none = await cli(['report', 'week1.csv', '--codebook', 'cb.json', '-o', 'rep1.html', '--ledger', 'season.duckdb', '--threads', '1'], dir);
    expect(none.code).toBe(2);
    expect(none.err).toMatch(/holds no delivery before this one/);
  });
});
