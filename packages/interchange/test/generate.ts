/**
 * fast-check generators of valid codebooks for the round-trip properties: every item type and
 * level, codes (with bins for ordinal integer items), missing codes inline and from sets,
 * ranges, soft bounds, units, patterns, routing over earlier integer items, rules, and labels
 * as one string or one per language. Texts mix letters, digits, spaces and the characters the
 * cell syntax and XML must escape (; = [ ] ( ) " ' < > &), accented letters and an emoji.
 */
import fc from 'fast-check';
import type { Codebook } from '@codeweir/codebook';

const CHARS = [...'abcdefgh XYZ0123456789;=[]()"\'<>&.,:-+/éøñ😀'];
const textArb = fc
  .string({ unit: fc.constantFrom(...CHARS), minLength: 1, maxLength: 14 })
  .filter((s) => s.trim() === s && s.trim() !== '' && !/_x[0-9A-Fa-f]{4}_/.test(s));

const LANGS = ['en', 'fr'];

function labelArb(multi: boolean): fc.Arbitrary<string | Record<string, string>> {
  if (!multi) return textArb;
  return fc.oneof(textArb, fc.record({ en: textArb, fr: textArb }));
}

const kindArb = fc.constantFrom('dont-know', 'refused', 'not-applicable', 'not-administered', 'not-reached', 'invalid', 'omitted');

interface Spec {
  kind: 'coded-int' | 'binned' | 'coded-dec' | 'coded-text' | 'continuous-int' | 'continuous-dec' | 'text' | 'date';
}

function itemArb(name: string, multi: boolean, earlierInts: string[], setNames: string[]): fc.Arbitrary<Record<string, unknown>> {
  const kinds: Spec['kind'][] = ['coded-int', 'binned', 'coded-dec', 'coded-text', 'continuous-int', 'continuous-dec', 'text', 'date'];
  type Arb = fc.Arbitrary<Record<string, unknown>>;
  return fc.constantFrom(...kinds).chain((kind): Arb => {
    const base = {
      label: labelArb(multi),
      text: fc.option(textArb, { nil: undefined }),
      askedWhen: earlierInts.length > 0 ? fc.option(fc.constantFrom(...earlierInts).map((n) => `${n} > 0`), { nil: undefined }) : fc.constant(undefined),
    };
    const negMissing = fc.option(
      fc.uniqueArray(fc.integer({ min: -99, max: -1 }), { minLength: 1, maxLength: 3 }).chain((codes) =>
        fc.tuple(...codes.map((code) => fc.record({ code: fc.constant(code), kind: kindArb, label: fc.option(labelArb(multi), { nil: undefined }) }, { requiredKeys: ['code', 'kind'] }))),
      ),
      { nil: undefined },
    );
    const numericMissing = setNames.length > 0 ? fc.oneof(negMissing, fc.constantFrom(...setNames)) : negMissing;
    switch (kind) {
      case 'coded-int':
      case 'coded-dec':
        return (fc.record({
          ...base,
          level: fc.constantFrom('nominal', 'ordinal'),
          codes: fc
            .uniqueArray(kind === 'coded-int' ? fc.integer({ min: 0, max: 30 }) : fc.integer({ min: 0, max: 120 }).map((n) => n / 4), { minLength: 1, maxLength: 5 })
            .chain((codes) => fc.tuple(...codes.map((code) => fc.record({ code: fc.constant(code), label: labelArb(multi) })))),
          missing: numericMissing,
          type: fc.constant(kind === 'coded-int' ? 'integer' : 'decimal'),
        }) as unknown as Arb);
      case 'binned':
        return (fc.record({
          ...base,
          level: fc.constant('ordinal'),
          type: fc.constant('integer'),
          codes: fc.uniqueArray(fc.integer({ min: 1, max: 40 }), { minLength: 1, maxLength: 4 }).chain((cuts) => {
            const sorted = [...cuts].sort((a, b) => a - b);
            const bins = sorted.map((lo, i) => (i + 1 < sorted.length ? { min: lo, max: sorted[i + 1]! - 1 } : { min: lo }));
            return fc.tuple(...bins.map((bin, i) => labelArb(multi).map((label) => ({ code: i + 1, label, bin }))));
          }),
          missing: numericMissing,
        }) as unknown as Arb);
      case 'coded-text':
        return (fc.record({
          ...base,
          type: fc.constant('text'),
          level: fc.constantFrom('nominal', 'ordinal'),
          codes: fc
            .uniqueArray(textArb.map((t) => `c${t}`), { minLength: 1, maxLength: 4 })
            .chain((codes) => fc.tuple(...codes.map((code) => fc.record({ code: fc.constant(code), label: labelArb(multi) })))),
          missing: fc.option(
            fc.uniqueArray(textArb.map((t) => `m${t}`), { minLength: 1, maxLength: 2 }).chain((codes) => fc.tuple(...codes.map((code) => fc.record({ code: fc.constant(code), kind: kindArb })))),
            { nil: undefined },
          ),
        }) as unknown as Arb);
      case 'continuous-int':
      case 'continuous-dec': {
        const n = kind === 'continuous-int' ? fc.integer({ min: 0, max: 500 }) : fc.integer({ min: 0, max: 2000 }).map((x) => x / 8);
        return (fc.record({
          ...base,
          type: fc.constant(kind === 'continuous-int' ? 'integer' : 'decimal'),
          level: fc.constantFrom('interval', 'ratio'),
          unit: fc.option(textArb, { nil: undefined }),
          range: fc.option(fc.tuple(n, n).map(([a, b]) => ({ min: Math.min(a, b), max: Math.max(a, b) })), { nil: undefined }),
          missing: numericMissing,
          unique: fc.option(fc.boolean(), { nil: undefined }),
        }) as unknown as Arb).map((it) => {
          const r = it.range as { min: number; max: number } | undefined;
          return r ? { ...it, expect: { min: r.min } } : it;
        });
      }
      case 'text':
        return fc.record({ ...base, type: fc.constant('text') as fc.Arbitrary<string>, pattern: fc.option(fc.constantFrom('[A-Z]{2}-[0-9]+', 'x|y', '[a-z ]*'), { nil: undefined }) }) as unknown as Arb;
      case 'date':
        return fc.record({ ...base, type: fc.constant('date') as fc.Arbitrary<string>, level: fc.constant('interval') as fc.Arbitrary<string> }) as unknown as Arb;
    }
  }).map((it) => {
    const out: Record<string, unknown> = { name };
    for (const [k, v] of Object.entries(it)) if (v !== undefined) out[k] = v;
    return out;
  });
}

