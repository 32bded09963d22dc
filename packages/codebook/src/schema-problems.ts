/**
 * Turns schema violations (zod issues, ajv errors) into lint problems with JSON pointers and
 * one-sentence messages, including "did you mean" hints for misspelt field names and enum
 * values.
 */
import type { z } from 'zod';
import type { ErrorObject } from 'ajv';
import { CodebookSchema } from './schema.ts';
import { pointer } from './json-scan.ts';
import { didYouMean, problem, type CodebookProblem } from './problems.ts';

type Path = ReadonlyArray<PropertyKey>;
type AnySchema = z.core.$ZodType;

/** Name of a JSON value's type as a reader would say it. */
export function jsonTypeName(v: unknown): string {
  if (v === null) return 'null';
  if (Array.isArray(v)) return 'an array';
  if (typeof v === 'object') return 'an object';
  if (typeof v === 'string') return `the string ${JSON.stringify(v.length > 40 ? v.slice(0, 40) + '...' : v)}`;
  if (typeof v === 'number') return `the number ${v}`;
  if (typeof v === 'boolean') return `${v}`;
  return typeof v;
}

function valueAt(data: unknown, path: Path): unknown {
  let v = data;
  for (const k of path) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<PropertyKey, unknown>)[k];
  }
  return v;
}

function def(s: AnySchema): Record<string, unknown> & { type: string } {
  return (s as unknown as { _zod: { def: Record<string, unknown> & { type: string } } })._zod.def;
}

/** Strips optional/default wrappers; for unions picks the option that fits `value`. */
function settle(s: AnySchema, value: unknown): AnySchema {
  for (;;) {
    const d = def(s);
    if (d.type === 'optional' || d.type === 'nullable' || d.type === 'default') s = d.innerType as AnySchema;
    else if (d.type === 'union') {
      const opts = d.options as AnySchema[];
      const want = Array.isArray(value) ? 'array' : value !== null && typeof value === 'object' ? 'object' : undefined;
      const hit = opts.find((o) => {
        const t = def(settle(o, value)).type;
        return t === want || (want === 'object' && t === 'record');
      });
      if (!hit) return s;
      s = hit;
    } else return s;
  }
}

/** The schema at `path` inside the codebook schema, following the data for unions. */
function schemaAt(data: unknown, path: Path): AnySchema | undefined {
  let s: AnySchema = CodebookSchema;
  for (let i = 0; i < path.length; i++) {
    s = settle(s, valueAt(data, path.slice(0, i)));
    const d = def(s);
    const k = path[i]!;
    if (d.type === 'object') s = (d.shape as Record<string, AnySchema>)[String(k)]!;
    else if (d.type === 'array') s = d.element as AnySchema;
    else if (d.type === 'record') s = d.valueType as AnySchema;
    else return undefined;
    if (!s) return undefined;
  }
  return settle(s, valueAt(data, path));
}

/** Field names an object at `path` accepts (empty when the path is not an object). */
export function allowedFieldsAt(data: unknown, path: Path): string[] {
  const s = schemaAt(data, path);
  if (!s) return [];
  const d = def(s);
  return d.type === 'object' ? Object.keys(d.shape as Record<string, unknown>) : [];
}

function unknownFieldMessage(key: string, allowed: string[]): string {
  const hint = didYouMean(key, allowed);
  return hint ? `unknown field "${key}"${hint}` : `unknown field "${key}"; allowed fields are ${allowed.join(', ')}`;
}

function expectedName(e: string): string {
  return e === 'object' ? 'an object' : e === 'array' ? 'an array' : `a ${e}`;
}

/**
 * Problems for the issues of a failed zod parse of `data` against the codebook schema. An
 * issue inside a union is reported from the branch that fits the value's type, so a
 * misspelt field inside an inline missing list reads as that, not as "invalid input".
 */
