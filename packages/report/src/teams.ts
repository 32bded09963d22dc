/**
 * Field teams: the first screen's table (one row per code of a group item: errors, warnings,
 * missing percent, worst items), one short section per team on the main page, and on a team's
 * own page the comparison of the team with the whole delivery.
 */
import type { Finding, GroupItemTally } from '@codeweir/check';
import { CodeweirError } from '@codeweir/core';
import type { CompiledCodebook } from '@codeweir/codebook';
import { escapeHtml as esc } from './escape.ts';
import { formatNumber as num, formatPercent as pct } from './format.ts';
import { type Ctx, table } from './context.ts';
import { unansweredOf, cellsOf, isFreeText } from './missingness.ts';
import { GROUP_INVALID, GROUP_MISSING, NO_ROW } from '@codeweir/check';

/** The key of rows whose group cell is missing or invalid, as one team page and one table row. */
export const UNASSIGNED = '(unassigned)';

/** One code of a group item, with its counts in the delivery. */
export interface TeamRow {
  /** check's group key: the code text, or UNASSIGNED. */
  key: string;
  /** The code's label and code, e.g. `North Reach [3]`. */
  name: string;
  /** Anchor and file-name stem, unique within the group item. */
  slug: string;
  rows: number;
  errors: number;
  warnings: number;
  info: number;
  /** Missing cells other than valid skips, over the cells of the items counted (0 to 100). */
  missingPercent: number;
  /** Items with the most error and warning findings in the team's rows, most first. */
  worst: Array<[string, number]>;
}

/**
 * The group item of the first screen: `groupBy` when given (it must be a group item), else the
 * codebook's first group item; undefined when the codebook has none.
 * Throws CodeweirError CW_USAGE naming the group items when `groupBy` is not one of them.
 */
export function chosenGroup(ctx: Pick<Ctx, 'input' | 'options'>): string | undefined {
  const want = ctx.options.groupBy;
  return want === undefined ? ctx.input.codebook.groupItems[0]?.name : groupItemOrThrow(ctx.input.codebook, want);
}

/**
 * `name` when it is a group item of the codebook. Throws CodeweirError CW_USAGE naming the
 * group items otherwise, e.g. `--split-by takes a group item, got "sex"; the codebook's group
 * items are district, team.` Cost: O(group items).
 */
export function groupItemOrThrow(codebook: CompiledCodebook, name: string): string {
  const groups = codebook.groupItems.map((g) => g.name);
  if (groups.includes(name)) return name;
  const known = groups.length > 0 ? `the codebook's group items are ${groups.join(', ')}` : 'the codebook has no group item (role "group")';
  throw new CodeweirError('CW_USAGE', `--split-by takes a group item, got ${JSON.stringify(name)}; ${known}.`);
}

/** A safe, unique file-name stem for each key: letters, digits, `-` and `_` only. */
function slugs(keys: readonly string[]): Map<string, string> {
  const out = new Map<string, string>();
  const used = new Set<string>();
  for (const key of keys) {
    const base = key === UNASSIGNED ? 'unassigned' : key.replace(/[^A-Za-z0-9_-]+/g, '_').replace(/^_+|_+$/g, '') || 'code';
    let slug = base;
    for (let i = 2; used.has(slug); i++) slug = `${base}-${i}`;
    used.add(slug);
    out.set(key, slug);
  }
  return out;
}

/** Sums tallies (the unassigned rows are the `(missing)` and `(invalid)` keys together). */
function addTally(a: GroupItemTally | undefined, b: GroupItemTally): GroupItemTally {
  if (!a) return { valid: b.valid, invalid: b.invalid, missing: { ...b.missing } };
  const missing = { ...a.missing };
  for (const [k, v] of Object.entries(b.missing)) missing[k as keyof typeof missing] = (missing[k as keyof typeof missing] ?? 0) + (v ?? 0);
  return { valid: a.valid + b.valid, invalid: a.invalid + b.invalid, missing };
}

