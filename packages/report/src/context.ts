import type { CheckResult, CheckSummary } from '@codeweir/check';
import type { DescribeResult } from '@codeweir/describe';
import type { CompiledCodebook, CompiledItem } from '@codeweir/codebook';
import { escapeHtml as esc } from './escape.ts';
import type { ChartDef } from './vega.ts';
import { MAX_SCATTER_POINTS } from './data.ts';
import { commonWithheld } from './glossary.ts';
import type { SeasonInput } from './season.ts';
import { holdsSuppressed, type DisclosureNote } from './disclosure.ts';

/** What {@link renderReport} reads. */
export interface ReportInput {
  check: CheckResult;
  describe: DescribeResult;
  codebook: CompiledCodebook;
  /** The delivery's path or name, as the user gave it. */
  file?: string;
  /** When the report was made (ISO 8601); the current time when omitted. */
  generatedAt?: string;
  /** The comparison with the previous delivery and the season's trend (report --previous / --ledger). */
  season?: SeasonInput;
  /** Set by discloseReportInput: what was suppressed and withheld, for the legend. */
  disclosure?: DisclosureNote;
}

/** Knobs of the report; the defaults keep a report of a large delivery to a few megabytes. */
export interface ReportOptions {
  /** Findings listed per rule (the counts stay exact). Default 5. */
  findingsPerRule?: number;
  /** Bar order of nominal items: `code` (codebook order, default) or `frequency` (most frequent first). */
  nominalOrder?: 'code' | 'frequency';
  /** Most points drawn in a scatter plot. Default MAX_SCATTER_POINTS (800). */
  maxScatterPoints?: number;
  /** Pairs drawn as cards with charts; every pair stays in the overview table. Default 60. */
  maxPairCards?: number;
  /**
   * The group item whose codes make the first screen's table of field teams. Default: the
   * codebook's first group item. Throws CodeweirError CW_USAGE when it is not a group item.
   */
  groupBy?: string;
  /** Links from the field-team table to one page per code (set by renderSplitReport). */
  pages?: PageLinks;
  /** Set on a field team's own page: which team it is and the whole delivery to compare with. */
  team?: TeamScope;
}

/** Where the pages of a split report are, relative to the page that links to them. */
export interface PageLinks {
  /** The index page of the team pages. */
  index: string;
  /** Group code text -> that code's page. */
  byCode: Record<string, string>;
}

/** What a field team's page knows beyond its own rows. */
export interface TeamScope {
  /** The group item the delivery was split by. */
  group: string;
  /** The group code text (check's group key), or UNASSIGNED for rows without a valid code. */
  code: string;
  /** How the team is named on the page: its label and code. */
  name: string;
  /** The whole delivery's check summary, for the comparisons. */
  whole: CheckSummary;
  /** Link back to the main report and to the index of team pages. */
  main: string;
  index: string;
  /** Findings of the whole delivery that belong to no row (header, whole-column findings). */
  fileFindings: number;
  /** Set when the findings log keeps only part of some rule's findings: says which, for the page. */
  capped?: string;
}

type Defaulted = 'findingsPerRule' | 'nominalOrder' | 'maxScatterPoints' | 'maxPairCards';

export interface Ctx {
  input: ReportInput;
  options: Required<Pick<ReportOptions, Defaulted>> & Omit<ReportOptions, Defaulted>;
  charts: ChartDef[];
  /** Queues a chart and returns the placeholder that the rendered SVG replaces. */
  chart(def: Omit<ChartDef, 'id'>): string;
  item(name: string): CompiledItem | undefined;
  /** What the glossary says once for every card: the withheld statistics each level group shares. */
  glossary: { withheld: Map<string, Map<string, string>> };
}

export function createCtx(input: ReportInput, options: ReportOptions = {}): Ctx {
  const charts: ChartDef[] = [];
  return {
    input,
    options: {
      ...options,
      findingsPerRule: options.findingsPerRule ?? (options.team ? 200 : 5),
      nominalOrder: options.nominalOrder ?? 'code',
      maxScatterPoints: options.maxScatterPoints ?? MAX_SCATTER_POINTS,
      maxPairCards: options.maxPairCards ?? 60,
    },
    charts,
    chart(def) {
      // A chart of a table with a suppressed count (NaN) would show it by its bar: left out.
      if (holdsSuppressed(def.spec)) return '';
      const id = `chart-${charts.length + 1}`;
      charts.push({ ...def, id });
      return `<!--chart:${id}-->`;
    },
    item: (name) => input.codebook.byName.get(name),
    glossary: { withheld: commonWithheld(input.describe.items) },
  };
}

/** `name` in code style followed by its label, both escaped. */
export function itemTitle(ctx: Ctx, name: string): string {
  const label = ctx.item(name)?.label ?? ctx.input.describe.items[name]?.label;
  return label ? `<code>${esc(name)}</code> ${esc(label)}` : `<code>${esc(name)}</code>`;
}

/** Plain-text name for chart titles and descriptions (escaped later, where it is written). */
export function itemText(ctx: Ctx, name: string): string {
  const label = ctx.item(name)?.label ?? ctx.input.describe.items[name]?.label;
  return label ? `${name} (${label})` : name;
}

/** Text of a cell value inside a table: every value is escaped. */
export interface Table {
  head: string[];
  /** Cells already as HTML (callers escape text with escapeHtml). */
  rows: string[][];
  /** Indices of numeric columns (right-aligned). */
  numeric?: number[];
  caption?: string;
  className?: string;
}

/** An HTML table from escaped header text and cell HTML. */
export function table(t: Table): string {
  const num = new Set(t.numeric ?? []);
  const cls = (i: number) => (num.has(i) ? ' class="num"' : '');
  const head = t.head.map((h, i) => `<th scope="col"${cls(i)}>${esc(h)}</th>`).join('');
  const body = t.rows.map((r) => `<tr>${r.map((c, i) => `<td${cls(i)}>${c}</td>`).join('')}</tr>`).join('');
  const caption = t.caption ? `<caption class="note">${esc(t.caption)}</caption>` : '';
  return `<div class="scroll"><table${t.className ? ` class="${t.className}"` : ''}>${caption}<thead><tr>${head}</tr></thead><tbody>${body}</tbody></table></div>`;
}

/** A chart with its caption and, when given, its table alternative in a details element. */
export function figure(ctx: Ctx, def: Omit<ChartDef, 'id'>, caption: string, alt?: string): string {
  const placeholder = ctx.chart(def);
  const details = alt ? `<details class="alt"><summary>Table of this chart</summary>${alt}</details>` : '';
  return `<figure class="chart">${placeholder}<figcaption>${esc(caption)}</figcaption>${details}</figure>`;
}
