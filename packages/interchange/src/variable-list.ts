/**
 * The spreadsheet variable list: one row an item, read into a codebook and written from one.
 * The same tables come from an xlsx workbook (sheets `items`, `missing sets`, `rules`,
 * `about`) or a CSV file (the items table alone). The columns are documented in
 * docs/codebook.md ("Spreadsheet variable list"); the cell syntax is in `cells.ts`.
 */
import { MISSING_KINDS, ROLES, type Codebook, type Label, type MissingKind, type Role } from '@codeweir/codebook';
import { formatBounds, formatEntry, formatListCell, parseBounds, parseListCell, type CellEntry } from './cells.ts';
import { Guesses, LEVEL_WORDS, TYPE_WORDS, kindFromLabel, type ImportGuess } from './guess.ts';

/** The tables of a variable list, each a list of rows of cell texts, the first row the header. */
export interface VariableList {
  items: string[][];
  missingSets?: string[][];
  rules?: string[][];
  about?: string[][];
}

/** A codebook read from elsewhere: the JSON, the guesses a person must confirm, and notes on what was left out. */
export interface ImportResult {
  codebook: Codebook;
  guesses: ImportGuess[];
  /** Things the import skipped or could not read, one sentence each, with the row where it applies. */
  notes: string[];
}

type Field =
  | 'name' | 'label' | 'text' | 'role' | 'type' | 'level' | 'unit' | 'codes' | 'code' | 'codeLabel' | 'bin'
  | 'missing' | 'missingKind' | 'range' | 'expect' | 'askedWhen' | 'unique' | 'pattern';

const ALIASES: Record<string, Field> = {
  name: 'name', variable: 'name', varname: 'name', variablename: 'name', column: 'name',
  label: 'label', variablelabel: 'label',
  text: 'text', question: 'text', questiontext: 'text', wording: 'text',
  role: 'role',
  type: 'type', datatype: 'type',
  level: 'level', measurement: 'level', measurementlevel: 'level', levelofmeasurement: 'level',
  unit: 'unit', units: 'unit',
  codes: 'codes', valuelabels: 'codes', categories: 'codes',
  code: 'code', value: 'code',
  codelabel: 'codeLabel', valuelabel: 'codeLabel',
  bin: 'bin',
  missing: 'missing', missingcodes: 'missing', missingvalues: 'missing',
  missingkind: 'missingKind', kind: 'missingKind',
  range: 'range', validrange: 'range',
  expect: 'expect', expected: 'expect', softrange: 'expect',
  askedwhen: 'askedWhen', routing: 'askedWhen', filter: 'askedWhen', askedif: 'askedWhen',
  unique: 'unique',
  pattern: 'pattern',
};

/** Fields that may carry a language suffix (`label@fr`). */
const LANGUAGE_FIELDS = new Set<Field>(['label', 'codes', 'missing', 'codeLabel']);

interface Column {
  field: Field;
  lang?: string;
}

function headerKey(h: string): { key: string; lang?: string } {
  const m = /^(.*?)\s*[@:]\s*([A-Za-z]{2,8}(?:-[A-Za-z0-9]{1,8})*)\s*$/.exec(h);
  const base = (m ? m[1]! : h).toLowerCase().replace(/[\s_-]+/g, '');
  return m ? { key: base, lang: m[2]! } : { key: base };
}

function readHeader(header: readonly string[], table: string, notes: string[]): Array<Column | undefined> {
  return header.map((h, i) => {
    if (h.trim() === '') return undefined;
    const { key, lang } = headerKey(h);
    const field = ALIASES[key];
    if (!field || (lang !== undefined && !LANGUAGE_FIELDS.has(field))) {
      notes.push(`${table}: column ${i + 1} "${h}" is not a column the import reads; it was left out.`);
      return undefined;
    }
    return lang === undefined ? { field } : { field, lang };
  });
}

const NUMERIC = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

