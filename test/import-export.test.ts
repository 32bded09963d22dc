/**
 * codeweir import and export end to end, in-process. The statistics an export writes into DDI
 * are checked against first principles (counts of the delivery's cells) and against jStat's
 * mean and sample standard deviation of the valid values, computed here from the raw file.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { createRequire } from 'node:module';
import { openDelivery } from '@codeweir/read';
import { cli } from './support/cli.ts';

const { jStat } = createRequire(import.meta.url)('jstat') as { jStat: { mean(a: number[]): number; stdev(a: number[], sample: boolean): number } };
const root = resolve(import.meta.dirname, '..');
let dir = '';
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-interchange-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

async function column(name: string): Promise<string[]> {
  const d = await openDelivery(join(root, 'examples/demo-delivery.csv'));
  const c = d.header.indexOf(name);
  const out: string[] = [];
  for await (const b of d.batches()) for (let r = 0; r < b.count; r++) out.push(b.fields[b.offsets[r]! + c]!);
  return out;
}

describe('codeweir export and import', () => {
  it('export --to xlsx, then import, gives back the codebook (demo, legacy, two languages)', async () => {
    for (const name of ['household', 'household-legacy']) {
      const src = join(root, `examples/${name}.codebook.json`);
      const xlsx = join(dir, `${name}.xlsx`);
      const back = join(dir, `${name}.json`);
      expect((await cli(['export', src, '--to', 'xlsx', '-o', xlsx], root)).code).toBe(0);
      const r = await cli(['import', xlsx, '-o', back], root);
      expect(r.code).toBe(0);
      expect(r.out).toContain('nothing had to be guessed');
      expect(JSON.parse(await readFile(back, 'utf8'))).toEqual(JSON.parse(await readFile(src, 'utf8')));
    }
  });

  it('export --to ddi --data carries the delivery statistics, checked against the raw cells', async () => {
    const out = join(dir, 'demo.xml');
    const r = await cli(['export', 'examples/household.codebook.json', '--to', 'ddi', '--data', 'examples/demo-delivery.csv', '-o', out, '--threads', '1'], root);
    expect(r.code).toBe(0);
    const xml = await readFile(out, 'utf8');
    expect(xml).toContain('<caseQnty>4000</caseQnty>');
    const income = /<var ID="V\d+" name="income"[\s\S]*?<\/var>/.exec(xml)![0];
    const stat = (type: string) => Number(new RegExp(`<sumStat type="${type}">([^<]+)</sumStat>`).exec(income)![1]);
    // Valid income: a number, not a missing code (-8, -9), within the range 0 to 1,000,000 (first principles).
    const cells = await column('income');
    const valid = cells.filter((c) => c.trim() !== '' && Number.isFinite(Number(c))).map(Number).filter((v) => v !== -8 && v !== -9 && v >= 0 && v <= 1_000_000);
    expect(stat('vald')).toBe(valid.length);
    expect(stat('invd')).toBe(4000 - valid.length);
    // jStat 1.9.6: mean and sample standard deviation (n - 1).
    expect(stat('mean')).toBeCloseTo(jStat.mean(valid), 8);
    expect(stat('stdev')).toBeCloseTo(jStat.stdev(valid, true), 8);
    expect(stat('min')).toBe(Math.min(...valid));
    expect(stat('max')).toBe(Math.max(...valid));
    // Category frequencies of sex: count the cells "1" and "2" (first principles).
    const sex = await column('sex');
    const sexVar = /<var ID="V\d+" name="sex"[\s\S]*?<\/var>/.exec(xml)![0];
    const freq = [...sexVar.matchAll(/<catValu>(-?\d+)<\/catValu>[\s\S]*?<catStat type="freq">(\d+)<\/catStat>/g)].map((m) => [Number(m[1]), Number(m[2])]);
    expect(freq.slice(0, 2)).toEqual([[1, sex.filter((c) => c === '1').length], [2, sex.filter((c) => c === '2').length]]);
    expect(xml).toContain('<notes type="codeweir:convention" subject="sumStat">');
    // Without -o the XML goes to stdout, and the import of it is the codebook again.
    const stdout = await cli(['export', 'examples/household.codebook.json', '--to', 'ddi'], root);
    expect(stdout.out.startsWith('<?xml version="1.0" encoding="UTF-8"?>\n<codeBook xmlns="ddi:codebook:2_5" version="2.5"')).toBe(true);
    const back = join(dir, 'from-ddi.json');
    expect((await cli(['import', out, '-o', back], root)).code).toBe(0);
    expect(JSON.parse(await readFile(back, 'utf8'))).toEqual(JSON.parse(await readFile(join(root, 'examples/household.codebook.json'), 'utf8')));
  });

  it('import of a list with something to decide writes the codebook, lists it as file:line:column lines, exits 1', async () => {
    const csv = join(dir, 'team-list.csv');
    await writeFile(csv, 'name,label,type,level,codes,missing\nsex,Sex,integer,nominal,"1=Male; 2=Female","2=Refused (refused)"\nage,Age,integer,ratio,,\n');
    const out = join(dir, 'team-list.json');
    const r = await cli(['import', csv, '-o', out], root);
    expect(r.code).toBe(1);
    expect(r.out).toMatch(/A person must decide before the codebook can be used/);
    expect(r.out).toMatch(/team-list\.json:\d+:\d+: error: missing code 2 is also a valid code of item "sex": .* \[missing-collides\]/);
    expect(JSON.parse(await readFile(out, 'utf8')).items).toHaveLength(2);
    // An existing codebook is not replaced without --force; a directory or unknown file is refused.
    expect((await cli(['import', csv, '-o', out], root)).code).toBe(2);
    expect((await cli(['import', csv, '-o', out, '--force', '--json'], root)).code).toBe(1);
    expect((await cli(['import', join(dir, 'nothing.xlsx'), '-o', join(dir, 'x.json')], root)).code).toBe(2);
  });

  it('usage errors exit 2 with one sentence; an invalid codebook exits 1', async () => {
    const a = await cli(['export', 'examples/household.codebook.json', '--to', 'xlsx'], root);
    expect(a.code).toBe(2);
    expect(a.err).toBe('codeweir: --to xlsx writes a workbook, so it needs -o <file.xlsx>.\n');
    expect((await cli(['export', 'examples/household.codebook.json', '--to', 'pdf'], root)).code).toBe(2);
    const bad = join(dir, 'bad.codebook.json');
    await writeFile(bad, JSON.stringify({ codebook: 'x', version: '1', title: 't', items: [{ name: 'a', label: 'A', type: 'integer', level: 'nominal' }] }));
    const b = await cli(['export', bad, '--to', 'ddi'], root);
    expect(b.code).toBe(1);
    expect(b.out).toBe('');
  });
});