export function zodIssuesToProblems(issues: readonly z.core.$ZodIssue[], data: unknown, prefix: Path = []): CodebookProblem[] {
  const out: CodebookProblem[] = [];
  for (const issue of issues) {
    const path = [...prefix, ...issue.path];
    const here = pointer(path as Array<string | number>);
    const value = valueAt(data, path);
    switch (issue.code) {
      case 'unrecognized_keys': {
        const allowed = allowedFieldsAt(data, path);
        for (const key of issue.keys) out.push(problem('unknown-field', pointer([...(path as Array<string | number>), key]), unknownFieldMessage(key, allowed)));
        break;
      }
      case 'invalid_type':
      case 'invalid_value': {
        if (value === undefined) {
          const field = String(path[path.length - 1]);
          out.push(problem('missing-field', here, `required field "${field}" is missing`));
        } else if (issue.code === 'invalid_type') {
          out.push(problem('wrong-type', here, `expected ${expectedName(issue.expected)}, got ${jsonTypeName(value)}`));
        } else {
          const allowed = issue.values.map(String);
          const hint = typeof value === 'string' ? didYouMean(value, allowed) : '';
          out.push(problem('invalid-value', here, `${jsonTypeName(value)} is not one of ${allowed.join(', ')}${hint}`));
        }
        break;
      }
      case 'invalid_union': {
        const branches = issue.errors;
        const typeOnly = (b: readonly z.core.$ZodIssue[]) => b.length === 1 && b[0]!.code === 'invalid_type' && b[0]!.path.length === 0;
        const deeper = branches.filter((b) => !typeOnly(b));
        if (value === undefined) {
          out.push(problem('missing-field', here, `required field "${String(path[path.length - 1])}" is missing`));
        } else if (deeper.length > 0) {
          const best = deeper.reduce((a, b) => (b.length < a.length ? b : a));
          out.push(...zodIssuesToProblems(best, data, path));
        } else {
          const expected = branches.map((b) => expectedName((b[0] as { expected: string }).expected));
          out.push(problem('wrong-type', here, `expected ${expected.join(' or ')}, got ${jsonTypeName(value)}`));
        }
        break;
      }
      case 'invalid_key':
        out.push(problem('invalid-value', here, `${JSON.stringify(String(path[path.length - 1]))} is not a BCP 47 language tag (such as en, fr or pt-BR)`));
        break;
      case 'too_small':
        out.push(problem('invalid-value', here, Array.isArray(value) ? 'must not be an empty list' : 'must not be empty'));
        break;
      case 'invalid_format':
        out.push(
          problem(
            'invalid-value',
            here,
            `${jsonTypeName(value)} is not a valid identifier: use letters, digits, dot, underscore and hyphen, starting with a letter or digit`,
          ),
        );
        break;
      default:
        out.push(problem('schema', here, issue.message));
    }
  }
  return out;
}

/** Problems for ajv errors against the shipped JSON Schema (instancePath is a JSON pointer). */
export function ajvErrorsToProblems(errors: readonly ErrorObject[], data: unknown): CodebookProblem[] {
  return errors.map((e) => {
    const params = e.params as Record<string, unknown>;
    if (e.keyword === 'additionalProperties') {
      const key = String(params.additionalProperty);
      const path = e.instancePath.split('/').slice(1).map((t) => t.replace(/~1/g, '/').replace(/~0/g, '~'));
      const allowed = allowedFieldsAt(data, path.map((t) => (/^\d+$/.test(t) ? Number(t) : t)));
      return problem('unknown-field', `${e.instancePath}/${key.replace(/~/g, '~0').replace(/\//g, '~1')}`, unknownFieldMessage(key, allowed));
    }
    if (e.keyword === 'required') {
      const field = String(params.missingProperty);
      return problem('missing-field', `${e.instancePath}/${field}`, `required field "${field}" is missing`);
    }
    if (e.keyword === 'type') return problem('wrong-type', e.instancePath, `expected ${String(params.type)} (JSON Schema)`);
    if (e.keyword === 'enum') return problem('invalid-value', e.instancePath, `${e.message ?? 'is not an allowed value'} (JSON Schema)`);
    return problem('schema', e.instancePath, `${e.message ?? 'does not match the schema'} (JSON Schema)`);
  });
}

/**
 * Problems of a codebook that the shipped JSON Schema rejects with `ajvErrors`: zod's issues
 * when the zod schema rejects it too, else ajv's errors, since the zod schema accepting what
 * the shipped JSON Schema rejects means the file is stale or was edited by hand (reported
 * rather than letting the editor and codeweir disagree silently). Cost: one zod parse.
 */
export function structureProblems(data: unknown, ajvErrors: readonly ErrorObject[]): CodebookProblem[] {
  const zod = CodebookSchema.safeParse(data);
  return zod.success ? ajvErrorsToProblems(ajvErrors, data) : zodIssuesToProblems(zod.error.issues, data);
}
