import * as vega from 'vega';
import { compile, type TopLevelSpec } from 'vega-lite';
import { escapeHtml } from './escape.ts';
import { PALETTE, CATEGORY_COLOURS } from './palette.ts';

/** One chart: a vega-lite spec plus the words that make it accessible without the picture. */
export interface ChartDef {
  /** Unique within the report; used for the SVG's title/desc ids. */
  id: string;
  title: string;
  /** Plain-language description: what is plotted and what the marks mean. */
  description: string;
  spec: TopLevelSpec;
  /** Add a hover `<title>` to every mark that carries an aria label (bars, cells). */
  hover?: boolean;
}

const FONT = 'system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif';

/** The report's vega-lite theme: our palette, quiet axes, left-aligned titles. */
export const CHART_CONFIG = {
  font: FONT,
  background: PALETTE.paper,
  padding: 6,
  view: { stroke: null },
  title: { anchor: 'start', fontSize: 13, fontWeight: 600, color: PALETTE.ink, offset: 8 },
  axis: {
    labelColor: PALETTE.ink,
    titleColor: PALETTE.muted,
    titleFontWeight: 500,
    gridColor: PALETTE.rule,
    domainColor: PALETTE.grey,
    tickColor: PALETTE.grey,
    labelLimit: 180,
    labelFontSize: 11,
    titleFontSize: 11,
  },
  legend: { labelColor: PALETTE.ink, titleColor: PALETTE.muted, labelLimit: 180, orient: 'bottom', direction: 'horizontal' },
  range: { category: [...CATEGORY_COLOURS] },
  bar: { color: PALETTE.blue },
  point: { color: PALETTE.blue },
  rect: { color: PALETTE.blue },
} as const;

/**
 * Compiles a vega-lite spec with `vega-lite` and renders it to an SVG string with `vega` in
 * Node (no DOM, no canvas: text widths are estimated by vega). The SVG gets `role="img"`, a
 * `<title>` and a `<desc>` (escaped here), and, when `hover` is set, a `<title>` child on every
 * mark with an aria label so the numbers show on hover. Text inside the SVG is escaped by
 * vega's own SVG writer (`&`, `<`, `>` in text; also `"` in attributes).
 *
 * Cost: about 10 ms for a small chart once vega is warm. Throws when the spec is invalid (a
 * programming error, not bad input: every spec is built by this package from typed data).
 */
export async function renderChart(def: ChartDef): Promise<string> {
  const spec = { ...def.spec, config: CHART_CONFIG } as TopLevelSpec;
  const view = new vega.View(vega.parse(compile(spec).spec), { renderer: 'none' });
  try {
    const svg = await view.toSVG();
    return decorate(svg, def);
  } finally {
    view.finalize();
  }
}

/**
 * Renders many charts, all started before any is awaited so that vega's asynchronous dataflow
 * steps interleave; results keep the input order.
 */
export function renderCharts(defs: readonly ChartDef[]): Promise<string[]> {
  return Promise.all(defs.map(renderChart));
}

const MARK_WITH_LABEL = /<(path|circle|rect|line|polygon)\b([^>]*?\saria-label="([^"]*)"[^>]*?)\/>/g;

function decorate(svg: string, def: ChartDef): string {
  const t = `${def.id}-t`;
  const d = `${def.id}-d`;
  // The opening tag is vega's own: `<svg xmlns=... class="marks" width=... height=... viewBox=...>`.
  let out = svg.replace(
    /^<svg /,
    `<svg id="${def.id}" role="img" aria-labelledby="${t} ${d}" preserveAspectRatio="xMinYMin meet" `,
  );
  out = out.replace(/^(<svg [^>]*>)/, `$1<title id="${t}">${escapeHtml(def.title)}</title><desc id="${d}">${escapeHtml(def.description)}</desc>`);
  if (def.hover) {
    // vega has already escaped the label for an attribute, which is also safe as element text.
    out = out.replace(MARK_WITH_LABEL, (_m, tag: string, attrs: string, label: string) => `<${tag}${attrs}><title>${label}</title></${tag}>`);
  }
  return out;
}