/** A valid codebook (lints without errors), with or without declared languages. */
export const codebookArb: fc.Arbitrary<Codebook> = fc
  .record({
    codebook: fc.stringMatching(/^[a-z][a-z0-9.-]{0,8}$/),
    version: fc.stringMatching(/^[0-9]{1,2}(\.[0-9]{1,2}){0,2}$/),
    title: textArb,
    multi: fc.boolean(),
    // Names start with q: a name that is a CEL reserved word (if, in, ...) cannot be used in routing.
    names: fc.uniqueArray(fc.stringMatching(/^q[a-z0-9_]{0,6}$/), { minLength: 1, maxLength: 6 }),
    hasSet: fc.boolean(),
  })
  .chain(({ codebook, version, title, multi, names, hasSet }) => {
    const sets = hasSet
      ? fc.record({ std: fc.constant([{ code: -8, kind: 'dont-know' }, { code: -9, kind: 'refused', label: multi ? { en: 'Refused', fr: 'Refus' } : 'Refused' }]) })
      : fc.constant(undefined);
    return sets.chain((missingSets) => {
      const setNames = missingSets ? Object.keys(missingSets) : [];
      // Routing may read earlier items only, so it never forms a cycle; integer items of any kind qualify.
      const items = names.reduce<fc.Arbitrary<Array<Record<string, unknown>>>>(
        (acc, name) =>
          acc.chain((done) => {
            const ints = done.filter((d) => d.type === 'integer').map((d) => d.name as string);
            return itemArb(name, multi, ints, setNames).map((it) => [...done, it]);
          }),
        fc.constant([]),
      );
      return items.chain((list) => {
        const ints = list.filter((d) => d.type === 'integer').map((d) => d.name as string);
        const rules = ints.length > 0
          ? fc.option(
              fc.uniqueArray(fc.stringMatching(/^[a-z][a-z-]{0,8}$/), { minLength: 1, maxLength: 2 }).chain((ids) =>
                fc.tuple(...ids.map((id) => fc.record({ id: fc.constant(id), test: fc.constantFrom(...ints).map((n) => `${n} >= 0`), when: fc.option(fc.constantFrom(...ints).map((n) => `${n} != 3`), { nil: undefined }), severity: fc.constantFrom('error', 'warning'), message: textArb }).map((r) => {
                  const o: Record<string, unknown> = {};
                  for (const [k, v] of Object.entries(r)) if (v !== undefined) o[k] = v;
                  return o;
                }))),
              ),
              { nil: undefined },
            )
          : fc.constant(undefined);
        return rules.map((r) => {
          const cb: Record<string, unknown> = { codebook, version, title };
          if (multi) cb.languages = LANGS;
          if (missingSets) cb.missingSets = missingSets;
          cb.items = list;
          if (r) cb.rules = r;
          return cb as unknown as Codebook;
        });
      });
    });
  });
