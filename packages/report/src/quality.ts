/** The check half of the report: verdict, header problems, findings, cross-item rules. */
import type { Finding, FindingRule, FindingSeverity } from '@codeweir/check';
import { escapeHtml as esc } from './escape.ts';
import { formatNumber as num, formatPercent as pct } from './format.ts';
import { rules as RULE_DEFS } from '@codeweir/check';
import { type Ctx, table } from './context.ts';
import { findingTarget } from './teams.ts';
import { keyRuleAt } from '@codeweir/check';

const plural = (n: number, one: string, many = `${one}s`) => `${num(n)} ${n === 1 ? one : many}`;

/** A count for ordering: a suppressed one (NaN) as 0, so that its place says nothing of it. */
export const sortable = (n: number | undefined): number => (n === undefined || Number.isNaN(n) ? 0 : n);

/** Where the findings are when a page leaves their list out (under --min-cell). */
export const FINDINGS_LEFT_OUT =
  'Under --min-cell the findings are not listed one by one here: counting them would give the suppressed counts back. They are in the findings log (check --out), and each team’s in its folder of check --split-by, for the data manager and the team whose records they list.';

/** True when the delivery has no error findings (check's own `accepted` when it set one). */
export function isAccepted(ctx: Ctx): boolean {
  const s = ctx.input.check.summary;
  return s.accepted ?? (s.findings.bySeverity.error ?? 0) === 0;
}

/**
 * How many findings of a rule have a severity. A cross-item rule (`rule-failed`) carries the
 * severity each codebook rule gives it: counted exactly from the rules' failed counts where
 * check gave them, else from the findings log; every other rule has one severity, that of its
 * findings (or the rule's default).
 */
export function ruleCount(ctx: Ctx, rule: FindingRule, severity: FindingSeverity): number {
  const { summary, findings } = ctx.input.check;
  const shown = ctx.input.disclosure?.findings;
  if (shown) return shown.ruleAt.get(keyRuleAt(rule, severity)) ?? 0;
  if (rule === 'rule-failed') {
    const defs = ctx.input.codebook.rules;
    if (Object.keys(summary.rules).length > 0) return defs.filter((d) => d.severity === severity).reduce((a, d) => a + (summary.rules[d.id]?.failed ?? 0), 0);
    return findings.filter((f) => f.rule === rule && f.severity === severity).length;
  }
  const own = findings.find((f) => f.rule === rule)?.severity ?? RULE_DEFS[rule]?.severity ?? 'error';
  return own === severity ? (summary.findings.byRule[rule] ?? 0) : 0;
}

/** The severities a rule's findings have, most severe first. */
export function severitiesOf(ctx: Ctx, rule: FindingRule): FindingSeverity[] {
  return (['error', 'warning', 'info'] as const).filter((s) => ruleCount(ctx, rule, s) !== 0);
}

/** A rule's most severe severity among its findings. */
function severityOf(ctx: Ctx, rule: FindingRule): FindingSeverity {
  return severitiesOf(ctx, rule)[0] ?? RULE_DEFS[rule]?.severity ?? 'error';
}

/** Rules with findings, errors first, then by count. */
function rulesWithFindings(ctx: Ctx): FindingRule[] {
  const byRule = ctx.input.check.summary.findings.byRule;
  return (Object.keys(byRule) as FindingRule[])
    .filter((r) => (byRule[r] ?? 0) !== 0)
    .sort((a, b) => SEVERITY_ORDER[severityOf(ctx, a)] - SEVERITY_ORDER[severityOf(ctx, b)] || sortable(byRule[b]) - sortable(byRule[a]) || a.localeCompare(b));
}

/**
 * What a rule's findings hit, most first: `[item, count]` from the item tallies, or, for rules
 * whose findings name no item (cross-item rules, ragged rows), from the findings log (only those
 * of `severity` when given).
 */
function itemsOfRule(ctx: Ctx, rule: FindingRule, severity?: FindingSeverity): Array<[string, number]> {
  let counts = Object.entries(ctx.input.check.summary.items).map(([name, t]): [string, number] => [name, t.findings[rule] ?? 0]);
  if (!counts.some(([, n]) => n !== 0)) {
    const m = new Map<string, number>();
    for (const f of ctx.input.check.findings) if (f.rule === rule && (severity === undefined || f.severity === severity)) m.set(f.item, (m.get(f.item) ?? 0) + 1);
    counts = [...m];
  }
  return counts.filter(([, n]) => n !== 0).sort((a, b) => sortable(b[1]) - sortable(a[1]) || a[0].localeCompare(b[0]));
}

