/**
 * What check, compare, history and report share for a fieldwork season: checking a delivery
 * file into a snapshot, recording it in the ledger, and the options that go with them. Every
 * import of @codeweir/ledger (and so of DuckDB's native module) is dynamic, so a command that
 * does not use the ledger never loads it.
 */
import { dirname, join, resolve } from 'node:path';
import type { CheckResult } from '@codeweir/check';
import type { CompiledCodebook } from '@codeweir/codebook';
import type { AppendResult, Comparison, DeliverySnapshot, DriftThresholds, History } from '@codeweir/ledger';
import type { SeasonInput } from '@codeweir/report';
import { CodeweirError } from '@codeweir/core';
import { isPlainText, type InputFormat } from './formats.ts';
import type { Io } from './io.ts';

/** `--ledger-wait` as check and report declare it. */
export const LEDGER_WAIT_OPTION = {
  type: 'string',
  describe: 'seconds to wait for another run to release the ledger file before giving up; default 30',
} as const;

export const DRIFT_P_OPTION = { type: 'string', describe: 'drift is flagged when the test\'s p-value is below this (and the PSI at or above --drift-psi); default 0.01' } as const;
export const DRIFT_PSI_OPTION = { type: 'string', describe: 'drift is flagged when the population stability index is at or above this (and p below --drift-p); default 0.1' } as const;

/** Reads `--ledger-wait` in seconds into milliseconds. Throws CodeweirError CW_USAGE for anything but a number of 0 or more. */
export function ledgerWaitMs(v: unknown): number | undefined {
  if (v === undefined) return undefined;
  const s = Number(v);
  if (!Number.isFinite(s) || s < 0) throw new CodeweirError('CW_USAGE', `--ledger-wait takes a number of seconds (0 or more), got ${String(v)}.`);
  return s * 1000;
}

/** `--drift-p` and `--drift-psi`, validated. */
export async function thresholdsOf(args: Record<string, unknown>): Promise<DriftThresholds> {
  const { normalizeThresholds } = await import('@codeweir/ledger');
  return normalizeThresholds({ p: args['drift-p'], psi: args['drift-psi'] });
}

export interface ReadArgs {
  delimiter?: string;
  encoding?: string;
  maxFieldBytes?: number;
}

/**
 * The snapshot of a checked delivery file: the check's counts and retained columns, the file's
 * content hash and its records (a second pass over the file, for record ids and cell hashes).
 * Cost: the hash and the records pass, each one read of the file. Throws what the reader throws.
 */
export async function snapshotOfResult(result: CheckResult, codebook: CompiledCodebook, path: string, name: string, input: InputFormat, read: ReadArgs): Promise<DeliverySnapshot> {
  const [{ snapshotFromCheck, readRecords, fileHash }, { openAnyDelivery }] = await Promise.all([import('@codeweir/ledger'), import('@codeweir/read')]);
  const delivery = await openAnyDelivery(path, { format: input.format, sheet: input.sheet, delimiter: read.delimiter, encoding: read.encoding as never, maxFieldBytes: read.maxFieldBytes });
  const [hash, records] = await Promise.all([fileHash(path), readRecords(delivery, codebook)]);
  const accepted = result.summary.accepted ?? (result.summary.findings.bySeverity.error ?? 0) === 0;
  return snapshotFromCheck(result, codebook, { file: name, hash, checkedAt: new Date().toISOString(), accepted }, records);
}

/**
 * Checks a delivery file for comparison (coded columns retained for the code counts) on
 * `threads` threads and returns its result and snapshot. Throws what check and the reader throw.
 */
export async function checkForSeason(
  path: string,
  name: string,
  codebook: CompiledCodebook,
  options: Record<string, unknown> & ReadArgs,
  input: InputFormat,
  threads: number,
): Promise<{ result: CheckResult; snapshot: DeliverySnapshot }> {
  const { checkFile } = await import('@codeweir/check');
  const opts = { ...options, retainCoded: true };
  let result: CheckResult;
  if (await isPlainText(path, input)) result = await checkFile(path, codebook, { ...opts, threads });
  else {
    const { checkTypedInput } = await import('./formats.ts');
    result = await checkTypedInput(path, codebook, opts, input);
  }
  result.summary.file = name;
  return { result, snapshot: await snapshotOfResult(result, codebook, path, name, input, options) };
}