interface LabelDraft {
  plain?: string;
  langs: Map<string, string>;
}
interface CodeDraft extends LabelDraft {
  code: string;
  quoted: boolean;
  bin?: { min: number; max?: number };
}
interface MissingDraft extends LabelDraft {
  code: string;
  quoted: boolean;
  kind?: MissingKind;
  kindText?: string;
}
interface ItemDraft {
  row: number;
  name: string;
  label: LabelDraft;
  single: Partial<Record<Field, string>>;
  codes: CodeDraft[];
  missing: MissingDraft[];
  missingSet?: string;
}

function sameCode(a: string, b: string): boolean {
  return a === b || (NUMERIC.test(a) && NUMERIC.test(b) && Number(a) === Number(b));
}

/** The label of a draft: one string, or one per language; undefined when none was given. */
function labelOf(d: LabelDraft, defaultLang: string | undefined, onUndetermined: () => void): Label | undefined {
  if (d.langs.size === 0) return d.plain;
  const out: Record<string, string> = {};
  if (d.plain !== undefined) {
    const lang = defaultLang ?? 'und';
    if (defaultLang === undefined) onUndetermined();
    if (!d.langs.has(lang)) out[lang] = d.plain;
  }
  for (const [k, v] of d.langs) out[k] = v;
  return out;
}

function typedCode(text: string, quoted: boolean, numeric: boolean): number | string {
  return numeric && !quoted && NUMERIC.test(text) ? Number(text) : text;
}

function slug(name: string): string {
  const s = name.replace(/\.[^.]*$/, '').replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^[^A-Za-z0-9]+/, '').replace(/-+$/, '');
  return s === '' ? 'imported' : s;
}

/**
 * Builds a codebook from a variable list. Every value that had to be guessed (a type or level
 * not given or written in other words, a missing code's kind read from its label, the
 * codebook's identifier) is recorded and marked `[check: ...]` in the item's label (or the
 * codebook's title). What cannot be read at all is left out and named in `notes`. The result
 * is meant to lint clean once the guesses are confirmed; whatever lint still reports is for a
 * person to decide. `source` names the file (its name gives the identifier when the list has
 * none). Pure; O(cells).
 */
