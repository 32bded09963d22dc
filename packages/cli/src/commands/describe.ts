import { resolve } from 'node:path';
import type { CompiledCodebook } from '@codeweir/codebook';
import type { DescribeResult, ItemDescription, PairDescription } from '@codeweir/describe';
import type { CommandDef } from '../io.ts';
import { FORMAT_OPTION, SHEET_OPTION, checkTypedInput, inputFormatOf, isPlainText } from '../formats.ts';
import { THREADS_OPTION, threadsOption } from '../threads.ts';
import { LANG_OPTION, langOption } from '../lang.ts';
import { MIN_CELL_OPTION, disclosureChoice } from '../disclosure.ts';

/** Numbers in the text summary: four significant digits, whole numbers as they are. */
function num(x: number | undefined | null): string {
  if (x === undefined || x === null || Number.isNaN(x)) return '-';
  return Number.isInteger(x) ? String(x) : String(Number(x.toPrecision(4)));
}

function missingText(d: ItemDescription): string {
  const parts = Object.entries(d.missing).map(([kind, n]) => `${kind} ${num(n)}`);
  return parts.length > 0 ? parts.join(', ') : 'none';
}

/** Date items hold days since 1970-01-01: locations print as ISO dates. */
function isoDay(x: number | undefined): string {
  if (x === undefined || !Number.isFinite(x)) return '-';
  return new Date(Math.round(x) * 86_400_000).toISOString().slice(0, 10);
}

/** A few readable lines for one item, by its level. */
function itemLines(name: string, d: ItemDescription, date: boolean): string[] {
  const head = `${name} (${d.level}${d.binned ? ', binned' : ''}${d.unit ? `, ${d.unit}` : ''}): n ${num(d.n)}, missing ${missingText(d)}, invalid ${num(d.invalid)}`;
  const lines = [head];
  if (d.frequencies) {
    const shown = d.frequencies.slice(0, 12);
    for (const f of shown) {
      const cum = f.cumulativePercent !== undefined ? `  cum ${num(f.cumulativePercent)}%` : '';
      const w = f.weightedPercent !== undefined ? `  weighted ${num(f.weightedPercent)}%` : '';
      lines.push(`  ${String(f.code).padStart(4)} ${f.label.slice(0, 30).padEnd(30)} ${num(f.count).padStart(7)}  ${num(f.percent).padStart(6)}%${cum}${w}`);
    }
    if (d.frequencies.length > shown.length) lines.push(`  ... ${d.frequencies.length - shown.length} more codes`);
    if (d.mode && d.mode.length > 0) lines.push(`  mode ${d.mode.join(', ')}`);
  }
  if (d.medianCode) {
    lines.push(`  median ${d.medianCode.code} (${d.medianCode.label}), quartiles ${d.q1Code!.code} to ${d.q3Code!.code}, IQR ${d.iqr} scale steps`);
  }
  if (d.groupedMedian !== undefined) lines.push(`  grouped median ${num(d.groupedMedian)}`);
  if (d.mean !== undefined && date) {
    lines.push(`  mean ${isoDay(d.mean)}, sd ${num(d.sd)} days, min ${isoDay(d.min)}, max ${isoDay(d.max)}`);
    lines.push(`  median ${isoDay(d.median)}, q1 ${isoDay(d.q1)}, q3 ${isoDay(d.q3)}, IQR ${num(d.iqr)} days`);
  } else if (d.mean !== undefined) {
    lines.push(`  mean ${num(d.mean)}, sd ${num(d.sd)}, min ${num(d.min)}, max ${num(d.max)}`);
    lines.push(`  median ${num(d.median)}, q1 ${num(d.q1)}, q3 ${num(d.q3)}, IQR ${num(d.iqr)}; skewness ${num(d.skewness)}, excess kurtosis ${num(d.kurtosis)}`);
    if (d.level === 'ratio') {
      const or = (v: number | undefined, key: string) => (v !== undefined ? num(v) : `withheld (${d.withheld[key] ?? 'not given'})`);
      lines.push(`  cv ${or(d.cv, 'cv')}, geometric mean ${or(d.geometricMean, 'geometricMean')}`);
    }
    if (d.outliers !== undefined) lines.push(`  outliers ${d.outliers}, extremes ${d.extremes} (Tukey fences ${num(d.fences!.lower)} and ${num(d.fences!.upper)})`);
    if (d.outlierNote) lines.push(`  note: ${d.outlierNote}`);
  }
  if (d.percentiles) lines.push(`  percentiles ${Object.entries(d.percentiles).map(([p, v]) => `${p}: ${num(v)}`).join(', ')}`);
  if (d.percentileCodes) lines.push(`  percentiles ${Object.entries(d.percentileCodes).map(([p, v]) => `${p}: ${v.code}`).join(', ')}`);
  if (d.weighted) {
    const w = d.weighted;
    const at = date ? isoDay : num;
    const figures = w.mean !== undefined ? `, mean ${at(w.mean)}, sd ${num(w.sd)}, median ${at(w.median)}` : w.medianCode ? `, median ${w.medianCode.code}` : '';
    lines.push(`  weighted: sum of weights ${num(w.sumOfWeights)}, n ${num(w.n)}, excluded ${num(w.excluded)}${figures}`);
    lines.push(...designLines(d));
  }
  return lines;
}

