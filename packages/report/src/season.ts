/**
 * "Since the previous delivery": what changed between the delivery before and this one
 * (records added, removed and changed; codes that appeared or disappeared; each kind of missing;
 * the drift of each item's distribution; each field team's missing share and error cells), and
 * per field team a small chart of its trend across the deliveries of the season. Drawn when the
 * report is given a previous delivery or a ledger. The input is plain data (the comparison and
 * the ledger's history), so this package needs no database.
 */
import type { TopLevelSpec } from 'vega-lite';
import type { MissingTally } from '@codeweir/codebook';
import { escapeHtml as esc } from './escape.ts';
import { figure, itemTitle, table, type Ctx } from './context.ts';
import { formatNumber, formatP } from './format.ts';
import { PALETTE } from './palette.ts';
import type { ChartDef } from './vega.ts';

interface Before<T> {
  previous: T;
  current: T;
}

/** One item's change, as the comparison gives it. */
export interface SeasonItem {
  level?: string;
  newCodes: string[];
  goneCodes: string[];
  missing: Partial<Record<MissingTally, Before<number>>>;
  drift: { test: string; statistic: number | null; df: number | null; p: number | null; method?: string; psi: number | null; flagged: boolean } | null;
}

/** What the report's season section reads: the comparison with the delivery before, and the trend. */
export interface SeasonInput {
  previous: { file: string; checkedAt: string; rows: number; delivery?: number };
  records: { idItem: string; added: number; removed: number; changed: number; unchanged: number; byItem: Record<string, number> } | null;
  recordsNote?: string;
  items: Record<string, SeasonItem>;
  groupItem: string | null;
  groups: Record<string, { rows: Before<number>; missingPercent: Before<number | null>; errors: Before<number>; records?: { added: number; removed: number; changed: number } }>;
  /** The drift conventions and thresholds (compare's `conventions`). */
  conventions: Record<string, string | number>;
  /** The season's deliveries, oldest first, this one last, and each group code's points in that order. */
  trend?: {
    deliveries: string[];
    groups: Record<string, Array<{ missingPercent: number | null; errors: number }>>;
  };
}

type Trend = NonNullable<SeasonInput['trend']>;

/** Percentage points of rows by which a kind of missing must move to be listed (common practice for a first look; every figure is in compare's JSON). */
const MISSING_SHIFT = 1;

function before(v: Before<number | null>, digits = 1): string {
  const f = (x: number | null): string => (x === null ? '–' : x.toFixed(digits));
  return `${f(v.previous)} → ${f(v.current)}`;
}

/**
 * Small multiples: one panel per field team, deliveries along the x axis (numbered in order),
 * the share of the team's cells that are missing up the y axis, every panel on the same scale
 * so that teams compare at a glance.
 */
function trendChart(title: string, description: string, deliveries: readonly string[], groups: Trend['groups'], field: 'missingPercent' | 'errors'): Omit<ChartDef, 'id'> {
  const values: Array<Record<string, unknown>> = [];
  for (const [code, points] of Object.entries(groups)) {
    points.forEach((p, i) => {
      const y = field === 'errors' ? p.errors : p.missingPercent;
      if (y === null) return;
      values.push({ g: code, x: i + 1, y, d: `${code}, delivery ${i + 1} (${deliveries[i] ?? ''}): ${field === 'errors' ? `${y} cells with an error finding` : `${(y as number).toFixed(1)}% missing`}` });
    });
  }
  const spec = {
    title,
    data: { values },
    facet: { field: 'g', type: 'nominal', title: null, sort: Object.keys(groups), header: { labelFontSize: 11, labelColor: PALETTE.ink } },
    columns: 6,
    spec: {
      width: 96,
      height: 60,
      encoding: {
        x: { field: 'x', type: 'quantitative', title: null, scale: { domain: [1, Math.max(2, deliveries.length)] }, axis: { tickMinStep: 1, format: 'd', labelFontSize: 9 } },
        y: { field: 'y', type: 'quantitative', title: field === 'errors' ? 'error cells' : '% missing', axis: { labelFontSize: 9, tickCount: 3 } },
      },
      layer: [
        { mark: { type: 'line', color: PALETTE.blue, strokeWidth: 1.5 } },
        { mark: { type: 'point', filled: true, size: 18, color: PALETTE.blue }, encoding: { description: { field: 'd' } } },
      ],
    },
    resolve: { scale: { y: 'shared' } },
  };
  return { title, description, spec: spec as unknown as TopLevelSpec, hover: true };
}

