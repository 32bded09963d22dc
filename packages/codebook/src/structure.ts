/**
 * The structural stage of loading a codebook: the shipped JSON Schema (ajv) decides whether a
 * codebook has the format's shape, and only a codebook it rejects goes through the zod schema,
 * whose issues give the problems' messages (`structureProblems`). The zod schema is the source
 * the JSON Schema is generated from, and both accept the same documents (the codebook tests
 * compare them on every fixture), so a valid codebook never loads zod: that was most of the
 * start-up of a command reading a codebook.
 */
import type { Codebook } from './schema.ts';
import type { CodebookProblem } from './problems.ts';
import { shippedSchema, validateWithShippedSchema } from './json-schema.ts';
import { structureProblems } from './schema-problems.ts';

type JsonSchema = Record<string, unknown>;

/** The schema a `$ref` (`#/definitions/Name`) or a single-entry `allOf` stands for. */
function deref(s: JsonSchema, root: JsonSchema): JsonSchema {
  for (;;) {
    if (typeof s.$ref === 'string') {
      s = s.$ref.slice(2).split('/').reduce<JsonSchema>((o, k) => o[k] as JsonSchema, root);
    } else if (Array.isArray(s.allOf) && s.allOf.length === 1) s = s.allOf[0] as JsonSchema;
    else return s;
  }
}

/** Whether `v` is of the JSON type `s` names (a schema without a type fits anything). */
function fitsType(s: JsonSchema, v: unknown): boolean {
  switch (s.type) {
    case undefined:
      return true;
    case 'object':
      return v !== null && typeof v === 'object' && !Array.isArray(v);
    case 'array':
      return Array.isArray(v);
    case 'integer':
      return Number.isInteger(v);
    case 'null':
      return v === null;
    default:
      return typeof v === s.type;
  }
}

/**
 * `v`, valid against `s`, as the zod schema parses it: an object of known fields is rebuilt
 * with its fields in the schema's order (absent optional fields left out), a map (label
 * languages, missing sets) keeps its keys in the file's order without `__proto__`, and a union
 * takes the first branch of the value's type. Pure; linear in the size of `v`.
 */
function inSchemaOrder(v: unknown, s: JsonSchema, root: JsonSchema): unknown {
  s = deref(s, root);
  if (Array.isArray(s.anyOf)) {
    const branch = (s.anyOf as JsonSchema[]).map((b) => deref(b, root)).find((b) => fitsType(b, v));
    if (!branch) return v;
    s = branch;
  }
  if (Array.isArray(v)) return s.items && typeof s.items === 'object' ? v.map((x) => inSchemaOrder(x, s.items as JsonSchema, root)) : [...v];
  if (v === null || typeof v !== 'object') return v;
  const input = v as Record<string, unknown>;
  const out: Record<string, unknown> = {};
  if (s.properties && typeof s.properties === 'object') {
    for (const [k, sub] of Object.entries(s.properties as Record<string, JsonSchema>)) if (k in input) out[k] = inSchemaOrder(input[k], sub, root);
    return out;
  }
  const values = s.additionalProperties && typeof s.additionalProperties === 'object' ? (s.additionalProperties as JsonSchema) : {};
  for (const k of Object.keys(input)) if (k !== '__proto__') out[k] = inSchemaOrder(input[k], values, root);
  return out;
}

/** What the structural stage found: the codebook as parsed, or the problems of its shape. */
export type StructureResult = { ok: true; codebook: Codebook } | { ok: false; problems: CodebookProblem[] };

/**
 * Checks the shape of parsed JSON: with ajv against the shipped schema, and, only when that
 * rejects it, with zod for the problems. A valid codebook is returned as the zod schema would
 * return it (same fields in the same order). Cost: linear in the size of the document; one
 * zod parse more for an invalid one.
 */
export function checkStructure(data: unknown): StructureResult {
  const errors = validateWithShippedSchema(data);
  if (errors.length > 0) return { ok: false, problems: structureProblems(data, errors) };
  const root = shippedSchema();
  return { ok: true, codebook: inSchemaOrder(data, root, root) as Codebook };
}