export function codebookFromVariableList(list: VariableList, source: string): ImportResult {
  const notes: string[] = [];
  const guesses = new Guesses();

  // About: identifier, version, title, languages.
  const about = new Map<string, string>();
  for (const row of (list.about ?? []).slice(1)) {
    const k = (row[0] ?? '').trim();
    if (k !== '') about.set(k.toLowerCase().replace(/[\s_-]+/g, ''), row[1] ?? '');
  }
  const declared = (about.get('languages') ?? '').split(/[\s,;]+/).filter((s) => s !== '');

  // Missing sets.
  const sets = new Map<string, MissingDraft[]>();
  if (list.missingSets && list.missingSets.length > 0) {
    const [head, ...rows] = list.missingSets;
    const cols = head!.map((h) => headerKey(h));
    rows.forEach((row, r) => {
      let set = '';
      const m: MissingDraft = { code: '', quoted: false, langs: new Map() };
      cols.forEach((c, i) => {
        const v = row[i] ?? '';
        if (c.key === 'set' || c.key === 'name') set = v.trim();
        else if (c.key === 'code' || c.key === 'value') {
          const q = v.trimStart().startsWith('"');
          m.code = q ? v.trim().slice(1, -1).replaceAll('""', '"') : v.trim();
          m.quoted = q;
        } else if (c.key === 'kind' || c.key === 'missingkind') m.kindText = v.trim();
        else if (c.key === 'label' && v !== '') {
          if (c.lang) m.langs.set(c.lang, v);
          else m.plain = v;
        }
      });
      if (set === '' || m.code === '') {
        if (row.some((c) => c.trim() !== '')) notes.push(`missing sets: row ${r + 2} has no set name or no code; it was left out.`);
        return;
      }
      const listed = sets.get(set) ?? [];
      listed.push(m);
      sets.set(set, listed);
    });
  }

  // Items.
  const [header, ...rows] = list.items;
  if (!header) return { codebook: emptyCodebook(source), guesses: [], notes: ['the variable list is empty.'] };
  const cols = readHeader(header, 'items', notes);
  const drafts: ItemDraft[] = [];
  rows.forEach((row, r) => {
    const rowNo = r + 2;
    const cells: Array<{ col: Column; v: string }> = [];
    cols.forEach((c, i) => {
      const v = row[i] ?? '';
      if (c && v.trim() !== '') cells.push({ col: c, v });
    });
    if (cells.length === 0) return;
    const name = cells.find((c) => c.col.field === 'name')?.v.trim() ?? '';
    const cur = drafts[drafts.length - 1];
    let d: ItemDraft;
    if (name === '' || (cur !== undefined && name === cur.name)) {
      if (!cur) {
        notes.push(`items: row ${rowNo} has no name and no item above it; it was left out.`);
        return;
      }
      d = cur;
    } else {
      d = { row: rowNo, name, label: { langs: new Map() }, single: {}, codes: [], missing: [] };
      drafts.push(d);
    }
    const oneRow: { code?: string; quoted?: boolean; label: LabelDraft; bin?: string; kind?: string } = { label: { langs: new Map() } };
    for (const { col, v } of cells) {
      switch (col.field) {
        case 'name':
          break;
        case 'label':
          if (col.lang) d.label.langs.set(col.lang, v);
          else d.label.plain = v;
          break;
        case 'codes':
          if (col.lang) languageLabels(v, col.lang, d.codes, `items: row ${rowNo}, codes@${col.lang}`, `the codes column of item "${d.name}"`, notes);
          else {
            for (const e of parseListCell(v, { bins: true })) d.codes.push(codeDraft(e));
          }
          break;
        case 'missing':
          if (col.lang) languageLabels(v, col.lang, d.missing, `items: row ${rowNo}, missing@${col.lang}`, `the missing column of item "${d.name}"`, notes);
          else {
            const entries = parseListCell(v, { kinds: true });
            const only = entries[0];
            const isSetName =
              entries.length === 1 && only!.label === undefined && only!.kind === undefined && !only!.quoted && (sets.has(only!.code) || !NUMERIC.test(only!.code));
            if (isSetName) d.missingSet = only!.code;
            else for (const e of entries) d.missing.push(missingDraft(e));
          }
          break;
        case 'code': {
          const q = v.trimStart().startsWith('"');
          oneRow.code = q ? v.trim().slice(1, -1).replaceAll('""', '"') : v.trim();
          oneRow.quoted = q;
          break;
        }
        case 'codeLabel':
          if (col.lang) oneRow.label.langs.set(col.lang, v);
          else oneRow.label.plain = v;
          break;
        case 'bin':
          oneRow.bin = v;
          break;
        case 'missingKind':
          oneRow.kind = v.trim();
          break;
        default:
          if (d.single[col.field] !== undefined && d.single[col.field] !== v) {
            notes.push(`items: row ${rowNo} gives ${col.field} of item "${d.name}" again; the first one is kept.`);
          } else d.single[col.field] = v;
      }
    }
    if (oneRow.code !== undefined) {
      if (oneRow.kind !== undefined) {
        const m: MissingDraft = { code: oneRow.code, quoted: oneRow.quoted ?? false, langs: oneRow.label.langs, kindText: oneRow.kind };
        if (oneRow.label.plain !== undefined) m.plain = oneRow.label.plain;
        d.missing.push(m);
      } else {
        const c: CodeDraft = { code: oneRow.code, quoted: oneRow.quoted ?? false, langs: oneRow.label.langs };
        if (oneRow.label.plain !== undefined) c.plain = oneRow.label.plain;
        if (oneRow.bin !== undefined) {
          const b = parseBounds(oneRow.bin);
          if (b && b.min !== undefined) c.bin = b.max === undefined ? { min: b.min } : { min: b.min, max: b.max };
          else notes.push(`items: row ${rowNo}, the bin ${JSON.stringify(oneRow.bin)} of code ${oneRow.code} is not min..max; it was left out.`);
        }
        d.codes.push(c);
      }
    } else if (oneRow.bin !== undefined || oneRow.kind !== undefined) {
      notes.push(`items: row ${rowNo} gives a bin or missing kind without a code; it was left out.`);
    }
  });

  // Languages: declared in "about", else those of the label columns.
  const found: string[] = [];
  const see = (l: LabelDraft) => {
    for (const k of l.langs.keys()) if (!found.includes(k)) found.push(k);
  };
  for (const d of drafts) {
    see(d.label);
    d.codes.forEach(see);
    d.missing.forEach(see);
  }
  for (const s of sets.values()) s.forEach(see);
  // A plain label beside labels per language belongs to the declared default language only.
  const defaultLang = declared[0];
  const undetermined = (item: string, what: string) => () =>
    guesses.add(item, 'label', 'und', `${what} has a plain label beside labels per language and the codebook declares no languages`, `${what}: the plain label is taken as language "und"`);

  const kindOf = (m: MissingDraft, item: string, where: string): MissingKind => {
    if (m.kindText !== undefined && (MISSING_KINDS as readonly string[]).includes(m.kindText)) return m.kindText as MissingKind;
    if (m.kind) return m.kind;
    const label = m.plain ?? m.langs.values().next().value;
    const k = kindFromLabel(label);
    const given = m.kindText ? `the kind "${m.kindText}" is not one of ${MISSING_KINDS.join(', ')}` : 'no kind given';
    if (k) {
      guesses.add(item, 'missing', { code: m.code, kind: k }, `${given}; the label ${JSON.stringify(label)} reads as ${k} (common practice wording)`, `${where} ${m.code} taken as ${k}`);
      return k;
    }
    guesses.add(item, 'missing', { code: m.code, kind: 'omitted' }, `${given} and the label does not say; omitted is a placeholder`, `${where} ${m.code}: kind unknown, set to omitted`);
    return 'omitted';
  };
  const missingCode = (m: MissingDraft, numeric: boolean, item: string, where: string) => {
    const out: { code: number | string; kind: MissingKind; label?: Label } = { code: typedCode(m.code, m.quoted, numeric), kind: kindOf(m, item, where) };
    const label = labelOf(m, defaultLang, undetermined(item, `missing code ${m.code}`));
    if (label !== undefined) out.label = label;
    return out;
  };

  const missingSets: Record<string, Array<{ code: number | string; kind: MissingKind; label?: Label }>> = {};
  for (const [name, list2] of sets) missingSets[name] = list2.map((m) => missingCode(m, true, '', `set "${name}" code`));

  const items = drafts.map((d) => buildItem(d, { guesses, notes, defaultLang, undetermined, missingCode, sets }));

  // The codebook itself.
  const cbName = about.get('codebook')?.trim();
  const codebook = cbName || slug(source);
  if (!cbName) guesses.add('', 'codebook', codebook, 'the variable list gives no identifier; taken from the file name', `identifier "${codebook}" from the file name`);
  const version = about.get('version')?.trim();
  if (!version) guesses.add('', 'version', '1', 'the variable list gives no version', 'version 1 assumed');
  const title = about.get('title')?.trim() || `Codebook imported from ${source}`;
  const cb: Codebook = { codebook, version: version || '1', title, items: items as Codebook['items'] } as Codebook;
  const schema = about.get('$schema')?.trim() || about.get('schema')?.trim();
  const ordered: Record<string, unknown> = {};
  if (schema) ordered.$schema = schema;
  Object.assign(ordered, { codebook: cb.codebook, version: cb.version, title: cb.title });
  if (declared.length > 0) ordered.languages = declared;
  else if (found.length > 1 || (found.length === 1 && drafts.some((d) => d.label.plain !== undefined && d.label.langs.size === 0))) {
    ordered.languages = found;
    guesses.add('', 'languages', found, 'the variable list declares no languages; taken from the label columns', `languages ${found.join(', ')} from the label columns`);
  }
  if (Object.keys(missingSets).length > 0) ordered.missingSets = missingSets;
  ordered.items = items;
  const rules = readRules(list.rules, guesses, notes);
  if (rules.length > 0) ordered.rules = rules;
  const marks = guesses.marksOf('');
  if (marks.length > 0) ordered.title = `${title} [check: ${marks.join('; ')}]`;
  // Item labels get their marks last, once every guess about them is in.
  for (const it of items) it.label = guesses.mark(it.name, it.label);
  return { codebook: ordered as unknown as Codebook, guesses: guesses.list, notes };
}

