/** A field team's work list: every error and warning finding in its rows, in row order. */
import type { Finding } from '@codeweir/check';
import { escapeHtml as esc } from './escape.ts';
import { formatNumber as num } from './format.ts';
import { type Ctx, table } from './context.ts';
import { findingTarget } from './teams.ts';
import { FINDINGS_LEFT_OUT } from './quality.ts';

/** Most rows listed; the counts stay exact and the findings section has every rule's rows. */
export const MAX_ROWS_TO_FIX = 500;

const ORDER = { error: 0, warning: 1, info: 2 } as const;

/**
 * On a team's own page: the rows the team has to fix (errors) or look at again (warnings), one
 * finding a line in delivery row order, so the list can go back to the field as it is. Writes
 * '' on the main report and when the team has none. Cost: O(findings log x log). Throws nothing.
 */
export function toFixSection(ctx: Ctx): string {
  if (!ctx.options.team) return '';
  if (ctx.input.disclosure?.findings) {
    const n = ctx.input.check.summary.findings;
    if ((n.bySeverity.error ?? 0) === 0 && (n.bySeverity.warning ?? 0) === 0) return '';
    return `<section id="to-fix" class="block"><h2>Rows to fix</h2><p class="note">${esc(FINDINGS_LEFT_OUT)}</p></section>`;
  }
  const list = ctx.input.check.findings.filter((f) => f.severity !== 'info').sort((a: Finding, b: Finding) => a.row - b.row || ORDER[a.severity] - ORDER[b.severity]);
  if (list.length === 0) return '';
  const shown = list.slice(0, MAX_ROWS_TO_FIX);
  const hasSuggestion = shown.some((f) => f.suggestion !== undefined);
  const rows = shown.map((f) => [
    num(f.row),
    `<code>${esc(f.id)}</code>`,
    findingTarget(ctx, f.item),
    `<code>${esc(f.value)}</code>`,
    `<span class="nobr"><span class="sev sev-${f.severity}">${esc(f.severity)}</span> <code>${esc(f.rule)}</code></span>`,
    esc(f.message),
    ...(hasSuggestion ? [f.suggestion === undefined ? '' : `<code>${esc(f.suggestion)}</code>`] : []),
  ]);
  const errors = list.filter((f) => f.severity === 'error').length;
  const note = `${num(errors)} ${errors === 1 ? 'error' : 'errors'} to fix and ${num(list.length - errors)} ${list.length - errors === 1 ? 'warning' : 'warnings'} to look at again, by delivery row (data rows, the header not counted)${
    shown.length < list.length ? `; the first ${num(shown.length)} are listed` : ''
  }. Outliers (info) are under Findings.`;
  return `<section id="to-fix" class="block"><h2>Rows to fix</h2><p class="note">${esc(note)}</p>${table({
    head: ['row', 'id', 'item', 'value', 'rule', 'message', ...(hasSuggestion ? ['suggestion'] : [])],
    numeric: [0],
    rows,
    className: 'wide',
  })}</section>`;
}
