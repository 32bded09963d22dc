/**
 * Loading a codebook file: read, locate JSON syntax errors, validate against the shipped JSON
 * Schema (ajv; the zod schema gives the problems of a codebook it rejects), run the meaning
 * checks, compile.
 */
import { readFile, stat } from 'node:fs/promises';
import { CodeweirError } from '@codeweir/core';
import type { CompiledCodebook, LoadResult, Problem } from './compiled.ts';
import { checkStructure } from './structure.ts';
import { lineColumn, scanJson } from './json-scan.ts';
import { analyseCodebook } from './checks/index.ts';
import { buildCompiled, type CompileOptions } from './compile.ts';

/** How a codebook is loaded. */
export interface LoadOptions extends CompileOptions {
  /** Warnings count as errors: a codebook with any problem is not ok. */
  strict?: boolean;
}

/**
 * What a problem at `path` is about, read from the parsed JSON: the item's name for a path
 * under `/items/<i>`, the rule's id under `/rules/<i>`. Undefined elsewhere.
 */
function subjectOf(data: unknown, path: string): { item: string; words: string } | undefined {
  const m = /^\/(items|rules)\/(\d+)(?:\/|$)/.exec(path);
  if (!m || data === null || typeof data !== 'object') return undefined;
  const list = (data as Record<string, unknown>)[m[1]!];
  const entry = Array.isArray(list) ? (list[Number(m[2])] as Record<string, unknown> | undefined) : undefined;
  const key = m[1] === 'items' ? entry?.name : entry?.id;
  if (typeof key !== 'string' || key === '') {
    return m[1] === 'items' ? { item: `item ${m[2]}`, words: `item ${m[2]}` } : { item: `rule ${m[2]}`, words: `rule ${m[2]}` };
  }
  return { item: key, words: `${m[1] === 'items' ? 'item' : 'rule'} ${JSON.stringify(key)}` };
}

/** The problem with `item` set and, unless its message names it already, the subject in front. */
function named(p: Problem, data: unknown): Problem {
  const s = subjectOf(data, p.path);
  if (!s) return p;
  const message = p.message.includes(JSON.stringify(s.item)) ? p.message : `${s.words}: ${p.message}`;
  return { ...p, message, item: s.item };
}
import { hasErrors, problem, type CodebookProblem } from './problems.ts';

/** Offset of the deepest recorded ancestor of `path` (a missing field points at its object). */
function offsetOf(positions: ReadonlyMap<string, number>, path: string): number | undefined {
  let p = path;
  for (;;) {
    const o = positions.get(p);
    if (o !== undefined) return o;
    if (p === '') return undefined;
    p = p.slice(0, p.lastIndexOf('/'));
  }
}

/**
 * Offset in the file of the offending character of a problem inside a string value (CEL),
 * when the string up to that character has no escapes, so characters map one to one.
 */
function charOffset(src: string, valueStarts: ReadonlyMap<string, number>, p: Problem): number | undefined {
  const idx = (p as CodebookProblem).charIndex;
  const start = valueStarts.get(p.path);
  if (idx === undefined || start === undefined || src[start] !== '"') return undefined;
  const raw = src.slice(start + 1, start + 1 + idx);
  return raw.includes('\\') || raw.includes('"') ? undefined : start + 1 + idx;
}

/**
 * Parses and checks codebook text. Returns `ok: true` with the compiled codebook when no
 * problem is at error severity (warnings are returned alongside; with `strict` no problem at
 * all), else `ok: false` with every problem found. Problems carry line and column (1-based) of
 * the value they point at, `item` (the item's name, or the rule id) where they lie inside an
 * item or a rule, a message that names that item or rule, and are ordered by position in the
 * file. A UTF-8 byte-order mark is accepted. Labels are resolved to `options.lang`.
 *
 * Stages: JSON syntax (`json-syntax`, `duplicate-key`); schema, the shipped JSON Schema via ajv
 * and, for a codebook it rejects, the zod schema (unknown fields with a "did you mean" hint);
 * meaning checks (see `checks/`). Meaning checks run only on a schema-valid codebook.
 * Cost: linear in the text plus one CEL parse and type check per expression. Never throws.
 */
