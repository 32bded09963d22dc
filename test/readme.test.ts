/**
 * The README's codebook example is a real codebook: it passes the same loader `lint` uses, and
 * the commands it documents are the ones the CLI has.
 */
import { describe, it, expect } from 'vitest';
import { readFile } from 'node:fs/promises';
import { resolve } from 'node:path';
import { parseCodebook } from '@codeweir/codebook';
import { run } from '@codeweir/cli';

const readme = await readFile(resolve(import.meta.dirname, '..', 'README.md'), 'utf8');

describe('README', () => {
  it('its codebook example loads with no error problem', () => {
    const section = readme.slice(readme.indexOf('## The codebook'));
    const m = /```json\n([\s\S]*?)```/.exec(section);
    expect(m).not.toBeNull();
    const r = parseCodebook(m![1]!, 'README.md');
    expect(r.problems.filter((p) => p.severity === 'error')).toEqual([]);
    expect(r.ok).toBe(true);
  });

  it('documents exactly the commands the CLI has', async () => {
    let out = '';
    expect(await run(['--help'], { stdout: (t) => void (out += t), stderr: () => {}, isTTY: false })).toBe(0);
    const cliCommands = [...out.matchAll(/^\s+codeweir (\w+)/gm)].map((x) => x[1]).sort();
    const table = readme.slice(readme.indexOf('## What it does'), readme.indexOf('## The codebook'));
    const documented = [...table.matchAll(/^\| `codeweir (\w+)/gm)].map((x) => x[1]).sort();
    expect(documented).toEqual(cliCommands);
  });
});
