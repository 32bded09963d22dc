/**
 * A codebook from DDI-Codebook 2.5 XML (parsed with fast-xml-parser). Every `var` of
 * `dataDscr` becomes an item: `@name`; `labl` (one per `xml:lang`); `qstn/qstnLit` as the
 * question text; `catgry` as codes, those with `missing="Y"` as missing codes (kind from
 * `@missType`, else read from the label and marked); `valrng/range` as `range`; `varFormat`
 * and `@intrvl`/`@dcml` for the type; `@nature` for the level; `@wgt="wgt"` for the weight;
 * `@measUnit` for the unit; values an `invalrng` lists become missing codes (kind marked). The notes of our own type (`codeweir:...`) that `ddiFromCodebook`
 * writes are read back, so an exported codebook imports as itself. What had to be guessed is
 * marked as `codeweir draft` marks it; a `universe` in words (not routing we wrote) is left for
 * a person to turn into `askedWhen`.
 */
import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { CodeweirError } from '@codeweir/core';
import { MISSING_KINDS, type Codebook, type Label, type MissingKind } from '@codeweir/codebook';
import { Guesses, kindFromLabel } from './guess.ts';
import { BIN_TEXT, NOTE } from './ddi-export.ts';
import type { ImportResult } from './variable-list.ts';

type Node = Record<string, unknown>;

const NUMERIC = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

function kids(n: Node | undefined, name: string): Node[] {
  const v = n?.[name];
  return Array.isArray(v) ? (v as Node[]) : [];
}
function kid(n: Node | undefined, name: string): Node | undefined {
  return kids(n, name)[0];
}
function text(n: Node | undefined): string | undefined {
  if (n === undefined) return undefined;
  const t = n['#text'];
  return t === undefined ? undefined : String(t);
}
function attr(n: Node | undefined, name: string): string | undefined {
  const v = n?.[`@_${name}`];
  return v === undefined ? undefined : String(v);
}

/** Labels of an element: one string, or one per `xml:lang` when any is tagged. */
function labelOf(n: Node | undefined): Label | undefined {
  const ls = kids(n, 'labl').filter((l) => text(l) !== undefined);
  if (ls.length === 0) return undefined;
  if (ls.every((l) => attr(l, 'lang') === undefined)) return text(ls[0]);
  const out: Record<string, string> = {};
  for (const l of ls) {
    const lang = attr(l, 'lang') ?? 'und';
    if (!(lang in out)) out[lang] = text(l)!;
  }
  return out;
}

function parseBoundsText(t: string): { min?: number; max?: number } | undefined {
  const m = /^\s*(\S*?)\s*\.\.\s*(\S*)\s*$/.exec(t);
  if (!m) return undefined;
  const out: { min?: number; max?: number } = {};
  if (m[1] !== '' && NUMERIC.test(m[1]!)) out.min = Number(m[1]);
  if (m[2] !== '' && NUMERIC.test(m[2]!)) out.max = Number(m[2]);
  return out;
}

/**
 * Reads DDI-Codebook XML text into a codebook. `file` names it in messages and gives the
 * identifier when the study has no `IDNo`. Pure apart from parsing; O(size of the text).
 * Throws CodeweirError CW_FILE_UNREADABLE (exit 2) with the line and column of malformed XML, and
 * the same code when the root element is not `codeBook` or it has no `var`.
 */
