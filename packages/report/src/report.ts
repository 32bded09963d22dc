import { escapeHtml as esc } from './escape.ts';
import { CSS } from './css.ts';
import { createCtx, type Ctx, type ReportInput, type ReportOptions } from './context.ts';
import { verdictSection, headerSection, findingsSection, rulesSection, isAccepted } from './quality.ts';
import { missingnessSection } from './missingness.ts';
import { itemsSection } from './items.ts';
import { pairsSection } from './pairs.ts';
import { renderCharts } from './vega.ts';

/**
 * The page's Content-Security-Policy: nothing may load or connect (`default-src 'none'`), the
 * inline stylesheet is allowed, images only as data: URIs, and no script runs at all: the report
 * has none, so any script that escaped into it would be blocked as well.
 */
export const CONTENT_SECURITY_POLICY =
  "default-src 'none'; style-src 'unsafe-inline'; img-src data:; script-src 'none'; object-src 'none'; base-uri 'none'; form-action 'none'";

/**
 * Renders the report of one delivery as one self-contained HTML page: inline CSS and SVG, no
 * script, no external resource, a CSP that forbids all network access, print styles. Sections:
 * verdict, header problems, findings (by rule and item, first rows of each rule), cross-item
 * rules, missingness (table by kind, items x groups heat maps), one card per item with the
 * chart its level calls for (bars for nominal and ordinal; histogram and box plot for interval
 * and ratio), the pairs (contingency table and conditional bars, scatter, side-by-side boxes),
 * and the conventions in use. Every string from the codebook or the delivery is HTML-escaped.
 *
 * Charts are vega-lite specs rendered to SVG by vega in Node, all started together. Cost: about
 * 10 ms per chart once vega is warm, plus O(rows) per item over the retained columns for
 * whiskers and scatter points. Throws only on a programming error in a chart spec.
 * @example const html = await renderReport({ check, describe, codebook, file: 'wave3.csv' });
 */
export async function renderReport(input: ReportInput, options: ReportOptions = {}): Promise<string> {
  const ctx = createCtx(input, options);
  const { summary } = input.check;
  const cb = input.codebook;
  const generatedAt = input.generatedAt ?? new Date().toISOString();
  const body = [
    verdictSection(ctx),
    headerSection(ctx),
    findingsSection(ctx),
    rulesSection(ctx),
    missingnessSection(ctx),
    itemsSection(ctx),
    pairsSection(ctx),
    conventionsSection(ctx),
  ].join('\n');
  const svgs = await renderCharts(ctx.charts);
  const byId = new Map(ctx.charts.map((c, i) => [c.id, svgs[i]!]));
  // Placeholders are HTML comments the report wrote itself; escaped user text cannot form one.
  const filled = body.replace(/<!--chart:(chart-\d+)-->/g, (_m, id: string) => byId.get(id) ?? '');
  const file = input.file ?? summary.file;
  const verdict = isAccepted(ctx) ? 'accepted' : 'not accepted';
  const nav = [
    ['verdict', 'Verdict'],
    ['header', 'Header'],
    ['findings', 'Findings'],
    ...(Object.keys(summary.rules).length > 0 ? [['rules', 'Rules']] : []),
    ['missingness', 'Missingness'],
    ['items', 'Items'],
    ...(input.describe.pairs.length > 0 ? [['pairs', 'Pairs']] : []),
    ['conventions', 'Conventions'],
  ]
    .map(([id, label]) => `<a href="#${id}">${label}</a>`)
    .join('');
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${CONTENT_SECURITY_POLICY}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="codeweir">
<title>${esc(`${cb.title || cb.id}: ${file ?? 'delivery'} ${verdict}`)}</title>
<style>${CSS}</style>
</head>
<body>
<header class="top"><div class="inner">
<h1>${esc(cb.title || cb.id)}</h1>
<p class="meta">Delivery ${file ? `<code>${esc(file)}</code>` : ''} checked against codebook <code>${esc(cb.id)}</code> version ${esc(cb.version)} &middot; report made <time datetime="${esc(generatedAt)}">${esc(generatedAt)}</time></p>
<nav class="toc" aria-label="Sections">${nav}</nav>
</div></header>
<main>
${filled}
</main>
<footer>Made by codeweir. This file is self-contained: it loads nothing and runs no script.</footer>
</body>
</html>
`;
}

function conventionsSection(ctx: Ctx): string {
  const d = ctx.input.describe;
  const rows: Array<[string, string]> = [
    ['quantiles', `Hyndman-Fan type ${d.quantileType}`],
    ['outliers', 'Tukey fences: beyond 1.5 x IQR from the quartiles is an outlier, beyond 3 x IQR an extreme'],
    ['pairs', d.listwise ? 'listwise: rows valid on every item of the pairs' : 'pairwise complete: rows where both items are valid'],
    ...(d.weight ? ([['weight', `weighted statistics use ${d.weight}`]] as Array<[string, string]>) : []),
    ...Object.entries(d.conventions),
  ];
  return `<section id="conventions" class="block"><h2>Conventions</h2><ul class="plain conventions">${rows.map(([k, v]) => `<li><strong>${esc(k)}</strong>: ${esc(v)}</li>`).join('')}</ul>
<p class="note">Statistics describe valid cells only: no missing code is ever counted as a number.</p></section>`;
}