/**
 * Each key's tallies by item for one group item, with `(missing)` and `(invalid)` joined as
 * UNASSIGNED. Cost: O(keys x items). Throws nothing.
 */
export function tallyByKey(ctx: Pick<Ctx, 'input'>, group: string): Map<string, Record<string, GroupItemTally>> {
  const byCode = ctx.input.check.summary.groups[group] ?? {};
  const out = new Map<string, Record<string, GroupItemTally>>();
  for (const [key, perItem] of Object.entries(byCode)) {
    const k = key === GROUP_MISSING || key === GROUP_INVALID ? UNASSIGNED : key;
    const into = out.get(k) ?? {};
    for (const [item, t] of Object.entries(perItem)) into[item] = addTally(into[item], t);
    out.set(k, into);
  }
  return out;
}

/** The group key of a finding's row, UNASSIGNED for a row without a valid group code, undefined for no row. */
export function keyOfFinding(f: Finding, group: string): string | undefined {
  const k = f.groups?.[group];
  if (k === undefined) return undefined;
  return k === GROUP_MISSING || k === GROUP_INVALID || k === '' ? UNASSIGNED : k;
}

/** Rows of a key: every cell of a row is tallied once per item, so any item's cells count the rows. */
function rowsOf(perItem: Record<string, GroupItemTally>, group: string): number {
  const t = perItem[group] ?? Object.values(perItem)[0];
  return t ? cellsOf(t) : 0;
}

/** Missing percent of a set of tallies: valid skips not counted, free text and group items left out. */
export function missingPercentOf(ctx: Pick<Ctx, 'input' | 'item'>, perItem: Record<string, GroupItemTally>): number {
  let missing = 0;
  let cells = 0;
  for (const [name, t] of Object.entries(perItem)) {
    const item = ctx.item(name);
    if (item?.role === 'group' || isFreeText(ctx, name)) continue;
    missing += unansweredOf(t);
    cells += cellsOf(t);
  }
  return cells === 0 ? 0 : (100 * missing) / cells;
}

/** Rules whose findings the log keeps only in part: per-team counts of them are lower bounds. */
export function cappedRules(ctx: Pick<Ctx, 'input'>): string[] {
  // Under suppression the page holds no findings: which rules are capped was noted before.
  const shown = ctx.input.disclosure?.findings;
  if (shown) return shown.capped;
  const logged = new Map<string, number>();
  for (const f of ctx.input.check.findings) logged.set(f.rule, (logged.get(f.rule) ?? 0) + 1);
  return Object.entries(ctx.input.check.summary.findings.byRule)
    .filter(([r, n]) => (logged.get(r) ?? 0) < (n ?? 0))
    .map(([r]) => r);
}

/**
 * One row per code of the group item, in codebook order (codes with no rows included), then the
 * codes the codebook does not know, then the rows without a valid code. Counts of findings
 * come from the findings log. Cost: O(findings + keys x items). Throws nothing.
 */