/** "not-a-code 23 (water_src 12, edu 11)" for the largest rules of one severity. */
function ruleReasons(ctx: Ctx, severity: FindingSeverity, most = 3): string {
  const rules = rulesWithFindings(ctx)
    .filter((r) => ruleCount(ctx, r, severity) !== 0)
    .sort((a, b) => sortable(ruleCount(ctx, b, severity)) - sortable(ruleCount(ctx, a, severity)));
  const parts = rules.slice(0, most).map((r) => {
    const items = itemsOfRule(ctx, r, severity);
    const where = items.length === 0 ? '' : ` (${items.slice(0, 2).map(([n, c]) => `${findingTarget(ctx, n)} ${num(c)}`).join(', ')}${items.length > 2 ? ', …' : ''})`;
    return `<code>${esc(r)}</code> ${num(ruleCount(ctx, r, severity))}${where}`;
  });
  if (rules.length > most) parts.push(esc(`${rules.length - most} more ${rules.length - most === 1 ? 'rule' : 'rules'}`));
  return parts.join('; ');
}

/**
 * The verdict and its reason: accepted or not, the counts, and the rules and items behind the
 * errors (or the warnings to review). On a field team's page: what the team has to fix, with
 * the delivery's own verdict beside it.
 */
export function verdictSection(ctx: Ctx): string {
  const { summary } = ctx.input.check;
  const errors = summary.findings.bySeverity.error ?? 0;
  const warnings = summary.findings.bySeverity.warning ?? 0;
  const info = summary.findings.bySeverity.info ?? 0;
  const team = ctx.options.team;
  const accepted = team ? errors === 0 : isAccepted(ctx);
  const rows = plural(summary.rows, 'row');
  const badge = team ? (errors === 0 ? 'No errors' : `${plural(errors, 'error')} to fix`) : accepted ? 'Accepted' : 'Not accepted';
  const sentence = team
    ? `${team.name}: ${plural(errors, 'error')} and ${plural(warnings, 'warning')} in the team’s ${rows}.`
    : accepted
      ? `No error findings in ${rows}; ${plural(warnings, 'warning')} to review.`
      : `${plural(errors, 'error')} and ${plural(warnings, 'warning')} in ${rows}.`;
  const reasons: string[] = [];
  if (errors !== 0) reasons.push(`${team ? 'To fix' : 'Rejected for'}: ${ruleReasons(ctx, 'error')}.`);
  const h = summary.header;
  const headerProblems = h.missing.length + h.unexpected.length + h.duplicate.length;
  if (!team && headerProblems > 0) reasons.push(esc(`Header: ${plural(headerProblems, 'column problem')} (see Header).`));
  if (warnings !== 0) reasons.push(`To review: ${ruleReasons(ctx, 'warning')}.`);
  if (team) {
    const whole = team.whole;
    const wErrors = whole.findings.bySeverity.error ?? 0;
    const wAccepted = whole.accepted ?? wErrors === 0;
    reasons.push(esc(`The delivery as a whole is ${wAccepted ? 'accepted' : 'not accepted'} (${plural(wErrors, 'error')} in ${plural(whole.rows, 'row')}).`));
  }
  const capped = ctx.options.team?.capped ? `<p class="note">${esc(ctx.options.team.capped)}</p>` : '';
  const fact = (dt: string, dd: string) => `<div><dt>${esc(dt)}</dt><dd>${dd}</dd></div>`;
  const cb = ctx.input.codebook;
  return `<section id="verdict" class="block verdict ${accepted ? 'accepted' : 'rejected'}" aria-label="Verdict">
<div class="badge">${esc(badge)}</div>
<div><p class="sentence">${esc(sentence)}</p>${reasons.map((r) => `<p class="reason">${r}</p>`).join('')}${capped}</div>
<dl class="facts">${[
    fact('rows', num(summary.rows)),
    ...(team ? [fact('of the delivery', pct((100 * summary.rows) / Math.max(1, team.whole.rows)))] : []),
    fact('errors', num(errors)),
    fact('warnings', num(warnings)),
    fact('info', num(info)),
    fact('codebook', `<code>${esc(summary.codebook.codebook || cb.id)}</code> ${esc(summary.codebook.version || cb.version)}`),
  ].join('')}</dl>
</section>`;
}

export function headerSection(ctx: Ctx): string {
  const h = ctx.input.check.summary.header;
  const lines: string[] = [];
  const list = (what: string, names: string[]) => {
    if (names.length > 0) lines.push(`<li>${esc(what)}: ${names.map((n) => `<code>${esc(n)}</code>`).join(', ')}</li>`);
  };
  list('Columns the codebook expects that are missing', h.missing);
  list('Columns the codebook does not know', h.unexpected);
  list('Column names that appear more than once', h.duplicate);
  if (h.outOfOrder) lines.push('<li>The columns are not in the codebook order.</li>');
  const body = lines.length > 0 ? `<ul class="plain">${lines.join('')}</ul>` : '<p class="none">The header matches the codebook.</p>';
  return `<section id="header" class="block"><h2>Header</h2>${body}</section>`;
}

const SEVERITY_ORDER: Record<FindingSeverity, number> = { error: 0, warning: 1, info: 2 };

function severityTag(s: FindingSeverity): string {
  return `<span class="sev sev-${s}">${esc(s)}</span>`;
}

/** A rule's severity tags, with the count of each when its findings have more than one. */
function severityTags(ctx: Ctx, rule: FindingRule): string {
  const all = severitiesOf(ctx, rule);
  if (all.length <= 1) return severityTag(all[0] ?? severityOf(ctx, rule));
  return all.map((s) => `${severityTag(s)}&nbsp;${num(ruleCount(ctx, rule, s))}`).join(' ');
}

