/**
 * The shipped JSON Schema file and its validator. Loading a codebook validates it against the
 * committed `codebook.schema.json` with ajv, and against the zod schema whenever ajv rejects it
 * (see `structure.ts`), so what an editor shows for a file and what codeweir says about it
 * cannot drift apart unnoticed. Nothing here loads zod.
 */
import { readFileSync } from 'node:fs';
import { Ajv, type ErrorObject, type ValidateFunction } from 'ajv';

/** Absolute URL of the shipped schema file (package root). */
export const SCHEMA_FILE_URL = new URL('../codebook.schema.json', import.meta.url);

let parsed: Record<string, unknown> | undefined;

/**
 * The shipped schema file, parsed on first use and cached (do not modify it). Throws when the
 * file is missing, which only a broken install can cause.
 */
export function shippedSchema(): Record<string, unknown> {
  parsed ??= JSON.parse(readFileSync(SCHEMA_FILE_URL, 'utf8')) as Record<string, unknown>;
  return parsed;
}

let validator: ValidateFunction | undefined;

/**
 * The ajv validator of the shipped schema file, compiled on first use (a few milliseconds) and
 * cached. Reads the file from the package root; throws when it is missing, which only a broken
 * install can cause.
 */
export function shippedSchemaValidator(): ValidateFunction {
  if (!validator) {
    const schema = shippedSchema();
    // allErrors so the lint report lists every structural problem, not only the first.
    validator = new Ajv({ allErrors: true, strict: false }).compile(schema);
  }
  return validator;
}

/**
 * Validates parsed JSON against the shipped schema with ajv and returns ajv's errors (empty
 * when valid). Cost: linear in the size of the document.
 */
export function validateWithShippedSchema(data: unknown): ErrorObject[] {
  const v = shippedSchemaValidator();
  return v(data) ? [] : [...(v.errors ?? [])];
}
