import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { CodebookSchema } from '../src/index.ts';
import { checkStructure } from '../src/structure.ts';
import { structureProblems } from '../src/schema-problems.ts';
import { validateWithShippedSchema } from '../src/json-schema.ts';
import { household, objectsIn, type Json } from './fixtures.ts';

// The structural stage decides validity with ajv and loads zod only for a codebook ajv rejects.
// The reference is zod itself (the library the format is written in): a valid codebook must come
// back exactly as zod's parse returns it, fields in the same order, since that order reaches
// library consumers through `CompiledCodebook.source`.
const asZodParses = (doc: unknown): string => JSON.stringify(CodebookSchema.parse(doc));
const asStructureGives = (doc: unknown): string => {
  const r = checkStructure(doc);
  if (!r.ok) throw new Error(`rejected: ${r.problems.map((p) => p.message).join('; ')}`);
  return JSON.stringify(r.codebook);
};

/** `v` with the keys of every object in reverse order (a codebook written in another order). */
function reversed(v: unknown): unknown {
  if (Array.isArray(v)) return v.map(reversed);
  if (v === null || typeof v !== 'object') return v;
  return Object.fromEntries(Object.entries(v).reverse().map(([k, x]) => [k, reversed(x)]));
}

const examples = ['examples/household.codebook.json', 'examples/household-legacy.codebook.json'].map(
  (f) => [f, JSON.parse(readFileSync(new URL(`../../../${f}`, import.meta.url), 'utf8')) as Json] as const,
);

describe('structural stage', () => {
  it.each([['household fixture', household()] as const, ...examples])('%s comes back as zod parses it, in either key order', (_f, doc) => {
    expect(asStructureGives(doc)).toBe(asZodParses(doc));
    const other = reversed(doc);
    expect(JSON.stringify(other)).not.toBe(JSON.stringify(doc));
    expect(asStructureGives(other)).toBe(asZodParses(other));
  });

  it('a "__proto__" key of the missing sets is dropped as zod drops it', () => {
    // (In a label map the shipped schema's language-tag pattern rejects it.)
    const cb = household();
    const text = JSON.stringify(cb).replace('"missingSets":{', '"missingSets":{"__proto__":[],');
    const doc = JSON.parse(text) as Json;
    expect(Object.keys(doc.missingSets)).toContain('__proto__');
    expect(asStructureGives(doc)).toBe(asZodParses(doc));
  });

  it('on random key orders and single deletions of a valid codebook, it agrees with zod', () => {
    // Property: for any order of fields and any one field removed, the verdict is zod's and a
    // valid result is zod's output, key for key.
    fc.assert(
      fc.property(fc.nat(), fc.nat(), fc.boolean(), (seed, pick, drop) => {
        let state = seed;
        const rand = () => ((state = (state * 1103515245 + 12345) % 2147483648) / 2147483648);
        const shuffle = (v: unknown): unknown => {
          if (Array.isArray(v)) return v.map(shuffle);
          if (v === null || typeof v !== 'object') return v;
          const entries = Object.entries(v).map(([k, x]) => [k, shuffle(x)] as const);
          for (let i = entries.length - 1; i > 0; i--) {
            const j = Math.floor(rand() * (i + 1));
            [entries[i], entries[j]] = [entries[j]!, entries[i]!];
          }
          return Object.fromEntries(entries);
        };
        const doc = shuffle(household()) as Json;
        if (drop) {
          const objects = objectsIn(doc);
          const target = objects[pick % objects.length]!;
          const keys = Object.keys(target);
          delete target[keys[pick % keys.length]!];
        }
        const zod = CodebookSchema.safeParse(doc);
        const r = checkStructure(doc);
        expect(r.ok).toBe(zod.success);
        if (r.ok) expect(JSON.stringify(r.codebook)).toBe(JSON.stringify(zod.data));
        else expect(r.problems).toEqual(structureProblems(doc, validateWithShippedSchema(doc)));
      }),
      { seed: 20261, numRuns: 300 },
    );
  });
});