/**
 * Findings: one table by rule (severity, count, the items it hit), then each rule's first rows
 * in a `details` element the table links to.
 */
export function findingsSection(ctx: Ctx): string {
  const { summary, findings } = ctx.input.check;
  const byRule = new Map<FindingRule, Finding[]>();
  for (const f of findings) {
    let list = byRule.get(f.rule);
    if (!list) byRule.set(f.rule, (list = []));
    list.push(f);
  }
  const rules = rulesWithFindings(ctx);
  const team = ctx.options.team;
  const fileNote = team && team.fileFindings !== 0 ? `<p class="note">${esc(`${plural(team.fileFindings, 'finding')} of the delivery belong to no row (the header, whole columns); they are in the main report.`)}</p>` : '';
  if (rules.length === 0) return `<section id="findings" class="block"><h2>Findings</h2><p class="none">No findings${team ? ' in the team’s rows' : ''}.</p>${fileNote}</section>`;

  const ruleTable = table({
    head: ['rule', 'severity', 'findings', 'items'],
    numeric: [2],
    className: 'wide',
    rows: rules.map((r) => {
      const items = itemsOfRule(ctx, r);
      const shown = items.slice(0, 6).map(([n, c]) => `<span class="nobr">${findingTarget(ctx, n)} ${num(c)}</span>`).join(', ');
      return [`<a href="#rule-${esc(r)}"><code>${esc(r)}</code></a>`, severityTags(ctx, r), num(summary.findings.byRule[r] ?? 0), items.length > 6 ? `${shown}, and ${num(items.length - 6)} more` : shown];
    }),
  });

  const cap = ctx.options.findingsPerRule;
  const firstRows = rules
    .map((r) => {
      const list = byRule.get(r) ?? [];
      const total = summary.findings.byRule[r] ?? 0;
      const shown = list.slice(0, cap);
      const note =
        shown.length === 0
          ? 'None of these are in the findings log.'
          : shown.length === total
            ? `All ${num(total)}.`
            : `The first ${num(shown.length)} of ${num(total)}${list.length < total ? ` (the log keeps ${num(list.length)})` : ''}.`;
      const hasSuggestion = shown.some((f) => f.suggestion !== undefined);
      const head = ['row', 'id', 'item', 'value', 'message', ...(hasSuggestion ? ['suggestion'] : [])];
      const rows = shown.map((f) => [
        f.row > 0 ? num(f.row) : '-',
        `<code>${esc(f.id)}</code>`,
        `<code>${esc(f.item)}</code>`,
        `<code>${esc(f.value)}</code>`,
        esc(f.message),
        ...(hasSuggestion ? [f.suggestion === undefined ? '' : `<code>${esc(f.suggestion)}</code>`] : []),
      ]);
      return `<details class="rule" id="rule-${esc(r)}"><summary><code>${esc(r)}</code> ${severityTags(ctx, r)} ${esc(plural(total, 'finding'))}</summary><p class="note">${esc(note)}</p>${
        shown.length > 0 ? table({ head, rows, numeric: [0], className: 'wide' }) : ''
      }</details>`;
    })
    .join('');

  const rowsOfRules = ctx.input.disclosure?.findings ? `<p class="note">${esc(FINDINGS_LEFT_OUT)}</p>` : `<h3>Rows of each rule</h3>${firstRows}`;
  return `<section id="findings" class="block"><h2>Findings</h2>
<p>${esc(`${plural(summary.findings.total, 'finding')} under ${plural(rules.length, 'rule')}${team ? ' in the team’s rows' : ''}. Rows are data rows of the delivery, the header not counted.`)}</p>${fileNote}
${ruleTable}${rowsOfRules}</section>`;
}

export function rulesSection(ctx: Ctx): string {
  const results = ctx.input.check.summary.rules;
  const ids = Object.keys(results);
  if (ids.length === 0) return '';
  const byId = new Map(ctx.input.codebook.rules.map((r) => [r.id, r]));
  const anySkipped = ids.some((id) => results[id]?.skipped !== undefined);
  const rows = ids.map((id) => {
    const r = results[id]!;
    const def = byId.get(id);
    return [
      `<code>${esc(id)}</code>`,
      def ? severityTag(def.severity) : '',
      def ? esc(def.message) : '',
      num(r.passed),
      num(r.failed),
      num(r.undetermined),
      ...(anySkipped ? [num(r.skipped ?? 0)] : []),
    ];
  });
  return `<section id="rules" class="block"><h2>Cross-item rules</h2>
<p class="note">Undetermined: a row where an item the rule reads is missing or invalid; such rows are counted, not reported.</p>
${table({ head: ['rule', 'severity', 'message', 'passed', 'failed', 'undetermined', ...(anySkipped ? ['not applicable'] : [])], rows, numeric: anySkipped ? [3, 4, 5, 6] : [3, 4, 5], className: 'wide' })}</section>`;
}
