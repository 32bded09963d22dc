/** Bivariate pairs: contingency tables and conditional bars, scatter plots, side-by-side box plots. */
import type { PairCategorical, PairContinuous, PairDescription, PairMixed } from '@codeweir/describe';
import { escapeHtml as esc } from './escape.ts';
import { formatNumber as num, formatPercent as pct, formatP } from './format.ts';
import { type Ctx, table, figure, itemTitle, itemText } from './context.ts';
import { boxPlot, conditionalBars, scatter, type Box, type BoxPoint, type Segment } from './charts.ts';
import { boxFromValues, pairPoints, pointsAtRows, thin, valuesByCode } from './data.ts';
import { categoryKeys } from './items.ts';
import { conventionLines } from './glossary.ts';
import { countText } from './disclosure.ts';

/**
 * The pairs as an index: one row per pair with its kind, n and headline association; the
 * first `maxPairCards` rows open (a `details` element) to the pair's card, the rest are listed
 * in a table of their own, collapsed.
 */
export function pairsSection(ctx: Ctx): string {
  const pairs = ctx.input.describe.pairs;
  if (pairs.length === 0) return '';
  const cap = ctx.options.maxPairCards;
  const shown = pairs.slice(0, cap);
  const rest = pairs.slice(cap);
  const head = `<div class="row head" aria-hidden="true"><span></span><span>pair</span><span>kind</span><span class="num">n</span><span>association</span></div>`;
  const more =
    rest.length > 0
      ? `<details class="more"><summary>${esc(`${num(rest.length)} more pairs, without charts`)}</summary>${table({
          head: ['pair', 'kind', 'n', 'association'],
          numeric: [2],
          rows: rest.map((p) => [pairName(p), esc(p.kind), num(p.n), esc(association(p))]),
          className: 'wide',
        })}</details>`
      : '';
  const note = `${pairs.length === 1 ? 'One pair' : `${num(pairs.length)} pairs`}; n counts rows where both items are valid. Open a row for its chart and tables.${rest.length > 0 ? ` The first ${num(cap)} have cards.` : ''}`;
  return `<section id="pairs"><h2 class="section-title">Pairs</h2><p class="note">${esc(note)}</p>
<div class="index pairs">${head}${shown.map((p, k) => pairEntry(ctx, p, k)).join('')}</div>${more}</section>`;
}

function pairName(p: PairDescription): string {
  return `<code>${esc(p.x)}</code> &times; <code>${esc(p.y)}</code>`;
}

/** The pair's headline association statistic, in words. */
function association(p: PairDescription): string {
  return p.kind === 'categorical-categorical'
    ? `Cramer's V ${num(p.cramersV)}, chi-square ${num(p.chiSquare)} (df ${num(p.df)}, p ${formatP(p.p)})`
    : p.kind === 'continuous-continuous'
      ? `Pearson's r ${num(p.pearson)}, Spearman's rho ${num(p.spearman)}, ${num(p.bivariateOutliers.length)} bivariate outliers`
      : `eta squared ${num(p.etaSquared)} over ${num(p.groups.length)} groups`;
}

function pairEntry(ctx: Ctx, p: PairDescription, k: number): string {
  const summary = `<summary class="row"><span class="mark"></span><span>${pairName(p)}</span><span class="lvl">${esc(p.kind)}</span><span class="num">${num(p.n)}</span><span>${esc(association(p))}</span></summary>`;
  return `<details class="entry" id="pair-${k + 1}">${summary}${pairCard(ctx, p)}</details>`;
}

function pairCard(ctx: Ctx, p: PairDescription): string {
  const body = p.kind === 'categorical-categorical' ? categorical(ctx, p) : p.kind === 'continuous-continuous' ? continuous(ctx, p) : mixed(ctx, p);
  // Pair conventions are listed in the glossary under the pair kind; the card names only others.
  const all = ctx.input.describe.conventions;
  const own = Object.entries(p.conventions ?? {}).filter(([c, v]) => all[`${p.kind} ${c}`] !== v && all[c] !== v);
  const conventions = `<p class="see">Conventions of ${esc(p.kind)} pairs: <a href="#conventions">glossary</a>.</p>${
    own.length > 0 ? `<h4>Conventions of this pair</h4><ul class="plain conventions">${conventionLines(own)}</ul>` : ''
  }`;
  return `<article class="card"><header><h3>${itemTitle(ctx, p.x)} &times; ${itemTitle(ctx, p.y)}</h3><span class="tags"><span class="tag">${esc(p.kind)}</span><span class="tag">n = ${num(p.n)} (both valid)</span></span></header>${body}${conventions}</article>`;
}

