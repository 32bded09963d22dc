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
import { mkdtempSync, writeFileSync, readFileSync, existsSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type Browser, type Page } from 'playwright-core';
import { renderReport } from '@codeweir/report';
import { loadCodebookOrThrow } from '@codeweir/codebook';
import { checkFile } from '@codeweir/check';
import { describe as describeData } from '@codeweir/describe';
import { fixture, PAYLOADS } from '../packages/report/test/fixtures.ts';

const ROOT = resolve(import.meta.dirname, '..');
const SCREENSHOT = join(ROOT, 'examples', 'report-screenshot.png');
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
  const file = join(dir, name);
  writeFileSync(file, html);
  const url = pathToFileURL(file).href;
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

  it('screenshots the demo report: non-blank, and as wide as the committed screenshot', async () => {
    const codebook = await loadCodebookOrThrow(join(ROOT, 'examples', 'household.codebook.json'));
    const check = await checkFile(join(ROOT, 'examples', 'demo-delivery.csv'), codebook);
    const described = describeData(check, codebook, { pairs: [['district', 'water_src'], ['hh_size', 'children'], ['district', 'income']] });
    const html = await renderReport({ check, describe: described, codebook, file: 'examples/demo-delivery.csv', generatedAt: '2026-12-01T00:00:00Z' });
    const { page, requests, errors, url } = await open(html, 'demo.html');
    expect(errors).toEqual([]);
    expect(requests).toEqual([url]);
    const verdict = await page.textContent('#verdict .badge');
    expect(verdict).toBe((check.summary.findings.bySeverity.error ?? 0) > 0 ? 'Not accepted' : 'Accepted');
    const png = await page.screenshot({ clip: { x: 0, y: 0, width: VIEWPORT.width, height: 2400 }, fullPage: true });
    // PNG: 8-byte signature, then IHDR with width and height as big-endian 32-bit integers.
    const size = (b: Buffer) => ({ width: b.readUInt32BE(16), height: b.readUInt32BE(20) });
    expect(size(png)).toEqual({ width: VIEWPORT.width, height: 2400 });
    // Non-blank: the page holds far more than one colour, so a compressed capture of it is
    // much larger than a blank one of the same size would be.
    const blank = await page.evaluate(() => {
      document.body.innerHTML = '';
      return true;
    });
    expect(blank).toBe(true);
    const empty = await page.screenshot({ clip: { x: 0, y: 0, width: VIEWPORT.width, height: 2400 } });
    expect(png.length).toBeGreaterThan(20 * empty.length);
    if (process.env.CODEWEIR_UPDATE_SCREENSHOT === '1') writeFileSync(SCREENSHOT, png);
    expect(existsSync(SCREENSHOT)).toBe(true);
    expect(size(readFileSync(SCREENSHOT)).width).toBe(VIEWPORT.width);
    await page.close();
  });
});
