import { describe, it, expect, beforeAll } from 'vitest';
import { renderReport, escapeHtml, CONTENT_SECURITY_POLICY } from '../src/index.ts';
import { fixture, PAYLOADS, WORDS } from './fixtures.ts';

let plain: string;
let hostile: string;
let accepted: string;

beforeAll(async () => {
  [plain, hostile, accepted] = await Promise.all([
    renderReport(fixture()),
    renderReport(fixture({ hostile: true })),
    renderReport(fixture({ accepted: true })),
  ]);
});

/** The HTML of one item's index entry and card (a details element), found by the item name. */
function card(html: string, name: string): string {
  const cards = html.split('<details class="entry" id="item-').slice(1);
  const found = cards.find((c) => c.includes(`<h3 id="item-${c.split('"')[0]}-h"><code>${escapeHtml(name)}</code></h3>`));
  if (!found) throw new Error(`no card for ${name}`);
  return found.split('</section>')[0]!.split('<div class="row plain-row"')[0]!;
}

/**
 * Every attribute name of every tag. Attribute values in the report are always double-quoted
 * (its own markup and vega's), so a value cannot hide a name from this scan.
 */
function attributeNames(html: string): string[] {
  const names: string[] = [];
  for (const tag of html.matchAll(/<[a-zA-Z][^\s>\/]*((?:\s+[^\s=\/>]+(?:="[^"]*")?)*)\s*\/?>/g)) {
    for (const a of tag[1]!.matchAll(/\s+([^\s=\/>]+)(?:="[^"]*")?/g)) names.push(a[1]!);
  }
  return names;
}

/** Charts in a piece of HTML: each SVG's title text. */
function chartTitles(html: string): string[] {
  return [...html.matchAll(/<svg id="chart-\d+"[^>]*>(?:<title id="[^"]+">([^<]*)<\/title>)/g)].map((m) => m[1]!);
}

/** Category labels of the first chart's y axis in `html`, top to bottom (vega's document order). */
function axisLabels(html: string): string[] {
  const start = html.indexOf('<svg id="chart-');
  const svg = html.slice(start, html.indexOf('</svg>', start) + 6);
  const yAxis = svg.slice(svg.indexOf('aria-label="Y-axis'));
  const labels = yAxis.slice(yAxis.indexOf('role-axis-label'));
  return [...labels.slice(0, labels.indexOf('</g>')).matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]!);
}

describe('page shell', () => {
  it('declares a CSP that forbids scripts and every network fetch', () => {
    expect(plain).toContain(`<meta http-equiv="Content-Security-Policy" content="${CONTENT_SECURITY_POLICY}">`);
    // First principles of CSP: default-src 'none' covers every fetch directive not named;
    // the named ones only allow inline style and data: images, and script-src is 'none'.
    expect(CONTENT_SECURITY_POLICY).toMatch(/^default-src 'none';/);
    expect(CONTENT_SECURITY_POLICY).toContain("script-src 'none'");
    expect(CONTENT_SECURITY_POLICY).not.toMatch(/https?:|\*/);
  });

  it('has no script element and no event-handler attribute at all', () => {
    expect(attributeNames('<p class="a">x</p><img src="y" onerror="z">')).toEqual(['class', 'src', 'onerror']);
    for (const html of [plain, hostile, accepted]) {
      expect(/<script/i.test(html)).toBe(false);
      expect(attributeNames(html).filter((n) => /^on/i.test(n))).toEqual([]);
    }
  });

  it('references no http(s) resource: the only URIs are the SVG and XLink namespace names', () => {
    for (const html of [plain, hostile]) {
      const uris = [...html.matchAll(/https?:\/\/[^\s"'<>)]+/g)].map((m) => m[0]);
      expect(uris.length).toBeGreaterThan(0);
      expect(new Set(uris)).toEqual(new Set(['http://www.w3.org/2000/svg', 'http://www.w3.org/1999/xlink']));
      // Each occurrence is an xmlns attribute value, never a src, href or url().
      const inXmlns = [...html.matchAll(/xmlns(?::xlink)?="https?:\/\/[^"]+"/g)].length;
      expect(inXmlns).toBe(uris.length);
    }
    // Links and paint references stay inside the page: fragment identifiers only.
    expect(/\b(?:src|href)="(?!#)/.test(plain)).toBe(false);
    expect(/url\((?!#)/.test(plain)).toBe(false);
  });

  it('has print styles', () => {
    expect(/@media print \{[^]*break-inside: avoid/.test(plain)).toBe(true);
  });
});

describe('sections', () => {
  it('has every section for a delivery with findings, rules, groups and pairs', () => {
    for (const id of ['teams', 'header', 'findings', 'rules', 'field-teams', 'missingness', 'items', 'pairs', 'glossary']) {
      expect(plain).toContain(`id="${id}"`);
      expect(plain).toContain(`<a href="#${id}">`);
    }
    expect(plain).toContain('id="verdict"');
    // The first screen comes first: the verdict, then the table of field teams.
    expect(plain.indexOf('id="verdict"')).toBeLessThan(plain.indexOf('id="teams"'));
    expect(plain.indexOf('id="teams"')).toBeLessThan(plain.indexOf('id="findings"'));
  });

  it('states the verdict with codebook id, version, rows and the error and warning counts', () => {
    const verdict = plain.slice(plain.indexOf('id="verdict"'), plain.indexOf('</section>', plain.indexOf('id="verdict"')));
    expect(verdict).toContain('class="block verdict rejected"');
    expect(verdict).toContain('<div class="badge">Not accepted</div>');
    expect(verdict).toContain('2 errors and 0 warnings in 12 rows.');
    expect(verdict).toContain('<code>hollow-reach-panel</code>');
    expect(verdict).toContain('0.3.1');
    expect(accepted).toContain('<div class="badge">Accepted</div>');
    expect(accepted).toContain('No error findings in 12 rows; 0 warnings to review.');
  });

  it('gives the reason: the rules and items behind the errors, and cross-item rules under their own severity', async () => {
    const verdict = plain.slice(plain.indexOf('id="verdict"'), plain.indexOf('</section>', plain.indexOf('id="verdict"')));
    // The fixture's two errors: one not-a-number in age, one unbinned-value in trips.
    expect(verdict).toContain('Rejected for: <code>not-a-number</code> 1 (<code>age</code> 1); <code>unbinned-value</code> 1 (<code>trips</code> 1).');
    const input = fixture();
    // head-age is a warning rule of the codebook: its two failures are warnings to review.
    input.check.summary.rules['head-age']!.failed = 2;
    input.check.summary.findings.byRule['rule-failed'] = 2;
    input.check.summary.findings.bySeverity.warning = 2;
    for (const row of [2, 5]) input.check.findings.push({ row, id: `H-${row}`, item: 'head-age', value: '', rule: 'rule-failed', severity: 'warning', message: 'x', groups: { team: row < 5 ? '1' : '2' } });
    const html = await renderReport(input);
    expect(html).toContain('To review: <code>rule-failed</code> 2 (<span class="nobr">rule <code>head-age</code></span> 2).');
  });

  it('lists header problems and the first rows of each rule with their suggestion', () => {
    expect(plain).toContain('Columns the codebook does not know: <code>interviewer_note</code>');
    expect(plain).toContain('id="rule-not-a-number"');
    expect(plain).toContain(escapeHtml(WORDS.plain.findingMessage));
    const unbinned = plain.slice(plain.indexOf('id="rule-unbinned-value"'));
    expect(unbinned.slice(0, unbinned.indexOf('</table>'))).toMatch(/<th scope="col">suggestion<\/th>[^]*<code>3<\/code>/);
  });

  it('caps the findings shown per rule and says how many there are', async () => {
    const input = fixture();
    const extra = Array.from({ length: 8 }, (_, i) => ({ ...input.check.findings[0]!, row: 20 + i }));
    input.check.findings.push(...extra);
    input.check.summary.findings.byRule['not-a-number'] = 9;
    const html = await renderReport(input, { findingsPerRule: 3 });
    const section = html.slice(html.indexOf('id="rule-not-a-number"'));
    expect(section).toContain('The first 3 of 9.');
    const rows = section.slice(0, section.indexOf('</table>')).match(/<tr>/g) ?? [];
    expect(rows.length).toBe(1 + 3); // header row + three findings
  });

  it('shows cross-item rules with passed, failed and undetermined counts', () => {
    const rules = plain.slice(plain.indexOf('id="rules"'), plain.indexOf('</section>', plain.indexOf('id="rules"')));
    expect(rules).toContain('<code>head-age</code>');
    expect(rules).toContain(escapeHtml(WORDS.plain.ruleMessage));
    expect(rules).toMatch(/<td class="num">10<\/td><td class="num">0<\/td><td class="num">2<\/td>/);
  });

  it('draws missingness as a heat map with counts in hover titles and in a table', () => {
    const m = plain.slice(plain.indexOf('id="missingness"'), plain.indexOf('id="items"'));
    expect(chartTitles(m)).toEqual(['Percent missing by team (Field team), valid skips not counted']);
    // Team 2: one refusal among 4 sex cells = 25% (first principles: 1 / 4).
    expect(m).toContain('<title>sex in Lowmarsh [2]: 25.0% (1 of 4 cells)</title>');
    expect(m).toMatch(/<details class="alt"><summary>Table of this chart<\/summary>[^]*25\.0% <span class="note">\(1\/4\)<\/span>/);
    // Free text (remarks) is in the table by kind but not in the picture.
    expect(m).toContain('<code title="Remarks">remarks</code>');
    expect(m).not.toContain('<title>remarks in');
  });
});

describe('item cards', () => {
  it('gives each item its level, label and statistics, and links to the glossary for what its level withholds', () => {
    const age = card(plain, 'age');
    expect(age).toContain('<span class="tag level">ratio</span>');
    expect(age).toContain('<span class="label">Age</span>');
    expect(age).toContain('<span class="tag">unit: years</span>');
    expect(age).toContain(escapeHtml(WORDS.plain.question));
    expect(age).toMatch(/<td>median<\/td><td class="num">40<\/td>/);
    expect(age).toMatch(/<td>inner fences \(1\.5 x IQR\)<\/td><td class="num">19\.25 to 61\.25<\/td>/);
    expect(age).toContain('<a href="#withheld-ratio">glossary</a>');
    // The one ratio item's withheld list is its level's list: it is in the glossary, not the card.
    expect(age).not.toContain('<strong>frequencies</strong>');
    const glossary = plain.slice(plain.indexOf('id="glossary"'));
    expect(glossary).toContain('<h4 id="withheld-ratio">ratio items</h4>');
    expect(glossary).toContain('<li><strong>frequencies</strong>: a frequency table of a ratio item is given as a histogram</li>');
    // A convention of the item that differs from the report-wide one stays on the card.
    expect(age).toContain('<li><strong>quantileType</strong>: Hyndman-Fan type 7 sample quantiles</li>');
    expect(age).not.toContain(`<strong>sd</strong>`);
    expect(glossary).toContain(`<li><strong>sd</strong>: ${escapeHtml(WORDS.plain.convention)}</li>`);
  });

  it('says once in the glossary what every item of a level withholds; a card names only its own', () => {
    const glossary = plain.slice(plain.indexOf('id="glossary"'));
    // team and sex are both nominal and both withhold the mean for the same reason: said once.
    expect(glossary).toContain(`<li><strong>mean</strong>: ${escapeHtml(WORDS.plain.reason)}</li>`);
    expect(card(plain, 'team')).not.toContain('<strong>mean</strong>');
    expect(card(plain, 'sex')).not.toContain('<strong>mean</strong>');
    // Both withhold the median for the same reason as well: one line for the level.
    expect(glossary).toContain('<li><strong>median</strong>: nominal categories have no order</li>');
    expect(plain.split('nominal categories have no order').length - 1).toBe(1);
    expect(glossary).toContain('<li><strong>quantiles</strong>: Hyndman-Fan type 7</li>');
    // Every in-page link of the report has its target.
    const ids = new Set([...plain.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]));
    const dangling = [...plain.matchAll(/href="#([^"]+)"/g)].map((m) => m[1]).filter((id) => !ids.has(id));
    expect(dangling).toEqual([]);
  });

  it('collapses every card into a row of the item index with level, n, missing, invalid and a small chart', () => {
    const index = plain.slice(plain.indexOf('<div class="index items">'), plain.indexOf('id="pairs"'));
    // Every codebook item is a row, in codebook order; the id has no card.
    const names = [...index.matchAll(/<span class="mark"><\/span><span><code>([^<]+)<\/code>/g)].map((m) => m[1]);
    expect(names).toEqual(['hh_id', 'team', 'sex', 'edu', 'age', 'visit_date', 'trips', 'remarks']);
    expect(index).not.toContain('<details class="entry" id="item-1" open');
    // age: 11 valid, 0 missing, 1 invalid (the fixture's tallies).
    expect(card(plain, 'age')).toMatch(/<span class="lvl">ratio<\/span><span class="num">11<\/span><span class="num">0<\/span><span class="num n-error">1<\/span><span><svg class="spark"/);
    // The small histogram of age has one bar per bin of its histogram (7 bins).
    const spark = card(plain, 'age').match(/<svg class="spark"[^]*?<\/svg>/)![0];
    expect(spark.match(/<rect /g)?.length).toBe(7);
  });

  it('draws one bar chart for nominal and ordinal items, histogram and box plot for interval and ratio, none for text', () => {
    expect(chartTitles(card(plain, 'sex'))).toEqual(['sex (Sex): valid cells by category']);
    expect(chartTitles(card(plain, 'edu'))).toEqual(['edu (Schooling): valid cells by category']);
    expect(chartTitles(card(plain, 'trips'))).toEqual(['trips (Market trips): valid cells by category']);
    expect(chartTitles(card(plain, 'age'))).toEqual(['age (Age): distribution', 'age (Age): box plot']);
    expect(chartTitles(card(plain, 'visit_date'))).toEqual(['visit_date (Date of visit): distribution', 'visit_date (Date of visit): box plot']);
    expect(chartTitles(card(plain, 'remarks'))).toEqual([]);
    expect(card(plain, 'age')).toContain('Bins: Freedman-Diaconis, 7 bins of width 10;');
  });

  it('orders ordinal bars by the scale and nominal bars by code, or by frequency when asked', async () => {
    expect(axisLabels(card(plain, 'edu')).slice(0, 4)).toEqual(['None', 'Primary', 'Secondary', 'Tertiary']);
    // The fixture lists Male (code 2) first; code order puts Female (code 1) first.
    expect(axisLabels(card(plain, 'sex')).slice(0, 2)).toEqual(['Female', 'Male']);
    expect(card(plain, 'sex')).toContain('Bars in code order (the codebook order)');
    const byFrequency = await renderReport(fixture(), { nominalOrder: 'frequency' });
    expect(axisLabels(card(byFrequency, 'sex')).slice(0, 2)).toEqual(['Male', 'Female']);
    expect(card(byFrequency, 'sex')).toContain('Bars by frequency, most frequent first');
    // Ordinal items keep the scale order whatever the nominal order option says.
    expect(axisLabels(card(byFrequency, 'edu')).slice(0, 4)).toEqual(['None', 'Primary', 'Secondary', 'Tertiary']);
  });

  it('shows ordinal medians as categories and date statistics as dates', () => {
    const edu = card(plain, 'edu');
    expect(edu).toMatch(/<td>median<\/td><td class="num">Secondary <span class="note">\[3\]<\/span><\/td>/);
    expect(edu).toMatch(/<td>IQR \(scale steps\)<\/td><td class="num">1<\/td>/);
    const date = card(plain, 'visit_date');
    // 20514 days after 1970-01-01 is 2026-03-02 (first principles: 20514 x 86,400,000 ms as an ISO date).
    expect(new Date(20514 * 86_400_000).toISOString().slice(0, 10)).toBe('2026-03-02');
    expect(date).toMatch(/<td>minimum<\/td><td class="num">2026-03-02<\/td>/);
    expect(date).toMatch(/<td>range<\/td><td class="num">10 days<\/td>/);
  });

  it('marks the extreme value in the box plot apart from the box', () => {
    const age = card(plain, 'age');
    const box = age.slice(age.indexOf('age (Age): box plot'));
    // 91 lies beyond the outer fence 77: one extreme mark, no outlier mark.
    expect(box.match(/aria-label="extreme"/g)?.length).toBe(1);
    expect(box).not.toContain('aria-label="outlier"');
    expect(box).toContain('whiskers to the most extreme values inside the inner fences');
  });
});

describe('pairs', () => {
  it('shows a contingency table with cell, row and column percents and a conditional bar chart', () => {
    const pairs = plain.slice(plain.indexOf('id="pair-1"'));
    const first = pairs.slice(0, pairs.indexOf('</article>'));
    expect(chartTitles(first)).toEqual(['edu (Schooling) within each category of sex (Sex)']);
    // Female x Secondary: 2 of the 5 Female rows = 40% (first principles: 2 / 5).
    expect(first).toContain('2<span class="sub">40.0%</span>');
    expect(first).toContain('<summary>Column percents and percents of the table</summary>');
    expect(first).toContain('All 8 expected counts are below 5');
  });

  it('draws a scatter plot with the bivariate outlier marked, and side-by-side box plots', () => {
    const second = plain.slice(plain.indexOf('id="pair-2"'), plain.indexOf('id="pair-3"'));
    expect(chartTitles(second)).toEqual(['visit_date (Date of visit) against age (Age)']);
    expect(second).toContain('1 bivariate outliers drawn as diamonds');
    const third = plain.slice(plain.indexOf('id="pair-3"'));
    expect(chartTitles(third.slice(0, third.indexOf('</article>')))).toEqual(['age (Age) by team (Field team)']);
  });

  it('lists every pair in the overview and draws cards only up to the cap', async () => {
    const html = await renderReport(fixture(), { maxPairCards: 1 });
    expect(html).toContain('3 pairs; n counts rows where both items are valid. Open a row for its chart and tables. The first 1 have cards.');
    expect(html).toContain('<summary>2 more pairs, without charts</summary>');
    expect(html).toContain('id="pair-1"');
    expect(html).not.toContain('id="pair-2"');
  });
});

describe('escaping', () => {
  it('keeps every string from the codebook and the delivery as text', () => {
    const w = WORDS.hostile;
    const inserted = [w.title, w.teamLabel(0), w.teamLabel(1), w.sexLabel, ...w.eduLabels, w.question, w.unit, w.ruleMessage, w.findingValue, w.findingMessage, w.findingId, w.reason, w.convention, w.unexpectedColumn, w.ageName];
    for (const s of inserted) expect(hostile).toContain(escapeHtml(s));
    for (const p of PAYLOADS) expect(hostile).not.toContain(p);
    expect(/<img\b/i.test(hostile)).toBe(false);
    expect(/<svg[^>]*\sonload/i.test(hostile)).toBe(false);
  });

  it('escapes strings inside the SVG that vega writes (axis labels, hover titles)', () => {
    const svgs = [...hostile.matchAll(/<svg id="chart-\d+"[^]*?<\/svg>/g)].map((m) => m[0]);
    expect(svgs.length).toBeGreaterThan(5);
    const all = svgs.join('');
    // vega escapes & < > in text and also " in attributes.
    expect(all).toContain('&lt;script&gt;window.__pwned=1&lt;/script&gt;');
    expect(all).toContain('&lt;img src=x onerror=&quot;window.__pwned=2&quot;&gt;');
    for (const svg of svgs) expect(svg.slice(1).match(/<svg/g)).toBeNull();
  });
});