/**
 * The section "Since the previous delivery" ('' when the report has no season input): a line on
 * the records, the items whose codes, missing cells or distribution changed (drift with its
 * test, statistic, p-value and PSI, and the thresholds that flag it), the field teams' missing
 * share and error cells before and after, and the teams' trends across the season as small
 * multiples. Cost: O(items + groups x deliveries). Throws nothing.
 */
export function seasonSection(ctx: Ctx): string {
  const s = ctx.input.season;
  if (s === undefined) return '';
  if (ctx.options.team) return teamSeason(ctx, s, ctx.options.team.group, ctx.options.team.code);
  const parts: string[] = [];
  const prev = s.previous;
  parts.push(`<p>Compared with ${prev.delivery !== undefined ? `delivery ${prev.delivery}, ` : ''}<code>${esc(prev.file)}</code> (${formatNumber(prev.rows)} rows${prev.checkedAt ? `, checked ${esc(prev.checkedAt)}` : ''}).</p>`);
  if (s.records) {
    const r = s.records;
    const byItem = Object.entries(r.byItem).sort((a, b) => b[1] - a[1]);
    parts.push(`<p>Records by <code>${esc(r.idItem)}</code>: <strong>${formatNumber(r.added)}</strong> added, <strong>${formatNumber(r.removed)}</strong> removed, <strong>${formatNumber(r.changed)}</strong> changed${byItem.length ? ` (${byItem.slice(0, 10).map(([n, k]) => `<code>${esc(n)}</code> ${formatNumber(k)}`).join(', ')}${byItem.length > 10 ? ', …' : ''})` : ''}, ${formatNumber(r.unchanged)} unchanged.</p>`);
  } else if (s.recordsNote) parts.push(`<p class="note">${esc(s.recordsNote)}.</p>`);

  const rows: string[][] = [];
  const rowsNow = ctx.input.check.summary.rows;
  const share = (n: number, of: number): number => (of > 0 ? (100 * n) / of : 0);
  let quiet = 0;
  for (const [name, it] of Object.entries(s.items)) {
    // A kind of missing is worth a line when its share of the rows moved by a percentage point or more.
    const moved = Object.entries(it.missing).filter(([, v]) => v && Math.abs(share(v.current, rowsNow) - share(v.previous, prev.rows)) >= MISSING_SHIFT);
    const missing = moved.map(([k, v]) => `${esc(k)} ${formatNumber(v!.previous)} → ${formatNumber(v!.current)} (${share(v!.previous, prev.rows).toFixed(1)}% → ${share(v!.current, rowsNow).toFixed(1)}%)`);
    const d = it.drift;
    const interesting = it.newCodes.length > 0 || it.goneCodes.length > 0 || missing.length > 0 || d?.flagged === true;
    if (!interesting) {
      quiet++;
      continue;
    }
    const drift = d === null ? '–' : `${esc(d.test)}${d.statistic === null ? '' : ` ${d.test === 'chi-square' ? `X² ${d.statistic.toFixed(2)}, df ${d.df}` : `D ${d.statistic.toFixed(3)}`}`}, p ${formatP(d.p)}, PSI ${d.psi === null ? '–' : d.psi.toFixed(3)}${d.flagged ? ' <strong class="flag">flagged</strong>' : ''}`;
    rows.push([itemTitle(ctx, name), esc(it.newCodes.join(', ')), esc(it.goneCodes.join(', ')), missing.join('<br>'), drift]);
  }
  parts.push(
    rows.length
      ? table({ head: ['item', 'new codes', 'codes gone', 'missing cells before → now (% of rows)', 'drift'], rows, caption: `Items with new or vanished codes, a kind of missing whose share of rows moved by ${MISSING_SHIFT} percentage point or more, or flagged drift (${String(s.conventions.flagged ?? '')}).` })
      : '<p class="none">No item gained or lost a code, moved a kind of missing by a percentage point or drifted beyond the thresholds.</p>',
  );
  if (rows.length && quiet) parts.push(`<p class="note">${quiet} other item${quiet === 1 ? '' : 's'}: no new or vanished code, no such shift in missing, no flagged drift (every item's figures: <code>codeweir compare --json</code>).</p>`);
  const conv = ['chiSquare', 'kolmogorovSmirnov', 'psi'].map((k) => s.conventions[k]).filter((v) => v !== undefined);
  if (conv.length) parts.push(`<p class="note">${esc(conv.join('. '))}.</p>`);

  if (s.groupItem !== null && Object.keys(s.groups).length > 0) {
    const g = s.groupItem;
    const head = ['code', 'rows before → now', '% missing before → now', 'error cells before → now', ...(s.records ? ['records added / removed / changed'] : [])];
    const grows = Object.entries(s.groups).map(([code, x]) => [
      `<code>${esc(code)}</code>`,
      before(x.rows, 0),
      before(x.missingPercent),
      before(x.errors, 0),
      ...(s.records ? [x.records ? `${x.records.added} / ${x.records.removed} / ${x.records.changed}` : '–'] : []),
    ]);
    parts.push(`<h3>By <code>${esc(g)}</code></h3>`);
    parts.push(table({ head, rows: grows, numeric: [1, 2, 3], caption: '% missing: share of the cells of the group’s rows that are missing, valid skips and free text left out. Error cells: cells with an error finding.' }));
    const t = s.trend;
    if (t && t.deliveries.length >= 2) {
      const list = t.deliveries.map((d, i) => `${i + 1}: ${d}`).join('; ');
      parts.push(figure(ctx, trendChart(`% missing by ${g}, delivery by delivery`, `One small panel per ${g} code; deliveries 1 to ${t.deliveries.length} along, the share of the group's cells that are missing up, on one scale for all panels.`, t.deliveries, t.groups, 'missingPercent'), `Deliveries: ${list}.`));
      parts.push(figure(ctx, trendChart(`Error cells by ${g}, delivery by delivery`, `One small panel per ${g} code; deliveries along, the cells with an error finding up, on one scale for all panels.`, t.deliveries, t.groups, 'errors'), `Deliveries as above.`));
    }
  }
  return `<section id="season" class="block"><h2>Since the previous delivery</h2>\n${parts.join('\n')}</section>`;
}

