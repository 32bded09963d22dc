/**
 * The glossary: the words of the report, the conventions of every statistic shown, and the
 * statistics withheld by level, each said once. Item and pair cards link here and state only
 * what is particular to them.
 */
import type { ItemDescription } from '@codeweir/describe';
import { escapeHtml as esc } from './escape.ts';
import type { Ctx } from './context.ts';

/** The glossary group of an item: its level, with binned items apart (they have bins to use). */
export function levelGroup(d: Pick<ItemDescription, 'level' | 'binned'>): string {
  return d.binned ? `${d.level} (binned)` : d.level;
}

/** The anchor of a level group's withheld list. */
export function withheldAnchor(group: string): string {
  return `withheld-${group.replace(/[^a-z0-9]+/gi, '-').replace(/-+$/, '')}`;
}

/**
 * Withheld statistics shared by every described item of a level group: statistic -> reason,
 * kept only where every item of the group withholds it for the same reason. Cost: O(items x
 * statistics). Throws nothing.
 */
export function commonWithheld(items: Record<string, ItemDescription>): Map<string, Map<string, string>> {
  const out = new Map<string, Map<string, string>>();
  for (const d of Object.values(items)) {
    const g = levelGroup(d);
    const seen = out.get(g);
    if (!seen) {
      out.set(g, new Map(Object.entries(d.withheld)));
      continue;
    }
    for (const [stat, why] of seen) if (d.withheld[stat] !== why) seen.delete(stat);
  }
  return out;
}

/** An item's withheld statistics that its level group does not share: what its card must say. */
export function particularWithheld(ctx: Ctx, d: ItemDescription): Array<[string, string]> {
  const common = ctx.glossary.withheld.get(levelGroup(d));
  return Object.entries(d.withheld).filter(([stat, why]) => common?.get(stat) !== why);
}

/** An item's or pair's conventions that differ from the report-wide ones the glossary lists. */
export function particularConventions(ctx: Ctx, own: Record<string, string> | undefined): Array<[string, string]> {
  const all = ctx.input.describe.conventions;
  return Object.entries(own ?? {}).filter(([k, v]) => all[k] !== v);
}

/** Withheld statistics as one line per reason, naming every statistic it covers. */
export function withheldLines(entries: Iterable<[string, string]>): string {
  const byReason = new Map<string, string[]>();
  for (const [stat, why] of entries) {
    let list = byReason.get(why);
    if (!list) byReason.set(why, (list = []));
    list.push(stat);
  }
  return [...byReason].map(([why, stats]) => `<li>${stats.map((s) => `<strong>${esc(s)}</strong>`).join(', ')}: ${esc(why)}</li>`).join('');
}

/** Key: text pairs as a list. */
export function conventionLines(entries: ReadonlyArray<[string, string]>): string {
  return entries.map(([k, v]) => `<li><strong>${esc(k)}</strong>: ${esc(v)}</li>`).join('');
}

const TERMS: Array<[string, string]> = [
  ['valid', 'a cell holding one of the item’s codes, or a value of its type inside its range; every statistic is computed from valid cells only.'],
  ['missing', 'a blank cell, or one of the codebook’s declared missing codes (refused, don’t know, valid skip and so on); a missing code is never counted as a number.'],
  ['valid skip', 'the declared not-applicable code: the routing of the questionnaire skipped the question. Missing percents in the field-team tables and heat maps leave valid skips out, since they are not gaps.'],
  ['invalid', 'a cell that is neither valid nor missing (text in a number, an unknown code, a value outside the range); each one is a finding.'],
  ['missing % (field teams)', 'missing cells other than valid skips, over all cells of the items that are not free text and not the group item itself.'],
  ['error, warning, info', 'the severity of a finding: errors reject the delivery, warnings are to be reviewed, info findings (outliers) are for reading.'],
  ['accepted', 'a delivery with no finding at error severity.'],
  ['worst items', 'a team’s items with the most error and warning findings in its rows, most first.'],
];

/** The glossary section: terms, conventions, and the statistics withheld by level. */
export function glossarySection(ctx: Ctx): string {
  const d = ctx.input.describe;
  const conventions: Array<[string, string]> = [
    ['quantiles', `Hyndman-Fan type ${d.quantileType}`],
    ['outliers', 'Tukey fences: beyond 1.5 x IQR from the quartiles is an outlier, beyond 3 x IQR an extreme'],
    ['pairs', d.listwise ? 'listwise: rows valid on every item of the pairs' : 'pairwise complete: rows where both items are valid'],
    ...(d.weight ? ([['weight', `weighted statistics use ${d.weight}`]] as Array<[string, string]>) : []),
    ...Object.entries(d.conventions),
  ];
  const terms = TERMS.map(([t, v]) => `<dt>${esc(t)}</dt><dd>${esc(v)}</dd>`).join('');
  const groups = [...ctx.glossary.withheld]
    .filter(([, m]) => m.size > 0)
    .map(([g, m]) => `<h4 id="${withheldAnchor(g)}">${esc(g)} items</h4><ul class="plain withheld">${withheldLines(m)}</ul>`)
    .join('');
  return `<section id="glossary" class="block"><h2>Glossary</h2>
<h3>Words</h3><dl class="glossary">${terms}</dl>
<h3 id="conventions">Conventions</h3><ul class="plain conventions">${conventionLines(conventions)}</ul>
<p class="note">Statistics describe valid cells only. An item card lists a convention or a withheld statistic only where it differs from this list.</p>
${groups ? `<h3>Statistics withheld by level</h3><p class="note">A level of measurement does not support every statistic; these are left out of every item of the level, for the reason given.</p>${groups}` : ''}</section>`;
}
