/**
 * The legacy-style demo codebook (missing codes inside ranges, the way sponsors' codebooks are
 * often written) lints with warnings only and checks the demo delivery exactly as the clean
 * codebook does: the declared missing code always wins, and none of the legacy codes occurs in
 * the delivery's columns as a genuine value (asserted below from the data, not assumed).
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { openDelivery } from '@codeweir/read';
import { cli } from './support/cli.ts';

const root = resolve(import.meta.dirname, '..');
const clean = 'examples/household.codebook.json';
const legacy = 'examples/household-legacy.codebook.json';
const delivery = 'examples/demo-delivery.csv';

let dir = '';
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-legacy-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('the legacy-style demo codebook', () => {
  it('lints with one warning per missing code inside a range, each naming its item and code', async () => {
    const r = await cli(['lint', legacy, '--json'], root);
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.out);
    expect(doc.ok).toBe(true);
    expect(doc.problems.map((p: any) => [p.code, p.severity, p.item])).toEqual([
      ['missing-in-range', 'warning', 'children'],
      ['missing-in-range', 'warning', 'income'],
      ['missing-in-range', 'warning', 'income'],
    ]);
    expect(doc.problems.map((p: any) => p.message.match(/missing code (\d+)/)![1])).toEqual(['9', '9999998', '9999999']);
  });

  it('lint --strict and check --strict refuse it (exit 1)', async () => {
    expect((await cli(['lint', legacy, '--strict'], root)).code).toBe(1);
    const r = await cli(['check', delivery, '--codebook', legacy, '--strict', '--threads', '1'], root);
    expect(r.code).toBe(1);
    expect(r.out).toBe('');
    expect(r.err).toMatch(/^codeweir: Codebook .*household-legacy\.codebook\.json is invalid at \/items\/\d+\/missing\/2\/code: missing code 9 \(refused\) of item "children" .*--strict/);
  });

  it('none of the legacy codes occurs as a value in the demo delivery (so classification cannot differ)', async () => {
    const d = await openDelivery(join(root, delivery));
    const ci = d.header.indexOf('children');
    const ii = d.header.indexOf('income');
    const children: number[] = [];
    const income: number[] = [];
    for await (const b of d.batches()) {
      for (let r = 0; r < b.count; r++) {
        children.push(Number(b.fields[b.offsets[r]! + ci]));
        income.push(Number(b.fields[b.offsets[r]! + ii]));
      }
    }
    expect(children.length).toBe(4000);
    expect(children.filter((v) => v === 9 || v > 20)).toEqual([]);
    expect(income.filter((v) => v > 1_000_000)).toEqual([]);
  });

  it('checks the demo delivery exactly as the clean codebook does', async () => {
    const a = await cli(['check', delivery, '--codebook', clean, '--json', '--threads', '1'], root);
    const b = await cli(['check', delivery, '--codebook', legacy, '--json', '--threads', '1'], root);
    expect(b.code).toBe(a.code);
    const sa = JSON.parse(a.out);
    const sb = JSON.parse(b.out);
    expect(sb.codebook.codebook).toBe('tellmark-household-2026-legacy');
    expect(sb.findings).toEqual(sa.findings);
    expect(sb.items).toEqual(sa.items);
    expect(sb.groups).toEqual(sa.groups);
    expect(sb.rules).toEqual(sa.rules);
    expect({ ...sb, codebook: null }).toEqual({ ...sa, codebook: null });
  });

  it('describes and reports with it; --lang fr quotes the French labels', async () => {
    const d = await cli(['describe', delivery, '--codebook', legacy, '--json', '--threads', '1', '--lang', 'fr'], root);
    expect(d.code).toBe(1); // the demo delivery has planted error findings
    const doc = JSON.parse(d.out);
    expect(doc.items.sex.frequencies.map((f: any) => f.label)).toEqual(['Homme', 'Femme']);
    const en = JSON.parse((await cli(['describe', delivery, '--codebook', legacy, '--json', '--threads', '1'], root)).out);
    expect(en.items.sex.frequencies.map((f: any) => f.label)).toEqual(['Male', 'Female']);
    const html = join(dir, 'legacy.html');
    const r = await cli(['report', delivery, '--codebook', legacy, '-o', html, '--threads', '1', '--lang', 'fr', '--quiet'], root);
    expect(r.code).toBe(1);
    const text = await readFile(html, 'utf8');
    expect(text).toContain('Revenu monétaire du ménage le mois dernier');
    expect((await cli(['describe', delivery, '--codebook', legacy, '--lang', 'de'], root)).code).toBe(2);
  });

  it('a cell holding a legacy missing code is missing of its kind, never a value', async () => {
    const text = await readFile(join(root, delivery), 'utf8');
    const lines = text.split(/\r?\n/);
    const header = lines[0]!.split(',');
    const ci = header.indexOf('children');
    const ii = header.indexOf('income');
    const row = lines[1]!.split(',');
    row[ci] = '9';
    row[ii] = '9999998';
    const row2 = lines[2]!.split(',');
    row2[ii] = '9999999';
    await writeFile(join(dir, 'two.csv'), [lines[0], row.join(','), row2.join(',')].join('\n') + '\n');
    const r = await cli(['check', join(dir, 'two.csv'), '--codebook', join(root, legacy), '--json', '--threads', '1'], root);
    const s = JSON.parse(r.out);
    expect(s.items.children.missing).toEqual({ refused: 1 });
    expect(s.items.income.missing).toEqual({ 'dont-know': 1, refused: 1 });
    expect(s.items.income.valid).toBe(0);
  });
});