export interface LedgerStep {
  append: AppendResult;
  /** This delivery against the one recorded before it; null for the first delivery. */
  comparison: Comparison | null;
  /** Deliveries in the ledger after the write. */
  deliveries: number;
  /** With a group item: its codes' trend across every delivery of the ledger. */
  trend: History['groups'] | null;
}

/**
 * Appends a snapshot to the ledger (one transaction) and compares it with the delivery
 * recorded before it, when there is one. Returns the append result and the comparison.
 * Throws CodeweirError from the ledger (busy, unreadable, not a ledger).
 */
export async function recordInLedger(
  ledgerPath: string,
  snapshot: DeliverySnapshot,
  waitMs: number | undefined,
  thresholds: DriftThresholds,
  groupItem?: string,
): Promise<LedgerStep> {
  const { Ledger, compareSnapshots, ledgerHistory } = await import('@codeweir/ledger');
  const ledger = await Ledger.open(ledgerPath, waitMs === undefined ? {} : { waitMs });
  try {
    const append = await ledger.append(snapshot);
    let comparison: Comparison | null = null;
    if (append.previous) {
      const before = await ledger.snapshot(append.previous.id);
      comparison = compareSnapshots(before, snapshot, { thresholds, previousDelivery: append.previous.id, currentDelivery: append.delivery, ...(groupItem ? { groupItem } : {}) });
    }
    const trend = groupItem === undefined ? null : (await ledgerHistory(ledger, { groupItem, thresholds })).groups;
    return { append, comparison, deliveries: (await ledger.deliveries()).length, trend };
  } finally {
    ledger.close();
  }
}

/** The one-line account of a ledger write for the terminal. */
export function ledgerLine(ledgerPath: string, r: LedgerStep): string {
  const a = r.append;
  if (a.duplicate) {
    const e = a.existing!;
    return `Ledger ${ledgerPath}: this file's content (sha256 ${e.hash.slice(0, 12)}...) is already delivery ${e.id} (${e.file}, checked ${e.checkedAt}); not counted again.\n`;
  }
  const head = `Ledger ${ledgerPath}: recorded as delivery ${a.delivery} of ${r.deliveries}`;
  const c = r.comparison;
  if (c === null) return `${head} (the first).\n`;
  return changesLine(`${head}; since delivery ${a.previous!.id} (${a.previous!.file})`, c);
}

/** `<head>: N records added, N removed, N changed; new codes in ...; drift flagged in ....` */
function changesLine(head: string, c: Comparison): string {
  const rec = c.json.records;
  const changes = rec ? `${rec.added} records added, ${rec.removed} removed, ${rec.changed} changed` : 'records not compared (no ids)';
  const drift = Object.entries(c.json.items).filter(([, it]) => it.drift?.flagged).map(([n]) => n);
  const codes = Object.entries(c.json.items).filter(([, it]) => it.newCodes.length > 0).map(([n]) => n);
  return `${head}: ${changes}${codes.length ? `; new codes in ${codes.join(', ')}` : ''}${drift.length ? `; drift flagged in ${drift.join(', ')}` : ''}.\n`;
}

/**
 * The per-group change files of `--split-by` with a ledger: for each group code of `groupItem`
 * of `codes` (the split's folders) a `changes.json` (the group's records added, removed and changed, its missing percentage and
 * error cells before and after, each item's missing kinds before and after in the group, and the
 * group's trend across the ledger's deliveries) and `changes.csv` (the group's record changes).
 * `folderOf` names the folders as the split's own (`by-<item>/<code>/`). Returns [path, content]
 * pairs to be written together. Cost: O(changes x groups). Throws nothing.
 */
export async function groupChangeFiles(dir: string, groupItem: string, codes: readonly string[], step: LedgerStep, folderOf: (code: string) => string): Promise<Array<[string, string]>> {
  const { recordsCsv } = await import('@codeweir/ledger');
  const files: Array<[string, string]> = [];
  const c = step.comparison;
  for (const code of codes) {
    const items: Record<string, unknown> = {};
    if (c) for (const [name, it] of Object.entries(c.json.items)) if (it.missingByGroup[code]) items[name] = { missing: it.missingByGroup[code] };
    const doc = {
      groupItem,
      group: code,
      previous: c?.json.previous ?? null,
      current: c?.json.current ?? null,
      ...(c?.json.groups[code] ?? {}),
      items,
      trend: step.trend?.[code] ?? [],
    };
    const base = join(dir, `by-${folderOf(groupItem)}`, folderOf(code));
    files.push([join(base, 'changes.json'), JSON.stringify(doc, null, 2) + '\n']);
    files.push([join(base, 'changes.csv'), recordsCsv((c?.changes ?? []).filter((x) => x.groups[groupItem] === code), [groupItem])]);
  }
  return files;
}

