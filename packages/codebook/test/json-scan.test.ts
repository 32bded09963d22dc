import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { lineColumn, scanJson } from '../src/index.ts';
import { household, lint } from './fixtures.ts';
import { parseCodebook } from '../src/index.ts';

describe('JSON syntax errors', () => {
  // Offsets from first principles: count the characters before the offending one.
  it.each([
    ['a missing value', '{\n  "title": }', 2, 12],
    ['a trailing comma', '{\n  "a": 1,\n}', 3, 1],
    ['a missing colon', '{ "a" 1 }', 1, 7],
    ['a bare word', '{\n  "a": tru\n}', 2, 8],
    ['an unclosed object', '{ "a": 1', 1, 9],
    ['a raw line break in a string', '{ "a": "x\ny" }', 1, 10],
    ['a leading zero', '{\n\n  "n": 01 }', 3, 8],
    ['text after the document', '{}\n x', 2, 2],
    ['an empty file', '', 1, 1],
  ])('%s is located by line and column', (_name, text, line, column) => {
    const r = parseCodebook(text, 'x.json');
    expect(r.ok).toBe(false);
    expect(r.problems).toHaveLength(1);
    expect(r.problems[0]).toMatchObject({ code: 'json-syntax', path: '', line, column, severity: 'error' });
    expect(r.problems[0]!.message).toContain(`(line ${line}, column ${column})`);
  });

  it('agrees with the position in V8 JSON.parse messages where they carry one', () => {
    for (const text of ['{"a": 1,}', '{"a" 1}', '{"a": 1', '[1,2] x', '{"a":"\\q"}']) {
      let v8: number | undefined;
      try {
        JSON.parse(text);
      } catch (e) {
        v8 = Number(/at position (\d+)/.exec((e as Error).message)?.[1]);
      }
      expect(scanJson(text).error?.offset).toBe(v8);
    }
  });

  it('finds an error exactly when JSON.parse does (V8 as oracle), on random edits of JSON', () => {
    fc.assert(
      fc.property(fc.json(), fc.nat(), fc.constantFrom('', ',', '"', '}', ']', ':', '0', ' ', 'x', '\\'), (json, at, insert) => {
        const i = at % (json.length + 1);
        const text = json.slice(0, i) + insert + json.slice(i + (insert === '' ? 1 : 0));
        let parses = true;
        try {
          JSON.parse(text);
        } catch {
          parses = false;
        }
        expect(scanJson(text).error === undefined).toBe(parses);
      }),
      { seed: 7, numRuns: 2000 },
    );
  });

  it('handles nesting far deeper than any call stack', () => {
    // 50 000 levels: a recursive parser would overflow a default V8 stack long before.
    const deep = '['.repeat(50_000) + ']'.repeat(50_000);
    expect(scanJson(deep).error).toBeUndefined();
    const r = parseCodebook(deep);
    expect(r.ok).toBe(false);
    expect(r.problems[0]!.code).toBe('wrong-type');
  });

  it('accepts a UTF-8 byte-order mark', () => {
    expect(parseCodebook('\ufeff' + JSON.stringify(household())).ok).toBe(true);
  });
});

describe('positions', () => {
  it('lineColumn counts lines at \\n and columns in UTF-16 units', () => {
    expect(lineColumn('ab\ncd\r\nef', 0)).toEqual({ line: 1, column: 1 });
    expect(lineColumn('ab\ncd\r\nef', 4)).toEqual({ line: 2, column: 2 });
    expect(lineColumn('ab\ncd\r\nef', 7)).toEqual({ line: 3, column: 1 });
  });

  it('a problem carries the line and column of the field it points at', () => {
    const cb = household();
    cb.items[1].codes[2].code = 1;
    const text = JSON.stringify(cb, null, 2);
    const p = parseCodebook(text).problems[0]!;
    const lines = text.split('\n');
    // The pointer /items/1/codes/2/code names the third "code" key inside the second item.
    const expectedLine = lines.findIndex((l, k) => k > lines.findIndex((x) => x.includes('"Upper Carrow"')) - 2 && l.includes('"code": 1')) + 1;
    expect(p.line).toBe(expectedLine);
    expect(p.column).toBe(lines[expectedLine - 1]!.indexOf('"code"') + 1);
  });

  it('a CEL problem points at the offending character inside the string', () => {
    const cb = household();
    cb.items[5].askedWhen = 'hh_size > 1 && distrct == 2';
    const text = JSON.stringify(cb, null, 2);
    const p = parseCodebook(text).problems[0]!;
    const line = text.split('\n')[p.line! - 1]!;
    expect(line.slice(p.column! - 1).startsWith('distrct == 2')).toBe(true);
    expect(p.message).toContain('at character 16');
  });

  it('problems are ordered by their place in the file', () => {
    const cb = household();
    cb.items[6].level = 'ordinal';
    cb.items[0].pattern = '(';
    const lines = lint(cb).problems.map((p) => p.line!);
    expect(lines).toEqual([...lines].sort((a, b) => a - b));
    expect(lines).toHaveLength(2);
  });
});
