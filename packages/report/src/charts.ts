/**
 * Chart specs, one builder per chart kind. Every builder takes plain numbers and strings and
 * returns a {@link ChartDef}; user strings go into data values, titles and legend domains only,
 * never into vega expressions or field names, so no codebook text is ever evaluated.
 */
import type { TopLevelSpec } from 'vega-lite';
import type { ChartDef } from './vega.ts';

/** A chart before the report gives it an id. */
export type ChartSpec = Omit<ChartDef, 'id'>;
import { PALETTE, SEQUENTIAL, categoryColours, orderedColours } from './palette.ts';
import { daysToMs, formatDate, formatNumber } from './format.ts';

const WIDTH = 420;

/** A category with its display text (unique within the chart) and count. */
export interface Bar {
  key: string;
  count: number;
  percent: number;
}

/**
 * Horizontal bar chart for a nominal or ordinal item. Bars are separated by a gap (band
 * padding): the categories are distinct, not a continuum. Bars keep the order given.
 */
export function barChart(title: string, description: string, bars: readonly Bar[]): ChartSpec {
  const spec = {
    title,
    width: WIDTH - 180,
    height: { step: 20 },
    data: { values: bars.map((b) => ({ k: b.key, n: b.count, p: b.percent, d: `${b.key}: ${b.count} (${b.percent.toFixed(1)}%)` })) },
    encoding: {
      y: { field: 'k', type: 'nominal', sort: null, title: null, scale: { paddingInner: 0.3, paddingOuter: 0.15 } },
      x: { field: 'n', type: 'quantitative', title: 'valid cells', axis: { tickMinStep: 1, format: ',d' } },
    },
    layer: [
      { mark: { type: 'bar', color: PALETTE.blue }, encoding: { description: { field: 'd' } } },
      {
        mark: { type: 'text', align: 'left', dx: 3, fontSize: 10, color: PALETTE.muted, aria: false },
        encoding: { text: { field: 'p', type: 'quantitative', format: '.1f' } },
      },
    ],
  };
  return { title, description, spec: spec as unknown as TopLevelSpec, hover: true };
}

/**
 * Histogram from precomputed bin edges (edges.length = counts.length + 1). Bars touch: the
 * quantity is continuous.
 */
export function histogram(
  title: string,
  description: string,
  edges: readonly number[],
  counts: readonly number[],
  axisTitle: string,
  dates = false,
): ChartSpec {
  const at = (x: number) => (dates ? daysToMs(x) : x);
  const show = dates ? formatDate : formatNumber;
  const values = counts.map((n, i) => ({ a: at(edges[i]!), b: at(edges[i + 1]!), n, d: `${show(edges[i]!)} to ${show(edges[i + 1]!)}: ${n}` }));
  const spec = {
    title,
    width: WIDTH,
    height: 150,
    data: { values },
    mark: { type: 'bar', binSpacing: 0, color: PALETTE.blue, stroke: PALETTE.paper, strokeWidth: 0.5 },
    encoding: {
      x: dates ? { field: 'a', type: 'temporal', title: axisTitle, scale: { type: 'utc' } } : { field: 'a', type: 'quantitative', bin: { binned: true }, title: axisTitle, scale: { zero: false } },
      x2: { field: 'b' },
      y: { field: 'n', type: 'quantitative', title: 'valid cells', axis: { tickMinStep: 1, format: ',d' } },
      description: { field: 'd' },
    },
  };
  return { title, description, spec: spec as unknown as TopLevelSpec, hover: true };
}

/** Five numbers of one box: whisker ends are data values inside the fences. */
export interface Box {
  key: string;
  low: number;
  q1: number;
  median: number;
  q3: number;
  high: number;
}

/** A value beyond the fences: `outlier` past 1.5 IQR, `extreme` past 3 IQR. */
export interface BoxPoint {
  key: string;
  value: number;
  kind: 'outlier' | 'extreme';
}

/**
 * Horizontal box plots, one per key: box from Q1 to Q3, a median line, whiskers to the given
 * low/high, outliers as open circles and extremes as filled diamonds (shape and colour both
 * differ, so the two read apart without colour).
 */
