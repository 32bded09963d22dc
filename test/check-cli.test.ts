/**
 * `codeweir check` driven in-process through run(argv, io). Exit codes and output shape follow
 * the interface contract (interface.md): 0 nothing at error severity, 1 error findings or an
 * invalid codebook, 2 usage errors or unreadable input; --json prints only the summary.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtemp, rm, writeFile, readFile, readdir } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { cli } from './support/cli.ts';

const codebook = {
  codebook: 'check-cli-test',
  version: '2',
  title: 'Check CLI test: invented water-point survey',
  items: [
    { name: 'hh', label: 'Household', role: 'id', type: 'text' },
    { name: 'team', label: 'Field team', role: 'group', type: 'integer', level: 'nominal', codes: [{ code: 1, label: 'A' }, { code: 2, label: 'B' }] },
    { name: 'km', label: 'Distance to water', type: 'decimal', level: 'ratio', range: { min: 0, max: 50 }, expect: { max: 10 }, missing: [{ code: -9, kind: 'refused' }] },
  ],
};

let dir = '';
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-check-cli-'));
  await writeFile(join(dir, 'cb.json'), JSON.stringify(codebook));
  await writeFile(join(dir, 'bad-cb.json'), JSON.stringify({ ...codebook, items: [{ name: 'hh', label: 'x', type: 'texty' }] }));
  await writeFile(join(dir, 'clean.csv'), 'hh,team,km\na,1,2.5\nb,2,-9\n');
  await writeFile(join(dir, 'warn.csv'), 'hh,team,km\na,1,12\n');
  await writeFile(join(dir, 'faulty.csv'), 'hh,team,km\na,1,2.5\nb,3,99\na,2,1\n');
  await writeFile(join(dir, 'empty.csv'), 'hh,team,km\n');
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('codeweir check', () => {
  it('exit 0 and a verdict line for a clean delivery', async () => {
    const r = await cli(['check', 'clean.csv', '--codebook', 'cb.json'], dir);
    expect(r.code).toBe(0);
    expect(r.out.split('\n')[0]).toBe('clean.csv: 2 rows checked against check-cli-test 2: accepted (0 errors, 0 warnings).');
    expect(r.err).toBe('');
  });

  it('exit 1 with error findings; counts by rule and the first findings are shown', async () => {
    const r = await cli(['check', 'faulty.csv', '--codebook', 'cb.json'], dir);
    expect(r.code).toBe(1);
    // team 3 is not a code, km 99 is outside range 0..50, hh a repeats: 3 errors.
    expect(r.out).toContain('not accepted (3 errors, 0 warnings)');
    expect(r.out).toMatch(/not-a-code: 1/);
    expect(r.out).toMatch(/row 2 \(b\) km: error impossible/);
  });

  it('--json prints exactly the summary document', async () => {
    const r = await cli(['check', 'faulty.csv', '--codebook', 'cb.json', '--json'], dir);
    expect(r.code).toBe(1);
    const doc = JSON.parse(r.out);
    expect(Object.keys(doc)).toEqual(expect.arrayContaining(['codebook', 'rows', 'header', 'findings', 'items', 'groups', 'rules']));
    expect(doc.codebook).toEqual({ codebook: 'check-cli-test', version: '2' });
    expect(doc.findings.byRule).toEqual({ 'not-a-code': 1, impossible: 1, 'duplicate-id': 1 });
    expect(doc.items.km).toMatchObject({ valid: 2, invalid: 1 });
  });

  it('--fail-on warning turns warnings into exit 1', async () => {
    expect((await cli(['check', 'warn.csv', '--codebook', 'cb.json'], dir)).code).toBe(0);
    expect((await cli(['check', 'warn.csv', '--codebook', 'cb.json', '--fail-on', 'warning'], dir)).code).toBe(1);
    // km 12 is inside range 0..50 but above expect.max 10: one implausible warning.
    const j = await cli(['check', 'warn.csv', '--codebook', 'cb.json', '--fail-on', 'warning', '--json'], dir);
    expect(JSON.parse(j.out)).toMatchObject({ accepted: false, findings: { byRule: { implausible: 1 } } });
  });

  it('a header without rows is exit 0 with a no-rows warning', async () => {
    const r = await cli(['check', 'empty.csv', '--codebook', 'cb.json', '--json'], dir);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.out).findings.byRule).toEqual({ 'no-rows': 1 });
  });

  it('--out writes the logs, --split-by one folder per group code', async () => {
    const r = await cli(['check', 'faulty.csv', '--codebook', 'cb.json', '--out', 'out', '--split-by', 'team', '--quiet'], dir);
    expect(r.code).toBe(1);
    expect((await readdir(join(dir, 'out'))).sort()).toEqual(['by-team', 'findings.csv', 'findings.jsonl', 'missingness-by-group.csv', 'missingness.csv', 'summary.json']);
    expect((await readdir(join(dir, 'out', 'by-team'))).sort()).toEqual(['1', '2', '_invalid_']);
    expect(await readFile(join(dir, 'out', 'by-team', '2', 'findings.csv'), 'utf8')).toContain('duplicate-id');
  });

  it('an invalid codebook is exit 1 with one sentence naming the file', async () => {
    const r = await cli(['check', 'clean.csv', '--codebook', 'bad-cb.json'], dir);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/bad-cb\.json/);
    expect(r.err.trim().split('\n')).toHaveLength(1);
  });

  it('unreadable input and usage errors are exit 2 without a stack', async () => {
    const missing = await cli(['check', 'nope.csv', '--codebook', 'cb.json'], dir);
    expect(missing.code).toBe(2);
    expect(missing.err).toMatch(/nope\.csv/);
    expect(missing.err).not.toMatch(/\n\s+at /);
    const q = await cli(['check', 'clean.csv', '--codebook', 'cb.json', '--quantiles', '12'], dir);
    expect(q.code).toBe(2);
    expect(q.err).toContain('--quantiles takes 1 to 9, got 12.');
    const split = await cli(['check', 'clean.csv', '--codebook', 'cb.json', '--split-by', 'team'], dir);
    expect(split.code).toBe(2);
    expect(split.err).toContain('--split-by writes files, so it needs --out <dir>.');
    const notGroup = await cli(['check', 'clean.csv', '--codebook', 'cb.json', '--out', 'o2', '--split-by', 'km'], dir);
    expect(notGroup.code).toBe(2);
    expect(notGroup.err).toContain('got km');
  });
});
