/**
 * A codebook as DDI-Codebook 2.5 XML (namespace `ddi:codebook:2_5`), the trade's open metadata
 * standard for data files. Each item is a `var` in `dataDscr`: its label(s) in `labl`
 * (`xml:lang` per language), the question in `qstn/qstnLit`, `range` in `valrng/range`,
 * codes and missing codes in `catgry` (`missing="Y"` with `missType` the kind), the level in
 * `@nature`, discrete or continuous in `@intrvl`, the type in `varFormat`, the unit in
 * `@measUnit`, a weight item with `@wgt="wgt"`, routing in `universe`. What DDI has no element
 * for (role, soft bounds, pattern, uniqueness, bins, missing sets, rules, languages) goes into
 * `notes` with a `type` of our own (`codeweir:...`), so that importing the file gives back the
 * same codebook. With a delivery's statistics, `sumStat` and `catStat` carry them and
 * `fileDscr` names the file. Element order follows the sequences of the published schema.
 */
import type { Codebook, Label, MissingCode } from '@codeweir/codebook';
import type { CheckSummary } from '@codeweir/check';
import type { DescribeResult } from '@codeweir/describe';

/** The statistics of one delivery that an export can carry. */
export interface DeliveryStatistics {
  /** File name as it should appear in `fileDscr/fileTxt/fileName`. */
  file: string;
  summary: CheckSummary;
  described: DescribeResult;
}

/** The note types of our own that carry what DDI has no element for. */
export const NOTE = {
  languages: 'codeweir:languages',
  schema: 'codeweir:schema',
  missingSet: 'codeweir:missing-set',
  rule: 'codeweir:rule',
  role: 'codeweir:role',
  expect: 'codeweir:expect',
  pattern: 'codeweir:pattern',
  unique: 'codeweir:unique',
  askedWhen: 'codeweir:asked-when',
  convention: 'codeweir:convention',
} as const;

/** The prefix of a category's `txt` that carries its bin. */
export const BIN_TEXT = 'bin ';

function esc(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/\r/g, '&#13;').replace(/\t/g, '&#9;').replace(/\n/g, '&#10;');
}
function escText(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/\r/g, '&#13;');
}

type Attrs = Record<string, string | number | undefined>;

function open(name: string, attrs: Attrs = {}): string {
  const a = Object.entries(attrs)
    .filter(([, v]) => v !== undefined)
    .map(([k, v]) => ` ${k}="${esc(String(v))}"`)
    .join('');
  return `<${name}${a}`;
}

/** An element with text content (or empty when text is undefined). */
function el(name: string, attrs: Attrs, text?: string): string {
  return text === undefined || text === '' ? `${open(name, attrs)}/>` : `${open(name, attrs)}>${escText(text)}</${name}>`;
}

/** An element with child elements, indented. */
function box(name: string, attrs: Attrs, children: readonly string[], indent: string): string {
  if (children.length === 0) return `${indent}${open(name, attrs)}/>`;
  return `${indent}${open(name, attrs)}>\n${children.join('\n')}\n${indent}</${name}>`;
}

function labls(label: Label | undefined, indent: string): string[] {
  if (label === undefined) return [];
  if (typeof label === 'string') return [`${indent}${el('labl', {}, label)}`];
  return Object.entries(label).map(([lang, text]) => `${indent}${el('labl', { 'xml:lang': lang }, text)}`);
}

function bounds(b: { min?: number; max?: number }): string {
  return `${b.min ?? ''}..${b.max ?? ''}`;
}

function num(x: number | undefined | null): string | undefined {
  return x === undefined || x === null || !Number.isFinite(x) ? undefined : String(x);
}

/**
 * The DDI-Codebook 2.5 XML text of a codebook (as written in its file, labels in every
 * language), with the statistics of a delivery when `stats` is given: per variable
 * `sumStat` of types vald (valid cells), invd (invalid and missing cells), and by level min,
 * max, mean, medn, stdev (interval and ratio), medn (ordinal, the median category's code),
 * mode (nominal and ordinal); per category `catStat type="freq"` (a missing category only when
 * its kind is its own, since missing cells are counted by kind). The conventions of those
 * figures are written as notes of `dataDscr`. Pure; O(size of the codebook).
 */