/** Puts the labels of a `codes@<tag>` or `missing@<tag>` cell on the codes listed already. */
function languageLabels(cell: string, lang: string, into: ReadonlyArray<{ code: string; langs: Map<string, string> }>, where: string, listed: string, notes: string[]): void {
  for (const e of parseListCell(cell, {})) {
    const c = into.find((x) => sameCode(x.code, e.code));
    if (c && e.label !== undefined) c.langs.set(lang, e.label);
    else notes.push(`${where} names code ${JSON.stringify(e.code)}, which ${listed} does not list; it was left out.`);
  }
}

function codeDraft(e: CellEntry): CodeDraft {
  const c: CodeDraft = { code: e.code, quoted: e.quoted, langs: new Map() };
  if (e.label !== undefined) c.plain = e.label;
  if (e.bin) c.bin = e.bin;
  return c;
}

function missingDraft(e: CellEntry): MissingDraft {
  const m: MissingDraft = { code: e.code, quoted: e.quoted, langs: new Map() };
  if (e.label !== undefined) m.plain = e.label;
  if (e.kind) m.kind = e.kind;
  return m;
}

interface BuildContext {
  guesses: Guesses;
  notes: string[];
  defaultLang: string | undefined;
  undetermined: (item: string, what: string) => () => void;
  missingCode: (m: MissingDraft, numeric: boolean, item: string, where: string) => { code: number | string; kind: MissingKind; label?: Label };
  sets: Map<string, MissingDraft[]>;
}

