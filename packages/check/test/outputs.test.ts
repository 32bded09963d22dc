/**
 * The written outputs, read back with csv-parse (an outside RFC 4180 parser) so the files are
 * checked by something other than the code that wrote them.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtemp, readFile, readdir, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { check, checkFile, writeCheckOutputs, neutraliseCell } from '../src/index.ts';
import { codebook } from './helpers.ts';

const cb = codebook([
  { name: 'id', label: 'Record', role: 'id', type: 'text' },
  { name: 'team', label: 'Team', role: 'group', type: 'integer', level: 'nominal', codes: [{ code: 1, label: 'North' }, { code: 2, label: 'South' }] },
  { name: 'note', label: 'Note', type: 'text', pattern: '[a-z ]*' },
  { name: 'n', label: 'Count', type: 'integer', level: 'ratio', range: { min: 0 }, missing: [{ code: -9, kind: 'refused' }] },
]);

const hostile = ['=HYPERLINK("http://x","y")', '+1+1', '-2+3', '@SUM(A1)', '\tTAB', '\rCR', 'a, "quoted"\nline'];

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'cw-check-out-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

async function allFiles(d: string): Promise<string[]> {
  const out: string[] = [];
  for (const e of await readdir(d, { withFileTypes: true })) {
    if (e.isDirectory()) out.push(...(await allFiles(join(d, e.name))).map((f) => join(e.name, f)));
    else out.push(e.name);
  }
  return out.sort();
}

describe('findings.csv', () => {
  it('neutralises cells a spreadsheet would run as formulas, including negative numbers', async () => {
    const rows = hostile.map((note, i) => [`r${i}`, '1', note, '-5']);
    const r = await check(rows, cb);
    const out = join(dir, 'hostile');
    await writeCheckOutputs(r, out);
    const raw = await readFile(join(out, 'findings.csv'), 'utf8');
    expect(raw.charCodeAt(0)).toBe(0xfeff);
    const recs = parse(raw, { bom: true, columns: true }) as Array<Record<string, string>>;
    expect(Object.keys(recs[0]!)).toEqual(['row', 'id', 'item', 'value', 'rule', 'severity', 'message', 'suggestion']);
    // Row 0 is the item-level surrounding-space warning (the tab cell is trimmed before matching).
    const notes = recs.filter((x) => x.item === 'note' && x.row !== '0');
    expect(notes.map((x) => x.value)).toEqual(hostile.map((h) => (/^[=+\-@\t\r]/.test(h) ? `'${h}` : h)));
    // -5 is impossible (range min 0); in the CSV it reads '-5 so no spreadsheet takes it as a formula.
    const n = recs.filter((x) => x.item === 'n');
    expect(n.every((x) => x.value === "'-5" && x.rule === 'impossible')).toBe(true);
    for (const rec of recs) for (const v of Object.values(rec)) expect(/^[=+\-@\t\r]/.test(v)).toBe(false);
    // The JSON Lines log keeps values as delivered.
    const jl = (await readFile(join(out, 'findings.jsonl'), 'utf8')).trim().split('\n').map((l) => JSON.parse(l));
    expect(jl.filter((x) => x.item === 'note' && x.row > 0).map((x) => x.value)).toEqual(hostile);
  });

  it('neutraliseCell leaves ordinary text alone', () => {
    expect(neutraliseCell('abc')).toBe('abc');
    expect(neutraliseCell('')).toBe('');
    expect(neutraliseCell('-9')).toBe("'-9");
  });
});

describe('writeCheckOutputs', () => {
  it('writes every file atomically (no temporaries left) and splits by group', async () => {
    const rows = [
      ['a', '1', 'ok', '3'],
      ['b', '2', 'BAD', '4'],
      ['c', '1', 'ok', '-9'],
      ['d', '2', 'ok', 'x'],
      ['e', '', 'ok', ''],
    ];
    const r = await check(rows, cb);
    const out = join(dir, 'split');
    await writeCheckOutputs(r, out, { splitBy: 'team' });
    expect(await allFiles(out)).toEqual([
      'by-team/(missing)'.replace(/[()]/g, '_') + '/findings.csv',
      'by-team/_missing_/missingness.csv',
      'by-team/1/findings.csv',
      'by-team/1/missingness.csv',
      'by-team/2/findings.csv',
      'by-team/2/missingness.csv',
      'findings.csv',
      'findings.jsonl',
      'missingness-by-group.csv',
      'missingness.csv',
      'summary.json',
    ].sort());
    const team2 = parse(await readFile(join(out, 'by-team', '2', 'findings.csv'), 'utf8'), { bom: true, columns: true }) as Array<Record<string, string>>;
    expect(team2.map((x) => [x.row, x.rule])).toEqual([
      ['2', 'pattern-mismatch'],
      ['4', 'not-a-number'],
    ]);
    const miss1 = parse(await readFile(join(out, 'by-team', '1', 'missingness.csv'), 'utf8'), { bom: true, columns: true }) as Array<Record<string, string>>;
    // Team 1 has rows a and c; c has n = -9 (refused): 1 of 2 rows missing = 50 percent.
    expect(miss1.find((x) => x.item === 'n')).toMatchObject({ rows: '2', valid: '1', refused: '1', missing: '1', percent_missing: '50' });
    const summary = JSON.parse(await readFile(join(out, 'summary.json'), 'utf8'));
    expect(summary).toEqual(JSON.parse(JSON.stringify(r.summary)));
  });

  it('refuses a split item that is not a group item, writing nothing', async () => {
    const r = await check([['a', '1', 'ok', '3']], cb);
    const out = join(dir, 'nosplit');
    await expect(writeCheckOutputs(r, out, { splitBy: 'note' })).rejects.toMatchObject({ code: 'CW_USAGE' });
    await expect(readdir(out)).rejects.toThrow();
  });

  it('never changes the delivery it reads', async () => {
    const file = join(dir, 'delivery.csv');
    const text = 'id,team,note,n\r\na,1,ok,3\r\nb,2, spaced ,x\r\n';
    await writeFile(file, text);
    const r = await checkFile(file, cb);
    await writeCheckOutputs(r, dir);
    expect(await readFile(file, 'utf8')).toBe(text);
    expect(r.summary.file).toBe(file);
    expect(r.summary.rows).toBe(2);
  });
});