export function parseCodebook(text: string, file?: string, options: LoadOptions = {}): LoadResult {
  const src = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const scan = scanJson(src);
  if (scan.error) {
    const { line, column, message } = scan.error;
    return { ok: false, problems: [{ ...problem('json-syntax', '', `${message} (line ${line}, column ${column})`), line, column }] };
  }
  const data: unknown = JSON.parse(src);
  const problems: CodebookProblem[] = scan.duplicateKeys.map((d) =>
    problem('duplicate-key', d.pointer, `field "${d.pointer.slice(d.pointer.lastIndexOf('/') + 1)}" appears twice in the same object; only the last one would count`),
  );
  const structure = checkStructure(data);
  let result: LoadResult;
  if (!structure.ok) {
    problems.push(...structure.problems);
    result = { ok: false, problems };
  } else {
    const analysis = analyseCodebook(structure.codebook);
    problems.push(...analysis.problems);
    const refused = hasErrors(problems) || (options.strict === true && problems.length > 0);
    result = refused ? { ok: false, problems } : { ok: true, codebook: buildCompiled(structure.codebook, analysis.expressions, file, options.lang === undefined ? {} : { lang: options.lang }), problems };
  }
  const located = result.problems.map((p) => {
    const offset = offsetOf(scan.positions, p.path);
    const at = charOffset(src, scan.valueStarts, p) ?? offset;
    const { charIndex: _c, ...rest } = named(p, data) as CodebookProblem;
    return { problem: at === undefined ? rest : { ...rest, ...lineColumn(src, at) }, offset: offset ?? -1 };
  });
  located.sort((a, b) => a.offset - b.offset);
  const out: Problem[] = located.map((l) => l.problem);
  return result.ok ? { ok: true, codebook: result.codebook, problems: out } : { ok: false, problems: out };
}

/**
 * Reads a codebook file (UTF-8) and parses it with {@link parseCodebook}, recording `file` on
 * the compiled codebook. Cost: one read plus parseCodebook.
 * Throws CodeweirError CW_FILE_NOT_FOUND, CW_FILE_IS_DIRECTORY or CW_FILE_UNREADABLE (exit
 * code 2) when the file cannot be read; an invalid codebook is not thrown but returned.
 */
export async function loadCodebook(path: string, options: LoadOptions = {}): Promise<LoadResult> {
  let text: string;
  try {
    const st = await stat(path);
    if (st.isDirectory()) throw new CodeweirError('CW_FILE_IS_DIRECTORY', `Codebook ${path} is a directory; name a codebook file.`, { file: path });
    text = await readFile(path, 'utf8');
  } catch (e) {
    if (e instanceof CodeweirError) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'ENOENT' || code === 'ENOTDIR') {
      throw new CodeweirError('CW_FILE_NOT_FOUND', `Codebook ${path} does not exist; check the path.`, { file: path, cause: e });
    }
    if (code === 'EISDIR') throw new CodeweirError('CW_FILE_IS_DIRECTORY', `Codebook ${path} is a directory; name a codebook file.`, { file: path, cause: e });
    throw new CodeweirError('CW_FILE_UNREADABLE', `Codebook ${path} cannot be read (${code ?? (e as Error).message}); check its permissions.`, { file: path, cause: e });
  }
  return parseCodebook(text, path, options);
}

/**
 * Loads a codebook that must be valid: resolves to the compiled codebook (warnings dropped;
 * with `strict` a warning refuses it too), its labels in `options.lang`.
 * Throws CodeweirError CW_CODEBOOK_INVALID (exit code 1) naming the file, the first error's
 * JSON pointer, line and column, and its message; CW_USAGE (exit code 2) when `lang` is not a
 * language of a codebook whose labels have languages; or the file errors of {@link loadCodebook}.
 */
export async function loadCodebookOrThrow(path: string, options: LoadOptions = {}): Promise<CompiledCodebook> {
  const r = await loadCodebook(path, options);
  if (r.ok) {
    // The languages of the codebook as written (its compiled source is resolved to one language).
    const langs = r.codebook.languages ?? [];
    const lang = options.lang;
    if (lang !== undefined && langs.length > 0 && !langs.some((l) => l.toLowerCase() === lang.toLowerCase())) {
      throw new CodeweirError('CW_USAGE', `--lang ${lang}: codebook ${path} gives its labels in ${langs.join(', ')}; choose one of those.`, { file: path });
    }
    return r.codebook;
  }
  const first = r.problems.find((p) => p.severity === 'error') ?? r.problems[0]!;
  const strictly = first.severity === 'warning' ? ' (with --strict a warning counts as an error)' : '';
  throw new CodeweirError(
    'CW_CODEBOOK_INVALID',
    `Codebook ${path} is invalid at ${first.path || '/'}: ${first.message}${strictly}; run codeweir lint ${path} for every problem.`,
    { file: path, path: first.path, ...(first.line !== undefined ? { line: first.line, column: first.column } : {}) },
    1,
  );
}