export function teamRows(ctx: Pick<Ctx, 'input' | 'item'>, group: string): TeamRow[] {
  const groupItem = ctx.item(group);
  const tallies = tallyByKey(ctx, group);
  const keys = (groupItem?.codes ?? []).map((c) => c.text);
  for (const k of tallies.keys()) if (!keys.includes(k) && k !== UNASSIGNED) keys.push(k);
  if (tallies.has(UNASSIGNED)) keys.push(UNASSIGNED);
  const slugOf = slugs(keys);
  const counts = new Map<string, { error: number; warning: number; info: number; items: Map<string, number> }>();
  for (const f of ctx.input.check.findings) {
    const k = keyOfFinding(f, group);
    if (k === undefined) continue;
    let c = counts.get(k);
    if (!c) counts.set(k, (c = { error: 0, warning: 0, info: 0, items: new Map() }));
    c[f.severity]++;
    if (f.severity !== 'info') c.items.set(f.item, (c.items.get(f.item) ?? 0) + 1);
  }
  const shown = ctx.input.disclosure?.findings?.groups.get(group);
  return keys.map((key) => {
    const perItem = tallies.get(key) ?? {};
    const own = shown?.get(key);
    // Under suppression the counts are the shared suppression's, and the worst items are left out.
    const c = shown ? { ...(own ?? { error: 0, warning: 0, info: 0 }), items: new Map<string, number>() } : counts.get(key);
    const idx = groupItem?.codeByText.get(key);
    const name = key === UNASSIGNED ? `no valid ${group} code` : idx === undefined ? `[${key}] (not in the codebook)` : `${groupItem!.codes[idx]!.label} [${key}]`;
    return {
      key,
      name,
      slug: slugOf.get(key)!,
      rows: rowsOf(perItem, group),
      errors: c?.error ?? 0,
      warnings: c?.warning ?? 0,
      info: c?.info ?? 0,
      missingPercent: missingPercentOf(ctx, perItem),
      worst: [...(c?.items ?? [])].sort((a, b) => b[1] - a[1] || a[0].localeCompare(b[0])).slice(0, 3),
    };
  });
}

const count = (n: number, one: string) => `${num(n)} ${n === 1 ? one : `${one}s`}`;

/** The anchor of a team's section on the main page. */
export function teamAnchor(group: string, slug: string): string {
  return `team-${group}-${slug}`.replace(/[^A-Za-z0-9_-]+/g, '_');
}

/** What a finding's `item` names: an item, a cross-item rule (rule-failed), or the whole row. */
export function findingTarget(ctx: Pick<Ctx, 'item'>, name: string): string {
  if (name === '') return 'whole row';
  return ctx.item(name) ? `<code>${esc(name)}</code>` : `<span class="nobr">rule <code>${esc(name)}</code></span>`;
}

/** A team's worst items as `item 3, rule college-age 1`, each kept on one line; `none` when there are none. */
export const worstText = (ctx: Pick<Ctx, 'item' | 'input'>, worst: Array<[string, number]>) =>
  ctx.input.disclosure?.findings ? '-' : worst.length === 0 ? '<span class="none">none</span>' : worst.map(([n, c]) => `<span class="nobr">${findingTarget(ctx, n)} ${num(c)}</span>`).join(', ');

/** The table of one group item's codes, with a row for the whole delivery. */
function groupTable(ctx: Ctx, group: string, withPages: boolean, linked = true): string {
  const rows = teamRows(ctx, group);
  const summary = ctx.input.check.summary;
  const pages = withPages ? ctx.options.pages : undefined;
  const lower = cappedRules(ctx).length > 0 ? '≥ ' : '';
  const noRow = ctx.input.disclosure?.findings?.groups.get(group)?.get(NO_ROW);
  const fileErrors = noRow ? noRow.error : ctx.input.check.findings.filter((f) => f.row <= 0 && f.severity === 'error').length;
  const fileWarnings = noRow ? noRow.warning : ctx.input.check.findings.filter((f) => f.row <= 0 && f.severity === 'warning').length;
  const body = rows.map((r) => {
    const page = pages?.byCode[r.key];
    const label = r.rows === 0 ? `${esc(r.name)} <span class="note">no rows</span>` : linked ? `<a href="#${teamAnchor(group, r.slug)}">${esc(r.name)}</a>` : esc(r.name);
    return [
      label,
      num(r.rows),
      r.errors !== 0 ? `<span class="n-error">${lower}${num(r.errors)}</span>` : '0',
      r.warnings !== 0 ? `<span class="n-warning">${lower}${num(r.warnings)}</span>` : '0',
      r.rows !== 0 ? pct(r.missingPercent) : '-',
      `<span class="worst">${r.rows !== 0 ? worstText(ctx, r.worst) : ''}</span>`,
      ...(pages ? [page ? `<a href="${esc(page)}">page</a>` : ''] : []),
    ];
  });
  const extra: string[][] = [];
  if (fileErrors !== 0 || fileWarnings !== 0) {
    extra.push([esc('in no row (header, whole columns)'), '', num(fileErrors), num(fileWarnings), '', '<a href="#findings">see Findings</a>', ...(pages ? [''] : [])]);
  }
  const totalErrors = summary.findings.bySeverity.error ?? 0;
  const totalWarnings = summary.findings.bySeverity.warning ?? 0;
  const all = ['all rows', num(summary.rows), num(totalErrors), num(totalWarnings), pct(missingPercentOf(ctx, summary.items)), '', ...(pages ? [`<a href="${esc(pages.index)}">index</a>`] : [])];
  const html = table({
    head: [ctx.item(group)?.label ? `${group} (${ctx.item(group)!.label})` : group, 'rows', 'errors', 'warnings', 'missing %', 'worst items', ...(pages ? ['own page'] : [])],
    numeric: [1, 2, 3, 4],
    rows: [...body, ...extra, all],
    className: 'wide teams',
  });
  // Mark the last row (the whole delivery) as the total: the table helper writes plain rows.
  return html.replace(/<tr>(?![^]*<tr>)/, '<tr class="total">');
}