export interface LedgerContext {
  io: Io;
  /** The delivery as named on the command line, and its resolved path. */
  data: string;
  dataPath: string;
  engine: string;
  input: InputFormat;
  options: ReadArgs;
  splitBy?: string;
  out?: unknown;
}

/**
 * `check --ledger` / `check --previous`: validates the options before the check starts, and
 * returns the step that runs after it: snapshot the checked file; with a ledger append it in one
 * transaction and compare it with the delivery recorded before; with --previous check that file
 * against the same codebook and compare with it; with `--split-by` write each group's
 * `changes.json` and `changes.csv` beside its split files. Returns the JSON part (`ledger`, or
 * `previous`, in check's --json) and the terminal line. Throws CodeweirError CW_USAGE for bad
 * options (both --ledger and --previous; --engine other than builtin: the ledger records delivery
 * files as the built-in reader reads them).
 */
/** The project file next to a codebook that may name the season's ledger. */
export const PROJECT_FILE = 'codeweir.json';

/**
 * The ledger named by the project file `codeweir.json` in the codebook's folder, resolved
 * against that folder: `{ "ledger": "season.duckdb" }`. Returns undefined when there is no such
 * file. Cost: one stat, and one small read when the file exists. Throws CodeweirError CW_USAGE
 * (with the file) when it is not a JSON object holding only a `ledger` text.
 */
export async function projectLedger(codebookPath: string): Promise<string | undefined> {
  const { readFile } = await import('node:fs/promises');
  const file = join(dirname(codebookPath), PROJECT_FILE);
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch {
    return undefined;
  }
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (e) {
    throw new CodeweirError('CW_USAGE', `${file} is not valid JSON (${(e as Error).message}); it should read like { "ledger": "season.duckdb" }.`, { file });
  }
  if (typeof doc !== 'object' || doc === null || Array.isArray(doc)) throw new CodeweirError('CW_USAGE', `${file} should hold a JSON object like { "ledger": "season.duckdb" }.`, { file });
  for (const key of Object.keys(doc)) if (key !== 'ledger') throw new CodeweirError('CW_USAGE', `${file} has a field ${JSON.stringify(key)}; the project file knows only "ledger".`, { file });
  const ledger = (doc as { ledger?: unknown }).ledger;
  if (ledger === undefined) return undefined;
  if (typeof ledger !== 'string' || ledger.trim() === '') throw new CodeweirError('CW_USAGE', `${file}: "ledger" takes the path of the ledger file, got ${JSON.stringify(ledger)}.`, { file });
  return resolve(dirname(file), ledger);
}

/**
 * `check`'s season step, or undefined when there is nothing to do: with --ledger or --previous,
 * or a ledger named in the project file next to the codebook (see {@link projectLedger}).
 * Throws as {@link ledgerSetup} and {@link projectLedger}.
 */
export async function checkSeason(args: Record<string, unknown>, cwd: string): Promise<Awaited<ReturnType<typeof ledgerSetup>> | undefined> {
  if (args.ledger === undefined && args.previous === undefined) {
    const fromProject = await projectLedger(resolve(cwd, String(args.codebook)));
    if (fromProject === undefined) return undefined;
    return ledgerSetup({ ...args, ledger: fromProject }, cwd);
  }
  return ledgerSetup(args, cwd);
}

