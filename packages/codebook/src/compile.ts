/**
 * From a schema-valid codebook to the compiled form of `compiled.ts`: every lookup the hot path
 * needs is built here once.
 */
import { CodeweirError } from '@codeweir/core';
import type {
  CompiledCode,
  CompiledCodebook,
  CompiledExpression,
  CompiledItem,
  CompiledMissingCode,
  CompiledRule,
} from './compiled.ts';
import type { Codebook } from './schema.ts';
import { compilePattern, resolveMissing } from './resolve.ts';
import { codeKeys } from './numbers.ts';
import { analyseCodebook } from './checks/index.ts';
import { hasErrors } from './problems.ts';
import { pointer } from './json-scan.ts';
import { codebookLanguages, labelText, resolveLabels } from './labels.ts';

/** How a codebook is compiled: the language its labels are resolved to. */
export interface CompileOptions {
  /** BCP 47 tag; default the first declared language (or each label's first entry). */
  lang?: string;
}

/**
 * Builds the compiled codebook from a codebook whose meaning checks found no error. `expressions`
 * maps the JSON pointer of each CEL field (`/items/3/askedWhen`, `/rules/0/test`) to its
 * compiled expression. Labels are resolved to plain strings in `options.lang` (see
 * `labels.ts`), and `source` is that resolved codebook. Internal: callers use
 * {@link compileCodebook} or `parseCodebook`.
 */
export function buildCompiled(given: Codebook, expressions: ReadonlyMap<string, CompiledExpression>, file?: string, options: CompileOptions = {}): CompiledCodebook {
  const languages = codebookLanguages(given);
  // Labels become plain strings in the chosen language here, so that every consumer (and every
  // worker thread, which compiles `source` again) sees strings.
  const cb = resolveLabels(given, options.lang);
  const items: CompiledItem[] = cb.items.map((it, index) => {
    const numeric = it.type === 'integer' || it.type === 'decimal';
    const codes: CompiledCode[] = (it.codes ?? []).map((c, i) => ({
      index: i,
      code: c.code,
      text: String(c.code),
      label: labelText(c.label, undefined),
      ...(c.bin ? { bin: { min: c.bin.min, max: c.bin.max ?? null } } : {}),
    }));
    const codeByText = new Map<string, number>();
    for (const c of codes) for (const k of codeKeys(c.code, numeric)) if (!codeByText.has(k)) codeByText.set(k, c.index);
    const missing: CompiledMissingCode[] = resolveMissing(cb, it.missing).map((m) => ({
      code: m.code,
      text: String(m.code),
      kind: m.kind,
      ...(m.label !== undefined ? { label: labelText(m.label, undefined) } : {}),
    }));
    const missingByText = new Map<string, CompiledMissingCode>();
    for (const m of missing) for (const k of codeKeys(m.code, numeric)) if (!missingByText.has(k)) missingByText.set(k, m);
    const binned = codes.length > 0 && codes.every((c) => c.bin !== undefined);
    const bins = binned ? codes.map((c) => ({ index: c.index, min: c.bin!.min, max: c.bin!.max })).sort((a, b) => a.min - b.min) : [];
    const role = it.role ?? 'item';
    const askedWhen = expressions.get(pointer(['items', index, 'askedWhen']));
    const item: CompiledItem = {
      index,
      name: it.name,
      label: labelText(it.label, undefined),
      role,
      type: it.type,
      codes,
      codeByText,
      binned,
      bins,
      missing,
      missingByText,
      unique: it.unique ?? role === 'id',
    };
    if (it.text !== undefined) item.text = it.text;
    if (it.level !== undefined) item.level = it.level;
    if (it.unit !== undefined) item.unit = it.unit;
    if (it.range) item.range = { ...it.range };
    if (it.expect) item.expect = { ...it.expect };
    if (it.pattern !== undefined) item.pattern = compilePattern(it.pattern);
    if (askedWhen) item.askedWhen = askedWhen;
    if (it.confidential) item.confidential = true;
    return item;
  });
  const rules: CompiledRule[] = (cb.rules ?? []).map((r, i) => {
    const test = expressions.get(pointer(['rules', i, 'test']))!;
    const when = expressions.get(pointer(['rules', i, 'when']));
    return { id: r.id, test, ...(when ? { when } : {}), severity: r.severity, message: r.message };
  });
  const out: CompiledCodebook = {
    source: cb,
    id: cb.codebook,
    version: cb.version,
    title: cb.title,
    items,
    byName: new Map(items.map((it) => [it.name, it])),
    groupItems: items.filter((it) => it.role === 'group'),
    rules,
  };
  const idItem = items.find((it) => it.role === 'id');
  const weightItem = items.find((it) => it.role === 'weight');
  if (idItem) out.idItem = idItem;
  if (weightItem) out.weightItem = weightItem;
  if (file !== undefined) out.file = file;
  if (cb.design) out.design = { ...cb.design };
  if (cb.disclosure?.minCell !== undefined) out.minCell = cb.disclosure.minCell;
  if (languages.length > 0) {
    out.languages = languages;
    out.language = options.lang ?? languages[0]!;
  }
  return out;
}

/**
 * Runs the meaning checks on a schema-valid codebook and compiles it: items by name, missing
 * sets resolved, code tables keyed by cell text (see `numbers.ts` for how numeric cells match),
 * bins sorted by `min`, ordinal order as declared, CEL compiled once, patterns anchored,
 * labels resolved to `options.lang`.
 * Cost: linear in the codebook plus one CEL parse and type check per expression.
 * Throws CodeweirError CW_CODEBOOK_INVALID (exit code 1) naming the first error's path.
 */
export function compileCodebook(cb: Codebook, file?: string, options: CompileOptions = {}): CompiledCodebook {
  const { problems, expressions } = analyseCodebook(cb);
  if (hasErrors(problems)) {
    const first = problems.find((p) => p.severity === 'error')!;
    const where = file ? `${file} ${first.path}` : first.path || '/';
    throw new CodeweirError('CW_CODEBOOK_INVALID', `Codebook is invalid: ${where}: ${first.message}.`, { path: first.path, ...(file ? { file } : {}) }, 1);
  }
  return buildCompiled(cb, expressions, file, options);
}
