/**
 * Field teams: the first screen's table, the split into one CheckResult per team, and the
 * pages of a split report. Expected counts are worked out by hand from the fixture's columns
 * (TEAM = 1,1,1,1,2,2,2,2,3,3,3,3; the findings at rows 4, 7 and 9): first principles.
 */
import { describe, it, expect, beforeAll } from 'vitest';
import { renderReport, renderSplitReport, splitCheck, splitLayout, teamRows, type SplitReport } from '../src/index.ts';
import { createCtx } from '../src/context.ts';
import { fixture, PAYLOADS } from './fixtures.ts';

let split: SplitReport;

beforeAll(async () => {
  split = await renderSplitReport(fixture(), { splitBy: 'team', mainFile: 'wave-3.html' });
});

describe('the table of field teams', () => {
  it('has one row per code of the group item with rows, errors, warnings and missing percent', () => {
    const rows = teamRows(createCtx(fixture()), 'team');
    expect(rows.map((r) => [r.name, r.rows, r.errors, r.warnings, r.info])).toEqual([
      ['North Reach [1]', 4, 1, 0, 0],
      ['Lowmarsh [2]', 4, 1, 0, 0],
      ['Kestrel Hills [3]', 4, 0, 0, 1],
    ]);
    // Team 2: one refusal among its 4 sex and 4 age cells = 1 / 8 = 12.5%; team 1: no missing cell.
    expect(rows[1]!.missingPercent).toBeCloseTo(12.5, 12);
    expect(rows[0]!.missingPercent).toBe(0);
    expect(rows[0]!.worst).toEqual([['age', 1]]);
    expect(rows[1]!.worst).toEqual([['trips', 1]]);
  });

  it('comes right after the verdict and links every team to its section', async () => {
    const html = await renderReport(fixture());
    const teams = html.slice(html.indexOf('<section id="teams"'), html.indexOf('</section>', html.indexOf('<section id="teams"')));
    expect(teams).toContain('<h2>By team: Field team</h2>');
    expect(teams).toContain('<a href="#team-team-1">North Reach [1]</a>');
    expect(html).toContain('<article class="card" id="team-team-1">');
    // The total row is the whole delivery: 12 rows, 2 errors.
    expect(teams).toMatch(/<tr class="total"><td>all rows<\/td><td class="num">12<\/td><td class="num">2<\/td>/);
  });

  it('refuses a --split-by that is not a group item, naming the group items', async () => {
    await expect(renderReport(fixture(), { groupBy: 'sex' })).rejects.toThrow(/--split-by takes a group item, got "sex"; the codebook's group items are team\./);
    expect(() => splitCheck(fixture(), 'age')).toThrow(expect.objectContaining({ code: 'CW_USAGE' }));
  });
});

describe('counts from a capped findings log', () => {
  it('marks a team’s counts as lower bounds when the log keeps only part of a rule', async () => {
    const input = fixture();
    // The log holds 1 not-a-number finding, the summary counts 4: the log was capped.
    input.check.summary.findings.byRule['not-a-number'] = 4;
    input.check.summary.findings.bySeverity.error = 5;
    const html = await renderReport(input);
    const teams = html.slice(html.indexOf('<section id="teams"'), html.indexOf('</section>', html.indexOf('<section id="teams"')));
    expect(teams).toContain('<span class="n-error">≥ 1</span>');
    expect(teams).toContain('≥: the findings log keeps only the first findings of not-a-number; a team’s counts are the logged ones.');
  });
});

describe('splitCheck', () => {
  it('gives each team only its rows, and the rows add up to the delivery', () => {
    const parts = splitCheck(fixture(), 'team');
    expect(parts.map((p) => [p.row.key, Array.from(p.rows)])).toEqual([
      ['1', [0, 1, 2, 3]],
      ['2', [4, 5, 6, 7]],
      ['3', [8, 9, 10, 11]],
    ]);
    expect(parts.reduce((a, p) => a + p.check.summary.rows, 0)).toBe(12);
    const age = parts[0]!.check.store.columns.age!;
    expect(age.kind === 'numeric' && Array.from(age.values)).toEqual([34, 41, 29, Number.NaN]);
    // Findings keep the delivery's row numbers and go to the team of their row.
    expect(parts.map((p) => p.check.findings.map((f) => f.row))).toEqual([[4], [7], [9]]);
    expect(parts.map((p) => p.check.summary.findings.bySeverity.error)).toEqual([1, 1, 0]);
    // Item tallies are check's group tallies of the team: team 2 has the one refusal of sex.
    expect(parts[1]!.check.summary.items.sex).toMatchObject({ valid: 3, invalid: 0, missing: { refused: 1 } });
  });
});

describe('renderSplitReport', () => {
  it('lays the files out beside the main report: a folder with an index and one page per team', () => {
    expect(split.files.map((f) => f.path)).toEqual(['wave-3.html', 'wave-3-team/team-1.html', 'wave-3-team/team-2.html', 'wave-3-team/team-3.html', 'wave-3-team/index.html']);
    expect(splitLayout('out.htm', 'field team', []).folder).toBe('out-field_team');
    const main = split.files[0]!.html;
    expect(main).toContain('<a href="wave-3-team/team-2.html">page</a>');
    expect(main).toContain('<a href="wave-3-team/index.html">index</a>');
    const index = split.files.at(-1)!.html;
    expect(index).toContain('<a href="team-1.html">North Reach [1]</a>');
    expect(index).toContain('<a href="../wave-3.html">Main report</a>');
  });

  it('writes on each team page only that team’s findings and summaries from its own rows', () => {
    const team1 = split.files[1]!.html;
    expect(team1).toContain('<h1>North Reach [1]</h1>');
    expect(team1).toContain('<a href="../wave-3.html">Main report</a>');
    expect(team1).toContain('id="rule-not-a-number"');
    expect(team1).not.toContain('id="rule-unbinned-value"');
    expect(team1).not.toContain('id="rule-outlier"');
    expect(team1).toContain('1 error to fix');
    // The work list: the one error of the team's rows, at delivery row 4.
    const toFix = team1.slice(team1.indexOf('<section id="to-fix"'), team1.indexOf('</section>', team1.indexOf('<section id="to-fix"')));
    expect(toFix).toContain('1 error to fix and 0 warnings to look at again');
    expect(toFix.match(/<tr><td class="num">(\d+)<\/td>/g)).toEqual(['<tr><td class="num">4</td>']);
    // age in team 1: valid 34, 41, 29 (row 4 is invalid); its median is the middle value, 34.
    expect(team1).toMatch(/<td>valid \(n\)<\/td><td class="num">3<\/td>[^]*?<td>median<\/td><td class="num">34<\/td>/);
    // Its missing percent sits beside the whole delivery's.
    expect(team1).toContain('<th scope="col" class="num">all rows</th>');
    const team3 = split.files[3]!.html;
    expect(team3).toContain('No errors');
    expect(team3).toContain('id="rule-outlier"');
    expect(team3).not.toContain('id="to-fix"');
    expect(team3).not.toContain('id="pairs"');
  });

  it('keeps markup in team labels and values as text on every page, and out of file names', async () => {
    const hostile = await renderSplitReport(fixture({ hostile: true }), { splitBy: 'team', mainFile: 'r.html' });
    for (const f of hostile.files) {
      expect(f.path).toMatch(/^[A-Za-z0-9._\/-]+$/);
      for (const p of PAYLOADS) expect(f.html, f.path).not.toContain(p);
    }
  });
});
