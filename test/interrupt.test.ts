/**
 * Process-level promises on bad input that need a real process: an interrupted run (SIGINT in
 * the middle of reading a delivery) leaves the previous outputs intact and no temporary files,
 * and a file the user may not read gets exit 2 and one sentence. The processes run the built CLI
 * (the bundle the `codeweir` binary loads), built for this test into a temporary folder that
 * every user may read: the checkout itself may lie under a folder another user cannot enter.
 */
import { describe, it, expect, beforeAll } from 'vitest';
import { mkdtemp, writeFile, readFile, readdir, chmod, open } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { corpusCodebook, cleanRows, seeded, toCsv, HEADER } from './adversarial/corpus.ts';
import { buildBundle } from '../scripts/bundle.ts';
import { startNode, waitUntilOpen } from './support/process.ts';

let bin = '';

/** The built CLI in the test folder, as the user `opts` names (the current one by default). */
function start(args: string[], opts: { uid?: number; gid?: number } = {}) {
  return startNode([bin, ...args], { cwd: dir, ...opts });
}

let dir: string;
let codebook: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-interrupt-'));
  await buildBundle(true, join(dir, 'cli'));
  bin = join(dir, 'cli', 'codeweir.mjs');
  codebook = join(dir, 'codebook.json');
  await writeFile(codebook, JSON.stringify(corpusCodebook));
});

describe('interrupted and unreadable', () => {
  it('SIGINT mid-file leaves the previous outputs intact and no temporary files', async () => {
    const out = join(dir, 'out');
    const small = join(dir, 'small.csv');
    await writeFile(small, toCsv(HEADER, cleanRows(seeded(7), 50)));
    const first = await start(['check', small, '--codebook', codebook, '--out', out, '--quiet']).done;
    expect(first.code, first.stderr).toBe(0);
    const names = (await readdir(out)).sort();
    const previous = new Map<string, Buffer>();
    for (const f of names) previous.set(f, await readFile(join(out, f)));

    // A delivery large enough that reading it takes a while (about 40 MB).
    const big = join(dir, 'big.csv');
    const fh = await open(big, 'w');
    const rand = seeded(11);
    await fh.write(HEADER.join(',') + '\n');
    for (let b = 0; b < 40; b++) await fh.write(toCsv(HEADER, cleanRows(rand, 40_000)).slice(HEADER.join(',').length + 1));
    await fh.close();

    const run = start(['check', big, '--codebook', codebook, '--out', out, '--quiet']);
    // Wait until the process has opened the delivery (it reads with positioned reads and
    // closes the file after the last row), then interrupt while it is still open: mid-file.
    expect(await waitUntilOpen(run.child.pid!, big, 4000), 'the run was caught while reading the file').toBe(true);
    run.child.kill('SIGINT');
    const r = await run.done;
    expect(r.code).toBe(130);
    expect(r.stderr).not.toMatch(/^\s+at /m);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    const after = (await readdir(out)).sort();
    expect(after).toEqual(names);
    for (const f of names) expect((await readFile(join(out, f))).equals(previous.get(f)!), f).toBe(true);
  });

  it('a file the user may not read: exit 2 and one sentence naming it', async () => {
    const secret = join(dir, 'secret.csv');
    await writeFile(secret, toCsv(HEADER, cleanRows(seeded(3), 5)));
    await chmod(secret, 0o000);
    // root reads any file whatever its mode, so run as the unprivileged user `nobody` then.
    const asRoot = process.getuid?.() === 0;
    if (asRoot) await chmod(dir, 0o755);
    const r = await start(['check', secret, '--codebook', codebook, '--json'], asRoot ? { uid: 65534, gid: 65534 } : {}).done;
    expect(r.code, r.stderr).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(/secret\.csv/);
    expect(r.stderr).not.toMatch(/^\s+at /m);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
  });
});
