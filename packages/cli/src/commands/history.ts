import { resolve } from 'node:path';
import type { History } from '@codeweir/ledger';
import type { CommandDef } from '../io.ts';
import { DRIFT_P_OPTION, DRIFT_PSI_OPTION, LEDGER_WAIT_OPTION, ledgerWaitMs, thresholdsOf } from '../season.ts';

function series(values: Array<number | null>, digits: number): string {
  return values.map((v) => (v === null ? '-' : v.toFixed(digits))).join(' -> ');
}

/** The human account of a ledger's history: deliveries, per group trends, one item's trend. */
export function humanHistory(h: History): string {
  const lines: string[] = [];
  lines.push(`${h.ledger}: ${h.deliveries.length} deliver${h.deliveries.length === 1 ? 'y' : 'ies'} (ledger schema ${h.schemaVersion}).`);
  for (const d of h.deliveries) {
    lines.push(`  ${String(d.id).padStart(3)}  ${d.checkedAt}  ${d.file}  ${d.rows} rows  ${d.verdict} (${d.errors} errors, ${d.warnings} warnings)  ${d.codebook} ${d.version}`);
  }
  if (h.groupItem !== null) {
    lines.push(`By ${h.groupItem}, delivery by delivery: missing share of cells | cells with an error finding`);
    for (const [code, points] of Object.entries(h.groups)) {
      lines.push(`  ${code}: ${series(points.map((p) => p.missingPercent), 1)} | ${points.map((p) => (p.rows === 0 ? '-' : String(p.errors))).join(' -> ')}`);
    }
  }
  if (h.item) {
    lines.push(`${h.item.name} (${h.item.level ?? 'no level'}), delivery by delivery:`);
    for (const p of h.item.points) {
      const kinds = Object.entries(p.missing).map(([k, n]) => `${k} ${n}`).join(', ');
      const d = p.drift;
      const drift = d ? `; drift from the delivery before: ${d.test} p = ${d.p === null ? '-' : d.p < 1e-4 ? d.p.toExponential(1) : d.p.toFixed(4)}, PSI = ${d.psi === null ? '-' : d.psi.toFixed(3)}${d.flagged ? ' FLAGGED' : ''}` : '';
      lines.push(`  ${String(p.delivery).padStart(3)}: ${p.valid} valid, ${p.invalid} invalid, missing ${p.missingPercent === null ? '-' : p.missingPercent.toFixed(1) + '%'}${kinds ? ` (${kinds})` : ''}${drift}`);
    }
  }
  return lines.join('\n') + '\n';
}

/**
 * `codeweir history --ledger <file> [--item <name>] [--group <item>] [--json] [--drift-p p]
 * [--drift-psi v] [--ledger-wait s]`: every delivery of the ledger, the per-group trend of
 * missingness and error findings, and with --item that item's missing kinds and drift from each
 * delivery to the next. Reads the ledger only (never changes it). Exit 0, 2 for usage errors and
 * a missing or unreadable ledger.
 */
export const historyCommand: CommandDef = {
  command: 'history',
  describe: 'The deliveries of a ledger: per group the trend of missingness and errors, per item missing kinds and drift.',
  builder: (y) =>
    y
      .option('ledger', { type: 'string', demandOption: true, describe: 'the ledger file (written by check --ledger)' })
      .option('item', { type: 'string', describe: "one item's trend: missing by kind and drift from the delivery before" })
      .option('group', { type: 'string', describe: 'group item of the per-group trend (default: the first recorded)' })
      .option('json', { type: 'boolean', default: false, describe: 'print the history as one JSON document on stdout' })
      .option('drift-p', DRIFT_P_OPTION)
      .option('drift-psi', DRIFT_PSI_OPTION)
      .option('ledger-wait', LEDGER_WAIT_OPTION),
  handler: async (args, io) => {
    const thresholds = await thresholdsOf(args);
    const waitMs = ledgerWaitMs(args['ledger-wait']);
    const { Ledger, ledgerHistory } = await import('@codeweir/ledger');
    const path = resolve(io.cwd, String(args.ledger));
    const ledger = await Ledger.open(path, { readOnly: true, ...(waitMs === undefined ? {} : { waitMs }) });
    let h: History;
    try {
      h = await ledgerHistory(ledger, {
        thresholds,
        ...(args.item === undefined ? {} : { item: String(args.item) }),
        ...(args.group === undefined ? {} : { groupItem: String(args.group) }),
      });
    } finally {
      ledger.close();
    }
    h.ledger = String(args.ledger);
    io.stdout(args.json === true ? JSON.stringify(h, null, 2) + '\n' : humanHistory(h));
    return 0;
  },
};
