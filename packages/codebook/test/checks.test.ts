import { describe, it, expect } from 'vitest';
import { household, lint, codesAndPaths, type Json } from './fixtures.ts';

/** Applies `edit` to a fresh valid codebook and returns its problems as `code path` strings. */
function problemsAfter(edit: (cb: Json) => void): string[] {
  const cb = household();
  edit(cb);
  return codesAndPaths(lint(cb).problems);
}

describe('meaning checks', () => {
  it('accepts the valid household codebook with no problem at all', () => {
    const r = lint(household());
    expect(r.problems).toEqual([]);
    expect(r.ok).toBe(true);
  });

  it('duplicate item names point at the second occurrence', () => {
    expect(problemsAfter((cb) => (cb.items[6].name = 'hh_size'))).toEqual(['duplicate-item /items/6/name']);
  });

  it('duplicate codes, also when the same number is written differently', () => {
    expect(problemsAfter((cb) => (cb.items[1].codes[2].code = 1))).toEqual(['duplicate-code /items/1/codes/2/code']);
    // 2 and "2.0" are the same cell value in an integer item: first principles of numeric matching.
    expect(problemsAfter((cb) => (cb.items[1].codes[2].code = '2.0'))).toEqual(['code-type /items/1/codes/2/code', 'duplicate-code /items/1/codes/2/code']);
  });

  it('codes that do not fit the item type', () => {
    expect(problemsAfter((cb) => (cb.items[1].codes[0].code = 1.5))).toEqual(['code-type /items/1/codes/0/code']);
  });

  it('a missing code colliding with a valid code', () => {
    expect(
      problemsAfter((cb) => {
        cb.items[1].missing = [{ code: 3, kind: 'refused' }];
      }),
    ).toEqual(['missing-collides /items/1/missing/0/code']);
    // Through a named set the pointer is the item's `missing` field.
    expect(problemsAfter((cb) => cb.items[4].codes.push({ code: -9, label: 'x', bin: { min: 100 } }))).toContain('missing-collides /items/4/missing');
  });

  it('a missing code inside range', () => {
    expect(problemsAfter((cb) => (cb.items[3].range = { min: -10, max: 40 }))).toEqual([
      'missing-in-range /items/3/missing',
      'missing-in-range /items/3/missing',
      'missing-in-range /items/3/missing',
    ]);
    expect(problemsAfter((cb) => (cb.items[5].missing = [{ code: 99, kind: 'dont-know' }]))).toEqual(['missing-in-range /items/5/missing/0/code']);
  });

  it('duplicate missing codes within one list', () => {
    expect(problemsAfter((cb) => cb.missingSets.std.push({ code: -9, kind: 'invalid' }))).toEqual(['duplicate-missing-code /missingSets/std/3/code']);
  });

  it('unknown and unused missing sets', () => {
    const p = lint({ ...household(), items: household().items.map((it: Json) => (it.missing === 'std' ? { ...it, missing: 'sdt' } : it)) }).problems;
    expect(codesAndPaths(p)).toEqual([
      'unused-missing-set /missingSets/std',
      'unknown-missing-set /items/3/missing',
      'unknown-missing-set /items/4/missing',
      'unknown-missing-set /items/5/missing',
    ]);
    expect(p[1]!.message).toContain('did you mean "std"');
    expect(p[0]!.severity).toBe('warning');
  });

  it('overlapping bins are an error, gaps a warning, open bins end the scale', () => {
    expect(problemsAfter((cb) => (cb.items[4].codes[2].bin = { min: 3, max: 7 }))).toEqual(['bins-overlap /items/4/codes/2/bin']);
    // Integer bounds: [1,3] then [5,7] leave the count 4 in no bin (first principles).
    const gap = household();
    gap.items[4].codes[2].bin = { min: 5, max: 7 };
    const g = lint(gap);
    expect(codesAndPaths(g.problems)).toEqual(['bins-gap /items/4/codes/2/bin']);
    expect(g.problems[0]!.severity).toBe('warning');
    expect(g.problems[0]!.message).toContain('values 4 fall in no bin');
    expect(g.ok).toBe(true);
    // A bin after the open top bin overlaps it.
    expect(problemsAfter((cb) => cb.items[4].codes.push({ code: 5, label: 'many', bin: { min: 20, max: 30 } }))).toEqual(['bins-overlap /items/4/codes/4/bin']);
  });

  it('bins listed out of order are sorted before comparing', () => {
    expect(problemsAfter((cb) => cb.items[4].codes.reverse())).toEqual([]);
  });

  it('inverted bins and codes without a bin in a binned item', () => {
    expect(problemsAfter((cb) => (cb.items[4].codes[2].bin = { min: 7, max: 4 }))).toContain('bin-inverted /items/4/codes/2/bin');
    expect(problemsAfter((cb) => delete cb.items[4].codes[1].bin)).toContain('bin-missing /items/4/codes/1');
  });

  it('a binned item whose level is not ordinal', () => {
    expect(problemsAfter((cb) => (cb.items[4].level = 'ratio'))).toEqual(['binned-not-ordinal /items/4/level']);
  });

  it('range and expect: inverted, expect outside range, non-numeric item', () => {
    expect(problemsAfter((cb) => (cb.items[3].range = { min: 40, max: 1 }))).toEqual(['range-inverted /items/3/range']);
    expect(problemsAfter((cb) => (cb.items[3].expect = { min: 10, max: 5 }))).toEqual(['expect-inverted /items/3/expect']);
    expect(problemsAfter((cb) => (cb.items[3].expect = { min: 0, max: 50 }))).toEqual(['expect-outside-range /items/3/expect/min', 'expect-outside-range /items/3/expect/max']);
    expect(problemsAfter((cb) => (cb.items[6].range = { max: 3 }))).toEqual(['range-type /items/6/range']);
  });

  it('nominal and ordinal items need codes', () => {
    expect(problemsAfter((cb) => delete cb.items[1].codes)).toEqual(['codes-required /items/1/codes']);
    expect(problemsAfter((cb) => (cb.items[6].level = 'ordinal'))).toEqual(['codes-required /items/6/codes']);
  });

  it('level required where the type needs one, and level fitting the type', () => {
    expect(problemsAfter((cb) => delete cb.items[3].level)).toEqual(['level-required /items/3/level']);
    // text and id items may go without a level
    expect(problemsAfter((cb) => delete cb.items[6].level)).toEqual([]);
    expect(problemsAfter((cb) => (cb.items[6].level = 'ratio'))).toEqual(['level-type /items/6/level']);
    expect(problemsAfter((cb) => (cb.items[2].level = 'ratio'))).toEqual(['level-type /items/2/level']);
  });

  it('roles at the wrong type, and more than one id or weight item', () => {
    expect(problemsAfter((cb) => (cb.items[0].type = 'decimal'))).toEqual(['role-type /items/0/type', 'pattern-type /items/0/pattern']);
    expect(problemsAfter((cb) => (cb.items[7].type = 'text'))).toEqual(['role-type /items/7/type', 'level-type /items/7/level']);
    expect(problemsAfter((cb) => (cb.items[7].level = 'interval'))).toEqual(['role-type /items/7/level']);
    expect(problemsAfter((cb) => (cb.items[1].type = 'date'))).toEqual(['role-type /items/1/type']);
    expect(problemsAfter((cb) => (cb.items[6].role = 'id'))).toEqual(['multiple-id /items/6/role']);
    expect(problemsAfter((cb) => cb.items.push({ name: 'wt2', label: 'w', role: 'weight', type: 'decimal', level: 'ratio' }))).toEqual(['multiple-weight /items/8/role']);
  });

  it('patterns that do not compile, that can backtrack catastrophically, or sit on a non-text item', () => {
    expect(problemsAfter((cb) => (cb.items[0].pattern = 'LM-([0-9]{5}'))).toEqual(['pattern-invalid /items/0/pattern']);
    // Classic catastrophic-backtracking shapes (recalled from memory): nested and ambiguous repetition.
    expect(problemsAfter((cb) => (cb.items[6].pattern = '([A-Za-z]+ ?)+'))).toEqual(['pattern-unsafe /items/6/pattern']);
    expect(problemsAfter((cb) => (cb.items[6].pattern = '(a|a)*'))).toEqual(['pattern-unsafe /items/6/pattern']);
    expect(problemsAfter((cb) => (cb.items[3].pattern = '[0-9]+'))).toEqual(['pattern-type /items/3/pattern']);
  });

  it('duplicate rule ids', () => {
    expect(problemsAfter((cb) => cb.rules.push({ ...cb.rules[0] }))).toEqual(['duplicate-rule-id /rules/1/id']);
  });
});

