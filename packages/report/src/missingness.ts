/** Missingness: counts by kind per item, and items x groups heat maps of percent missing. */
import type { GroupItemTally, ItemTally } from '@codeweir/check';
import type { MissingTally } from '@codeweir/codebook';
import { MISSING_KINDS } from '@codeweir/codebook';
import { escapeHtml as esc } from './escape.ts';
import { formatNumber as num, formatPercent as pct } from './format.ts';
import { type Ctx, table, figure, itemTitle } from './context.ts';
import { missingHeatmap, type HeatCell } from './charts.ts';

const KINDS: readonly MissingTally[] = ['blank', ...MISSING_KINDS];

function missingTotal(t: Pick<GroupItemTally, 'missing'>): number {
  let s = 0;
  for (const v of Object.values(t.missing)) s += v ?? 0;
  return s;
}

/** Every cell of an item: valid, invalid and missing. */
export function cellsOf(t: GroupItemTally | ItemTally): number {
  return t.valid + t.invalid + missingTotal(t);
}

/** Percent (0 to 100) of an item's cells that are missing other than by a valid skip. */
export function percentMissing(t: GroupItemTally | ItemTally): number {
  const cells = cellsOf(t);
  return cells === 0 ? 0 : (100 * unansweredOf(t)) / cells;
}

/** Missing cells other than valid skips: a skip is the questionnaire's routing, not a gap. */
export function unansweredOf(t: GroupItemTally | ItemTally): number {
  return missingTotal(t) - (t.missing['not-applicable'] ?? 0);
}

function heatCell(row: string, column: string, t: GroupItemTally | ItemTally): HeatCell {
  const cells = cellsOf(t);
  const missing = unansweredOf(t);
  return { row, column, percent: cells === 0 ? 0 : (100 * missing) / cells, missing, cells };
}

export function missingnessSection(ctx: Ctx): string {
  const { summary } = ctx.input.check;
  const names = ctx.input.codebook.items.map((i) => i.name).filter((n) => summary.items[n] !== undefined);
  const kinds = KINDS.filter((k) => names.some((n) => (summary.items[n]!.missing[k] ?? 0) > 0));
  const whole = ctx.options.team?.whole.items;
  // The percent (and the whole delivery's, on a team's page) first: a reader acts on those; the
  // counts by kind follow for the detail.
  const head = ['item', 'missing %', ...(whole ? ['all rows'] : []), 'missing', 'valid', 'invalid', ...kinds.map((k) => (k === 'invalid' ? 'invalid (declared code)' : k))];
  const byKind = table({
    head,
    numeric: head.map((_, i) => i).slice(1),
    rows: names.map((n) => {
      const t = summary.items[n]!;
      const mine = percentMissing(t);
      const all = whole?.[n] ? percentMissing(whole[n]!) : undefined;
      const shown = all !== undefined && mine - all >= 5 ? `<span class="worse">${pct(mine)}</span>` : pct(mine);
      return [nameWithLabel(ctx, n), shown, ...(whole ? [pct(all)] : []), num(missingTotal(t)), num(t.valid), num(t.invalid), ...kinds.map((k) => num(t.missing[k] ?? 0))];
    }),
    className: 'missing',
  });
  const heatmaps = Object.entries(summary.groups).map(([group, byCode]) => groupHeatmap(ctx, group, byCode, names)).join('');
  const records = recordMissing(ctx);
  // On a team's page the table is the section's substance; on the main page the heat maps are,
  // and the table (whose counts the item index also gives) opens on demand.
  const open = ctx.options.team ? ' open' : '';
  return `<section id="missingness" class="block"><h2>Missingness</h2>
<p class="note">Blank is an empty cell; the other kinds are the codebook's declared missing codes. Invalid cells are neither valid nor missing. Missing % leaves out valid skips (not-applicable), which follow the routing${ctx.options.team ? '; all rows: the same for the whole delivery, in orange where the team is 5 points or more above it' : ''}.</p>
${heatmaps ? `<div class="heatmaps">${heatmaps}</div>` : ''}<details class="table"${open}><summary>Missing cells by kind, item by item</summary>${byKind}</details>${records}</section>`;
}

