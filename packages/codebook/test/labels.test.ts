/** Labels in several languages: schema, lint and resolution to one language at compile time. */
import { describe, it, expect } from 'vitest';
import { codebookLanguages, labelText, parseCodebook, resolveLabels, type Codebook } from '../src/index.ts';
import { household, lint, codesAndPaths } from './fixtures.ts';

function bilingual(): any {
  const cb = household();
  cb.languages = ['en', 'fr'];
  cb.items[3].label = { en: 'Persons in household', fr: 'Personnes du ménage' };
  cb.items[1].codes[0].label = { en: 'Fenwick', fr: 'Fenwick' };
  cb.missingSets.std[0].label = { en: 'Refused', fr: 'Refus' };
  return cb;
}

describe('multilingual labels', () => {
  it('a label may be a string or an object keyed by language; a fully given codebook lints clean', () => {
    expect(lint(bilingual()).problems).toEqual([]);
  });

  it('lint names every label object that lacks a declared language, and undeclared or malformed tags', () => {
    const cb = bilingual();
    cb.items[3].label = { en: 'Persons in household' };
    cb.items[1].codes[0].label = { en: 'Fenwick', de: 'Fenwick' };
    const r = lint(cb);
    expect(r.ok).toBe(true);
    expect(codesAndPaths(r.problems)).toEqual([
      'label-language-undeclared /items/1/codes/0/label',
      'label-language-missing /items/1/codes/0/label',
      'label-language-missing /items/3/label',
    ]);
    expect(r.problems.find((p) => p.path === '/items/3/label')!.message).toBe(
      'the label of item "hh_size" has no fr text (the codebook declares en, fr); the first declared language it has stands in',
    );
  });

  it('a label key that is no language tag is a schema problem of that label', () => {
    const cb = bilingual();
    cb.items[6].label = { 'not a tag!': 'x', en: 'y', fr: 'z' };
    const r = lint(cb);
    expect(r.ok).toBe(false);
    expect(r.problems.map((p) => [p.code, p.path, p.item])).toEqual([['invalid-value', '/items/6/label/not a tag!', 'head_name']]);
    expect(r.problems[0]!.message).toBe('item "head_name": "not a tag!" is not a BCP 47 language tag (such as en, fr or pt-BR)');
  });

  it('a declared language must be a well-formed BCP 47 tag', () => {
    const cb = bilingual();
    cb.languages = ['en', 'fr', 'en-US-x-'];
    expect(codesAndPaths(lint(cb).problems)).toContain('invalid-value /languages/2');
    cb.languages = ['en', 'fr', 'a1'];
    expect(codesAndPaths(lint(cb).problems)).toContain('invalid-value /languages/2');
  });

  it('compiles to plain strings in the chosen language, falling back to the first declared one', () => {
    const text = JSON.stringify(bilingual());
    const en = parseCodebook(text);
    const fr = parseCodebook(text, undefined, { lang: 'fr' });
    if (!en.ok || !fr.ok) throw new Error('expected a valid codebook');
    expect(en.codebook.byName.get('hh_size')!.label).toBe('Persons in household');
    expect(fr.codebook.byName.get('hh_size')!.label).toBe('Personnes du ménage');
    expect(fr.codebook.byName.get('hh_size')!.missing.find((m) => m.code === -9)!.label).toBe('Refus');
    expect(fr.codebook.language).toBe('fr');
    expect(fr.codebook.languages).toEqual(['en', 'fr']);
    // The source handed to worker threads is resolved too, so they see the same strings.
    expect(JSON.stringify(fr.codebook.source)).not.toContain('"en":');
    // A language tag is matched without regard to case (BCP 47 tags are case-insensitive).
    expect(labelText({ en: 'a', 'pt-BR': 'b' }, 'pt-br')).toBe('b');
    expect(labelText({ en: 'a', fr: 'b' }, 'de', ['fr'])).toBe('b');
    expect(labelText('same', 'fr')).toBe('same');
  });

  it('--lang must be one of the languages of the labels, declared or not (exit 2)', async () => {
    const { mkdtemp, writeFile, rm } = await import('node:fs/promises');
    const { tmpdir } = await import('node:os');
    const { join } = await import('node:path');
    const { loadCodebookOrThrow } = await import('../src/index.ts');
    const dir = await mkdtemp(join(tmpdir(), 'codeweir-lang-'));
    try {
      const cb = bilingual();
      delete cb.languages;
      const file = join(dir, 'cb.json');
      await writeFile(file, JSON.stringify(cb));
      expect((await loadCodebookOrThrow(file, { lang: 'fr' })).byName.get('hh_size')!.label).toBe('Personnes du ménage');
      await expect(loadCodebookOrThrow(file, { lang: 'de' })).rejects.toMatchObject({ code: 'CW_USAGE', exitCode: 2 });
      await writeFile(file, JSON.stringify(household()));
      // Labels that are all plain strings are the same in every language: any tag is accepted.
      expect((await loadCodebookOrThrow(file, { lang: 'de' })).language).toBeUndefined();
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });

  it('languages are the declared ones, else those found in label objects', () => {
    const cb = bilingual() as Codebook;
    expect(codebookLanguages(cb)).toEqual(['en', 'fr']);
    delete (cb as any).languages;
    expect(codebookLanguages(cb)).toEqual(['en', 'fr']);
    expect(codebookLanguages(household() as Codebook)).toEqual([]);
    const resolved = resolveLabels(bilingual() as Codebook, 'fr');
    expect(resolved.items[3]!.label).toBe('Personnes du ménage');
    expect(resolved.missingSets!.std![0]!.label).toBe('Refus');
  });
});