describe('expression checks', () => {
  it('unknown item names the item, the character and the closest name', () => {
    const cb = household();
    cb.items[5].askedWhen = 'hh_sise > 1';
    const [p, ...rest] = lint(cb).problems;
    expect(rest).toEqual([]);
    expect(p).toMatchObject({ code: 'cel-unknown-item', path: '/items/5/askedWhen' });
    expect(p!.message).toBe('item "school_km": unknown item "hh_sise" at character 1 (did you mean "hh_size"?)');
    expect(p!.item).toBe('school_km');
  });

  it('type errors against the declared items', () => {
    // integer item compared with a string, decimal item with an int-only operator
    expect(problemsAfter((cb) => (cb.rules[0].test = 'district == "1"'))).toEqual(['cel-type /rules/0/test']);
    expect(problemsAfter((cb) => (cb.rules[0].test = 'head_name > 3'))).toEqual(['cel-type /rules/0/test']);
    expect(problemsAfter((cb) => (cb.rules[0].test = 'school_km % 2 == 0'))).toEqual(['cel-type /rules/0/test']);
  });

  it('non-boolean results and syntax errors', () => {
    expect(problemsAfter((cb) => (cb.rules[0].test = 'hh_size + 1'))).toEqual(['cel-not-boolean /rules/0/test']);
    expect(problemsAfter((cb) => (cb.rules[0].when = 'district ==='))).toEqual(['cel-syntax /rules/0/when']);
  });

  it('an askedWhen that reads its own item', () => {
    expect(problemsAfter((cb) => (cb.items[5].askedWhen = 'school_km > 0.5 || hh_size > 1'))).toEqual(['asked-when-self /items/5/askedWhen']);
  });

  it('routing that goes round in a circle', () => {
    const p = lint(
      (() => {
        const cb = household();
        cb.items[3].askedWhen = 'school_km > 0.0';
        return cb;
      })(),
    ).problems;
    expect(codesAndPaths(p)).toEqual(['asked-when-cycle /items/5/askedWhen']);
    expect(p[0]!.message).toBe('routing goes round in a circle: "hh_size" -> "school_km" -> "hh_size" (each askedWhen reads the next item)');
    // A chain without a circle is fine.
    expect(problemsAfter((cb) => (cb.items[3].askedWhen = 'district == 1'))).toEqual([]);
  });

  it('a fixed day that is not a calendar day', () => {
    expect(problemsAfter((cb) => (cb.rules[0].when = 'visit_date >= date("2026-02-30")'))).toEqual(['cel-bad-date /rules/0/when']);
    expect(problemsAfter((cb) => (cb.rules[0].when = 'visit_date >= date("2026-02-28")'))).toEqual([]);
  });

  it.each([
    ['5000 nested parentheses', '('.repeat(5000) + 'true' + ')'.repeat(5000)],
    ['5000 negations', '!'.repeat(5000) + 'true'],
    ['50000 negations', '!'.repeat(50_000) + 'true'],
    ['5000 unary minus', '-'.repeat(5000) + '1 > 0'],
    ['a chain of 5000 conjunctions', Array(5000).fill('hh_size > 1').join(' && ')],
    ['a sum of 5000 terms', Array(5000).fill('hh_size').join(' + ') + ' > 0'],
  ])('%s gives a clean cel-too-deep problem', (_name, expr) => {
    const cb = household();
    cb.rules[0].test = expr;
    const r = lint(cb);
    expect(r.ok).toBe(false);
    expect(codesAndPaths(r.problems)).toEqual(['cel-too-deep /rules/0/test']);
  });
});
