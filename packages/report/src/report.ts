import { escapeHtml as esc } from './escape.ts';
import { createCtx, type Ctx, type ReportInput, type ReportOptions } from './context.ts';
import { verdictSection, headerSection, findingsSection, rulesSection, isAccepted } from './quality.ts';
import { missingnessSection } from './missingness.ts';
import { itemsSection } from './items.ts';
import { pairsSection } from './pairs.ts';
import { teamsSection, teamSectionsSection } from './teams.ts';
import { glossarySection } from './glossary.ts';
import { toFixSection } from './to-fix.ts';
import { seasonSection } from './season.ts';
import { pageShell } from './page.ts';
import { renderCharts } from './vega.ts';
import { disclosureSection } from './disclosure.ts';

export { CONTENT_SECURITY_POLICY } from './page.ts';

/** One section of the page: its anchor, its name in the top links, and the function that writes it ('' to leave it out). */
interface Section {
  id: string;
  label: string;
  render: (ctx: Ctx) => string;
}

/**
 * The sections in page order. The first screen answers first: the verdict with its reason and
 * the table of field teams; then what to fix (findings, header, rules), each team's section,
 * missingness, the item index with its cards, the pairs, and the glossary that the cards link
 * to. A section that has nothing to say writes '' and loses its top link.
 */
const SECTIONS: readonly Section[] = [
  { id: 'verdict', label: 'Verdict', render: verdictSection },
  { id: 'disclosure', label: 'Disclosure control', render: (ctx) => disclosureSection(ctx.input.disclosure) },
  { id: 'teams', label: 'Teams', render: teamsSection },
  { id: 'season', label: 'Since the previous delivery', render: seasonSection },
  { id: 'to-fix', label: 'Rows to fix', render: toFixSection },
  { id: 'findings', label: 'Findings', render: findingsSection },
  { id: 'header', label: 'Header', render: (ctx) => (ctx.options.team ? '' : headerSection(ctx)) },
  { id: 'rules', label: 'Rules', render: rulesSection },
  { id: 'field-teams', label: 'Field teams', render: teamSectionsSection },
  { id: 'missingness', label: 'Missingness', render: missingnessSection },
  { id: 'items', label: 'Items', render: itemsSection },
  { id: 'pairs', label: 'Pairs', render: pairsSection },
  { id: 'glossary', label: 'Glossary', render: glossarySection },
];

/**
 * Renders the report of one delivery as one self-contained HTML page: inline CSS and SVG, no
 * script, no external resource, a CSP that forbids all network access, print styles. Sections:
 * verdict with its reason, the field teams of a group item (`groupBy`) (on a team's page: the
 * team beside the whole delivery and its rows to fix), findings by rule with
 * their rows, header problems, cross-item rules, one section per team, missingness (table by
 * kind, items x groups heat maps), the item index (level, n, missing, invalid, a small chart)
 * whose rows open to each item's card (the chart its level calls for, statistics,
 * frequencies), the pairs likewise, and the glossary of terms, conventions and statistics
 * withheld by level. Cards are `details` elements: collapsed on screen, open in print. Every
 * string from the codebook or the delivery is HTML-escaped. With `team` set, the page is that
 * team's own (see renderSplitReport).
 *
 * Charts are vega-lite specs rendered to SVG by vega in Node, all started together. Cost: about
 * 10 ms per chart once vega is warm, plus O(rows) per item over the retained columns for
 * whiskers and scatter points. Throws CodeweirError CW_USAGE when `groupBy` is not a group
 * item, otherwise only on a programming error in a chart spec.
 * @example const html = await renderReport({ check, describe, codebook, file: 'wave3.csv' });
 */
export async function renderReport(input: ReportInput, options: ReportOptions = {}): Promise<string> {
  const ctx = createCtx(input, options);
  const { summary } = input.check;
  const cb = input.codebook;
  const generatedAt = input.generatedAt ?? new Date().toISOString();
  const parts = SECTIONS.map((s) => ({ s, html: s.render(ctx) })).filter((p) => p.html !== '');
  const body = await fillCharts(ctx, parts.map((p) => p.html).join('\n'));
  const file = input.file ?? summary.file;
  const team = options.team;
  const verdict = team ? `${team.name}` : isAccepted(ctx) ? 'accepted' : 'not accepted';
  const title = cb.title || cb.id;
  const made = `report made <time datetime="${esc(generatedAt)}">${esc(generatedAt)}</time>`;
  const meta = team
    ? `${esc(title)}: the rows of this ${esc(team.group)} in ${file ? `<code>${esc(file)}</code>` : 'the delivery'}, checked against codebook <code>${esc(cb.id)}</code> version ${esc(cb.version)} &middot; ${made}`
    : `Delivery ${file ? `<code>${esc(file)}</code>` : ''} checked against codebook <code>${esc(cb.id)}</code> version ${esc(cb.version)} &middot; ${made}`;
  const crumbs = team ? `<a href="${esc(team.main)}">Main report</a> &middot; <a href="${esc(team.index)}">Every ${esc(team.group)}’s page</a>` : undefined;
  return pageShell({
    title: `${title}: ${file ?? 'delivery'} ${verdict}`,
    heading: team ? team.name : title,
    meta,
    ...(crumbs ? { crumbs } : {}),
    nav: parts.filter((p) => p.s.id !== 'verdict').map((p) => [p.s.id, p.s.label] as const),
    body,
  });
}

/** Renders the queued charts and puts each SVG where its placeholder is. */
async function fillCharts(ctx: Ctx, body: string): Promise<string> {
  const svgs = await renderCharts(ctx.charts);
  const byId = new Map(ctx.charts.map((c, i) => [c.id, svgs[i]!]));
  // Placeholders are HTML comments the report wrote itself; escaped user text cannot form one.
  return body.replace(/<!--chart:(chart-\d+)-->/g, (_m, id: string) => byId.get(id) ?? '');
}
