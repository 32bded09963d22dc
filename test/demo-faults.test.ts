/**
 * The demo delivery against its codebook: `codeweir check` must report every planted fault in
 * examples/demo-faults.json at its row, item and rule, and nothing else at error or warning
 * severity but the item-level surrounding-space warnings the manifest's header describes (one
 * per item with a spaced cell). Info findings (Tukey outliers) are expected in skewed amounts.
 */
import { describe, it, expect } from 'vitest';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { run } from '../packages/cli/src/index.ts';
import type { PlantedFault } from '../examples/make-demo.ts';

const examples = fileURLToPath(new URL('../examples/', import.meta.url));

interface LoggedFinding {
  row: number;
  item: string;
  rule: string;
  severity: string;
  value: string;
  suggestion?: string;
}

describe('demo delivery', () => {
  it('is checked into exactly its planted faults', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'codeweir-demo-check-'));
    try {
      const io = { stdout: () => undefined, stderr: () => undefined, isTTY: false, cwd: examples };
      const code = await run(['check', 'demo-delivery.csv', '--codebook', 'household.codebook.json', '--out', dir], io);
      // Planted errors make the delivery rejected.
      expect(code).toBe(1);
      const logged = (await readFile(join(dir, 'findings.jsonl'), 'utf8'))
        .trim()
        .split('\n')
        .map((l) => JSON.parse(l) as LoggedFinding)
        .filter((f) => f.severity !== 'info');
      const planted = JSON.parse(await readFile(join(examples, 'demo-faults.json'), 'utf8')) as PlantedFault[];

      const key = (row: number, item: string | null, rule: string): string => `${row} ${item ?? ''} ${rule}`;
      const byKey = new Map(logged.map((f) => [key(f.row, f.rule === 'ragged-row' ? null : f.item, f.rule), f]));
      for (const p of planted) {
        const f = byKey.get(key(p.row, p.item, p.rule));
        expect(f, `planted ${key(p.row, p.item, p.rule)}`).toBeDefined();
        expect(f?.severity).toBe(p.severity);
        if (p.value !== null) expect(f?.value).toBe(p.value);
        if (p.suggestion !== undefined) expect(f?.suggestion).toBe(p.suggestion);
      }
      const spaced = new Set(planted.filter((p) => p.value !== null && p.value !== p.value.trim()).map((p) => p.item));
      const extra = logged.filter((f) => !planted.some((p) => key(p.row, p.item, p.rule) === key(f.row, f.rule === 'ragged-row' ? null : f.item, f.rule)));
      expect(extra.map((f) => `${f.row} ${f.item} ${f.rule}`).sort()).toEqual([...spaced].map((i) => `0 ${i} surrounding-space`).sort());
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});