type ItemOut = Record<string, unknown> & { name: string; label: Label };

function buildItem(d: ItemDraft, ctx: BuildContext): ItemOut {
  const { guesses, notes } = ctx;
  const s = d.single;
  const name = d.name;
  // Type.
  let type: string | undefined;
  const typeText = s.type?.trim().toLowerCase();
  if (typeText) {
    const t = TYPE_WORDS[typeText];
    if (t) {
      type = t.type;
      if (!t.exact) guesses.add(name, 'type', t.type, `the type "${s.type}" read as ${t.type}`, `type ${t.type} (written "${s.type}")`);
    }
  }
  if (type === undefined) {
    const codes = d.codes.map((c) => c.code);
    const bounds = [parseBounds(s.range ?? ''), parseBounds(s.expect ?? '')].flatMap((b) => (b ? [b.min, b.max] : [])).filter((x): x is number => x !== undefined);
    let why: string;
    if (codes.length > 0 && codes.every((c) => NUMERIC.test(c))) {
      type = codes.every((c) => Number.isInteger(Number(c))) ? 'integer' : 'decimal';
      why = `its codes are ${type === 'integer' ? 'whole numbers' : 'numbers'}`;
    } else if (codes.length > 0) {
      type = 'text';
      why = 'its codes are not all numbers';
    } else if (bounds.length > 0) {
      type = bounds.every((b) => Number.isInteger(b)) ? 'integer' : 'decimal';
      why = 'it has numeric bounds';
    } else {
      type = 'text';
      why = 'nothing in the row says otherwise';
    }
    const given = typeText ? `the type "${s.type}" is not one of integer, decimal, text, date` : 'no type given';
    guesses.add(name, 'type', type, `${given}; ${why}`, `type ${type} guessed`);
  }
  const numeric = type === 'integer' || type === 'decimal';

  // Role.
  let role: Role | undefined;
  if (s.role !== undefined) {
    const r = s.role.trim().toLowerCase();
    if ((ROLES as readonly string[]).includes(r)) role = r as Role;
    else notes.push(`items: row ${d.row}, the role "${s.role}" of item "${name}" is not one of ${ROLES.join(', ')}; it was left out.`);
  }

  // Level.
  let level: string | undefined;
  const levelText = s.level?.trim().toLowerCase();
  if (levelText) {
    const l = LEVEL_WORDS[levelText];
    if (l) {
      level = l.level;
      if (!l.exact) guesses.add(name, 'level', l.level, `the level "${s.level}" read as ${l.level}`, `level ${l.level} (written "${s.level}")`);
    }
  }
  if (level === undefined && !(type === 'text' && d.codes.length === 0) && role !== 'id') {
    const range = parseBounds(s.range ?? '');
    let why: string;
    if (d.codes.length > 0) {
      const binned = d.codes.some((c) => c.bin);
      level = binned ? 'ordinal' : 'nominal';
      why = binned ? 'its codes stand for bins of a quantity' : 'it has a list of codes (ordinal if they form a scale)';
    } else if (type === 'date') {
      level = 'interval';
      why = 'calendar dates have no true zero';
    } else {
      level = range && range.min !== undefined && range.min >= 0 ? 'ratio' : 'interval';
      why = level === 'ratio' ? 'its range starts at 0 or above: a count or amount with a true zero' : 'no range from 0 up: no true zero assumed';
    }
    const given = levelText ? `the level "${s.level}" is not one of nominal, ordinal, interval, ratio` : 'no level given';
    guesses.add(name, 'level', level, `${given}; ${why}`, `level ${level} guessed`);
  }

  const out: ItemOut = { name, label: '' };
  const label = labelOf(d.label, ctx.defaultLang, ctx.undetermined(name, `item "${name}"`));
  if (label === undefined) {
    out.label = name;
    guesses.add(name, 'label', name, 'no label given', 'label missing');
  } else out.label = label;
  if (s.text !== undefined) out.text = s.text;
  if (role !== undefined) out.role = role;
  out.type = type;
  if (level !== undefined) out.level = level;
  if (s.unit !== undefined) out.unit = s.unit.trim();
  if (d.codes.length > 0) {
    out.codes = d.codes.map((c) => {
      const code: Record<string, unknown> = { code: typedCode(c.code, c.quoted, numeric) };
      const l = labelOf(c, ctx.defaultLang, ctx.undetermined(name, `code ${c.code}`));
      if (l === undefined) {
        code.label = '';
        guesses.add(name, 'codes', { code: c.code }, `code ${c.code} has no label`, `code ${c.code} has no label`);
      } else code.label = l;
      if (c.bin) code.bin = c.bin.max === undefined ? { min: c.bin.min } : { min: c.bin.min, max: c.bin.max };
      return code;
    });
  }
  for (const key of ['range', 'expect'] as const) {
    const b = parseBounds(s[key] ?? '');
    if (b === null) notes.push(`items: row ${d.row}, the ${key} ${JSON.stringify(s[key])} of item "${name}" is not min..max; it was left out.`);
    else if (b !== undefined) out[key] = b;
  }
  if (d.missingSet !== undefined) {
    out.missing = d.missingSet;
    if (d.missing.length > 0) notes.push(`items: row ${d.row}, item "${name}" names missing set "${d.missingSet}" and lists missing codes too; the set is kept.`);
  } else if (d.missing.length > 0) out.missing = d.missing.map((m) => ctx.missingCode(m, numeric, name, 'missing code'));
  if (s.askedWhen !== undefined) out.askedWhen = s.askedWhen.trim();
  if (s.unique !== undefined) {
    const u = s.unique.trim().toLowerCase();
    if (['true', 'yes', 'y', '1'].includes(u)) out.unique = true;
    else if (['false', 'no', 'n', '0'].includes(u)) out.unique = false;
    else notes.push(`items: row ${d.row}, unique "${s.unique}" of item "${name}" is not true or false; it was left out.`);
  }
  if (s.pattern !== undefined) out.pattern = s.pattern;
  return out;
}