export function ddiFromCodebook(cb: Codebook, stats?: DeliveryStatistics): string {
  const i1 = '  ';
  const i2 = '    ';
  const i3 = '      ';
  const i4 = '        ';
  const study: string[] = [];
  const titl = [`${i4}${el('titl', {}, cb.title)}`, `${i4}${el('IDNo', {}, cb.codebook)}`];
  study.push(
    box('citation', {}, [box('titlStmt', {}, titl, i3), box('verStmt', {}, [`${i4}${el('version', {}, cb.version)}`], i3)], i2),
  );
  if (cb.languages) study.push(`${i2}${el('notes', { type: NOTE.languages }, cb.languages.join(' '))}`);
  if (cb.$schema !== undefined) study.push(`${i2}${el('notes', { type: NOTE.schema }, cb.$schema)}`);
  for (const [name, list] of Object.entries(cb.missingSets ?? {})) {
    study.push(`${i2}${el('notes', { type: NOTE.missingSet, subject: name }, JSON.stringify(list))}`);
  }
  for (const r of cb.rules ?? []) study.push(`${i2}${el('notes', { type: NOTE.rule, subject: r.id }, JSON.stringify(r))}`);

  const parts: string[] = [box('stdyDscr', {}, study, i1)];
  if (stats) {
    const txt = [
      `${i3}${el('fileName', {}, stats.file)}`,
      box('dimensns', {}, [`${i4}${el('caseQnty', {}, String(stats.summary.rows))}`, `${i4}${el('varQnty', {}, String(cb.items.length))}`], i3),
    ];
    parts.push(box('fileDscr', { ID: 'F1' }, [box('fileTxt', {}, txt, i2)], i1));
  }

  const sets = cb.missingSets ?? {};
  const vars = cb.items.map((it, i) => {
    const missing: MissingCode[] = typeof it.missing === 'string' ? (sets[it.missing] ?? []) : (it.missing ?? []);
    const attrs: Attrs = {
      ID: `V${i + 1}`,
      name: it.name,
      files: stats ? 'F1' : undefined,
      wgt: it.role === 'weight' ? 'wgt' : undefined,
      dcml: it.type === 'integer' ? '0' : undefined,
      intrvl: it.type === 'decimal' ? 'contin' : 'discrete',
      nature: it.level,
      measUnit: it.unit,
    };
    const c: string[] = [...labls(it.label, i3)];
    if (it.text !== undefined) c.push(box('qstn', {}, [`${i4}${el('qstnLit', {}, it.text)}`], i3));
    if (it.range && (it.range.min !== undefined || it.range.max !== undefined)) {
      c.push(box('valrng', {}, [`${i4}${el('range', { min: it.range.min, max: it.range.max })}`], i3));
    }
    if (it.askedWhen !== undefined) c.push(`${i3}${el('universe', { clusion: 'I' }, it.askedWhen)}`);
    const s = stats?.summary.items[it.name];
    const d = stats?.described.items[it.name];
    if (s) {
      const missingCells = Object.values(s.missing).reduce((a, b) => a + (b ?? 0), 0);
      c.push(`${i3}${el('sumStat', { type: 'vald' }, String(s.valid))}`, `${i3}${el('sumStat', { type: 'invd' }, String(s.invalid + missingCells))}`);
      if (d && (d.level === 'interval' || d.level === 'ratio')) {
        for (const [type, v] of [['min', d.min], ['max', d.max], ['mean', d.mean], ['medn', d.median], ['stdev', d.sd]] as const) {
          const t = num(v);
          if (t !== undefined) c.push(`${i3}${el('sumStat', { type }, t)}`);
        }
      } else if (d && d.level === 'ordinal' && d.medianCode) {
        c.push(`${i3}${el('sumStat', { type: 'medn' }, String(d.medianCode.code))}`);
      }
      if (d && (d.level === 'nominal' || d.level === 'ordinal') && d.mode && d.mode.length > 0) {
        c.push(`${i3}${el('sumStat', { type: 'mode' }, String(d.mode[0]))}`);
      }
    }
    const freq = new Map((d?.frequencies ?? []).map((f) => [String(f.code), f.count]));
    for (const code of it.codes ?? []) {
      const cc = [`${i4}${el('catValu', {}, String(code.code))}`, ...labls(code.label, i4)];
      if (code.bin) cc.push(`${i4}${el('txt', {}, `${BIN_TEXT}${bounds(code.bin)}`)}`);
      if (d) cc.push(`${i4}${el('catStat', { type: 'freq' }, String(freq.get(String(code.code)) ?? 0))}`);
      c.push(box('catgry', {}, cc, i3));
    }
    for (const m of missing) {
      const mc = [`${i4}${el('catValu', {}, String(m.code))}`, ...labls(m.label, i4)];
      // Missing cells are counted by kind: a count belongs to a code only when no other code shares its kind.
      const own = missing.filter((x) => x.kind === m.kind).length === 1;
      if (s && own) mc.push(`${i4}${el('catStat', { type: 'freq' }, String(s.missing[m.kind] ?? 0))}`);
      c.push(box('catgry', { missing: 'Y', missType: m.kind }, mc, i3));
    }
    const format = it.type === 'text' ? { type: 'character' } : it.type === 'date' ? { type: 'character', category: 'date' } : { type: 'numeric' };
    c.push(`${i3}${el('varFormat', { ...format, formatname: it.type, schema: 'other' })}`);
    if (typeof it.missing === 'string') c.push(`${i3}${el('notes', { type: NOTE.missingSet }, it.missing)}`);
    if (it.role !== undefined) c.push(`${i3}${el('notes', { type: NOTE.role }, it.role)}`);
    if (it.expect) c.push(`${i3}${el('notes', { type: NOTE.expect }, bounds(it.expect))}`);
    if (it.pattern !== undefined) c.push(`${i3}${el('notes', { type: NOTE.pattern }, it.pattern)}`);
    if (it.unique !== undefined) c.push(`${i3}${el('notes', { type: NOTE.unique }, String(it.unique))}`);
    if (it.askedWhen !== undefined) c.push(`${i3}${el('notes', { type: NOTE.askedWhen }, it.askedWhen)}`);
    return box('var', attrs, c, i2);
  });
  const dataNotes = stats ? Object.entries(stats.described.conventions).map(([k, v]) => `${i2}${el('notes', { type: NOTE.convention, subject: k }, v)}`) : [];
  if (stats) {
    dataNotes.push(
      `${i2}${el('notes', { type: NOTE.convention, subject: 'sumStat' }, 'vald counts valid cells and invd invalid and missing cells as codeweir check classifies them; min, max, mean, medn, stdev and catStat frequencies summarise valid cells only; stdev is the sample standard deviation (n - 1); medn of an ordinal item is the code of its median category')}`,
    );
  }
  parts.push(box('dataDscr', {}, [...vars, ...dataNotes], i1));
  return `<?xml version="1.0" encoding="UTF-8"?>\n${box('codeBook', { xmlns: 'ddi:codebook:2_5', version: '2.5', ID: `cb-${cb.codebook}` }, parts, '')}\n`;
}
