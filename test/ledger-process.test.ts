/**
 * The ledger's promises that need real processes: a run interrupted (SIGINT) while it writes to
 * the ledger leaves the ledger readable with the earlier deliveries intact; two runs at once on
 * one ledger both get recorded, one after the other; a run that cannot get the ledger within
 * its --ledger-wait stops with one sentence and leaves the ledger as it was.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtemp, rm, writeFile, open } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { basename, join, resolve } from 'node:path';
import { DuckDBInstance } from '@duckdb/node-api';
import { Ledger } from '../packages/ledger/src/index.ts';
import { startNode, waitUntilOpen } from './support/process.ts';

const repo = resolve(import.meta.dirname, '..');
const bin = join(repo, 'packages/cli/src/bin.ts');

/** Runs the CLI from source (tsx resolves from the repository); file names are taken inside the test folder. */
function start(args: string[]) {
  const inDir = args.map((a) => (/\.(csv|json)$/.test(a) ? join(dir, a) : a));
  return startNode(['--conditions=source', '--import', 'tsx', bin, ...inDir], { cwd: repo });
}

const codebook = {
  codebook: 'ledger-process-test',
  version: '1',
  title: 'Ledger process test (invented)',
  items: [
    { name: 'hh', label: 'Household', role: 'id', type: 'text' },
    { name: 'team', label: 'Field team', role: 'group', type: 'integer', level: 'nominal', codes: [1, 2, 3].map((c) => ({ code: c, label: `Team ${c}` })) },
    { name: 'size', label: 'Household size', type: 'integer', level: 'ratio', range: { min: 1, max: 40 }, missing: [{ code: -9, kind: 'refused' }] },
  ],
};

async function delivery(path: string, rows: number, seed: number): Promise<void> {
  const fh = await open(path, 'w');
  await fh.write('hh,team,size\n');
  let chunk = '';
  for (let i = 0; i < rows; i++) {
    chunk += `H${seed}-${i},${1 + ((i * 7 + seed) % 3)},${1 + ((i * 13 + seed) % 9)}\n`;
    if (chunk.length > 1 << 20) {
      await fh.write(chunk);
      chunk = '';
    }
  }
  await fh.write(chunk);
  await fh.close();
}

async function files(ledger: string): Promise<string[]> {
  const l = await Ledger.open(ledger, { readOnly: true });
  try {
    return (await l.deliveries()).map((d) => basename(d.file));
  } finally {
    l.close();
  }
}

let dir = '';
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-ledger-process-'));
  await writeFile(join(dir, 'cb.json'), JSON.stringify(codebook));
  await delivery(join(dir, 'small1.csv'), 50, 1);
  await delivery(join(dir, 'small2.csv'), 60, 2);
  await delivery(join(dir, 'small3.csv'), 70, 3);
  // Large enough that writing its 400,000 records to the ledger takes a while.
  await delivery(join(dir, 'big.csv'), 400_000, 4);
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('the ledger across processes', () => {
  it('SIGINT while writing the ledger leaves it readable with the earlier deliveries', async () => {
    const ledger = join(dir, 'interrupt.duckdb');
    const first = await start(['check', 'small1.csv', '--codebook', 'cb.json', '--ledger', ledger, '--threads', '1']).done;
    expect(first.code, first.stderr).toBe(0);

    const run = start(['check', 'big.csv', '--codebook', 'cb.json', '--ledger', ledger, '--threads', '1']);
    // The ledger file is opened only after the check, for the write: catch the run holding it.
    expect(await waitUntilOpen(run.child.pid!, ledger, 6000), 'the run was caught while it held the ledger').toBe(true);
    run.child.kill('SIGINT');
    const r = await run.done;
    expect(r.code).toBe(130);
    expect(r.stderr).not.toMatch(/^\s+at /m);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    // The interrupted delivery is not there, the first one is, and the ledger takes new writes.
    expect(await files(ledger)).toEqual(['small1.csv']);
    const l = await Ledger.open(ledger, { readOnly: true });
    const s = await l.snapshot(1);
    l.close();
    expect(s.records?.ids).toHaveLength(50);
    const after = await start(['check', 'small2.csv', '--codebook', 'cb.json', '--ledger', ledger, '--threads', '1']).done;
    expect(after.code, after.stderr).toBe(0);
    expect(await files(ledger)).toEqual(['small1.csv', 'small2.csv']);
  });

  it('two runs at once on one ledger: both recorded, one after the other', async () => {
    const ledger = join(dir, 'together.duckdb');
    const a = start(['check', 'small1.csv', '--codebook', 'cb.json', '--ledger', ledger, '--threads', '1']);
    const b = start(['check', 'small2.csv', '--codebook', 'cb.json', '--ledger', ledger, '--threads', '1']);
    const [ra, rb] = await Promise.all([a.done, b.done]);
    expect(ra.code, ra.stderr).toBe(0);
    expect(rb.code, rb.stderr).toBe(0);
    expect((await files(ledger)).sort()).toEqual(['small1.csv', 'small2.csv']);
    // One of them was first, the other second and compared with it.
    const lines = [ra.stdout, rb.stdout].map((o) => o.split('\n').find((x) => x.startsWith('Ledger'))!).sort();
    expect(lines[0]).toMatch(/recorded as delivery 1 of 1 \(the first\)/);
    expect(lines[1]).toMatch(/recorded as delivery 2 of 2; since delivery 1/);
  });

  it('waits for a ledger held by another process, or stops with one sentence when its wait runs out', async () => {
    const ledger = join(dir, 'held.duckdb');
    (await Ledger.open(ledger)).close();
    // This test process holds the file (DuckDB locks it per process) for 1.5 s.
    const holder = await DuckDBInstance.create(ledger);
    const patient = start(['check', 'small1.csv', '--codebook', 'cb.json', '--ledger', ledger, '--ledger-wait', '60', '--threads', '1']);
    const hasty = start(['check', 'small3.csv', '--codebook', 'cb.json', '--ledger', ledger, '--ledger-wait', '0.2', '--threads', '1']);
    const h = await hasty.done;
    await new Promise((r) => setTimeout(r, 1500));
    holder.closeSync();
    const p = await patient.done;
    expect(h.code).toBe(2);
    expect(h.stderr.trim().split('\n')).toHaveLength(1);
    expect(h.stderr).toMatch(/is in use by another codeweir run and was not released within 0 s; try again/);
    expect(p.code, p.stderr).toBe(0);
    expect(await files(ledger)).toEqual(['small1.csv']);
  });
});