export async function ledgerSetup(args: Record<string, unknown>, cwd: string): Promise<{
  record(result: CheckResult, codebook: CompiledCodebook, ctx: LedgerContext): Promise<{ key: 'ledger' | 'previous'; json: Record<string, unknown>; line: string }>;
}> {
  if (args.ledger !== undefined && args.previous !== undefined) throw new CodeweirError('CW_USAGE', 'give --ledger (compare with the delivery recorded before) or --previous <file>, not both.');
  const ledgerPath = args.ledger === undefined ? undefined : resolve(cwd, String(args.ledger));
  const waitMs = ledgerWaitMs(args['ledger-wait']);
  const thresholds = await thresholdsOf(args);
  if ((args.engine ?? 'builtin') !== 'builtin') throw new CodeweirError('CW_USAGE', `--${ledgerPath ? 'ledger' : 'previous'} compares delivery files as the built-in engine reads them; leave out --engine to use it.`);
  return {
    async record(result, codebook, ctx) {
      if (ledgerPath !== undefined && resolve(ctx.dataPath) === ledgerPath) throw new CodeweirError('CW_USAGE', `--ledger names the delivery itself (${ctx.data}); choose another file for the ledger.`);
      const snapshot = await snapshotOfResult(result, codebook, ctx.dataPath, ctx.data, ctx.input, ctx.options);
      let step: LedgerStep;
      if (ledgerPath !== undefined) step = await recordInLedger(ledgerPath, snapshot, waitMs, thresholds, ctx.splitBy);
      else step = await compareWithPrevious(String(args.previous), cwd, snapshot, codebook, ctx, thresholds);
      if (ctx.splitBy !== undefined && ctx.out !== undefined) {
        const [{ folderName }, { writeFilesAtomic }] = await Promise.all([import('@codeweir/check'), import('@codeweir/core')]);
        const codes = Object.keys(result.summary.groups[ctx.splitBy] ?? {});
        await writeFilesAtomic(await groupChangeFiles(resolve(cwd, String(ctx.out)), ctx.splitBy, codes, step, folderName));
      }
      const c = step.comparison;
      const changes = {
        records: c?.json.records ?? null,
        newCodes: Object.fromEntries(Object.entries(c?.json.items ?? {}).filter(([, it]) => it.newCodes.length).map(([n, it]) => [n, it.newCodes])),
        driftFlagged: Object.entries(c?.json.items ?? {}).filter(([, it]) => it.drift?.flagged).map(([n]) => n),
      };
      if (ledgerPath === undefined) return { key: 'previous', json: { file: String(args.previous), ...changes }, line: changesLine(`Since ${String(args.previous)}`, c!) };
      const json: Record<string, unknown> = {
        file: String(args.ledger),
        delivery: step.append.delivery,
        duplicate: step.append.duplicate,
        deliveries: step.deliveries,
        previous: step.append.previous?.id ?? null,
        ...changes,
      };
      return { key: 'ledger', json, line: ledgerLine(String(args.ledger), step) };
    },
  };
}

/** `check --previous`: the previous file checked with the same options, compared, with a two-point trend per group. */
async function compareWithPrevious(previous: string, cwd: string, now: DeliverySnapshot, codebook: CompiledCodebook, ctx: LedgerContext, thresholds: DriftThresholds): Promise<LedgerStep> {
  const { compareSnapshots } = await import('@codeweir/ledger');
  const path = resolve(cwd, previous);
  if (path === resolve(ctx.dataPath)) throw new CodeweirError('CW_USAGE', `--previous names the delivery itself (${ctx.data}); name the delivery before it.`);
  const before = (await checkForSeason(path, previous, codebook, { ...ctx.options }, ctx.input, 1)).snapshot;
  const comparison = compareSnapshots(before, now, { thresholds, ...(ctx.splitBy ? { groupItem: ctx.splitBy } : {}) });
  let trend: LedgerStep['trend'] = null;
  if (ctx.splitBy !== undefined) {
    const g = ctx.splitBy;
    const codes = new Set([...Object.keys(before.groups[g] ?? {}), ...Object.keys(now.groups[g] ?? {})]);
    trend = Object.fromEntries([...codes].map((code) => [code, [before, now].map((s, i) => ({ delivery: i + 1, rows: s.groups[g]?.[code]?.rows ?? 0, findings: {}, ...pointOf(s, g, code) }))]));
  }
  return { append: { delivery: 0, duplicate: false }, comparison, deliveries: 2, trend };
}

/** The report's season options (`--previous`, `--ledger`, `--ledger-wait`, `--drift-p`, `--drift-psi`), validated before anything is read. */
export async function reportSeasonOptions(args: Record<string, unknown>, cwd: string): Promise<{ previous?: string; ledger?: string; waitMs?: number; thresholds: DriftThresholds } | undefined> {
  if (args.previous === undefined && args.ledger === undefined) return undefined;
  const out: { previous?: string; ledger?: string; waitMs?: number; thresholds: DriftThresholds } = { thresholds: await thresholdsOf(args) };
  if (args.previous !== undefined) out.previous = String(args.previous);
  if (args.ledger !== undefined) out.ledger = resolve(cwd, String(args.ledger));
  const w = ledgerWaitMs(args['ledger-wait']);
  if (w !== undefined) out.waitMs = w;
  return out;
}

type SeasonTrend = NonNullable<SeasonInput['trend']>;