/**
 * The first screen's table of field teams: the chosen group item's codes with errors,
 * warnings, missing percent and worst items, each linked to the team's section (and, in a
 * split report, its own page). Writes '' when the codebook has no group item (the verdict's
 * reason then names the items behind the findings); on a team's page, the team beside the
 * whole delivery instead.
 */
export function teamsSection(ctx: Ctx): string {
  if (ctx.options.team) return comparisonSection(ctx);
  const group = chosenGroup(ctx);
  if (group === undefined) return '';
  const others = ctx.input.codebook.groupItems.map((g) => g.name).filter((g) => g !== group);
  const capped = cappedRules(ctx);
  const notes = [
    'Missing % leaves out valid skips and free text. Worst items: the most error and warning findings in the team’s rows.',
    ...(capped.length > 0 ? [`≥: the findings log keeps only the first findings of ${capped.join(', ')}; a team’s counts are the logged ones.`] : []),
    ...(others.length > 0 ? [`By ${others.join(', ')}: see Field teams below.`] : []),
  ];
  return `<section id="teams" class="block"><h2>By ${esc(group)}${ctx.item(group) ? `: ${esc(ctx.item(group)!.label)}` : ''}</h2>
${groupTable(ctx, group, true)}<p class="note">${esc(notes.join(' '))}</p></section>`;
}

/** Items of a team worth a supervisor's look: findings first, then missing percent above all rows. */
function teamItems(ctx: Ctx, group: string, row: TeamRow, perItem: Record<string, GroupItemTally>): string {
  if (ctx.input.disclosure?.findings) return '<p class="none">Under --min-cell a team’s counts of findings by item are left out: no table adds them up, so they could not be protected.</p>';
  const counts = new Map<string, { e: number; w: number }>();
  for (const f of ctx.input.check.findings) {
    if (keyOfFinding(f, group) !== row.key || f.severity === 'info') continue;
    const c = counts.get(f.item) ?? { e: 0, w: 0 };
    if (f.severity === 'error') c.e++;
    else c.w++;
    counts.set(f.item, c);
  }
  const whole = ctx.input.check.summary.items;
  const pctOf = (t: GroupItemTally | undefined) => (t && cellsOf(t) > 0 ? (100 * unansweredOf(t)) / cellsOf(t) : 0);
  const names = [...new Set([...Object.keys(perItem), ...counts.keys()])].filter((n) => n !== group && !isFreeText(ctx, n));
  const scored = names
    .map((n) => ({ n, e: counts.get(n)?.e ?? 0, w: counts.get(n)?.w ?? 0, mine: pctOf(perItem[n]), all: pctOf(whole[n]) }))
    .filter((x) => x.e + x.w > 0 || x.mine - x.all >= 5)
    .sort((a, b) => b.e + b.w - (a.e + a.w) || b.mine - b.all - (a.mine - a.all))
    .slice(0, 4);
  if (scored.length === 0) return '<p class="none">No findings and no item with a missing percent well above all rows.</p>';
  return table({
    head: ['item', 'errors', 'warnings', 'missing %', 'all rows'],
    numeric: [1, 2, 3, 4],
    rows: scored.map((x) => [findingTarget(ctx, x.n), num(x.e), num(x.w), x.mine - x.all >= 5 ? `<span class="worse">${pct(x.mine)}</span>` : pct(x.mine), pct(x.all)]),
    className: 'wide',
  });
}

