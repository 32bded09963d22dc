/** One card per item: level, label, the chart its level calls for, statistics, withheld, conventions. */
import type { Frequency, ItemDescription, OrdinalPosition } from '@codeweir/describe';
import type { CompiledItem } from '@codeweir/codebook';
import { escapeHtml as esc } from './escape.ts';
import { formatDate, formatNumber as num, formatPercent as pct } from './format.ts';
import { type Ctx, table, figure, itemText } from './context.ts';
import { barChart, boxPlot, histogram, type Bar } from './charts.ts';
import { histogramSorted, sortedValid, type Histogram } from '@codeweir/stats';
import { boxFromValues, columnValues } from './data.ts';
import { sparkBars } from './spark.ts';
import { conventionLines, levelGroup, particularConventions, particularWithheld, withheldAnchor, withheldLines } from './glossary.ts';
import { countText } from './disclosure.ts';

/** Display keys for categories: the label, with the code added where labels repeat (vega groups by key). */
export function categoryKeys(positions: ReadonlyArray<Pick<OrdinalPosition, 'code' | 'label'>>): string[] {
  const seen = new Map<string, number>();
  for (const p of positions) seen.set(p.label, (seen.get(p.label) ?? 0) + 1);
  return positions.map((p) => (p.label === '' || (seen.get(p.label) ?? 0) > 1 ? `${p.label} [${String(p.code)}]` : p.label));
}

/**
 * The items as an index first: one row per codebook item with its level, valid n, missing and
 * invalid counts and a small chart; each described item's row opens (a `details` element, no
 * script) to its card. Items without a summary (the id, free text) are rows without a card.
 */
export function itemsSection(ctx: Ctx): string {
  const items = ctx.input.describe.items;
  const tallies = ctx.input.check.summary.items;
  const ordered = ctx.input.codebook.items.map((i) => i.name).filter((n) => items[n] !== undefined || tallies[n] !== undefined);
  for (const n of Object.keys(items)) if (!ordered.includes(n)) ordered.push(n);
  const head = `<div class="row head" aria-hidden="true"><span></span><span>item</span><span>label</span><span>level</span><span class="num">valid n</span><span class="num">missing</span><span class="num">invalid</span><span>distribution</span></div>`;
  const rows = ordered.map((n, k) => (items[n] ? itemEntry(ctx, n, items[n]!, k) : plainRow(ctx, n))).join('');
  return `<section id="items"><h2 class="section-title">Items</h2>
<p class="note">Every item of the codebook in codebook order. Open a row for its card: chart, statistics and frequencies. Missing counts every missing cell (blank or a declared missing code); invalid cells are findings.</p>
<div class="index items">${head}${rows}</div></section>`;
}

const missingOf = (m: ItemDescription['missing']) => Object.values(m).reduce<number>((a, b) => a + (b ?? 0), 0);

function rowCells(name: string, label: string, level: string, n: number, missing: number, invalid: number, spark: string): string {
  return `<span class="mark"></span><span><code>${esc(name)}</code></span><span>${esc(label)}</span><span class="lvl">${esc(level)}</span><span class="num">${num(n)}</span><span class="num">${num(missing)}</span><span class="num${invalid > 0 ? ' n-error' : ''}">${num(invalid)}</span><span>${spark}</span>`;
}

function plainRow(ctx: Ctx, name: string): string {
  const item = ctx.item(name);
  const t = ctx.input.check.summary.items[name]!;
  const level = item?.role === 'id' ? 'id' : (item?.level ?? 'text');
  const why = item?.role === 'id' ? 'the record id: checked, not summarised' : 'free text: checked, not summarised';
  return `<div class="row plain-row" title="${esc(why)}">${rowCells(name, item?.label ?? '', level, t.valid, missingOf(t.missing), t.invalid, `<span class="note">${esc(why.split(':')[0]!)}</span>`)}</div>`;
}

/** The index row's small chart: bars for categories, a histogram for quantities. */
function sparkOf(ctx: Ctx, name: string, d: ItemDescription): string {
  const item = ctx.item(name);
  if (d.frequencies && d.frequencies.length > 0) {
    const freqs = orderedFrequencies(ctx, d, item);
    return sparkBars(freqs.map((f) => f.count), `${name}: ${freqs.length} categories, ${countText(d.n)} valid cells`, false);
  }
  const hist = d.histogram ?? histogramOf(columnValues(ctx.input.check.store, name));
  return hist ? sparkBars(hist.counts, `${name}: histogram of ${countText(d.n)} valid values in ${hist.counts.length} bins`, true) : '';
}