/** The item's name in code style, its label as the hover title: for wide tables of many items. */
function nameWithLabel(ctx: Ctx, name: string): string {
  const label = ctx.item(name)?.label;
  return label ? `<code title="${esc(label)}">${esc(name)}</code>` : `<code>${esc(name)}</code>`;
}

function groupHeatmap(ctx: Ctx, group: string, byCode: Record<string, Record<string, GroupItemTally>>, names: readonly string[]): string {
  const groupItem = ctx.item(group);
  const summary = ctx.input.check.summary;
  const codes = Object.keys(byCode);
  const order = (c: string) => groupItem?.codeByText.get(c) ?? Number.MAX_SAFE_INTEGER;
  codes.sort((a, b) => order(a) - order(b) || a.localeCompare(b, 'en', { numeric: true }));
  const labelOf = (c: string) => {
    const i = groupItem?.codeByText.get(c);
    return i === undefined ? c : `${groupItem!.codes[i]!.label} [${c}]`;
  };
  const allLabel = 'all rows';
  const columns = [allLabel, ...codes.map(labelOf)];
  // Free text is blank by design on most rows; its counts stay in the table above.
  const rows = names.filter((n) => n !== group && !isFreeText(ctx, n));
  const cells: HeatCell[] = [];
  for (const n of rows) {
    cells.push(heatCell(n, allLabel, summary.items[n]!));
    for (const c of codes) {
      const g = byCode[c]![n];
      if (g) cells.push(heatCell(n, labelOf(c), g));
    }
  }
  const groupText = groupItem ? `${group} (${groupItem.label})` : group;
  const title = `Percent missing by ${groupText}, valid skips not counted`;
  const description = `Heat map of the percent of cells missing for any reason other than a valid skip, for ${rows.length} items (rows) in ${codes.length} groups of ${groupText} and in all rows (columns); darker is more missing.`;
  const cellOf = new Map(cells.map((c) => [`${c.row}\u0000${c.column}`, c]));
  const alt = table({
    head: ['item', ...columns],
    numeric: columns.map((_, i) => i + 1),
    rows: rows.map((n) => [
      `<code>${esc(n)}</code>`,
      ...columns.map((col) => {
        const c = cellOf.get(`${n}\u0000${col}`);
        return c ? `${pct(c.percent)} <span class="note">(${num(c.missing)}/${num(c.cells)})</span>` : '-';
      }),
    ]),
  });
  return `<div class="heatmap"><h3>By ${itemTitle(ctx, group)}</h3>${figure(
    ctx,
    missingHeatmap(title, description, rows, columns, cells),
    'Percent of cells missing other than by a valid skip; shading from 0 to the largest percent (at least 10). Hover a cell for its counts. Free-text items are left out.',
    alt,
  )}</div>`;
}

/** A text item without codes (not the id): blank by design on most rows. */
export function isFreeText(ctx: Pick<Ctx, 'item'>, name: string): boolean {
  const item = ctx.item(name);
  return item !== undefined && item.type === 'text' && item.codes.length === 0 && item.role !== 'id';
}

function recordMissing(ctx: Ctx): string {
  const rm = ctx.input.check.summary.recordMissing;
  if (!rm || rm.length === 0) return '';
  const total = rm.reduce((a, b) => a + b, 0);
  const rows = rm.map((count, k) => [num(k), num(count), pct(total === 0 ? 0 : (100 * count) / total)]).filter((_, k) => rm[k]! > 0);
  return `<details class="table"><summary>Records by number of items missing</summary>${table({ head: ['items missing', 'records', '% of records'], numeric: [0, 1, 2], rows })}</details>`;
}
