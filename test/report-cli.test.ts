/** `codeweir report` end to end, in-process through run(argv, io), and the progress line. */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtempSync, writeFileSync, readFileSync, existsSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { run } from '@codeweir/cli';
import { createProgress } from '../packages/cli/src/progress.ts';
import type { Io } from '../packages/cli/src/io.ts';

let dir: string;

const CODEBOOK = {
  codebook: 'reach-mini',
  version: '1.0.0',
  title: 'Reach mini panel (fictional)',
  items: [
    { name: 'id', label: 'Household', role: 'id', type: 'text' },
    { name: 'team', label: 'Team', role: 'group', type: 'integer', level: 'nominal', codes: [{ code: 1, label: 'North' }, { code: 2, label: 'South' }] },
    { name: 'size', label: 'Household size', type: 'integer', level: 'ratio', range: { min: 1, max: 30 } },
  ],
};

function capture(isTTY = false): Io & { out: string; err: string } {
  const io = { out: '', err: '', isTTY, cwd: dir, stdout: (t: string) => void (io.out += t), stderr: (t: string) => void (io.err += t) };
  return io;
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'codeweir-report-cli-'));
  writeFileSync(join(dir, 'mini.codebook.json'), JSON.stringify(CODEBOOK));
  writeFileSync(join(dir, 'clean.csv'), 'id,team,size\nH1,1,3\nH2,1,4\nH3,2,2\nH4,2,5\nH5,1,3\n');
  writeFileSync(join(dir, 'faulty.csv'), 'id,team,size\nH1,1,3\nH2,1,four\nH3,2,2\nH4,2,5\nH5,1,3\n');
});

afterAll(() => rmSync(dir, { recursive: true, force: true }));

const tempsLeft = () => readdirSync(dir).filter((f) => f.endsWith('.tmp'));

