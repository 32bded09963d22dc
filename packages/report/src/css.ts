import { PALETTE } from './palette.ts';

/**
 * The report's whole stylesheet (inline: the page loads nothing).
 *
 * Text rules that keep figures whole: numbers use tabular figures and numeric cells never wrap;
 * codes (`code`) never wrap; labels wrap only between words (no hyphenation, no break inside a
 * word); a table wider than its card scrolls inside the card (`.scroll`) rather than squeezing
 * its columns. Collapsed sections are `details` elements (no script); in print every
 * `details` is shown open through its `::details-content` part, and cards are not split
 * across pages.
 */
export const CSS = `
:root { --ink: ${PALETTE.ink}; --muted: ${PALETTE.muted}; --rule: ${PALETTE.rule}; --blue: ${PALETTE.blue};
  --orange: ${PALETTE.orange}; --dark-orange: ${PALETTE.darkOrange}; --grey: ${PALETTE.grey}; --paper: ${PALETTE.paper};
  --wash: #f5f7f9; --blue-wash: #e8f0f8; --orange-wash: #fcefe2; --warn: #7a5a00; }
* { box-sizing: border-box; }
html { font: 14px/1.45 system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif; color: var(--ink); background: var(--wash);
  font-variant-numeric: tabular-nums; overflow-wrap: normal; word-break: normal; hyphens: none; }
body { margin: 0; }
main { max-width: 1180px; margin: 0 auto; padding: 0 20px 40px; }
h1 { font-size: 1.5rem; margin: 0 0 2px; font-weight: 650; }
h2 { font-size: 1.2rem; margin: 0 0 10px; font-weight: 650; }
h3 { font-size: 1rem; margin: 0; font-weight: 650; }
h4 { font-size: 0.9rem; margin: 14px 0 6px; color: var(--muted); font-weight: 600; }
p { margin: 6px 0; }
a { color: var(--blue); }
code, .mono { font-family: ui-monospace, "SF Mono", Menlo, Consolas, monospace; font-size: 0.92em; white-space: nowrap; }
.top { background: var(--paper); border-bottom: 1px solid var(--rule); padding: 12px 0 10px; margin-bottom: 14px; }
.top .inner { max-width: 1180px; margin: 0 auto; padding: 0 20px; }
.meta { color: var(--muted); margin: 0; }
.crumbs { margin: 0 0 4px; font-size: 0.9rem; }
nav.toc { display: flex; flex-wrap: wrap; gap: 2px 14px; margin-top: 6px; font-size: 0.9rem; }
nav.toc a { text-decoration: none; }
nav.toc a:hover { text-decoration: underline; }
section.block { background: var(--paper); border: 1px solid var(--rule); border-radius: 6px; padding: 14px 18px; margin: 0 0 14px; min-width: 0; }
.section-title { margin: 20px 0 10px; }
.verdict { display: grid; grid-template-columns: auto 1fr; gap: 6px 22px; align-items: center; border-left: 6px solid var(--blue) !important; }
.verdict.rejected { border-left-color: var(--orange) !important; }
.badge { display: inline-block; padding: 6px 14px; border-radius: 4px; font-weight: 700; font-size: 1.15rem; white-space: nowrap; }
.accepted .badge { background: var(--blue-wash); color: var(--blue); }
.rejected .badge { background: var(--orange-wash); color: var(--dark-orange); }
.badge::before { margin-right: 8px; }
.accepted .badge::before { content: "\\2713"; }
.rejected .badge::before { content: "\\2717"; }
.verdict .sentence { font-size: 1.05rem; margin: 0; }
.verdict .reason { margin: 2px 0 0; }
.facts { display: flex; flex-wrap: wrap; gap: 4px 26px; margin: 2px 0 0; grid-column: 1 / -1; }
.facts div { display: flex; flex-direction: column; }
.facts dt { color: var(--muted); font-size: 0.78rem; text-transform: uppercase; letter-spacing: 0.04em; }
.facts dd { margin: 0; font-weight: 600; white-space: nowrap; }
table { border-collapse: collapse; margin: 4px 0 8px; }
th, td { text-align: left; padding: 3px 12px 3px 0; border-bottom: 1px solid var(--rule); vertical-align: top; }
th { font-weight: 600; color: var(--muted); font-size: 0.85rem; }
td.num, th.num { text-align: right; padding-left: 12px; white-space: nowrap; }
tr.total td { font-weight: 600; border-top: 1px solid var(--grey); }
tr.aside td { color: var(--muted); }
.scroll { overflow-x: auto; max-width: 100%; }
table.wide { width: 100%; }
.split { display: grid; grid-template-columns: minmax(260px, 1fr) 2fr; gap: 0 28px; }
@media (max-width: 800px) { .split { grid-template-columns: 1fr; } }
.split > div { min-width: 0; }
.sev { display: inline-block; min-width: 4.6em; font-size: 0.8rem; font-weight: 600; white-space: nowrap; }
.sev-error { color: var(--dark-orange); }
.sev-error::before { content: "\\25A0\\00a0"; }
.sev-warning { color: var(--warn); }
.sev-warning::before { content: "\\25B2\\00a0"; }
.sev-info { color: var(--grey); }
.sev-info::before { content: "\\25CB\\00a0"; }
.n-error { color: var(--dark-orange); font-weight: 600; }
.n-warning { color: var(--warn); }
.none { color: var(--muted); font-style: italic; }
.note { color: var(--muted); font-size: 0.88rem; }
.worse { color: var(--dark-orange); }
.cards { display: grid; grid-template-columns: repeat(auto-fill, minmax(520px, 1fr)); gap: 14px; align-items: start; }
@media (max-width: 600px) { .cards, .team-cards { grid-template-columns: minmax(0, 1fr); } }
.card { background: var(--paper); border: 1px solid var(--rule); border-radius: 6px; padding: 12px 16px; min-width: 0; }
.card > header { display: flex; flex-wrap: wrap; align-items: baseline; gap: 4px 10px; margin-bottom: 6px; }
.card header .label { color: var(--muted); }
.tags { display: flex; flex-wrap: wrap; gap: 4px; }
.tag { font-size: 0.75rem; border: 1px solid var(--rule); border-radius: 10px; padding: 0 8px; color: var(--muted); background: var(--wash); white-space: nowrap; }
.tag.level { border-color: var(--blue); color: var(--blue); background: var(--blue-wash); }
.question { font-style: italic; color: var(--muted); margin: 0 0 6px; }
figure.chart { margin: 8px 0; overflow-x: auto; }
figure.chart svg { max-width: 100%; height: auto; display: block; }
figcaption { color: var(--muted); font-size: 0.85rem; margin-top: 2px; }
details { margin: 4px 0; }
summary { cursor: pointer; color: var(--blue); font-size: 0.88rem; }
.stats { display: grid; grid-template-columns: repeat(auto-fit, minmax(220px, 1fr)); gap: 0 18px; }
.stats > div { min-width: 0; }
ul.plain { margin: 4px 0; padding-left: 18px; }
.withheld li, .conventions li { font-size: 0.9rem; }
.ct td .sub { color: var(--muted); font-size: 0.8rem; margin-left: 4px; }
.ct td, .ct th { white-space: nowrap; }
.index { border: 1px solid var(--rule); border-radius: 6px; background: var(--paper); overflow-x: auto; }
.index > .row, .index > details { min-width: 780px; }
.index.pairs > .row, .index.pairs > details { min-width: 700px; }
.index .row { display: grid; grid-template-columns: 1.2rem minmax(9rem, 12rem) minmax(8rem, 1fr) 5.5rem 4.8rem 4.8rem 4.8rem 132px; gap: 0 10px; align-items: center; padding: 5px 12px; }
.index.pairs .row { grid-template-columns: 1.2rem minmax(14rem, 1.2fr) 11rem 4.8rem minmax(12rem, 1.6fr); }
.index .row > span { min-width: 0; }
.index .head { color: var(--muted); font-size: 0.82rem; font-weight: 600; border-bottom: 1px solid var(--rule); }
.index .num { text-align: right; white-space: nowrap; }
.index .lvl { font-size: 0.8rem; color: var(--blue); white-space: nowrap; }
.index details.entry { margin: 0; border-bottom: 1px solid var(--rule); }
.index details.entry:last-child { border-bottom: 0; }
.index details.entry > summary { list-style: none; color: var(--ink); font-size: 1rem; }
.index details.entry > summary::-webkit-details-marker { display: none; }
.index details.entry > summary:hover { background: var(--wash); }
.index details.entry > summary .mark::before { content: "\\25B8"; color: var(--blue); }
.index details.entry[open] > summary .mark::before { content: "\\25BE"; }
.index details.entry[open] > summary { background: var(--blue-wash); }
.index .entry > .card { border: 0; border-top: 1px solid var(--rule); border-radius: 0; padding: 12px 16px 14px 34px; }
.index .plain-row { border-bottom: 1px solid var(--rule); }
svg.spark { display: block; }
.nobr { white-space: nowrap; }
.heatmaps { display: flex; flex-wrap: wrap; gap: 0 36px; align-items: flex-start; }
.heatmap { min-width: 0; max-width: 100%; }
.team-cards { display: grid; grid-template-columns: repeat(auto-fill, minmax(460px, 1fr)); gap: 12px; align-items: start; }
.team-cards .card h3 { margin-bottom: 4px; }
dl.glossary { margin: 4px 0 10px; display: grid; grid-template-columns: max-content 1fr; gap: 3px 16px; }
dl.glossary dt { font-weight: 600; }
dl.glossary dd { margin: 0; }
@media (max-width: 700px) { dl.glossary { grid-template-columns: 1fr; } }
.card .see { font-size: 0.88rem; color: var(--muted); }
footer { color: var(--muted); font-size: 0.85rem; text-align: center; padding: 10px; }
@media print {
  @page { margin: 14mm 12mm; }
  html { background: #fff; font-size: 10.5px; }
  main { max-width: none; padding: 0; }
  .top { border: 0; padding: 0 0 8px; }
  nav.toc { display: none; }
  section.block, .card, .index details.entry, .team-cards .card, figure.chart, tr { break-inside: avoid; page-break-inside: avoid; }
  h2, h3, summary { break-after: avoid; page-break-after: avoid; }
  .cards, .team-cards { display: block; }
  .card { margin-bottom: 10px; }
  summary { color: var(--ink); }
  .index details.entry > summary .mark::before { content: ""; }
  details::details-content { content-visibility: visible; display: block; }
  .scroll, figure.chart, .index { overflow: visible; }
  /* Paper does not scroll: wide tables get small type and tight cells, and the counts behind
     a table's percentages (given in full elsewhere) are left off. */
  table.ct td, table.ct th, table.missing td, table.missing th, details.alt td, details.alt th { font-size: 7px; padding: 1px 3px 1px 0; }
  /* Column headings are category labels: on paper they wrap between words (the figures below do not). */
  table.ct th, table.ct th.num, .index table.ct th.num, details.alt th, details.alt th.num, .index details.alt th.num { white-space: normal; }
  table.ct td .sub, details.alt td .note { display: none; }
  .index > .row, .index > details, .index.pairs > .row, .index.pairs > details { min-width: 0; }
  a { color: inherit; text-decoration: none; }
}
`;