/**
 * On a field team's own page: the team's records added, removed and changed, its missing share
 * and error cells before and after, and its own trend across the season ('' when the season was
 * compared by another group item or the team is not in it).
 */
function teamSeason(ctx: Ctx, s: SeasonInput, group: string, code: string): string {
  const g = s.groups[code];
  if (s.groupItem !== group || g === undefined) return '';
  const rec = g.records ? `<p>Records of this ${esc(group)}: <strong>${formatNumber(g.records.added)}</strong> added, <strong>${formatNumber(g.records.removed)}</strong> removed, <strong>${formatNumber(g.records.changed)}</strong> changed.</p>` : '';
  const rows = [[before(g.rows, 0), before(g.missingPercent), before(g.errors, 0)]];
  const t = s.trend;
  const mine = t?.groups[code];
  const chart = t && mine && t.deliveries.length >= 2
    ? figure(ctx, trendChart(`% missing in ${code}, delivery by delivery`, `The share of this ${group}'s cells that are missing, deliveries 1 to ${t.deliveries.length} along.`, t.deliveries, { [code]: mine }, 'missingPercent'), `Deliveries: ${t.deliveries.map((d, i) => `${i + 1}: ${d}`).join('; ')}.`)
    : '';
  return `<section id="season" class="block"><h2>Since the previous delivery</h2>
<p>Compared with <code>${esc(s.previous.file)}</code>.</p>${rec}${table({ head: ['rows before → now', '% missing before → now', 'error cells before → now'], rows, numeric: [0, 1, 2] })}${chart}</section>`;
}