/** Design-based figures: the mean's se, deff and interval, or each code's percent with them; then the domains. */
function designLines(d: ItemDescription): string[] {
  const w = d.weighted!;
  if (w.df === undefined) return [];
  const ci = (c: unknown): string => {
    const i = c as { low?: number; high?: number } | null | undefined;
    return i && typeof i.low === 'number' ? `${num(i.low)} to ${num(i.high)}` : '-';
  };
  const lines: string[] = [];
  const figures = (f: NonNullable<ItemDescription['domains']>[string] | typeof w): string[] => {
    if (f.mean !== undefined && typeof f.deff !== 'object') return [`mean ${num(f.mean)}, se ${num(f.se)}, deff ${num(f.deff)}, n effective ${num(f.nEffective as number)}, 95% CI ${ci(f.ci)}`];
    const deff = (f.deff ?? {}) as Record<string, number | null>;
    const cis = (f.ci ?? {}) as Record<string, unknown>;
    return Object.entries(f.percent ?? {}).map(([code, p]) => `${code}: ${num(p)}%, se ${num(f.percentSe?.[code])}, deff ${num(deff[code])}, 95% CI ${ci(cis[code])}`);
  };
  lines.push(...figures(w).map((l) => `  design: ${l}`));
  for (const [code, dom] of Object.entries(d.domains ?? {})) {
    if (dom.n === 0) lines.push(`  domain ${code} (${dom.label}): no cases`);
    else lines.push(...figures(dom).map((l) => `  domain ${code} (${dom.label}), n ${num(dom.n)}: ${l}`));
  }
  return lines;
}

function pairLine(p: PairDescription): string {
  switch (p.kind) {
    case 'categorical-categorical':
      return `${p.x} x ${p.y}: n ${p.n}, chi-square ${num(p.chiSquare)} (df ${p.df}, p ${num(p.p)}), Cramer's V ${num(p.cramersV)}`;
    case 'continuous-continuous':
      return `${p.x} x ${p.y}: n ${p.n}, Pearson r ${num(p.pearson)}, Spearman rho ${num(p.spearman)}, bivariate outliers ${p.bivariateOutliers.length}`;
    case 'categorical-continuous':
      return `${p.x} x ${p.y}: n ${p.n}, eta squared ${num(p.etaSquared)}, ${p.groups.length} groups`;
  }
}

/**
 * The readable summary of a describe result: one block per item, then pairs, then the
 * conventions in use. `dateItems` names the items whose values are days since 1970-01-01.
 * Cost: O(items + codes). Throws nothing.
 */