function pointOf(s: DeliverySnapshot, groupItem: string | null, code: string): { missingPercent: number | null; errors: number } {
  const g = groupItem === null ? undefined : s.groups[groupItem]?.[code];
  return { missingPercent: g && g.cells > 0 ? (100 * g.missingCells) / g.cells : null, errors: g?.invalidCells ?? 0 };
}

/**
 * The report's "since the previous delivery" input: this delivery's snapshot compared with the
 * `--previous` file (checked here against the same codebook) or, with `--ledger`, with the
 * delivery recorded before this one (the last one when this file is not in the ledger); the
 * trend per group across the ledger's deliveries up to this one (or the two deliveries). The
 * ledger is opened read-only. Throws CodeweirError from the reader and the ledger, and CW_USAGE
 * when the ledger holds no delivery before this one and no --previous is given.
 */
export async function seasonForReport(
  o: { previous?: string; ledger?: string; waitMs?: number; thresholds: DriftThresholds },
  cwd: string,
  result: CheckResult,
  codebook: CompiledCodebook,
  current: { path: string; name: string; input: InputFormat; read: ReadArgs; threads: number; groupItem?: string },
): Promise<SeasonInput> {
  const { Ledger, compareSnapshots, ledgerHistory } = await import('@codeweir/ledger');
  const now = await snapshotOfResult(result, codebook, current.path, current.name, current.input, current.read);
  let before: DeliverySnapshot | undefined;
  let beforeId: number | undefined;
  let trend: SeasonTrend | undefined;
  const groupItem = current.groupItem ?? codebook.groupItems[0]?.name ?? null;
  if (o.ledger !== undefined) {
    const ledger = await Ledger.open(o.ledger, { readOnly: true, ...(o.waitMs === undefined ? {} : { waitMs: o.waitMs }) });
    try {
      const all = await ledger.deliveries();
      const self = all.find((d) => d.hash === now.hash);
      const upTo = self ? all.filter((d) => d.id <= self.id) : all;
      const prior = upTo.filter((d) => d.id !== self?.id).pop();
      if (o.previous === undefined && prior !== undefined) {
        before = await ledger.snapshot(prior.id);
        beforeId = prior.id;
      }
      if (groupItem !== null) {
        const h = await ledgerHistory(ledger, { groupItem, thresholds: o.thresholds }).catch(() => undefined);
        const ids = upTo.map((d) => d.id);
        const groups: SeasonTrend['groups'] = {};
        const codes = new Set([...Object.keys(h?.groups ?? {}), ...Object.keys(now.groups[groupItem] ?? {})]);
        for (const code of codes) {
          const pts = (h?.groups[code] ?? []).filter((p) => ids.includes(p.delivery)).map((p) => ({ missingPercent: p.missingPercent, errors: p.errors }));
          while (pts.length < ids.length) pts.unshift({ missingPercent: null, errors: 0 });
          if (!self) pts.push(pointOf(now, groupItem, code));
          groups[code] = pts;
        }
        trend = { deliveries: [...upTo.map((d) => d.file), ...(self ? [] : [current.name])], groups };
      }
    } finally {
      ledger.close();
    }
  }
  if (o.previous !== undefined) {
    const prevPath = resolve(cwd, o.previous);
    before = (await checkForSeason(prevPath, o.previous, codebook, { ...current.read }, current.input, current.threads)).snapshot;
    if (trend === undefined && groupItem !== null) {
      const codes = new Set([...Object.keys(before.groups[groupItem] ?? {}), ...Object.keys(now.groups[groupItem] ?? {})]);
      trend = { deliveries: [o.previous, current.name], groups: Object.fromEntries([...codes].map((c) => [c, [pointOf(before!, groupItem, c), pointOf(now, groupItem, c)]])) };
    }
  }
  if (before === undefined) {
    throw new CodeweirError('CW_USAGE', `the ledger ${o.ledger ?? ''} holds no delivery before this one; check an earlier delivery with --ledger first, or name one with --previous.`);
  }
  const c = compareSnapshots(before, now, { thresholds: o.thresholds, ...(beforeId !== undefined ? { previousDelivery: beforeId } : {}), ...(groupItem !== null ? { groupItem } : {}) });
  const j = c.json;
  const out: SeasonInput = { previous: j.previous, records: j.records, items: j.items, groupItem: j.groupItem, groups: j.groups, conventions: j.conventions };
  if (j.recordsNote !== undefined) out.recordsNote = j.recordsNote;
  if (trend !== undefined) out.trend = trend;
  return out;
}