function readRules(table: string[][] | undefined, guesses: Guesses, notes: string[]): Array<Record<string, unknown>> {
  if (!table || table.length === 0) return [];
  const [head, ...rows] = table;
  const keys = head!.map((h) => headerKey(h).key);
  const out: Array<Record<string, unknown>> = [];
  rows.forEach((row, r) => {
    const get = (k: string) => {
      const i = keys.indexOf(k);
      const v = i < 0 ? '' : (row[i] ?? '');
      return v === '' ? undefined : v;
    };
    const id = get('id')?.trim();
    const test = get('test');
    if (!id || test === undefined) {
      if (row.some((c) => c.trim() !== '')) notes.push(`rules: row ${r + 2} has no id or no test; it was left out.`);
      return;
    }
    const rule: Record<string, unknown> = { id, test };
    const when = get('when');
    if (when !== undefined) rule.when = when;
    const sev = get('severity')?.trim().toLowerCase();
    if (sev === 'error' || sev === 'warning') rule.severity = sev;
    else {
      rule.severity = 'error';
      guesses.add('', 'rules', { id, severity: 'error' }, `rule "${id}" has ${sev ? `the severity "${sev}"` : 'no severity'}`, `rule ${id} severity error assumed`);
    }
    rule.message = get('message') ?? `Rule ${id} failed.`;
    if (get('message') === undefined) guesses.add('', 'rules', { id }, `rule "${id}" has no message`, `rule ${id} message written for it`);
    out.push(rule);
  });
  return out;
}