export function describeText(r: DescribeResult, dateItems: ReadonlySet<string> = new Set()): string {
  const out: string[] = [`${r.rows} rows; quantiles Hyndman-Fan type ${r.quantileType}${r.weight ? `; weighted by ${r.weight}` : ''}`, ''];
  if (r.design) {
    const g = r.design;
    out.splice(1, 0, `design: strata ${g.strata ?? '-'} (${g.strataCount}), clusters ${g.cluster ?? 'records'} (${g.clusters}), fpc ${g.fpc ?? '-'}, ${g.df} degrees of freedom, ${g.excludedRows} records left out${g.singleCluster.note ? `; ${g.singleCluster.note}` : ''}`);
  }
  for (const [name, d] of Object.entries(r.items)) out.push(...itemLines(name, d, dateItems.has(name)), '');
  if (r.pairs.length > 0) {
    out.push('Pairs:');
    for (const p of r.pairs) out.push(`  ${pairLine(p)}`);
    out.push('');
  }
  out.push('Conventions:');
  for (const [k, v] of Object.entries(r.conventions)) out.push(`  ${k}: ${v}`);
  return out.join('\n') + '\n';
}

/**
 * `codeweir describe <data> --codebook <file> [--pair x:y ...] [--pairs all] [--listwise]
 * [--weight <item>] [--quantiles 1..9] [--percentiles 10,90] [--delimiter] [--encoding] [--lang tag] [--threads N] [--json]`:
 * checks the delivery, then prints level-appropriate summaries of the valid cells (JSON with
 * --json). Exit 0 when the delivery has no error findings, 1 when it has some (the summaries are
 * printed all the same) or the codebook is invalid, 2 for usage errors or unreadable input.
 */
