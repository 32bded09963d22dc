import { resolve, join } from 'node:path';
import type { CompareJson, ItemChange } from '@codeweir/ledger';
import { CodeweirError } from '@codeweir/core';
import type { CommandDef } from '../io.ts';
import { FORMAT_OPTION, SHEET_OPTION, inputFormatOf } from '../formats.ts';
import { THREADS_OPTION, threadsOption } from '../threads.ts';
import { DRIFT_P_OPTION, DRIFT_PSI_OPTION, checkForSeason, thresholdsOf } from '../season.ts';

function pct(v: number | null): string {
  return v === null ? '-' : `${v.toFixed(1)}%`;
}

function pValue(p: number | null): string {
  if (p === null) return '-';
  return p < 1e-4 ? p.toExponential(1) : p.toFixed(4);
}

function driftText(name: string, it: ItemChange): string {
  const d = it.drift!;
  const stat = d.test === 'chi-square' ? `X² = ${d.statistic?.toFixed(2)}, df ${d.df}` : `D = ${d.statistic?.toFixed(3)} (${d.method})`;
  return `  ${name}: ${d.test} ${stat}, p = ${pValue(d.p)}, PSI = ${d.psi === null ? '-' : d.psi.toFixed(3)}${d.flagged ? '  FLAGGED' : ''}`;
}

/** The human account of a comparison: records, codes, drift, missingness and groups. */
export function humanCompare(j: CompareJson): string {
  const lines: string[] = [];
  lines.push(`${j.current.file} (${j.current.rows} rows) against ${j.previous.file} (${j.previous.rows} rows), codebook ${j.current.codebook.codebook} ${j.current.codebook.version}:`);
  if (j.records) {
    const r = j.records;
    const byItem = Object.entries(r.byItem).filter(([, n]) => n > 0).sort((a, b) => b[1] - a[1]);
    lines.push(`Records by ${r.idItem}: ${r.added} added, ${r.removed} removed, ${r.changed} changed${byItem.length ? ` (${byItem.slice(0, 8).map(([n, k]) => `${n} ${k}`).join(', ')}${byItem.length > 8 ? ', ...' : ''})` : ''}, ${r.unchanged} unchanged.`);
  } else lines.push(`Records: ${j.recordsNote}.`);
  const items = Object.entries(j.items);
  const newCodes = items.filter(([, it]) => it.newCodes.length).map(([n, it]) => `${n} (${it.newCodes.join(', ')})`);
  const gone = items.filter(([, it]) => it.goneCodes.length).map(([n, it]) => `${n} (${it.goneCodes.join(', ')})`);
  if (newCodes.length) lines.push(`New codes: ${newCodes.join('; ')}.`);
  if (gone.length) lines.push(`Codes no longer used: ${gone.join('; ')}.`);
  const drifted = items.filter(([, it]) => it.drift?.flagged);
  lines.push(`Drift (flagged when ${j.conventions.flagged}):`);
  if (drifted.length === 0) lines.push('  none flagged');
  for (const [n, it] of drifted) lines.push(driftText(n, it));
  const missing: string[] = [];
  for (const [n, it] of items) {
    for (const [kind, v] of Object.entries(it.missing)) if (v && v.previous !== v.current) missing.push(`${n} ${kind} ${v.previous} -> ${v.current}`);
  }
  if (missing.length) lines.push(`Missing cells that changed: ${missing.slice(0, 12).join('; ')}${missing.length > 12 ? `; and ${missing.length - 12} more (--json)` : ''}.`);
  if (j.groupItem !== null) {
    lines.push(`By ${j.groupItem} (missing share of cells, cells with an error finding):`);
    for (const [code, g] of Object.entries(j.groups)) {
      const rec = g.records ? `; records +${g.records.added} -${g.records.removed} ~${g.records.changed}` : '';
      lines.push(`  ${code}: missing ${pct(g.missingPercent.previous)} -> ${pct(g.missingPercent.current)}, errors ${g.errors.previous} -> ${g.errors.current}${rec}`);
    }
  }
  return lines.join('\n') + '\n';
}

/**
 * `codeweir compare <previous> <current> --codebook <file> [--json] [--out <dir>] [--group <item>]
 * [--drift-p p] [--drift-psi v] [--delimiter c] [--encoding e] [--decimal-comma] [--threads N]
 * [--format f] [--sheet s]`: checks both deliveries against the codebook and compares them
 * (records by id, codes, missingness, drift by level of measurement, per group). With --out,
 * writes compare.json and records.csv (the ids of the added, removed and changed records).
 * Exit 0 when compared (drift is information, not a verdict), 1 for an invalid codebook,
 * 2 for usage errors and unreadable input.
 */
