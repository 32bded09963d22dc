/// <reference lib="dom" />
/// <reference lib="dom.iterable" />
/**
 * The report in a real browser: Debian's headless Chromium driven by playwright-core (never a
 * browser download). Checks that charts render with visible marks, that the page logs no error
 * and fetches nothing but itself, and that markup planted in a codebook and a delivery stays
 * text. Then screenshots the demo report: written to examples/report-screenshot.png with
 * CODEWEIR_UPDATE_SCREENSHOT=1, otherwise compared with the committed one by width (the page
 * layout) and by being non-blank, since pixel equality would depend on fonts and rendering.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtempSync, mkdirSync, writeFileSync, readFileSync, existsSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type Browser, type Page } from 'playwright-core';
import { renderReport, renderSplitReport, UNASSIGNED, type SplitReport } from '@codeweir/report';
import { loadCodebookOrThrow, type CompiledCodebook } from '@codeweir/codebook';
import { checkFile, type CheckResult } from '@codeweir/check';
import { describe as describeData } from '@codeweir/describe';
import { fixture, PAYLOADS } from '../packages/report/test/fixtures.ts';

const ROOT = resolve(import.meta.dirname, '..');
const SCREENSHOT = join(ROOT, 'examples', 'report-screenshot.png');
const TEAM_SCREENSHOT = join(ROOT, 'examples', 'report-team-screenshot.png');
const VIEWPORT = { width: 1200, height: 1000 };
let browser: Browser;
let dir: string;

beforeAll(async () => {
  browser = await chromium.launch({
    executablePath: process.env.CODEWEIR_CHROMIUM ?? '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
  });
  dir = mkdtempSync(join(tmpdir(), 'codeweir-report-'));
});

afterAll(async () => {
  await browser?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

interface Opened {
  page: Page;
  requests: string[];
  errors: string[];
  url: string;
}

/** Opens `html` from a file:// URL, recording every request and every console or page error. */
async function open(html: string, name: string): Promise<Opened> {
  writeFileSync(join(dir, name), html);
  return openFile(name);
}

/** Opens a file already written under the temporary folder, recording every request and every console or page error. */
async function openFile(name: string): Promise<Opened> {
  const url = pathToFileURL(join(dir, name)).href;
  const page = await browser.newPage({ viewport: VIEWPORT });
  const requests: string[] = [];
  const errors: string[] = [];
  page.on('request', (r) => requests.push(r.url()));
  page.on('console', (m) => {
    if (m.type() === 'error' || m.type() === 'warning') errors.push(m.text());
  });
  page.on('pageerror', (e) => errors.push(e.message));
  await page.goto(url, { waitUntil: 'load' });
  return { page, requests, errors, url };
}

/** Per chart: its id, its size on the page, and how many marks with a non-zero box it draws. */
async function chartBoxes(page: Page) {
  return page.$$eval('svg[id^="chart-"]', (svgs) =>
    svgs.map((svg) => {
      const r = svg.getBoundingClientRect();
      const marks = [...svg.querySelectorAll('.role-mark path, .role-mark line, .role-mark rect')].filter((m) => {
        const b = (m as SVGGraphicsElement).getBBox();
        return b.width > 0 || b.height > 0;
      });
      return { id: svg.id, width: r.width, height: r.height, marks: marks.length };
    }),
  );
}

describe('report in headless Chromium', () => {
  it('renders every chart with marks, logs no error and requests nothing but the file', async () => {
    const { page, requests, errors, url } = await open(await renderReport(fixture()), 'fixture.html');
    // Cards are collapsed: open every details element so that the charts inside are laid out.
    await page.evaluate(() => document.querySelectorAll('details').forEach((d) => (d.open = true)));
    const charts = await chartBoxes(page);
    // Fixture: 1 heat map, bars for team, sex, edu, trips, histogram + box for age and
    // visit_date, and one chart per pair (3): 1 + 4 + 4 + 3 = 12.
    expect(charts.length).toBe(12);
    for (const c of charts) {
      expect(c.width, c.id).toBeGreaterThan(0);
      expect(c.height, c.id).toBeGreaterThan(0);
      expect(c.marks, c.id).toBeGreaterThan(0);
    }
    expect(errors).toEqual([]);
    expect(requests).toEqual([url]);
    await page.close();
  });

  it('keeps markup from the codebook and the delivery as visible text', async () => {
    const { page, requests, errors, url } = await open(await renderReport(fixture({ hostile: true })), 'hostile.html');
    expect(await page.evaluate(() => (window as unknown as { __pwned?: unknown }).__pwned)).toBeUndefined();
    // No element came from the payloads: the page's own markup has no img and no inline handler.
    expect(await page.$$eval('img', (els) => els.length)).toBe(0);
    expect(await page.$$eval('*', (els) => els.filter((e) => [...e.attributes].some((a) => a.name.startsWith('on'))).length)).toBe(0);
    const text = await page.evaluate(() => document.body.innerText);
    for (const p of PAYLOADS) expect(text).toContain(p);
    // Inside SVG too: vega's axis labels carry the payload as text nodes.
    const svgText = await page.$$eval('svg text', (els) => els.map((e) => e.textContent ?? '').join('\n'));
    expect(svgText).toContain('<img src=x onerror');
    expect(errors).toEqual([]);
    expect(requests).toEqual([url]);
    await page.close();
  });

});