/**
 * One short section per code of every group item on the main page: its counts, the items to
 * look at, a link to its own page in a split report. The first screen's table links here.
 */
export function teamSectionsSection(ctx: Ctx): string {
  if (ctx.options.team) return '';
  const chosen = chosenGroup(ctx);
  if (chosen === undefined) return '';
  const groups = [chosen, ...ctx.input.codebook.groupItems.map((g) => g.name).filter((g) => g !== chosen)];
  const blocks = groups.map((group) => {
    const title = ctx.item(group)?.label ? `${group}: ${ctx.item(group)!.label}` : group;
    // The chosen group item's codes get a card each (the first screen links to them); the
    // other group items get their table.
    if (group !== chosen) return `<h3 class="section-title">${esc(title)}</h3>${groupTable(ctx, group, false, false)}`;
    const tallies = tallyByKey(ctx, group);
    const pages = ctx.options.pages;
    const cards = teamRows(ctx, group)
      .filter((r) => r.rows !== 0)
      .map((r) => {
        const page = pages?.byCode[r.key];
        const head = `<h3>${esc(r.name)}</h3><p class="note">${esc(`${count(r.rows, 'row')}; ${count(r.errors, 'error')}, ${count(r.warnings, 'warning')}; missing ${pct(r.missingPercent)}`)}${page ? ` &middot; <a href="${esc(page)}">the team’s own page</a>` : ''}</p>`;
        return `<article class="card" id="${teamAnchor(group, r.slug)}">${head}${teamItems(ctx, group, r, tallies.get(r.key) ?? {})}</article>`;
      })
      .join('');
    return `<h3 class="section-title">${esc(title)}</h3><div class="team-cards">${cards}</div>`;
  });
  return `<section id="field-teams"><h2 class="section-title">Field teams</h2><p class="note">Per team: the items with findings in its rows, or with a missing percent at least 5 points above all rows (a first look, not a test).</p>${blocks.join('')}</section>`;
}

/** A team page's first table: the team beside the whole delivery. */
function comparisonSection(ctx: Ctx): string {
  const team = ctx.options.team!;
  const mine = ctx.input.check.summary;
  const whole = team.whole;
  const wholeCtx = { input: { ...ctx.input, check: { ...ctx.input.check, summary: whole } }, item: ctx.item };
  const line = (who: string, s: typeof mine, c: Pick<Ctx, 'input' | 'item'>) => [
    who,
    num(s.rows),
    num(s.findings.bySeverity.error ?? 0),
    num(s.findings.bySeverity.warning ?? 0),
    pct(missingPercentOf(c, s.items)),
  ];
  const rows = [line('this team', mine, ctx), line('all rows', whole, wholeCtx)];
  return `<section id="teams" class="block"><h2>${esc(team.name)} beside the whole delivery</h2>${table({ head: ['', 'rows', 'errors', 'warnings', 'missing %'], numeric: [1, 2, 3, 4], rows })}
<p class="note">Missing % leaves out valid skips and free text. Findings are the delivery’s findings in the team’s rows: outlier fences are those of the whole delivery. Item summaries below are computed from the team’s rows alone.</p></section>`;
}