export function boxPlot(
  title: string,
  description: string,
  boxes: readonly Box[],
  points: readonly BoxPoint[],
  axisTitle: string,
  dates = false,
): ChartSpec {
  const at = (x: number) => (dates ? daysToMs(x) : x);
  const t = dates ? 'temporal' : 'quantitative';
  const y = { field: 'k', type: 'nominal', sort: boxes.map((b) => b.key), title: null };
  const boxData = { values: boxes.map((b) => ({ k: b.key, lo: at(b.low), q1: at(b.q1), md: at(b.median), q3: at(b.q3), hi: at(b.high) })) };
  const layer: unknown[] = [
    { data: boxData, mark: { type: 'rule', color: PALETTE.grey }, encoding: { y, x: { field: 'lo', type: t, title: axisTitle, scale: dates ? { type: 'utc' } : { zero: false } }, x2: { field: 'hi' } } },
    { data: boxData, mark: { type: 'tick', color: PALETTE.grey, thickness: 1, size: 10 }, encoding: { y, x: { field: 'lo', type: t } } },
    { data: boxData, mark: { type: 'tick', color: PALETTE.grey, thickness: 1, size: 10 }, encoding: { y, x: { field: 'hi', type: t } } },
    {
      data: boxData,
      mark: { type: 'bar', size: 18, color: PALETTE.lightBlue, stroke: PALETTE.darkBlue, strokeWidth: 1 },
      encoding: { y, x: { field: 'q1', type: t }, x2: { field: 'q3' } },
    },
    { data: boxData, mark: { type: 'tick', color: PALETTE.darkBlue, thickness: 2.5, size: 18 }, encoding: { y, x: { field: 'md', type: t } } },
  ];
  const outliers = points.filter((p) => p.kind === 'outlier');
  const extremes = points.filter((p) => p.kind === 'extreme');
  if (outliers.length > 0) {
    layer.push({
      data: { values: outliers.map((p) => ({ k: p.key, v: at(p.value), t: 'outlier' })) },
      mark: { type: 'point', shape: 'circle', size: 40, strokeWidth: 1.5, filled: false, color: PALETTE.orange },
      encoding: { y, x: { field: 'v', type: t }, description: { field: 't' } },
    });
  }
  if (extremes.length > 0) {
    layer.push({
      data: { values: extremes.map((p) => ({ k: p.key, v: at(p.value), t: 'extreme' })) },
      mark: { type: 'point', shape: 'diamond', size: 50, filled: true, color: PALETTE.darkOrange },
      encoding: { y, x: { field: 'v', type: t }, description: { field: 't' } },
    });
  }
  const spec = { title, width: WIDTH, height: { step: 36 }, layer };
  return { title, description, spec: spec as unknown as TopLevelSpec, hover: true };
}

/** One segment of a conditional bar: row category, column category, count. */
export interface Segment {
  row: string;
  column: string;
  count: number;
}

/**
 * 100% stacked bars: one bar per row category, split by the column categories in their
 * order; shares are conditional on the row. Ordered column categories take the sequential
 * ramp, unordered ones the qualitative colours.
 */
export function conditionalBars(
  title: string,
  description: string,
  rows: readonly string[],
  columns: readonly string[],
  segments: readonly Segment[],
  columnTitle: string,
  ordered: boolean,
): ChartSpec {
  const spec = {
    title,
    width: WIDTH - 140,
    height: { step: 24 },
    data: { values: segments.map((s) => ({ r: s.row, c: s.column, n: s.count, o: columns.indexOf(s.column), d: `${s.row}, ${s.column}: ${s.count}` })) },
    mark: { type: 'bar', stroke: PALETTE.paper, strokeWidth: 0.75 },
    encoding: {
      y: { field: 'r', type: 'nominal', sort: [...rows], title: null, scale: { paddingInner: 0.3 } },
      x: { field: 'n', type: 'quantitative', stack: 'normalize', title: 'share of the row', axis: { format: '.0%' } },
      color: {
        field: 'c',
        type: 'nominal',
        title: columnTitle,
        scale: { domain: [...columns], range: ordered ? orderedColours(columns.length) : categoryColours(columns.length) },
        legend: { columns: 3, symbolType: 'square' },
      },
      order: { field: 'o', type: 'quantitative' },
      description: { field: 'd' },
    },
  };
  return { title, description, spec: spec as unknown as TopLevelSpec, hover: true };
}