function itemEntry(ctx: Ctx, name: string, d: ItemDescription, k: number): string {
  const summary = `<summary class="row">${rowCells(name, d.label, d.level, d.n, missingOf(d.missing), d.invalid, sparkOf(ctx, name, d))}</summary>`;
  return `<details class="entry" id="item-${k + 1}">${summary}${itemCard(ctx, name, d, k)}</details>`;
}

function itemCard(ctx: Ctx, name: string, d: ItemDescription, k: number): string {
  const item = ctx.item(name);
  const tags = [
    `<span class="tag level">${esc(d.level)}</span>`,
    item ? `<span class="tag">${esc(item.type)}</span>` : '',
    item && item.role !== 'item' ? `<span class="tag">${esc(item.role)}</span>` : '',
    d.unit ? `<span class="tag">unit: ${esc(d.unit)}</span>` : '',
    d.binned ? '<span class="tag">binned counts</span>' : '',
  ].join('');
  const question = item?.text ? `<p class="question">${esc(item.text)}</p>` : '';
  const absent = ctx.input.check.summary.items[name]?.absent ? '<p class="note">The delivery has no column for this item.</p>' : '';
  const charts = d.level === 'nominal' || d.level === 'ordinal' ? categoricalChart(ctx, name, d, item) : d.level === 'interval' || d.level === 'ratio' ? continuousCharts(ctx, name, d) : '';
  const freq = d.frequencies && d.frequencies.length > 0 ? `<h4>Frequencies</h4>${frequencyTable(d, orderedFrequencies(ctx, d, item))}` : '';
  return `<article class="card" aria-labelledby="item-${k + 1}-h">
<header><h3 id="item-${k + 1}-h"><code>${esc(name)}</code></h3><span class="label">${esc(d.label)}</span><span class="tags">${tags}</span></header>
${question}${absent}${charts}<div class="stats"><div><h4>Statistics</h4>${statisticsTable(ctx, name, d)}</div><div>${particulars(ctx, d)}</div></div>${
    d.outlierNote ? `<p class="note">${esc(d.outlierNote)}</p>` : ''
  }${freq}</article>`;
}

/** What the card says beyond the glossary: withheld statistics and conventions of this item only. */
function particulars(ctx: Ctx, d: ItemDescription): string {
  const group = levelGroup(d);
  const withheld = particularWithheld(ctx, d);
  const conventions = particularConventions(ctx, d.conventions);
  const shared = (ctx.glossary.withheld.get(group)?.size ?? 0) > 0;
  const see = shared
    ? `<p class="see">Conventions and the statistics withheld from ${esc(group)} items: <a href="#${withheldAnchor(group)}">glossary</a>.</p>`
    : `<p class="see">Conventions: <a href="#conventions">glossary</a>.</p>`;
  return `${see}${withheld.length > 0 ? `<h4>Also withheld here</h4><ul class="plain withheld">${withheldLines(withheld)}</ul>` : ''}${
    conventions.length > 0 ? `<h4>Conventions of this item</h4><ul class="plain conventions">${conventionLines(conventions)}</ul>` : ''
  }`;
}

/** Frequencies in the order the chart and table use: scale order (ordinal), code or frequency order (nominal). */
function orderedFrequencies(ctx: Ctx, d: ItemDescription, item: CompiledItem | undefined): Frequency[] {
  const freqs = [...(d.frequencies ?? [])];
  const pos = (f: Frequency) => item?.codeByText.get(String(f.code)) ?? Number.MAX_SAFE_INTEGER;
  if (d.level === 'nominal' && ctx.options.nominalOrder === 'frequency') freqs.sort((a, b) => b.count - a.count || pos(a) - pos(b));
  else freqs.sort((a, b) => pos(a) - pos(b));
  return freqs;
}

function categoricalChart(ctx: Ctx, name: string, d: ItemDescription, item: CompiledItem | undefined): string {
  const freqs = orderedFrequencies(ctx, d, item);
  if (freqs.length === 0) return '';
  const keys = categoryKeys(freqs);
  const bars: Bar[] = freqs.map((f, i) => ({ key: keys[i]!, count: f.count, percent: f.percent }));
  const order =
    d.level === 'ordinal' ? 'in scale order (ordinal: the codebook order of the codes)' : ctx.options.nominalOrder === 'frequency' ? 'by frequency, most frequent first' : 'in code order (the codebook order)';
  const what = itemText(ctx, name);
  const title = `${what}: valid cells by category`;
  const top = [...bars].sort((a, b) => b.count - a.count)[0]!;
  const description = `Bar chart of ${bars.length} categories of ${what}, ${order}, over ${countText(d.n)} valid cells; the largest is ${top.key} with ${top.count} (${top.percent.toFixed(1)}%).`;
  return figure(ctx, barChart(title, description, bars), `Bars ${order}; separate bars because the categories are distinct. Numbers at the bar ends are percent of valid cells. The frequency table below is this chart's table.`);
}