export const compareCommand: CommandDef = {
  command: 'compare <previous> <current>',
  describe: 'Compare two deliveries: records added, removed and changed, new and gone codes, missingness, drift, per group.',
  builder: (y) =>
    y
      .positional('previous', { type: 'string', describe: 'the earlier delivery', demandOption: true })
      .positional('current', { type: 'string', describe: 'the later delivery', demandOption: true })
      .option('codebook', { type: 'string', demandOption: true, describe: 'the codebook JSON file' })
      .option('json', { type: 'boolean', default: false, describe: 'print the comparison as one JSON document on stdout' })
      .option('out', { type: 'string', describe: 'folder for compare.json and records.csv (the ids of added, removed and changed records)' })
      .option('group', { type: 'string', describe: "group item of the per-group part (default: the codebook's first group item)" })
      .option('drift-p', DRIFT_P_OPTION)
      .option('drift-psi', DRIFT_PSI_OPTION)
      .option('delimiter', { type: 'string', describe: 'field delimiter (detected from the header when absent)' })
      .option('encoding', { type: 'string', describe: 'utf-8 (default), windows-1252, latin1, utf-16le, utf-16be' })
      .option('decimal-comma', { type: 'boolean', default: false, describe: 'decimals are written with a comma (1,5)' })
      .option('max-field-bytes', { type: 'string', describe: 'largest field allowed, in bytes' })
      .option('threads', THREADS_OPTION)
      .option('format', FORMAT_OPTION)
      .option('sheet', SHEET_OPTION)
      .option('quiet', { type: 'boolean', default: false, describe: 'no progress on stderr' }),
  handler: async (args, io) => {
    const threads = threadsOption(args.threads);
    const thresholds = await thresholdsOf(args);
    const [{ loadCodebookOrThrow }, { normalizeCheckOptions }, { compareSnapshots, recordsCsv }, { writeFilesAtomic }] = await Promise.all([
      import('@codeweir/codebook'),
      import('@codeweir/check'),
      import('@codeweir/ledger'),
      import('@codeweir/core'),
    ]);
    const options = normalizeCheckOptions({
      decimalComma: args['decimal-comma'] === true,
      delimiter: args.delimiter,
      encoding: args.encoding,
      maxFieldBytes: args['max-field-bytes'],
    });
    const codebook = await loadCodebookOrThrow(resolve(io.cwd, String(args.codebook)));
    const group = args.group === undefined ? undefined : String(args.group);
    if (group !== undefined && !codebook.groupItems.some((g) => g.name === group)) {
      const groups = codebook.groupItems.map((g) => g.name);
      throw new CodeweirError('CW_USAGE', `--group takes a group item of the codebook${groups.length ? ` (${groups.join(', ')})` : ', which has none'}, got ${group}.`);
    }
    const input = inputFormatOf(args);
    const prevName = String(args.previous);
    const curName = String(args.current);
    const prevPath = resolve(io.cwd, prevName);
    const curPath = resolve(io.cwd, curName);
    const read = { delimiter: options.delimiter, encoding: options.encoding, maxFieldBytes: options.maxFieldBytes };
    const before = await checkForSeason(prevPath, prevName, codebook, { ...options, ...read }, input, threads);
    const after = await checkForSeason(curPath, curName, codebook, { ...options, ...read }, input, threads);
    const c = compareSnapshots(before.snapshot, after.snapshot, { thresholds, ...(group ? { groupItem: group } : {}) });
    if (args.out !== undefined) {
      const dir = resolve(io.cwd, String(args.out));
      await writeFilesAtomic([
        [join(dir, 'compare.json'), JSON.stringify(c.json, null, 2) + '\n'],
        [join(dir, 'records.csv'), recordsCsv(c.changes, codebook.groupItems.map((g) => g.name))],
      ]);
    }
    if (args.json === true) io.stdout(JSON.stringify(c.json, null, 2) + '\n');
    else {
      io.stdout(humanCompare(c.json));
      if (args.out !== undefined) io.stdout(`compare.json and records.csv written to ${String(args.out)}.\n`);
    }
    return 0;
  },
};