export function codebookFromDdi(xml: string, file: string): ImportResult {
  const valid = XMLValidator.validate(xml);
  if (valid !== true) {
    const { line, col, msg } = valid.err;
    throw new CodeweirError('CW_FILE_UNREADABLE', `${file}:${line}:${col}: not well-formed XML: ${msg}`, { file, line, column: col });
  }
  const parser = new XMLParser({
    ignoreAttributes: false,
    attributeNamePrefix: '@_',
    removeNSPrefix: true,
    alwaysCreateTextNode: true,
    parseTagValue: false,
    parseAttributeValue: false,
    trimValues: false,
    htmlEntities: true,
    isArray: (_name, _path, _leaf, isAttribute) => !isAttribute,
  });
  const doc = parser.parse(xml) as Node;
  const root = kid(doc, 'codeBook');
  if (!root) throw new CodeweirError('CW_FILE_UNREADABLE', `${file} is XML but not a DDI codebook: its root element is not codeBook.`, { file });
  const notes: string[] = [];
  const guesses = new Guesses();

  const study = kid(root, 'stdyDscr');
  const citation = kid(study, 'citation');
  const studyNotes = new Map<string, Node[]>();
  for (const n of kids(study, 'notes')) {
    const t = attr(n, 'type') ?? '';
    studyNotes.set(t, [...(studyNotes.get(t) ?? []), n]);
  }
  const titleText = text(kid(kid(citation, 'titlStmt'), 'titl'));
  const idText = text(kid(kid(citation, 'titlStmt'), 'IDNo'));
  const versionText = text(kid(kid(citation, 'verStmt'), 'version'));

  const sets: Record<string, unknown[]> = {};
  for (const n of studyNotes.get(NOTE.missingSet) ?? []) {
    const name = attr(n, 'subject');
    try {
      const list = JSON.parse(text(n) ?? '');
      if (name && Array.isArray(list)) sets[name] = list;
    } catch {
      notes.push(`the missing set note "${name ?? ''}" is not readable JSON; it was left out.`);
    }
  }
  const rules: unknown[] = [];
  for (const n of studyNotes.get(NOTE.rule) ?? []) {
    try {
      rules.push(JSON.parse(text(n) ?? ''));
    } catch {
      notes.push(`the rule note "${attr(n, 'subject') ?? ''}" is not readable JSON; it was left out.`);
    }
  }

  const vars = kids(root, 'dataDscr').flatMap((d) => kids(d, 'var'));
  if (vars.length === 0) throw new CodeweirError('CW_FILE_UNREADABLE', `${file} has no var elements in dataDscr: there is no variable to import.`, { file });
  const seenLangs: string[] = [];
  const see = (l: Label | undefined) => {
    if (l !== undefined && typeof l !== 'string') for (const k of Object.keys(l)) if (!seenLangs.includes(k)) seenLangs.push(k);
  };

  const items = vars.map((v, i) => {
    let name = attr(v, 'name') ?? '';
    if (name === '') {
      name = `var${i + 1}`;
      guesses.add(name, 'name', name, `var ${i + 1} has no name attribute`, 'name made up');
    }
    const vnotes = new Map<string, string>();
    for (const n of kids(v, 'notes')) {
      const t = attr(n, 'type');
      if (t?.startsWith('codeweir:') && !vnotes.has(t)) vnotes.set(t, text(n) ?? '');
    }
    const fmt = kid(v, 'varFormat');
    const fmtType = attr(fmt, 'type');
    const formatname = attr(fmt, 'formatname');
    const cats = kids(v, 'catgry');
    const valid = cats.filter((c) => attr(c, 'missing') !== 'Y');
    const missingCats = cats.filter((c) => attr(c, 'missing') === 'Y');

    // Type.
    let type: string;
    if (formatname && ['integer', 'decimal', 'text', 'date'].includes(formatname)) type = formatname;
    else if (attr(fmt, 'category') === 'date') type = 'date';
    else {
      const values = valid.map((c) => text(kid(c, 'catValu')) ?? '');
      const dcml = attr(v, 'dcml');
      const intrvl = attr(v, 'intrvl') ?? 'discrete';
      let why: string;
      if (fmtType === 'character') {
        type = 'text';
        why = 'varFormat type is character';
      } else if (fmtType === 'numeric' || values.every((x) => NUMERIC.test(x))) {
        const whole = values.every((x) => Number.isInteger(Number(x)));
        type = dcml !== undefined ? (dcml === '0' ? 'integer' : 'decimal') : intrvl === 'contin' || !whole ? 'decimal' : 'integer';
        why = dcml !== undefined ? `dcml is ${dcml}` : `intrvl is ${intrvl}${values.length ? ' and the codes are numbers' : ''}`;
      } else {
        type = 'text';
        why = 'the codes are not all numbers';
      }
      guesses.add(name, 'type', type, `no varFormat formatname of ours; ${why}`, `type ${type} guessed`);
    }
    const numeric = type === 'integer' || type === 'decimal';
    const typed = (t: string) => (numeric && NUMERIC.test(t) ? Number(t) : t);

    // Role and level.
    const roleNote = vnotes.get(NOTE.role);
    const role = roleNote ?? (attr(v, 'wgt') === 'wgt' ? 'weight' : undefined);
    const nature = attr(v, 'nature');
    let level: string | undefined;
    if (nature && ['nominal', 'ordinal', 'interval', 'ratio'].includes(nature)) level = nature;
    else if (!(type === 'text' && valid.length === 0) && role !== 'id') {
      const binned = valid.some((c) => kids(c, 'txt').some((t) => (text(t) ?? '').startsWith(BIN_TEXT)));
      level = valid.length > 0 ? (binned ? 'ordinal' : 'nominal') : type === 'date' ? 'interval' : attr(v, 'intrvl') === 'contin' || numeric ? 'ratio' : 'nominal';
      const given = nature ? `nature "${nature}" is not one of nominal, ordinal, interval, ratio` : 'no nature given';
      const why = valid.length > 0 ? 'it has categories (ordinal if they form a scale)' : level === 'ratio' ? 'numeric without categories (interval if it has no true zero)' : 'dates have no true zero';
      guesses.add(name, 'level', level, `${given}; ${why}`, `level ${level} guessed`);
    }

    const item: Record<string, unknown> = { name, label: '' };
    const label = labelOf(v);
    see(label);
    if (label === undefined) {
      item.label = name;
      guesses.add(name, 'label', name, 'no labl element', 'label missing');
    } else item.label = label;
    const q = text(kid(kid(v, 'qstn'), 'qstnLit'));
    if (q !== undefined) item.text = q;
    if (role !== undefined) item.role = role;
    item.type = type;
    if (level !== undefined) item.level = level;
    const unit = attr(v, 'measUnit');
    if (unit !== undefined) item.unit = unit;
    if (valid.length > 0) {
      item.codes = valid.map((c) => {
        const value = text(kid(c, 'catValu'));
        const code: Record<string, unknown> = { code: typed(value ?? '') };
        if (value === undefined) guesses.add(name, 'codes', {}, 'a category has no catValu', 'a category without a value');
        const l = labelOf(c);
        see(l);
        code.label = l ?? '';
        if (l === undefined) guesses.add(name, 'codes', { code: value }, `category ${value} has no label`, `code ${value} has no label`);
        const binText = kids(c, 'txt').map((t) => text(t) ?? '').find((t) => t.startsWith(BIN_TEXT));
        if (binText) {
          const b = parseBoundsText(binText.slice(BIN_TEXT.length));
          if (b && b.min !== undefined) code.bin = b.max === undefined ? { min: b.min } : { min: b.min, max: b.max };
        }
        return code;
      });
    }
    const range = kid(kid(v, 'valrng'), 'range');
    if (range) {
      const r: { min?: number; max?: number } = {};
      const mn = attr(range, 'min');
      const mx = attr(range, 'max');
      if (mn !== undefined && NUMERIC.test(mn)) r.min = Number(mn);
      if (mx !== undefined && NUMERIC.test(mx)) r.max = Number(mx);
      if (r.min !== undefined || r.max !== undefined) item.range = r;
      if (kids(v, 'valrng').length > 1 || kids(kid(v, 'valrng'), 'range').length > 1) notes.push(`var ${name}: only the first valrng range was read; a codebook range is one interval.`);
    }
    const expect = vnotes.get(NOTE.expect);
    if (expect !== undefined) {
      const b = parseBoundsText(expect);
      if (b) item.expect = b;
    }
    const setName = vnotes.get(NOTE.missingSet);
    if (setName !== undefined && Object.hasOwn(sets, setName)) item.missing = setName;
    else if (missingCats.length > 0) {
      item.missing = missingCats.map((c) => {
        const value = text(kid(c, 'catValu')) ?? '';
        const l = labelOf(c);
        see(l);
        const missType = attr(c, 'missType');
        let kind: MissingKind;
        if (missType && (MISSING_KINDS as readonly string[]).includes(missType)) kind = missType as MissingKind;
        else {
          const words = typeof l === 'string' ? l : l ? Object.values(l)[0] : undefined;
          const k = kindFromLabel(words);
          kind = k ?? 'omitted';
          const given = missType ? `missType "${missType}" is not one of ours` : 'no missType';
          guesses.add(
            name,
            'missing',
            { code: value, kind },
            k ? `${given}; the label ${JSON.stringify(words)} reads as ${k} (common practice wording)` : `${given} and the label does not say; omitted is a placeholder`,
            k ? `missing code ${value} taken as ${k}` : `missing code ${value}: kind unknown, set to omitted`,
          );
        }
        const m: Record<string, unknown> = { code: typed(value), kind };
        if (l !== undefined) m.label = l;
        return m;
      });
    }
    // Some producers list missing values as invalid values (invalrng) rather than as categories.
    const declared = new Set((Array.isArray(item.missing) ? (item.missing as Array<{ code: unknown }>) : []).map((m) => String(m.code)));
    for (const inval of kids(v, 'invalrng')) {
      for (const it of kids(inval, 'item')) {
        const value = attr(it, 'VALUE');
        if (value === undefined || declared.has(value) || typeof item.missing === 'string') continue;
        declared.add(value);
        const list = (Array.isArray(item.missing) ? item.missing : (item.missing = [])) as Array<Record<string, unknown>>;
        list.push({ code: typed(value), kind: 'omitted' });
        guesses.add(name, 'missing', { code: value, kind: 'omitted' }, `invalrng lists ${value} as an invalid value, with no label to read a kind from; omitted is a placeholder`, `missing code ${value} from invalrng: kind unknown, set to omitted`);
      }
      if (kids(inval, 'range').length > 0) notes.push(`var ${name}: an invalrng range was not read; a codebook lists missing codes one by one.`);
    }
    const asked = vnotes.get(NOTE.askedWhen);
    if (asked !== undefined) item.askedWhen = asked;
    else {
      const universe = kids(v, 'universe').map((u) => text(u)).find((t) => t !== undefined);
      if (universe !== undefined) {
        guesses.add(name, 'askedWhen', universe, `the universe "${universe}" is in words; write it as a CEL routing condition in askedWhen if the item is routed`, 'universe in words: routing to write');
      }
    }
    const unique = vnotes.get(NOTE.unique);
    if (unique === 'true' || unique === 'false') item.unique = unique === 'true';
    const pattern = vnotes.get(NOTE.pattern);
    if (pattern !== undefined) item.pattern = pattern;
    return item as { name: string; label: Label };
  });

  const out: Record<string, unknown> = {};
  const schema = text((studyNotes.get(NOTE.schema) ?? [])[0]);
  if (schema !== undefined) out.$schema = schema;
  let id = idText?.trim();
  if (!id || !/^[A-Za-z0-9][A-Za-z0-9._-]*$/.test(id)) {
    const from = (id ?? attr(root, 'ID') ?? file.replace(/^.*[\\/]/, '').replace(/\.[^.]*$/, '')).replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^[^A-Za-z0-9]+/, '');
    const made = from === '' ? 'imported' : from;
    guesses.add('', 'codebook', made, idText ? `the IDNo "${idText}" is not a slug` : 'the study has no IDNo', `identifier "${made}" made up`);
    id = made;
  }
  out.codebook = id;
  out.version = versionText !== undefined && versionText.trim() !== '' ? versionText : '1';
  if (!versionText?.trim()) guesses.add('', 'version', '1', 'the citation has no verStmt/version', 'version 1 assumed');
  const title = titleText !== undefined && titleText.trim() !== '' ? titleText : `Codebook imported from ${file.replace(/^.*[\\/]/, '')}`;
  out.title = title;
  const langNote = text((studyNotes.get(NOTE.languages) ?? [])[0]);
  if (langNote !== undefined) out.languages = langNote.split(/\s+/).filter((s) => s !== '');
  else if (seenLangs.length > 0) {
    out.languages = seenLangs;
    guesses.add('', 'languages', seenLangs, 'the file declares no languages; taken from the labl xml:lang attributes', `languages ${seenLangs.join(', ')} from the labels`);
  }
  if (Object.keys(sets).length > 0) out.missingSets = sets;
  out.items = items;
  if (rules.length > 0) out.rules = rules;
  const marks = guesses.marksOf('');
  if (marks.length > 0) out.title = `${title} [check: ${marks.join('; ')}]`;
  for (const it of items) it.label = guesses.mark(it.name, it.label);
  return { codebook: out as unknown as Codebook, guesses: guesses.list, notes };
}