export const describeCommand: CommandDef = {
  command: 'describe <data>',
  describe: 'Level-appropriate summaries of the valid data of a delivery, and bivariate summaries of chosen pairs.',
  builder: (y) =>
    y
      .positional('data', { type: 'string', describe: 'the delivery (CSV or other delimited text)', demandOption: true })
      .option('codebook', { type: 'string', demandOption: true, describe: 'the codebook JSON file' })
      .option('pair', { type: 'string', array: true, describe: 'a pair of items to summarise together, as x:y (repeatable)' })
      .option('pairs', { type: 'string', describe: "'all' to summarise every pair of described items" })
      .option('listwise', { type: 'boolean', describe: 'pairs use only rows valid on every item of every requested pair' })
      .option('weight', { type: 'string', describe: "weight item (default: the codebook's weight item)" })
      .options(DESIGN_OPTIONS)
      .option('min-cell', MIN_CELL_OPTION)
      .option('quantiles', { type: 'string', describe: 'Hyndman-Fan quantile type, 1 to 9 (default 7)' })
      .option('percentiles', { type: 'string', describe: 'extra percentiles, e.g. 10,90' })
      .option('delimiter', { type: 'string', describe: 'field delimiter (detected when absent)' })
      .option('encoding', { type: 'string', describe: 'utf-8 (default), windows-1252, latin1, utf-16le, utf-16be' })
      .option('lang', LANG_OPTION)
      .option('threads', THREADS_OPTION)
      .option('format', FORMAT_OPTION)
      .option('sheet', SHEET_OPTION)
      .option('json', { type: 'boolean', default: false, describe: 'print the describe document as JSON on stdout' }),
  handler: async (args, io) => {
    // Options are checked before any file is read, so a typo fails at once.
    const pairsFlag = args.pairs;
    if (pairsFlag !== undefined && pairsFlag !== 'all') {
      return usage(io, `--pairs takes 'all', got ${JSON.stringify(pairsFlag)}; name single pairs with --pair x:y.`);
    }
    const threads = threadsOption(args.threads);
    // Loaded here, not at the top, so that starting the CLI costs only the command it runs.
    const [{ loadCodebookOrThrow }, { checkFile, missingnessSuppression, KINDS }, { describeParallel, normalizeDescribeOptions, suppressDescription }] = await Promise.all([
      import('@codeweir/codebook'),
      import('@codeweir/check'),
      import('@codeweir/describe'),
    ]);
    const options = normalizeDescribeOptions({
      quantileType: args.quantiles,
      weight: args.weight,
      pairs: pairsFlag === 'all' ? 'all' : ((args.pair as string[] | undefined) ?? []),
      listwise: args.listwise,
      percentiles: args.percentiles,
      ...designArgs(args),
    });
    const lang = langOption(args.lang);
    const codebook = await loadCodebookOrThrow(resolve(io.cwd, String(args.codebook)), lang === undefined ? {} : { lang });
    const dataPath = resolve(io.cwd, String(args.data));
    const input = inputFormatOf(args);
    const result = (await isPlainText(dataPath, input))
      ? await checkFile(dataPath, codebook, { quantileType: options.quantileType, delimiter: args.delimiter, encoding: args.encoding, threads })
      : await checkTypedInput(dataPath, codebook, { quantileType: options.quantileType, delimiter: args.delimiter as string | undefined, encoding: args.encoding as string | undefined }, input);
    const plain = await describeParallel(result, codebook, options, { threads });
    // --min-cell: counts below k suppressed with their complements, the item tallies as check's missingness.csv has them.
    const { minCell } = disclosureChoice(args, codebook);
    let described: DescribeResult = plain;
    let json: unknown = plain;
    if (minCell > 1) {
      const ms = missingnessSuppression(result, minCell);
      const lines = (name: string) => {
        const l = ms.overall.get(name);
        return l && { valid: l.cells[0] !== 0, invalid: l.cells[1] !== 0, missing: Object.fromEntries(KINDS.map((k, j) => [k, l.cells[2 + j] !== 0])) };
      };
      const s = suppressDescription(plain, minCell, lines);
      described = s.result;
      json = { ...s.result, disclosure: { minCell, suppressed: s.suppressed, unprotected: ms.unprotected } };
    }
    io.stdout(args.json === true ? JSON.stringify(json, null, 2) + '\n' : describeText(described, dateItems(codebook)) + (minCell > 1 ? `Disclosure control: counts from 1 to ${minCell - 1} are suppressed (-), with the counts that would give them away.\n` : ''));
    // The exit code follows the contract for every command: 1 when the delivery has findings
    // at error severity. The summaries above cover valid cells only, so they stand either way.
    const errors = result.summary.findings.bySeverity.error ?? 0;
    if (errors > 0) {
      io.stderr(`codeweir: the delivery has ${errors} error finding${errors === 1 ? '' : 's'}; the summaries cover valid cells only (run codeweir check for the findings log).\n`);
      return 1;
    }
    return 0;
  },
};

/** The sample design options of describe and report (`--weight` is declared by each command). */
export const DESIGN_OPTIONS = {
  strata: { type: 'string', describe: "strata item of the sample design (default: the codebook's design)" },
  cluster: { type: 'string', describe: 'cluster (primary sampling unit) item of the sample design' },
  fpc: { type: 'string', describe: 'finite population correction item: population count of clusters per stratum, or sampling fraction' },
  by: { type: 'string', describe: 'a group item: design-based estimates in each of its codes (domains)' },
} as const;

/** The design options given (only those, so a run without them normalises as before). */
export function designArgs(args: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const k of ['strata', 'cluster', 'fpc', 'by']) if (args[k] !== undefined) out[k] = args[k];
  return out;
}

function dateItems(codebook: CompiledCodebook): Set<string> {
  return new Set(codebook.items.filter((i) => i.type === 'date').map((i) => i.name));
}

function usage(io: { stderr(t: string): void }, message: string): number {
  io.stderr(`codeweir: ${message}\n`);
  return 2;
}