function emptyCodebook(source: string): Codebook {
  return { codebook: slug(source), version: '1', title: `Codebook imported from ${source}`, items: [] } as unknown as Codebook;
}

/** Every language tag used in a label object of the codebook, in first-use order. */
function languagesUsed(cb: Codebook): string[] {
  const seen: string[] = [];
  const add = (l: Label | undefined) => {
    if (l !== undefined && typeof l !== 'string') for (const k of Object.keys(l)) if (!seen.includes(k)) seen.push(k);
  };
  for (const list of Object.values(cb.missingSets ?? {})) list.forEach((m) => add(m.label));
  for (const it of cb.items) {
    add(it.label);
    it.codes?.forEach((c) => add(c.label));
    if (Array.isArray(it.missing)) it.missing.forEach((m) => add(m.label));
  }
  return seen;
}

/** A code as written in a numeric item's cell: numbers bare, a string that looks like a number in quotes. */
function codeCell(code: number | string, numeric: boolean): string | number {
  return numeric && typeof code === 'string' && NUMERIC.test(code) ? `"${code}"` : code;
}

/**
 * Writes a codebook as a variable list that {@link codebookFromVariableList} reads back to the
 * same codebook: one row an item, codes and missing codes one cell each (labels per language
 * in `label@<tag>`, `codes@<tag>` and `missing@<tag>` columns), missing sets, rules and the
 * codebook's own fields in their own tables. Pure; O(size of the codebook).
 */