function statList(rows: Array<[string, string | undefined]>): string {
  return table({ head: ['statistic', 'value'], numeric: [1], rows: rows.filter((r) => r[1] !== undefined).map(([l, v]) => [esc(l), v!]) });
}

const maybe = (x: number | null | undefined) => (x === undefined ? undefined : num(x));

function categorical(ctx: Ctx, p: PairCategorical): string {
  const rowKeys = categoryKeys(p.rows);
  const colKeys = categoryKeys(p.columns);
  const segments: Segment[] = [];
  p.table.forEach((r, i) => r.forEach((count, j) => segments.push({ row: rowKeys[i]!, column: colKeys[j]!, count })));
  const yOrdinal = ctx.item(p.y)?.level === 'ordinal';
  const xs = itemText(ctx, p.x);
  const ys = itemText(ctx, p.y);
  const title = `${ys} within each category of ${xs}`;
  const description = `100% stacked bars: one bar per category of ${xs} (${rowKeys.length}), split into the ${colKeys.length} categories of ${ys}; segment lengths are row percents over ${countText(p.n)} rows where both are valid.`;
  const chart = figure(ctx, conditionalBars(title, description, rowKeys, colKeys, segments, ys, yOrdinal), `Each bar is one category of ${p.x} and sums to 100%: the shares of ${p.y} within it (row percents). The contingency table below is this chart's table.`);
  const rowTotals = p.table.map((r) => r.reduce((a, b) => a + b, 0));
  const colTotals = p.columns.map((_, j) => p.table.reduce((a, r) => a + (r[j] ?? 0), 0));
  const cell = (i: number, j: number) => `${num(p.table[i]![j]!)}<span class="sub">${pct(p.rowPercent[i]?.[j])}</span>`;
  const percents = (what: readonly (readonly number[])[]) =>
    table({
      head: [`${p.x} \\ ${p.y}`, ...colKeys],
      numeric: colKeys.map((_, j) => j + 1),
      rows: rowKeys.map((rk, i) => [esc(rk), ...colKeys.map((_, j) => pct(what[i]?.[j]))]),
      className: 'ct',
    });
  const ct = table({
    head: [`${p.x} \\ ${p.y}`, ...colKeys, 'total'],
    numeric: [...colKeys.map((_, j) => j + 1), colKeys.length + 1],
    rows: [
      ...rowKeys.map((rk, i) => [esc(rk), ...colKeys.map((_, j) => cell(i, j)), num(rowTotals[i]!)]),
      ['total', ...colTotals.map((t) => num(t)), num(p.n)],
    ],
    className: 'ct',
    caption: 'Each cell: the count, then its row percent (the share of the row category).',
  });
  const stats = statList([
    ['chi-square (Pearson, no continuity correction)', maybe(p.chiSquare)],
    ['degrees of freedom', num(p.df)],
    ['p', p.p === null ? '-' : formatP(p.p)],
    ["Cramer's V", maybe(p.cramersV)],
    ['phi (2 x 2)', p.phi === null ? undefined : num(p.phi)],
    ['expected counts below 5', pct(p.lowExpectedPercent)],
    ["Spearman's rho", maybe(p.spearman)],
    ["Goodman-Kruskal gamma", maybe(p.gamma)],
  ]);
  const warnings = p.warnings.length > 0 ? `<ul class="plain">${p.warnings.map((w) => `<li>${esc(w)}</li>`).join('')}</ul>` : '';
  return `${chart}<h4>Contingency table</h4>${ct}<details class="alt"><summary>Column percents and percents of the table</summary><h4>Column percents</h4>${percents(p.columnPercent)}<h4>Percent of the table</h4>${percents(p.cellPercent)}</details><h4>Association</h4>${stats}${warnings}`;
}