function continuousCharts(ctx: Ctx, name: string, d: ItemDescription): string {
  const what = itemText(ctx, name);
  const dates = ctx.item(name)?.type === 'date';
  const at = dates ? formatDate : num;
  const axis = d.unit ? `${name} (${d.unit})` : name;
  const values = columnValues(ctx.input.check.store, name);
  const out: string[] = [];
  // Under suppression a histogram left out stays out: drawing it again from the values would show its bins.
  const suppressing = (ctx.input.disclosure?.minCell ?? 1) > 1;
  const hist = d.histogram ?? (suppressing ? undefined : histogramOf(values));
  if (hist && hist.counts.length > 0) {
    const width = hist.edges.length > 1 ? hist.edges[1]! - hist.edges[0]! : 0;
    const title = `${what}: distribution`;
    const description = `Histogram of ${countText(d.n)} valid values of ${what} in ${hist.counts.length} bins (${hist.rule}) from ${at(hist.edges[0])} to ${at(hist.edges.at(-1))}.`;
    const alt = table({
      head: ['from', 'to', 'count'],
      numeric: [0, 1, 2],
      rows: hist.counts.map((c, i) => [at(hist.edges[i]), at(hist.edges[i + 1]), num(c)]),
    });
    out.push(figure(ctx, histogram(title, description, hist.edges, hist.counts, axis, dates), `Bins: ${hist.rule}, ${hist.counts.length} bins of width ${num(width)}${dates ? ' days' : ''}; each bin holds values from its lower edge up to (not including) its upper edge, the last bin includes its upper edge.`, alt));
  }
  if (d.q1 !== undefined && d.median !== undefined && d.q3 !== undefined) {
    const stats = { q1: d.q1, median: d.median, q3: d.q3, min: d.min, max: d.max, fences: d.fences, outliers: d.outliers };
    const { box, points, exact } = boxFromValues(name, stats, values);
    const title = `${what}: box plot`;
    const nOut = points.filter((p) => p.kind === 'outlier').length;
    const nExt = points.length - nOut;
    const description = `Box plot of ${what}: median ${at(box.median)}, quartiles ${at(box.q1)} and ${at(box.q3)}, whiskers from ${at(box.low)} to ${at(box.high)}; ${nOut} distinct outlier values and ${nExt} distinct extreme values drawn.`;
    const alt = table({
      head: ['whisker low', 'Q1', 'median', 'Q3', 'whisker high', 'outliers', 'extremes'],
      numeric: [0, 1, 2, 3, 4, 5, 6],
      rows: [[at(box.low), at(box.q1), at(box.median), at(box.q3), at(box.high), num(d.outliers), num(d.extremes)]],
    });
    const whiskers = exact ? 'whiskers to the most extreme values inside the inner fences' : 'whiskers drawn to the inner fences (the values themselves were not retained)';
    const caption = `Box from Q1 to Q3 with a line at the median (quantile type ${ctx.input.describe.quantileType}); ${whiskers}; open circles: outliers beyond 1.5 x IQR (Tukey fences); filled diamonds: extremes beyond 3 x IQR.`;
    out.push(figure(ctx, boxPlot(title, description, [{ ...box, key: name }], points, axis, dates), caption, alt));
  }
  return out.join('');
}

/** A histogram of the valid values when describe gave none (the values retained, some valid). */
function histogramOf(values: Float64Array | undefined): Histogram | undefined {
  const sorted = values && sortedValid(values);
  return sorted && sorted.length > 0 ? histogramSorted(sorted) : undefined;
}

const positionText = (p: OrdinalPosition | undefined) => (p ? `${esc(p.label)} <span class="note">[${esc(p.code)}]</span>` : undefined);