/** Every table cell (and index-row cell) that holds a number or a code, with its text's height in lines. */
async function figureCells(page: Page) {
  return page.evaluate(() => {
    // A number as the report writes it: digit groups, decimals, percents, dates, `< 0.001`, and
    // cells of several (`19.25 to 61.25`, `12 3.1%`, `0.0% (0/386)`, `101, 92, 91`, `10 days`),
    // or a dash for none. A code is a cell whose text is all in <code>.
    const isFigure = (text: string) => text === '-' || /^[<>≥]? ?[-+]?\d[\d\s.,%()\/+e-]*$/.test(text.replace(/ to | days$/g, ' '));
    const cells = [...document.querySelectorAll('td, th, .index .row > span')] as HTMLElement[];
    const out: Array<{ text: string; lines: number; kind: string }> = [];
    for (const cell of cells) {
      const text = (cell.textContent ?? '').trim();
      if (text === '' || cell.getClientRects().length === 0) continue;
      const codes = [...cell.querySelectorAll('code')].map((c) => c.textContent ?? '').join('');
      const isCode = codes !== '' && codes.replace(/\s/g, '') === text.replace(/\s/g, '');
      const isNumber = isFigure(text);
      if (!isCode && !isNumber) continue;
      const range = document.createRange();
      range.selectNodeContents(cell);
      const height = range.getBoundingClientRect().height;
      const style = getComputedStyle(cell.querySelector('code') ?? cell);
      const lineHeight = parseFloat(style.lineHeight) || parseFloat(style.fontSize) * 1.45;
      out.push({ text, lines: height / lineHeight, kind: isCode ? 'code' : 'number' });
    }
    return out;
  });
}