export function variableListFromCodebook(cb: Codebook): VariableList {
  const langs = languagesUsed(cb);
  const header = ['name', 'label', ...langs.map((l) => `label@${l}`), 'text', 'role', 'type', 'level', 'unit', 'codes', ...langs.map((l) => `codes@${l}`), 'missing', ...langs.map((l) => `missing@${l}`), 'range', 'expect', 'askedWhen', 'unique', 'pattern'];
  const rows = cb.items.map((it) => {
    const numeric = it.type === 'integer' || it.type === 'decimal';
    const row: Record<string, string> = {};
    if (typeof it.label === 'string') row.label = it.label;
    else for (const [k, v] of Object.entries(it.label)) row[`label@${k}`] = v;
    row.name = it.name;
    if (it.text !== undefined) row.text = it.text;
    if (it.role !== undefined) row.role = it.role;
    row.type = it.type;
    if (it.level !== undefined) row.level = it.level;
    if (it.unit !== undefined) row.unit = it.unit;
    if (it.codes) {
      row.codes = formatListCell(
        it.codes.map((c) => formatEntry({ code: codeCell(c.code, numeric), ...(typeof c.label === 'string' ? { label: c.label } : {}), ...(c.bin ? { bin: c.bin } : {}) })),
      );
      for (const l of langs) {
        const e = it.codes.filter((c) => typeof c.label !== 'string' && Object.hasOwn(c.label, l)).map((c) => formatEntry({ code: codeCell(c.code, numeric), label: (c.label as Record<string, string>)[l]! }));
        if (e.length > 0) row[`codes@${l}`] = formatListCell(e);
      }
    }
    if (typeof it.missing === 'string') row.missing = it.missing;
    else if (it.missing) {
      const list = it.missing;
      row.missing = formatListCell(list.map((m) => formatEntry({ code: codeCell(m.code, numeric), ...(typeof m.label === 'string' ? { label: m.label } : {}), kind: m.kind })));
      for (const l of langs) {
        const e = list.filter((m) => m.label !== undefined && typeof m.label !== 'string' && Object.hasOwn(m.label, l)).map((m) => formatEntry({ code: codeCell(m.code, numeric), label: (m.label as Record<string, string>)[l]! }));
        if (e.length > 0) row[`missing@${l}`] = formatListCell(e);
      }
    }
    if (it.range) row.range = formatBounds(it.range);
    if (it.expect) row.expect = formatBounds(it.expect);
    if (it.askedWhen !== undefined) row.askedWhen = it.askedWhen;
    if (it.unique !== undefined) row.unique = String(it.unique);
    if (it.pattern !== undefined) row.pattern = it.pattern;
    return header.map((h) => row[h] ?? '');
  });
  const out: VariableList = { items: [header, ...rows] };
  const sets = Object.entries(cb.missingSets ?? {});
  if (sets.length > 0) {
    const setLangs = langs;
    out.missingSets = [
      ['set', 'code', 'kind', 'label', ...setLangs.map((l) => `label@${l}`)],
      ...sets.flatMap(([name, list]) =>
        list.map((m) => [
          name,
          String(codeCell(m.code, true)),
          m.kind,
          typeof m.label === 'string' ? m.label : '',
          ...setLangs.map((l) => (m.label !== undefined && typeof m.label !== 'string' ? (m.label[l] ?? '') : '')),
        ]),
      ),
    ];
  }
  if (cb.rules && cb.rules.length > 0) {
    out.rules = [['id', 'test', 'when', 'severity', 'message'], ...cb.rules.map((r) => [r.id, r.test, r.when ?? '', r.severity, r.message])];
  }
  const about: string[][] = [['field', 'value'], ['codebook', cb.codebook], ['version', cb.version], ['title', cb.title]];
  if (cb.languages) about.push(['languages', cb.languages.join(' ')]);
  if (cb.$schema !== undefined) about.push(['$schema', cb.$schema]);
  out.about = about;
  return out;
}
