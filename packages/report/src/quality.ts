/** The check half of the report: verdict, header problems, findings, cross-item rules. */
import type { Finding, FindingRule, FindingSeverity } from '@codeweir/check';
import { escapeHtml as esc } from './escape.ts';
import { formatNumber as num } from './format.ts';
import { type Ctx, table, itemTitle } from './context.ts';

const plural = (n: number, one: string, many = `${one}s`) => `${num(n)} ${n === 1 ? one : many}`;

/** True when the delivery has no error findings (check's own `accepted` when it set one). */
export function isAccepted(ctx: Ctx): boolean {
  const s = ctx.input.check.summary;
  return s.accepted ?? (s.findings.bySeverity.error ?? 0) === 0;
}

export function verdictSection(ctx: Ctx): string {
  const { summary } = ctx.input.check;
  const errors = summary.findings.bySeverity.error ?? 0;
  const warnings = summary.findings.bySeverity.warning ?? 0;
  const info = summary.findings.bySeverity.info ?? 0;
  const accepted = isAccepted(ctx);
  const sentence = accepted
    ? `No error findings in ${plural(summary.rows, 'row')}; ${plural(warnings, 'warning')} to review.`
    : `${plural(errors, 'error')} and ${plural(warnings, 'warning')} in ${plural(summary.rows, 'row')}.`;
  const fact = (dt: string, dd: string) => `<div><dt>${esc(dt)}</dt><dd>${dd}</dd></div>`;
  const cb = ctx.input.codebook;
  return `<section id="verdict" class="block verdict ${accepted ? 'accepted' : 'rejected'}" aria-label="Verdict">
<div class="badge">${accepted ? 'Accepted' : 'Not accepted'}</div>
<p class="sentence">${esc(sentence)}</p>
<dl class="facts">${[
    fact('rows', num(summary.rows)),
    fact('codebook', `<code>${esc(summary.codebook.codebook || cb.id)}</code>`),
    fact('version', esc(summary.codebook.version || cb.version)),
    fact('errors', num(errors)),
    fact('warnings', num(warnings)),
    fact('info', num(info)),
    fact('findings', num(summary.findings.total)),
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

export function findingsSection(ctx: Ctx): string {
  const { summary, findings } = ctx.input.check;
  const byRule = new Map<FindingRule, Finding[]>();
  for (const f of findings) {
    let list = byRule.get(f.rule);
    if (!list) byRule.set(f.rule, (list = []));
    list.push(f);
  }
  const severityOf = (rule: FindingRule): FindingSeverity => byRule.get(rule)?.[0]?.severity ?? 'error';
  const rules = (Object.keys(summary.findings.byRule) as FindingRule[])
    .filter((r) => (summary.findings.byRule[r] ?? 0) > 0)
    .sort((a, b) => SEVERITY_ORDER[severityOf(a)] - SEVERITY_ORDER[severityOf(b)] || (summary.findings.byRule[b] ?? 0) - (summary.findings.byRule[a] ?? 0) || a.localeCompare(b));
  if (rules.length === 0) return `<section id="findings" class="block"><h2>Findings</h2><p class="none">No findings.</p></section>`;

  const ruleTable = table({
    head: ['rule', 'severity', 'findings'],
    numeric: [2],
    rows: rules.map((r) => [`<a href="#rule-${esc(r)}"><code>${esc(r)}</code></a>`, severityTag(severityOf(r)), num(summary.findings.byRule[r] ?? 0)]),
  });

  const items = Object.entries(summary.items).filter(([, t]) => Object.values(t.findings).some((n) => (n ?? 0) > 0));
  const itemTable =
    items.length === 0
      ? ''
      : `<h3>By item</h3>${table({
          head: ['item', 'invalid cells', 'findings by rule'],
          className: 'wide',
          numeric: [1],
          rows: items.map(([name, t]) => [
            itemTitle(ctx, name),
            num(t.invalid),
            Object.entries(t.findings)
              .filter(([, n]) => (n ?? 0) > 0)
              .map(([r, n]) => `<code>${esc(r)}</code> ${num(n ?? 0)}`)
              .join(', '),
          ]),
        })}`;

  const cap = ctx.options.findingsPerRule;
  const firstRows = rules
    .map((r) => {
      const list = byRule.get(r) ?? [];
      const total = summary.findings.byRule[r] ?? 0;
      const shown = list.slice(0, cap);
      const note =
        shown.length === 0
          ? 'None of these are in the findings log.'
          : `The first ${num(shown.length)} of ${num(total)}${list.length < total ? ` (the log keeps ${num(list.length)})` : ''}.`;
      const hasSuggestion = shown.some((f) => f.suggestion !== undefined);
      const head = ['row', 'id', 'item', 'value', 'message', ...(hasSuggestion ? ['suggestion'] : [])];
      const rows = shown.map((f) => [
        f.row > 0 ? num(f.row) : '-',
        esc(f.id),
        `<code>${esc(f.item)}</code>`,
        `<code>${esc(f.value)}</code>`,
        esc(f.message),
        ...(hasSuggestion ? [f.suggestion === undefined ? '' : `<code>${esc(f.suggestion)}</code>`] : []),
      ]);
      return `<div id="rule-${esc(r)}"><h4><code>${esc(r)}</code> ${severityTag(severityOf(r))}</h4><p class="note">${esc(note)}</p>${
        shown.length > 0 ? table({ head, rows, numeric: [0], className: 'wide' }) : ''
      }</div>`;
    })
    .join('');

  return `<section id="findings" class="block"><h2>Findings</h2>
<p>${esc(`${plural(summary.findings.total, 'finding')} under ${plural(rules.length, 'rule')}.`)}</p>
<div class="split"><div><h3>By rule</h3>${ruleTable}</div><div>${itemTable}</div></div>
<h3>First rows of each rule</h3>${firstRows}</section>`;
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