/**
 * Scatter plot of a (sampled) set of points, with flagged points drawn over them as orange
 * diamonds. Points at exactly the same place are drawn once, their area growing with how many
 * rows sit there (survey counts and scales repeat values a lot). Marks carry no aria labels:
 * with hundreds of points they would only add size; the description and table carry the content.
 */
export function scatter(
  title: string,
  description: string,
  points: ReadonlyArray<readonly [number, number]>,
  flagged: ReadonlyArray<readonly [number, number]>,
  xTitle: string,
  yTitle: string,
): ChartSpec {
  const x = { field: 'x', type: 'quantitative', title: xTitle, scale: { zero: false } };
  const y = { field: 'y', type: 'quantitative', title: yTitle, scale: { zero: false } };
  const counts = new Map<string, { x: number; y: number; n: number }>();
  for (const [a, b] of points) {
    const key = `${a},${b}`;
    const c = counts.get(key);
    if (c) c.n++;
    else counts.set(key, { x: a, y: b, n: 1 });
  }
  const stacked = [...counts.values()].some((c) => c.n > 1);
  const layer: unknown[] = [
    {
      data: { values: [...counts.values()] },
      mark: { type: 'circle', opacity: 0.5, color: PALETTE.blue, aria: false, ...(stacked ? {} : { size: 16 }) },
      encoding: {
        x,
        y,
        ...(stacked ? { size: { field: 'n', type: 'quantitative', title: 'rows at the point', scale: { range: [14, 160] }, legend: { symbolFillColor: PALETTE.blue, symbolStrokeColor: PALETTE.blue } } } : {}),
      },
    },
  ];
  if (flagged.length > 0) {
    layer.push({
      data: { values: flagged.map(([a, b]) => ({ x: a, y: b, t: 'bivariate outlier' })) },
      mark: { type: 'point', shape: 'diamond', size: 60, filled: true, aria: false },
      encoding: { x, y, color: { field: 't', type: 'nominal', scale: { range: [PALETTE.orange] }, title: null } },
    });
  }
  const spec = { title, width: WIDTH, height: 260, layer, config: { aria: false } };
  return { title, description, spec: spec as unknown as TopLevelSpec };
}

/** One heat map cell: item (row), group (column), percent missing (0 to 100), counts. */
export interface HeatCell {
  row: string;
  column: string;
  percent: number;
  missing: number;
  cells: number;
}

/**
 * Heat map of percent missing, items down and groups across, shaded on the sequential ramp
 * from 0 to the largest percent (at least 10, so a clean delivery stays pale). Each cell shows
 * its percent and has a hover title with the counts.
 */
export function missingHeatmap(
  title: string,
  description: string,
  rows: readonly string[],
  columns: readonly string[],
  cells: readonly HeatCell[],
): ChartSpec {
  const top = Math.max(10, ...cells.map((c) => c.percent));
  const x = { field: 'g', type: 'nominal', sort: [...columns], title: null, axis: { orient: 'top', labelAngle: -40, labelAlign: 'left', labelLimit: 240 } };
  const y = { field: 'i', type: 'nominal', sort: [...rows], title: null };
  const values = cells.map((c) => ({
    i: c.row,
    g: c.column,
    p: c.percent,
    d: `${c.row} in ${c.column}: ${c.percent.toFixed(1)}% (${c.missing} of ${c.cells} cells)`,
  }));
  const spec = {
    title,
    width: { step: 46 },
    height: { step: 22 },
    data: { values },
    encoding: { x, y },
    layer: [
      {
        mark: { type: 'rect', stroke: PALETTE.paper, strokeWidth: 1 },
        encoding: {
          color: { field: 'p', type: 'quantitative', title: '% missing', scale: { domain: [0, top / 2, top], range: [...SEQUENTIAL], interpolate: 'rgb' }, legend: { orient: 'bottom', direction: 'horizontal', gradientLength: 160 } },
          description: { field: 'd' },
        },
      },
      {
        mark: { type: 'text', fontSize: 10, aria: false },
        encoding: {
          text: { field: 'p', type: 'quantitative', format: '.1f' },
          color: { condition: { test: `datum.p > ${top / 2}`, value: PALETTE.paper }, value: PALETTE.ink },
        },
      },
    ],
  };
  return { title, description, spec: spec as unknown as TopLevelSpec, hover: true };
}