describe('the demo report in headless Chromium at 1200 px', () => {
  let split: SplitReport;
  let check: CheckResult;
  let codebook: CompiledCodebook;
  let main: Opened;
  const TIMEOUT = 240_000;

  beforeAll(async () => {
    codebook = await loadCodebookOrThrow(join(ROOT, 'examples', 'household.codebook.json'));
    check = await checkFile(join(ROOT, 'examples', 'demo-delivery.csv'), codebook);
    // As the demo makes it (examples/run-demo.ts): every pair, split by field team.
    const described = describeData(check, codebook, { pairs: 'all' });
    split = await renderSplitReport({ check, describe: described, codebook, file: 'examples/demo-delivery.csv', generatedAt: '2026-12-01T00:00:00Z' }, { splitBy: 'team', mainFile: 'demo-report.html' });
    for (const f of split.files) {
      mkdirSync(dirname(join(dir, f.path)), { recursive: true });
      writeFileSync(join(dir, f.path), f.html);
    }
    main = await openFile(split.layout.main);
  }, TIMEOUT);

  it('loads nothing, logs no error, and states the verdict', async () => {
    expect(main.errors).toEqual([]);
    expect(main.requests).toEqual([main.url]);
    expect(await main.page.textContent('#verdict .badge')).toBe((check.summary.findings.bySeverity.error ?? 0) > 0 ? 'Not accepted' : 'Accepted');
    // Every link inside a page leads somewhere on it (glossary, rules, teams, cards).
    for (const file of [split.layout.main, split.files[1]!.path]) {
      const { page } = await openFile(file);
      const dangling = await page.$$eval('a[href^="#"]', (as) => as.map((a) => a.getAttribute('href')!.slice(1)).filter((id) => document.getElementById(id) === null));
      expect(dangling, file).toEqual([]);
      await page.close();
    }
  });

  it('is under 15,000 px tall with the cards collapsed, and every card opens', async () => {
    const { page } = main;
    const collapsed = await page.evaluate(() => document.documentElement.scrollHeight);
    expect(collapsed).toBeLessThan(15_000);
    const cards = await page.$$eval('details.entry', (els) => els.filter((e) => !(e as HTMLDetailsElement).open).length);
    expect(cards).toBeGreaterThan(25);
    // Opened, the same page is several times as long: the cards hold the detail.
    const opened = await page.evaluate(() => {
      document.querySelectorAll('details').forEach((d) => (d.open = true));
      return document.documentElement.scrollHeight;
    });
    expect(opened).toBeGreaterThan(3 * collapsed);
    await page.evaluate(() => document.querySelectorAll('details').forEach((d) => (d.open = false)));
    console.log(`demo report at 1200 px: ${collapsed} px collapsed, ${opened} px with every card open`);
  });

  it('shows the verdict and the whole team table within the first 900 px', async () => {
    const bottom = (sel: string) => main.page.$eval(sel, (e) => e.getBoundingClientRect().bottom + window.scrollY);
    expect(await bottom('#verdict')).toBeLessThanOrEqual(900);
    expect(await bottom('#teams table')).toBeLessThanOrEqual(900);
    // One row per team of the codebook, each linked to its section on the page.
    const links = await main.page.$$eval('#teams tbody a[href^="#team-"]', (as) => as.map((a) => a.getAttribute('href')!));
    expect(links.length).toBeGreaterThanOrEqual(12);
    for (const href of links) expect(await main.page.$(href)).not.toBeNull();
  });

  it('renders no number and no code on more than one line, in any table of the main page or a team page', async () => {
    const pages = [main.page, (await openFile(split.files[1]!.path)).page];
    for (const page of pages) {
      await page.evaluate(() => document.querySelectorAll('details').forEach((d) => (d.open = true)));
      const cells = await figureCells(page);
      expect(cells.length).toBeGreaterThan(1000);
      // A cell's text on one line is one line height tall (within rounding).
      const broken = cells.filter((c) => c.lines > 1.5);
      expect(broken).toEqual([]);
      // Labels may wrap, but only between words: no cell may break inside a word or hyphenate.
      const breakable = await page.$$eval('td, th, .index .row > span', (els) =>
        els.map((e) => getComputedStyle(e)).filter((st) => st.overflowWrap !== 'normal' || st.wordBreak !== 'normal' || (st.hyphens !== 'none' && st.hyphens !== 'manual')).length,
      );
      expect(breakable).toBe(0);
    }
    // The measure itself: squeezed columns that may break anywhere do show as cells on several lines.
    const page = pages[0]!;
    await page.addStyleTag({ content: 'td, th, code { white-space: normal !important; overflow-wrap: anywhere !important; } td, th { width: 1ch; max-width: 3ch; }' });
    expect((await figureCells(page)).filter((c) => c.lines > 1.5).length).toBeGreaterThan(100);
    await pages[1]!.close();
  });

  it('keeps a narrow window free of page-wide scrolling: wide tables scroll inside their box', async () => {
    for (const file of [split.layout.main, split.files[1]!.path]) {
      const { page } = await openFile(file);
      await page.setViewportSize({ width: 560, height: 900 });
      await page.evaluate(() => document.querySelectorAll('details').forEach((d) => (d.open = true)));
      const { pageWidth, scrolling } = await page.evaluate(() => ({
        pageWidth: document.documentElement.scrollWidth,
        scrolling: [...document.querySelectorAll('.scroll, .index, figure.chart')].filter((e) => e.scrollWidth > e.clientWidth + 1).length,
      }));
      expect(pageWidth, file).toBeLessThanOrEqual(560);
      expect(scrolling, file).toBeGreaterThan(0);
      await page.close();
    }
  });

  it('prints every collapsed section open', async () => {
    await main.page.close();
    main = await openFile(split.layout.main);
    const { page } = main;
    const hidden = () => page.$$eval('details.entry > .card', (cards) => cards.filter((c) => !(c as HTMLElement).checkVisibility()).length);
    expect(await hidden()).toBeGreaterThan(25);
    await page.emulateMedia({ media: 'print' });
    expect(await hidden()).toBe(0);
    await page.emulateMedia({ media: 'screen' });
    // A team's page printed on A4 (210 mm less 2 x 12 mm margins = 703 px at 96 px per inch):
    // every table fits the width of the paper, opened cards and all.
    const team = await openFile(split.files[1]!.path);
    await team.page.setViewportSize({ width: 703, height: 1000 });
    await team.page.emulateMedia({ media: 'print' });
    expect(await team.page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(703);
    await team.page.close();
  });

  it('prints the main report on A4 in portrait: every visible table fits the paper, the district x team cross table too', async () => {
    const { page } = await openFile(split.layout.main);
    await page.emulateMedia({ media: 'print' });
    // A4 less 2 x 12 mm margins at 96 px per inch: 703 px.
    await page.setViewportSize({ width: 703, height: 1000 });
    const overflowing = await page.$$eval('table', (ts) =>
      ts.filter((t) => (t as HTMLElement).checkVisibility() && t.getBoundingClientRect().right > 703.5).map((t) => t.className),
    );
    expect(overflowing).toEqual([]);
    // The widest table of the demo: district x team, 12 team columns with long labels.
    expect(await page.$$eval('table.ct', (ts) => Math.max(...ts.map((t) => t.querySelectorAll('thead th').length)))).toBeGreaterThanOrEqual(14);
    await page.close();
  });

  it('gives each team page only that team’s rows, and the pages add up to the whole delivery', async () => {
    const team = check.store.columns.team!;
    expect(team.kind).toBe('coded');
    const teamOfRow = (row: number) => (team.kind === 'coded' ? team.codes[row - 1]! : 0);
    let rows = 0;
    let errors = 0;
    for (const part of split.parts) {
      const file = split.layout.pages.get(part.row.key)!;
      const { page, requests, url } = await openFile(file);
      expect(requests).toEqual([url]);
      // The delivery rows named by the page's findings all belong to the team.
      const findingRows = await page.$$eval('#findings details.rule tbody tr td:first-child', (tds) => tds.map((td) => Number((td.textContent ?? '').replace(/,/g, ''))));
      // The store keeps 1 + the code's index in the codebook, 0 where the cell is not valid.
      const code = part.row.key === UNASSIGNED ? 0 : 1 + codebook.byName.get('team')!.codeByText.get(part.row.key)!;
      for (const r of findingRows) expect(teamOfRow(r), `${file} row ${r}`).toBe(code);
      // The team item's own frequency table on the page counts only this team's code.
      const freq = await page.$$eval('details.entry', (els) => {
        const t = els.find((e) => e.querySelector('summary code')?.textContent === 'team');
        const heading = [...(t?.querySelectorAll('h4') ?? [])].find((h) => h.textContent === 'Frequencies');
        const rows = heading?.nextElementSibling?.querySelectorAll('tbody tr') ?? [];
        return [...rows].map((tr) => [...tr.querySelectorAll('td')].slice(0, 3).map((td) => (td.textContent ?? '').trim()));
      });
      // (Every code of the codebook is listed; only the team's own has a count.)
      if (part.row.key !== UNASSIGNED) expect(freq.filter((f) => f[2] !== '0')).toEqual([[part.row.key, expect.any(String), part.row.rows.toLocaleString('en-US')]]);
      const facts = await page.$$eval('#verdict .facts dd', (dds) => dds.map((d) => (d.textContent ?? '').replace(/,/g, '')));
      rows += Number(facts[0]);
      errors += Number(facts[2]);
      await page.close();
    }
    const fileErrors = check.findings.filter((f) => f.row <= 0 && f.severity === 'error').length;
    expect(rows).toBe(check.summary.rows);
    expect(errors + fileErrors).toBe(check.summary.findings.bySeverity.error);
  });

  it('screenshots the first screen and a team page as a supervisor sees them', async () => {
    const shots: Array<[string, string]> = [
      [split.layout.main, SCREENSHOT],
      [split.layout.pages.get('3')!, TEAM_SCREENSHOT],
    ];
    for (const [file, target] of shots) {
      const { page } = await openFile(file);
      const png = await page.screenshot({ clip: { x: 0, y: 0, width: VIEWPORT.width, height: 900 } });
      const size = (b: Buffer) => ({ width: b.readUInt32BE(16), height: b.readUInt32BE(20) });
      expect(size(png)).toEqual({ width: VIEWPORT.width, height: 900 });
      // Non-blank: a capture of the page is much larger than one of the emptied page.
      await page.evaluate(() => (document.body.innerHTML = ''));
      const empty = await page.screenshot({ clip: { x: 0, y: 0, width: VIEWPORT.width, height: 900 } });
      expect(png.length).toBeGreaterThan(10 * empty.length);
      if (process.env.CODEWEIR_UPDATE_SCREENSHOT === '1') writeFileSync(target, png);
      expect(existsSync(target)).toBe(true);
      expect(size(readFileSync(target))).toEqual({ width: VIEWPORT.width, height: 900 });
      await page.close();
    }
  });
});