function statisticsTable(ctx: Ctx, name: string, d: ItemDescription): string {
  const rows: Array<[string, string | undefined]> = [];
  // Date items are days since 1970-01-01: locations print as dates, spreads as days.
  const dates = ctx.item(name)?.type === 'date';
  const at = dates ? formatDate : num;
  const span = (x: number) => (dates ? `${num(x)} days` : num(x));
  const add = (label: string, value: string | undefined) => rows.push([label, value]);
  const missing = Object.values(d.missing).reduce<number>((a, b) => a + (b ?? 0), 0);
  add('valid (n)', num(d.n));
  add('missing', num(missing));
  add('invalid', num(d.invalid));
  const tally = ctx.input.check.summary.items[name];
  if (tally?.routing) {
    add('routing: asked', num(tally.routing.asked));
    add('routing: skipped', num(tally.routing.skipped));
    add('routing: undetermined', num(tally.routing.undetermined));
  }
  if (tally?.trimmed) add('cells with surrounding spaces', num(tally.trimmed));
  if (d.mode && d.mode.length > 0) add(d.mode.length > 1 ? 'modes' : 'mode', d.mode.map((m) => esc(d.frequencies ? labelOfCode(d, m) : typeof m === 'number' ? at(m) : m)).join(', '));
  if (d.medianCode) {
    add('median', positionText(d.medianCode));
    add('Q1', positionText(d.q1Code));
    add('Q3', positionText(d.q3Code));
    if (d.iqr !== undefined) add('IQR (scale steps)', num(d.iqr));
  } else {
    if (d.median !== undefined) add('median', at(d.median));
    if (d.q1 !== undefined) add('Q1', at(d.q1));
    if (d.q3 !== undefined) add('Q3', at(d.q3));
    if (d.iqr !== undefined) add('IQR', span(d.iqr));
  }
  for (const [p, v] of Object.entries(d.percentileCodes ?? {})) add(`percentile ${p}`, positionText(v));
  if (d.groupedMedian !== undefined) add('grouped median', num(d.groupedMedian));
  for (const [p, v] of Object.entries(d.percentiles ?? {})) add(`percentile ${p}`, at(v));
  const simple: Array<[keyof ItemDescription, string, (x: number) => string]> = [
    ['mean', 'mean', at],
    ['sd', 'standard deviation', span],
    ['min', 'minimum', at],
    ['max', 'maximum', at],
    ['range', 'range', span],
    ['skewness', 'skewness', num],
    ['kurtosis', 'excess kurtosis', num],
    ['cv', 'coefficient of variation', num],
    ['geometricMean', 'geometric mean', num],
  ];
  for (const [key, label, f] of simple) if (typeof d[key] === 'number') add(label, f(d[key] as number));
  if (d.fences) {
    add('inner fences (1.5 x IQR)', `${at(d.fences.lower)} to ${at(d.fences.upper)}`);
    add('outer fences (3 x IQR)', `${at(d.fences.lowerExtreme)} to ${at(d.fences.upperExtreme)}`);
  }
  if (d.outliers !== undefined) add('outliers', num(d.outliers));
  if (d.extremes !== undefined) add('extremes', num(d.extremes));
  if (d.outlierValues) {
    if (d.outlierValues.low.length > 0) add('lowest beyond the fences', d.outlierValues.low.map(at).join(', '));
    if (d.outlierValues.high.length > 0) add('highest beyond the fences', d.outlierValues.high.map(at).join(', '));
  }
  if (d.weighted) {
    const w = d.weighted;
    const weight = ctx.input.describe.weight;
    add(`sum of weights${weight ? ` (${esc(weight)})` : ''}`, num(w.sumOfWeights));
    add('rows without a valid weight', num(w.excluded));
    if (w.mean !== undefined) add('weighted mean', at(w.mean));
    if (w.sd !== undefined) add('weighted standard deviation', span(w.sd));
    if (w.medianCode) add('weighted median', positionText(w.medianCode));
    if (w.q1Code) add('weighted Q1', positionText(w.q1Code));
    if (w.q3Code) add('weighted Q3', positionText(w.q3Code));
    if (w.median !== undefined) add('weighted median', at(w.median));
    if (w.q1 !== undefined) add('weighted Q1', at(w.q1));
    if (w.q3 !== undefined) add('weighted Q3', at(w.q3));
  }
  return table({ head: ['statistic', 'value'], numeric: [1], rows: rows.filter((r) => r[1] !== undefined).map(([l, v]) => [esc(l), v!]) });
}

function labelOfCode(d: ItemDescription, code: number | string): string {
  const f = d.frequencies?.find((x) => x.code === code);
  return f ? `${f.label} [${String(code)}]` : String(code);
}

function frequencyTable(d: ItemDescription, freqs: readonly Frequency[]): string {
  const cum = freqs.some((f) => f.cumulativePercent !== undefined);
  const weighted = freqs.some((f) => f.weightedPercent !== undefined);
  const head = ['code', 'label', 'count', 'percent', ...(cum ? ['cumulative'] : []), ...(weighted ? ['weighted count', 'weighted percent'] : [])];
  const rows = freqs.map((f) => [
    `<code>${esc(f.code)}</code>`,
    esc(f.label),
    num(f.count),
    pct(f.percent),
    ...(cum ? [pct(f.cumulativePercent)] : []),
    ...(weighted ? [num(f.weightedCount), pct(f.weightedPercent)] : []),
  ]);
  return table({ head, rows, numeric: head.map((_, i) => i).filter((i) => i >= 2), caption: `Percent of ${countText(d.n)} valid cells; missing codes are not categories.` });
}