describe('codeweir report', () => {
  it('writes the report and exits 0 for an accepted delivery', async () => {
    const io = capture();
    const code = await run(['report', 'clean.csv', '--codebook', 'mini.codebook.json', '-o', 'clean.html'], io);
    expect(code).toBe(0);
    const html = readFileSync(join(dir, 'clean.html'), 'utf8');
    expect(html.startsWith('<!doctype html>')).toBe(true);
    expect(html).toContain('<div class="badge">Accepted</div>');
    expect(io.out).toContain('Report written to clean.html: accepted (0 errors, 0 warnings).');
    expect(io.err).toBe('');
    expect(tempsLeft()).toEqual([]);
  });

  it('still writes the report and exits 1 when the delivery has error findings', async () => {
    const io = capture();
    const code = await run(['report', 'faulty.csv', '--codebook', 'mini.codebook.json', '-o', 'faulty.html', '--quiet'], io);
    expect(code).toBe(1);
    const html = readFileSync(join(dir, 'faulty.html'), 'utf8');
    expect(html).toContain('<div class="badge">Not accepted</div>');
    expect(html).toContain('id="rule-not-a-number"');
    expect(io.out).toBe('');
  });

  it('exits 2 without writing for unreadable input or bad options', async () => {
    for (const argv of [
      ['report', 'absent.csv', '--codebook', 'mini.codebook.json', '-o', 'absent.html'],
      ['report', 'clean.csv', '--codebook', 'mini.codebook.json', '-o', 'wrong.txt'],
      ['report', 'clean.csv', '--codebook', 'mini.codebook.json', '-o', 'pairs.html', '--pairs', 'some'],
      ['report', 'clean.csv', '--codebook', 'mini.codebook.json', '-o', 'q.html', '--quantiles', '12'],
    ]) {
      const io = capture();
      expect(await run(argv, io)).toBe(2);
      expect(io.err.split('\n').filter(Boolean)).toHaveLength(1);
      expect(io.err).not.toMatch(/\n\s+at /);
    }
    for (const f of ['absent.html', 'wrong.txt', 'pairs.html', 'q.html']) expect(existsSync(join(dir, f))).toBe(false);
    expect(tempsLeft()).toEqual([]);
  });

  it('--split-by team writes one page per team beside the report, each with only its rows, and an index', async () => {
    const io = capture();
    const code = await run(['report', 'faulty.csv', '--codebook', 'mini.codebook.json', '-o', 'split/faulty.html', '--split-by', 'team'], io);
    expect(code).toBe(1);
    expect(io.out).toContain('Report written to split/faulty.html and 2 team pages in split/faulty-team: not accepted (1 error, 0 warnings).');
    expect(readdirSync(join(dir, 'split')).sort()).toEqual(['faulty-team', 'faulty.html']);
    expect(readdirSync(join(dir, 'split', 'faulty-team')).sort()).toEqual(['index.html', 'team-1.html', 'team-2.html']);
    const main = readFileSync(join(dir, 'split', 'faulty.html'), 'utf8');
    expect(main).toContain('<a href="faulty-team/team-1.html">page</a>');
    // faulty.csv: H1, H2 and H5 are team 1 (North), H3 and H4 team 2 (South); "four" is in H2.
    const north = readFileSync(join(dir, 'split', 'faulty-team', 'team-1.html'), 'utf8');
    const south = readFileSync(join(dir, 'split', 'faulty-team', 'team-2.html'), 'utf8');
    expect(north).toContain('North [1]: 1 error and 0 warnings in the team’s 3 rows.');
    expect(north).toContain('id="rule-not-a-number"');
    expect(south).toContain('South [2]: 0 errors and 0 warnings in the team’s 2 rows.');
    expect(south).not.toContain('id="rule-not-a-number"');
    // size in team 2: 2 and 5, so its mean is 3.5 (first principles).
    expect(south).toMatch(/<td>mean<\/td><td class="num">3\.5<\/td>/);
    expect(readFileSync(join(dir, 'split', 'faulty-team', 'index.html'), 'utf8')).toContain('<a href="team-2.html">South [2]</a>');
    expect(readdirSync(join(dir, 'split', 'faulty-team')).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });

  it('refuses a --split-by that is not a group item before reading the delivery, writing nothing', async () => {
    const io = capture();
    expect(await run(['report', 'clean.csv', '--codebook', 'mini.codebook.json', '-o', 'nosplit.html', '--split-by', 'size'], io)).toBe(2);
    expect(io.err.trim()).toBe('codeweir: --split-by takes a group item, got "size"; the codebook\'s group items are team.');
    expect(existsSync(join(dir, 'nosplit.html'))).toBe(false);
    expect(existsSync(join(dir, 'nosplit-size'))).toBe(false);
  });

  it('draws the requested pair', async () => {
    const io = capture();
    expect(await run(['report', 'clean.csv', '--codebook', 'mini.codebook.json', '-o', 'pair.html', '--pair', 'team:size'], io)).toBe(0);
    const html = readFileSync(join(dir, 'pair.html'), 'utf8');
    expect(html).toContain('<title id="chart-');
    expect(html).toContain('size (Household size) by team (Team)');
  });

  it('shows progress on a terminal only, and never with --quiet', async () => {
    const tty = capture(true);
    expect(await run(['report', 'clean.csv', '--codebook', 'mini.codebook.json', '-o', 'tty.html'], tty)).toBe(0);
    expect(tty.err).toContain('drawing charts');
    // The line is cleared at the end: carriage return plus erase-to-end-of-line.
    expect(tty.err.endsWith('\r\u001b[K')).toBe(true);
    const quiet = capture(true);
    expect(await run(['report', 'clean.csv', '--codebook', 'mini.codebook.json', '-o', 'tty.html', '--quiet'], quiet)).toBe(0);
    expect(quiet.err).toBe('');
  });
});

describe('createProgress', () => {
  it('prints nothing when stderr is not a terminal or when quiet', () => {
    for (const [isTTY, quiet] of [[false, false], [true, true]] as const) {
      const io = capture(isTTY);
      const p = createProgress(io, { total: 10, label: 'rows', quiet });
      p.update(5);
      p.phase('next');
      p.done();
      expect(io.err).toBe('');
    }
  });

  it('draws a bar whose filled share is done / total', () => {
    const io = capture(true);
    const p = createProgress(io, { total: 8, label: 'rows' });
    p.update(2);
    // 2 of 8 = 25%: a quarter of the 24 cells (6) filled (first principles).
    expect(io.err).toBe(`\r\u001b[Krows [${'#'.repeat(6)}${'-'.repeat(18)}] 25%`);
    p.done();
    expect(io.err.endsWith('\r\u001b[K')).toBe(true);
  });
});
