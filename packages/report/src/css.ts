import { PALETTE } from './palette.ts';

/** The report's whole stylesheet (inline: the page loads nothing). */
export const CSS = `
:root { --ink: ${PALETTE.ink}; --muted: ${PALETTE.muted}; --rule: ${PALETTE.rule}; --blue: ${PALETTE.blue};
  --orange: ${PALETTE.orange}; --dark-orange: ${PALETTE.darkOrange}; --grey: ${PALETTE.grey}; --paper: ${PALETTE.paper};
  --wash: #f5f7f9; --blue-wash: #e8f0f8; --orange-wash: #fcefe2; }
* { box-sizing: border-box; }
html { font: 14px/1.45 system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif; color: var(--ink); background: var(--wash); }
body { margin: 0; }
main { max-width: 1180px; margin: 0 auto; padding: 0 20px 40px; }
h1 { font-size: 1.6rem; margin: 0 0 4px; font-weight: 650; }
h2 { font-size: 1.2rem; margin: 0 0 10px; font-weight: 650; }
h3 { font-size: 1rem; margin: 0; font-weight: 650; }
h4 { font-size: 0.9rem; margin: 14px 0 6px; color: var(--muted); font-weight: 600; }
p { margin: 6px 0; }
code, .mono { font-family: ui-monospace, "SF Mono", Menlo, Consolas, monospace; font-size: 0.92em; }
.top { background: var(--paper); border-bottom: 1px solid var(--rule); padding: 18px 0 14px; margin-bottom: 18px; }
.top .inner { max-width: 1180px; margin: 0 auto; padding: 0 20px; }
.meta { color: var(--muted); margin: 0; }
nav.toc { display: flex; flex-wrap: wrap; gap: 4px 14px; margin-top: 10px; font-size: 0.9rem; }
nav.toc a { color: var(--blue); text-decoration: none; }
nav.toc a:hover { text-decoration: underline; }
section.block { background: var(--paper); border: 1px solid var(--rule); border-radius: 6px; padding: 16px 18px; margin: 0 0 16px; }
.verdict { display: grid; grid-template-columns: auto 1fr; gap: 6px 22px; align-items: center; border-left: 6px solid var(--blue) !important; }
.verdict.rejected { border-left-color: var(--orange) !important; }
.badge { display: inline-block; padding: 6px 14px; border-radius: 4px; font-weight: 700; font-size: 1.15rem; letter-spacing: 0.01em; }
.accepted .badge { background: var(--blue-wash); color: var(--blue); }
.rejected .badge { background: var(--orange-wash); color: var(--dark-orange); }
.badge::before { margin-right: 8px; }
.accepted .badge::before { content: "\\2713"; }
.rejected .badge::before { content: "\\2717"; }
.verdict .sentence { font-size: 1.05rem; margin: 0; }
.facts { display: flex; flex-wrap: wrap; gap: 6px 26px; margin: 4px 0 0; grid-column: 1 / -1; }
.facts div { display: flex; flex-direction: column; }
.facts dt { color: var(--muted); font-size: 0.8rem; text-transform: uppercase; letter-spacing: 0.04em; }
.facts dd { margin: 0; font-weight: 600; font-variant-numeric: tabular-nums; }
table { border-collapse: collapse; font-variant-numeric: tabular-nums; margin: 4px 0 8px; }
th, td { text-align: left; padding: 3px 10px 3px 0; border-bottom: 1px solid var(--rule); vertical-align: top; overflow-wrap: anywhere; }
th { font-weight: 600; color: var(--muted); font-size: 0.85rem; overflow-wrap: normal; }
.split { display: grid; grid-template-columns: minmax(260px, 1fr) 2fr; gap: 0 28px; }
@media (max-width: 800px) { .split { grid-template-columns: 1fr; } }
td.num, th.num { text-align: right; padding-left: 10px; }
table.wide { width: 100%; }
.sev { display: inline-block; min-width: 4.6em; font-size: 0.8rem; font-weight: 600; }
.sev-error { color: var(--dark-orange); }
.sev-error::before { content: "\\25A0 "; }
.sev-warning { color: #7a5a00; }
.sev-warning::before { content: "\\25B2 "; }
.sev-info { color: var(--grey); }
.sev-info::before { content: "\\25CB "; }
.none { color: var(--muted); font-style: italic; }
.note { color: var(--muted); font-size: 0.88rem; }
.cards { display: grid; grid-template-columns: repeat(auto-fill, minmax(520px, 1fr)); gap: 16px; }
.card { background: var(--paper); border: 1px solid var(--rule); border-radius: 6px; padding: 14px 16px; min-width: 0; }
.card header { display: flex; flex-wrap: wrap; align-items: baseline; gap: 4px 10px; margin-bottom: 6px; }
.card header .label { color: var(--muted); }
.tags { display: flex; flex-wrap: wrap; gap: 4px; }
.tag { font-size: 0.75rem; border: 1px solid var(--rule); border-radius: 10px; padding: 0 8px; color: var(--muted); background: var(--wash); }
.tag.level { border-color: var(--blue); color: var(--blue); background: var(--blue-wash); }
.question { font-style: italic; color: var(--muted); margin: 0 0 6px; }
figure.chart { margin: 8px 0; overflow-x: auto; }
figure.chart svg { max-width: 100%; height: auto; display: block; }
figcaption { color: var(--muted); font-size: 0.85rem; margin-top: 2px; }
details { margin: 4px 0; }
summary { cursor: pointer; color: var(--blue); font-size: 0.88rem; }
.stats { display: grid; grid-template-columns: repeat(auto-fit, minmax(220px, 1fr)); gap: 0 18px; }
ul.plain { margin: 4px 0; padding-left: 18px; }
.withheld li, .conventions li { font-size: 0.9rem; }
.card.span { grid-column: 1 / -1; }
.ct td, .ct th { white-space: nowrap; overflow-wrap: normal; }
.ct td .sub { display: block; color: var(--muted); font-size: 0.78rem; line-height: 1.25; }
.scroll { overflow-x: auto; }
footer { color: var(--muted); font-size: 0.85rem; text-align: center; padding: 10px; }
@media print {
  @page { margin: 14mm 12mm; }
  html { background: #fff; font-size: 11px; }
  main { max-width: none; padding: 0; }
  .top { border: 0; padding: 0 0 8px; }
  nav.toc { display: none; }
  section.block, .card { border: 1px solid #ccc; break-inside: avoid; page-break-inside: avoid; }
  .cards { display: block; }
  .card { margin-bottom: 10px; }
  summary { color: var(--ink); }
  details::details-content { content-visibility: visible; display: block; }
  a { color: inherit; text-decoration: none; }
}
`;
