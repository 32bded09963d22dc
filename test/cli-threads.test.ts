/**
 * `--threads N` on check, describe and report. Splitting the reading and checking of a delivery
 * among threads must not change a single byte of what the CLI prints or writes: by first
 * principles the single-thread run is the oracle, since every count, finding and retained value
 * is a property of the file, not of how it was cut. The generator counts what it wrote (rows,
 * duplicate ids) while writing, an outside check that the rows were all read.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtemp, rm, readFile, readdir, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { cli } from './support/cli.ts';
import { countingWorkers } from '../packages/check/test/helpers.ts';
import { generateDelivery, type GeneratedDelivery } from '../bench/generate.ts';

let dir = '';
let gen: GeneratedDelivery;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-cli-threads-'));
  // About 98 bytes a row: 100,000 rows pass the 8 MiB below which a check stays on one thread.
  gen = generateDelivery({ rows: 100_000, dir, name: 'wave' });
  await writeFile(join(dir, 'small.csv'), 'resp_id\n1\n');
}, 60_000);
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('codeweir check --threads', () => {
  it('prints the same --json summary and writes the same files on 1 and 2 threads', async () => {
    expect((await stat(gen.csvPath)).size).toBeGreaterThan(8 * 2 ** 20);
    const one = await countingWorkers(() => cli(['check', 'wave.csv', '--codebook', 'wave.codebook.json', '--json', '--out', 'one', '--threads', '1'], dir));
    const two = await countingWorkers(() => cli(['check', 'wave.csv', '--codebook', 'wave.codebook.json', '--json', '--out', 'two', '--threads', '2'], dir));
    // One thread starts no worker; two threads start one besides the calling thread.
    expect(one.workers).toBe(0);
    expect(two.workers).toBe(1);
    expect(two.value.err).toBe('');
    expect(two.value.code).toBe(one.value.code);
    expect(two.value.out).toBe(one.value.out);
    const summary = JSON.parse(one.value.out);
    // Counted by the generator while writing the file.
    expect(summary.rows).toBe(gen.rows);
    expect(summary.findings.byRule['duplicate-id']).toBe(gen.duplicateIds);
    const files = (await readdir(join(dir, 'one'))).sort();
    expect(files).toContain('findings.csv');
    expect((await readdir(join(dir, 'two'))).sort()).toEqual(files);
    for (const f of files) {
      const a = await readFile(join(dir, 'one', f));
      const b = await readFile(join(dir, 'two', f));
      expect(b.equals(a), f).toBe(true);
    }
  }, 120_000);

  it('keeps a file under the minimum size on one thread whatever --threads says', async () => {
    const r = await countingWorkers(() => cli(['check', 'small.csv', '--codebook', 'wave.codebook.json', '--json', '--threads', '2'], dir));
    expect(r.workers).toBe(0);
    expect(JSON.parse(r.value.out).rows).toBe(1);
  });

  it('describe prints the same document on 1 and 2 threads', async () => {
    const argv = ['describe', 'wave.csv', '--codebook', 'wave.codebook.json', '--json'];
    const one = await cli([...argv, '--threads', '1'], dir);
    const two = await countingWorkers(() => cli([...argv, '--threads', '2'], dir));
    expect(two.workers).toBe(1);
    expect(two.value.code).toBe(one.code);
    expect(two.value.out).toBe(one.out);
  }, 120_000);
});

describe('--threads validation', () => {
  for (const command of ['check', 'describe', 'report']) {
    for (const bad of ['0', '-1', '1.5', 'two', '']) {
      it(`${command} --threads ${JSON.stringify(bad)} is a usage error (exit 2), before any file is read`, async () => {
        const extra = command === 'report' ? ['-o', 'r.html'] : [];
        // The data file does not exist: the option must be refused first.
        const r = await cli([command, 'absent.csv', '--codebook', 'absent.json', ...extra, `--threads=${bad}`], dir);
        expect(r.code).toBe(2);
        expect(r.err).toBe(`codeweir: --threads takes a positive whole number, got ${bad === '' ? 'nothing' : bad}.\n`);
        expect(r.out).toBe('');
      });
    }
  }
});
