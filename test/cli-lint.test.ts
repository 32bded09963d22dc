import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtemp, rm, writeFile, readFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { cli } from './support/cli.ts';

const valid = {
  codebook: 'lint-cli-test',
  version: '1',
  title: 'Lint CLI test: invented market-access survey',
  missingSets: { std: [{ code: -9, kind: 'refused' }], spare: [] },
  items: [
    { name: 'hh', label: 'Household', role: 'id', type: 'text' },
    { name: 'team', label: 'Field team', role: 'group', type: 'integer', level: 'nominal', codes: [{ code: 1, label: 'A' }, { code: 2, label: 'B' }] },
    { name: 'km', label: 'Distance to market', type: 'decimal', level: 'ratio', range: { min: 0 }, missing: 'std' },
  ],
};

let dir = '';
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-lint-'));
  await writeFile(join(dir, 'ok.json'), JSON.stringify(valid, null, 2));
  const broken = structuredClone(valid) as any;
  broken.items[1].codes[1].code = 1;
  broken.items[2].askedWhen = 'tema == 1';
  await writeFile(join(dir, 'broken.json'), JSON.stringify(broken, null, 2));
  await writeFile(join(dir, 'syntax.json'), '{\n  "codebook": "x",\n}\n');
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('codeweir lint', () => {
  it('exits 0 on a valid codebook, printing its warnings and the verdict', async () => {
    const r = await cli(['lint', 'ok.json'], dir);
    expect(r.code).toBe(0);
    expect(r.err).toBe('');
    // Two-space JSON.stringify puts "spare" on line 12: the brace, codebook, version, title,
    // missingSets and std lines, then the std entry's four lines and the closing bracket.
    expect(r.out.trimEnd().split('\n')).toEqual([
      'ok.json:12:5: warning: missing set "spare" is not used by any item [unused-missing-set]',
      'ok.json: valid codebook (1 warning).',
    ]);
  });

  it('exits 1 with one line per problem and a verdict', async () => {
    const r = await cli(['lint', 'broken.json'], dir);
    expect(r.code).toBe(1);
    const lines = r.out.trimEnd().split('\n');
    expect(lines).toHaveLength(4);
    // file:line:column, then the severity, then the message naming the item, then the code.
    expect(lines[0]).toMatch(/^broken\.json:12:5: warning: missing set "spare" /);
    expect(lines[1]).toMatch(/^broken\.json:\d+:\d+: error: code 1 of item "team" is already declared .* \[duplicate-code\]$/);
    expect(lines[2]).toMatch(/^broken\.json:\d+:\d+: error: item "km": unknown item "tema" at character 1 \(did you mean "team"\?\) \[cel-unknown-item\]$/);
    expect(lines[3]).toBe('broken.json: invalid codebook: 2 errors, 1 warning.');
  });

  it('--json prints exactly { ok, problems } and nothing else on stdout', async () => {
    const r = await cli(['lint', 'broken.json', '--json'], dir);
    expect(r.code).toBe(1);
    const doc = JSON.parse(r.out);
    expect(Object.keys(doc)).toEqual(['ok', 'problems']);
    expect(doc.ok).toBe(false);
    expect(doc.problems.map((p: any) => [p.code, p.path, p.severity])).toEqual([
      ['unused-missing-set', '/missingSets/spare', 'warning'],
      ['duplicate-code', '/items/1/codes/1/code', 'error'],
      ['cel-unknown-item', '/items/2/askedWhen', 'error'],
    ]);
    expect(doc.problems.map((p: any) => p.item)).toEqual([undefined, 'team', 'km']);
    for (const p of doc.problems) {
      expect(Object.keys(p).slice(0, 4)).toEqual(['path', 'code', 'severity', 'message']);
      expect(typeof p.line).toBe('number');
    }
    const ok = await cli(['lint', 'ok.json', '--json'], dir);
    expect(ok.code).toBe(0);
    expect(JSON.parse(ok.out).ok).toBe(true);
  });

  it('--strict counts warnings as errors', async () => {
    const r = await cli(['lint', 'ok.json', '--strict'], dir);
    expect(r.code).toBe(1);
    expect(r.out.trimEnd().split('\n')).toEqual([
      'ok.json:12:5: error: missing set "spare" is not used by any item [unused-missing-set]',
      'ok.json: invalid codebook: 0 errors, 1 warning (--strict: warnings count as errors).',
    ]);
    const j = await cli(['lint', 'ok.json', '--strict', '--json'], dir);
    expect(j.code).toBe(1);
    expect(JSON.parse(j.out).ok).toBe(false);
  });

  it('a JSON syntax error exits 1 with its line and column', async () => {
    const r = await cli(['lint', 'syntax.json', '--json'], dir);
    expect(r.code).toBe(1);
    const doc = JSON.parse(r.out);
    // The trailing comma on line 2 is followed by "}" at line 3, column 1.
    expect(doc.problems).toEqual([{ path: '', code: 'json-syntax', severity: 'error', message: "Trailing comma before '}' (line 3, column 1)", line: 3, column: 1 }]);
  });

  it('exits 2 with one sentence on stderr for a missing file or a directory, nothing on stdout', async () => {
    for (const target of ['missing.json', '.']) {
      const r = await cli(['lint', target, '--json'], dir);
      expect(r.code).toBe(2);
      expect(r.out).toBe('');
      expect(r.err.trimEnd().split('\n')).toHaveLength(1);
      expect(r.err).toMatch(/^codeweir: Codebook .* (does not exist|is a directory)/);
    }
  });

  it('exits 2 on usage errors', async () => {
    expect((await cli(['lint'], dir)).code).toBe(2);
  });

  it('never changes the input', async () => {
    const before = await readFile(join(dir, 'broken.json'), 'utf8');
    await cli(['lint', 'broken.json'], dir);
    expect(await readFile(join(dir, 'broken.json'), 'utf8')).toBe(before);
  });

  it('passes the demo codebook', async () => {
    const r = await cli(['lint', 'examples/household.codebook.json'], join(import.meta.dirname, '..'));
    expect(r.out).toBe('examples/household.codebook.json: valid codebook.\n');
    expect(r.code).toBe(0);
  });
});