function continuous(ctx: Ctx, p: PairContinuous): string {
  const cap = ctx.options.maxScatterPoints;
  const points = p.sample ? thin(p.sample, cap) : (pairPoints(ctx.input.check.store, p.x, p.y, cap) ?? []);
  const flagged = pointsAtRows(ctx.input.check.store, p.x, p.y, p.bivariateOutliers);
  const xs = itemText(ctx, p.x);
  const ys = itemText(ctx, p.y);
  const unit = (name: string) => (ctx.item(name)?.unit ? `${name} (${ctx.item(name)!.unit})` : name);
  const title = `${ys} against ${xs}`;
  const description = `Scatter plot of ${points.length} of ${countText(p.n)} rows where both ${p.x} and ${p.y} are valid; ${flagged.length} bivariate outliers drawn as diamonds.`;
  const alt = table({
    head: ['row', p.x, p.y],
    numeric: [0, 1, 2],
    rows: p.bivariateOutliers.slice(0, 50).map((r, i) => [num(r), num(flagged[i]?.[0]), num(flagged[i]?.[1])]),
    caption: `Bivariate outliers (first ${Math.min(50, p.bivariateOutliers.length)} of ${p.bivariateOutliers.length}).`,
  });
  const sampled = points.length < p.n ? `${num(points.length)} of ${num(p.n)} points drawn (an even sample). ` : '';
  const chart = figure(
    ctx,
    scatter(title, description, points, flagged, unit(p.x), unit(p.y)),
    `${sampled}Diamonds: rows whose squared Mahalanobis distance exceeds ${num(p.mahalanobisCutoff)} (the chi-square 2 df 0.999 point).`,
    p.bivariateOutliers.length > 0 ? alt : undefined,
  );
  const stats = statList([
    ["Pearson's r", maybe(p.pearson)],
    ["Spearman's rho", maybe(p.spearman)],
    ['bivariate outliers', num(p.bivariateOutliers.length)],
  ]);
  const notes = p.notes.length > 0 ? `<ul class="plain">${p.notes.map((w) => `<li>${esc(w)}</li>`).join('')}</ul>` : '';
  return `${chart}${stats}${notes}`;
}

function mixed(ctx: Ctx, p: PairMixed): string {
  const levelOf = (n: string) => ctx.item(n)?.level ?? ctx.input.describe.items[n]?.level;
  const catIsX = levelOf(p.x) === 'nominal' || levelOf(p.x) === 'ordinal' || !(levelOf(p.y) === 'nominal' || levelOf(p.y) === 'ordinal');
  const [cat, cont] = catIsX ? [p.x, p.y] : [p.y, p.x];
  const catItem = ctx.item(cat);
  const byCode = valuesByCode(ctx.input.check.store, cat, cont);
  const keys = categoryKeys(p.groups);
  const boxes: Box[] = [];
  const points: BoxPoint[] = [];
  let exactAll = true;
  p.groups.forEach((g, i) => {
    if (g.q1 === null || g.median === null || g.q3 === null) return;
    const idx = catItem?.codeByText.get(String(g.code));
    const sorted = idx === undefined ? undefined : byCode?.get(idx);
    const r = boxFromValues(keys[i]!, { q1: g.q1, median: g.median, q3: g.q3, fences: g.fences, outliers: g.outliers }, sorted);
    exactAll &&= r.exact;
    boxes.push(r.box);
    points.push(...r.points);
  });
  const cs = itemText(ctx, cat);
  const ns = itemText(ctx, cont);
  const title = `${ns} by ${cs}`;
  const description = `Side-by-side box plots of ${ns}, one for each of ${boxes.length} categories of ${cs}, over ${countText(p.n)} rows where both are valid.`;
  const unit = ctx.item(cont)?.unit;
  const whiskers = exactAll ? 'whiskers to the most extreme values inside the inner fences' : 'whiskers drawn to the inner fences where the values were not retained';
  const chart =
    boxes.length > 0
      ? figure(ctx, boxPlot(title, description, boxes, points, unit ? `${cont} (${unit})` : cont), `One box per category of ${cat}: Q1 to Q3 with the median line (quantile type ${ctx.input.describe.quantileType}); ${whiskers}; open circles outliers (1.5 x IQR), filled diamonds extremes (3 x IQR). The group table below is this chart's table.`)
      : '';
  const groups = table({
    head: ['code', 'label', 'n', 'mean', 'sd', 'median', 'Q1', 'Q3', 'outliers', 'extremes'],
    numeric: [2, 3, 4, 5, 6, 7, 8, 9],
    rows: p.groups.map((g) => [`<code>${esc(g.code)}</code>`, esc(g.label), num(g.n), num(g.mean), num(g.sd), num(g.median), num(g.q1), num(g.q3), num(g.outliers), num(g.extremes)]),
  });
  const stats = statList([['eta squared (between / total sum of squares)', maybe(p.etaSquared)]]);
  return `${chart}<h4>By group</h4>${groups}${stats}`;
}
