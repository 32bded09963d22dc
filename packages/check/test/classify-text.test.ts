/**
 * Text cells are looked up among the missing codes (and text codes) only when they are no longer
 * than the longest of them. The expectation is computed in the test from first principles, the
 * codebook contract: a cell is a missing code exactly when its text, spaces and tabs around it
 * removed, equals a declared missing code; a text-coded cell is valid exactly when that text
 * equals a code. Cells here are as long as, one longer and one shorter than the codes, and
 * codes that are prefixes of other cells.
 */
import { describe, it, expect } from 'vitest';
import { compileClassifiers, normalizeCheckOptions, MISSING, INVALID, VALID, KINDS } from '../src/index.ts';
import { codebook } from './helpers.ts';

const cb = codebook([
  { name: 'note', label: 'Note', type: 'text', missing: [{ code: 'n/a', kind: 'not-applicable' }, { code: 'refused by respondent', kind: 'refused' }, { code: '.', kind: 'dont-know' }] },
  { name: 'wall', label: 'Wall', type: 'text', level: 'nominal', codes: [{ code: 'mud', label: 'Mud' }, { code: 'timber frame', label: 'Timber' }], missing: [{ code: 'dk', kind: 'dont-know' }] },
]);

const cells = ['n/a', ' n/a ', 'n/ab', 'n/', '.', '..', 'refused by respondent', 'refused by respondentx', ' refused by respondent\t', 'mud', 'mudd', 'timber frame', 'timber frames', 'dk', 'dk ', 'x'.repeat(200), '', '   '];

describe('text classification', () => {
  const { out, items } = compileClassifiers(cb, normalizeCheckOptions({}));
  const strip = (c: string) => c.replace(/^[ \t\u00a0]+|[ \t\u00a0]+$/g, '');

  it('finds exactly the declared missing codes of a free-text item, whatever their length', () => {
    const declared = new Map([['n/a', 'not-applicable'], ['refused by respondent', 'refused'], ['.', 'dont-know']]);
    for (const cell of cells) {
      const t = strip(cell);
      const s = items[0]!.classify(cell);
      if (t === '') expect([s, KINDS[out.kind]], cell).toEqual([MISSING, 'blank']);
      else if (declared.has(t)) expect([s, KINDS[out.kind]], cell).toEqual([MISSING, declared.get(t)]);
      else expect([s, out.text], cell).toEqual([VALID, t]);
    }
  });

  it('finds exactly the codes and missing codes of a text-coded item', () => {
    for (const cell of cells) {
      const t = strip(cell);
      const s = items[1]!.classify(cell);
      if (t === '' || t === 'dk') expect(s, cell).toBe(MISSING);
      else if (t === 'mud' || t === 'timber frame') expect([s, out.text], cell).toEqual([VALID, t]);
      else expect(s, cell).toBe(INVALID);
    }
  });
});
