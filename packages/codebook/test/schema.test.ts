import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { CodebookSchema, SCHEMA_FILE_URL, parseCodebook, schemaFileText, validateWithShippedSchema } from '../src/index.ts';
import { household, lint, codesAndPaths, objectsIn, type Json } from './fixtures.ts';

describe('shipped JSON Schema', () => {
  it('is not stale: regenerating it from the zod schema gives the committed file', () => {
    // Regenerate with: npx tsx packages/codebook/scripts/write-schema.ts
    expect(readFileSync(SCHEMA_FILE_URL, 'utf8')).toBe(schemaFileText());
  });

  it('rejects unknown fields at every level (strict objects), as the zod schema does', () => {
    const schema = JSON.parse(schemaFileText()) as Json;
    expect(schema.additionalProperties).toBe(false);
    for (const name of ['Item', 'Code', 'MissingCode', 'Rule', 'Bounds', 'Bin']) expect(schema.definitions[name].additionalProperties).toBe(false);
  });
});

const minimal = () => ({ codebook: 'c', version: '1', title: '', items: [{ name: 'a', label: 'A', type: 'text' }] });

// Hand-picked documents on both sides of the schema; ajv (an independent JSON Schema
// implementation) and zod must give the same verdict on each.
const cases: Array<[string, unknown, boolean]> = [
  ['household', household(), true],
  ['minimal', minimal(), true],
  ['with $schema and inline missing codes', { ...minimal(), $schema: './codebook.schema.json', items: [{ name: 'a', label: 'A', type: 'integer', level: 'ratio', missing: [{ code: 'DK', kind: 'dont-know' }] }] }, true],
  ['not an object', [1, 2], false],
  ['no title', (({ title: _t, ...r }) => r)(minimal()), false],
  ['unknown top-level field', { ...minimal(), titel: 'x' }, false],
  ['unknown item field', { ...minimal(), items: [{ name: 'a', label: 'A', type: 'text', lable: 'x' }] }, false],
  ['type not in the enum', { ...minimal(), items: [{ name: 'a', label: 'A', type: 'string' }] }, false],
  ['boolean code', { ...minimal(), items: [{ name: 'a', label: 'A', type: 'text', codes: [{ code: true, label: 'y' }] }] }, false],
  ['empty string code', { ...minimal(), items: [{ name: 'a', label: 'A', type: 'text', codes: [{ code: '', label: 'y' }] }] }, false],
  ['no items', { ...minimal(), items: [] }, false],
  ['bad missing kind', { ...minimal(), items: [{ name: 'a', label: 'A', type: 'text', missing: [{ code: 9, kind: 'unknown' }] }] }, false],
  ['unknown bin field', { ...minimal(), items: [{ name: 'a', label: 'A', type: 'integer', codes: [{ code: 1, label: 'x', bin: { min: 0, upto: 3 } }] }] }, false],
  ['range as text', { ...minimal(), items: [{ name: 'a', label: 'A', type: 'integer', range: '0-9' }] }, false],
  ['rule severity info', { ...minimal(), rules: [{ id: 'r', test: 'true', severity: 'info', message: 'm' }] }, false],
  ['slug with a space', { ...minimal(), codebook: 'my survey' }, false],
  ['missing set not a list', { ...minimal(), missingSets: { std: { code: 9, kind: 'refused' } } }, false],
  ['empty item name', { ...minimal(), items: [{ name: '', label: 'A', type: 'text' }] }, false],
  ['missing as a number', { ...minimal(), items: [{ name: 'a', label: 'A', type: 'text', missing: 9 }] }, false],
];

describe('ajv and zod agree', () => {
  it.each(cases)('%s', (_name, doc, valid) => {
    expect(CodebookSchema.safeParse(doc).success).toBe(valid);
    expect(validateWithShippedSchema(doc).length === 0).toBe(valid);
  });

  it('on random single edits of a valid codebook', () => {
    // Property: whatever one edit does to the document, both validators give the same verdict.
    const junk = fc.oneof(fc.constant(null), fc.boolean(), fc.integer(), fc.double({ noNaN: true, noDefaultInfinity: true }), fc.string(), fc.constant([]), fc.constant({}));
    fc.assert(
      fc.property(fc.nat(), fc.nat(), fc.integer({ min: 0, max: 2 }), junk, fc.string({ minLength: 1, maxLength: 8 }), (pick, pick2, op, value, key) => {
        const doc = household();
        // Collect every object in the document, then edit one of them.
        const objects = objectsIn(doc);
        const target = objects[pick % objects.length]!;
        const keys = Object.keys(target);
        const k = keys[pick2 % keys.length]!;
        if (op === 0) delete target[k];
        else if (op === 1) target[k] = value;
        else target[key] = value;
        expect(validateWithShippedSchema(doc).length === 0).toBe(CodebookSchema.safeParse(doc).success);
      }),
      { seed: 20260, numRuns: 300 },
    );
  });
});

describe('schema problems', () => {
  it('an unknown field gets a did-you-mean hint from the allowed names', () => {
    const cb = household();
    cb.items[3].lable = 'x';
    const p = lint(cb).problems;
    expect(codesAndPaths(p)).toEqual(['unknown-field /items/3/lable']);
    expect(p[0]!.message).toBe('item "hh_size": unknown field "lable" (did you mean "label"?)');
  });

  it('an unknown field with no close name lists the allowed ones', () => {
    const p = lint({ ...household(), extra: 1 }).problems;
    expect(codesAndPaths(p)).toEqual(['unknown-field /extra']);
    expect(p[0]!.message).toContain('allowed fields are $schema, codebook, version, title, languages, missingSets, items, rules');
  });

  it('a misspelt enum value, a missing field, a wrong type, inside an inline missing list', () => {
    const cb = household();
    cb.items[1].level = 'nominall';
    delete cb.items[2].label;
    cb.items[5].missing = [{ code: 9, kind: 'refusd' }, { code: [1], kind: 'refused' }];
    const p = lint(cb).problems;
    expect(codesAndPaths(p)).toEqual([
      'invalid-value /items/1/level',
      'missing-field /items/2/label',
      'invalid-value /items/5/missing/0/kind',
      'wrong-type /items/5/missing/1/code',
    ]);
    expect(p[0]!.message).toContain('(did you mean "nominal"?)');
    expect(p[3]!.message).toBe('item "school_km": expected a number or a string, got an array');
  });

  it('a field given twice in one object', () => {
    const text = JSON.stringify(household(), null, 2).replace('"title": ', '"title": "x",\n  "title": ');
    const p = parseCodebook(text).problems;
    expect(codesAndPaths(p)).toEqual(['duplicate-key /title']);
  });
});
