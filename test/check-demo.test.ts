/**
 * The library API on the demo deliveries (examples/, written by examples/make-demo.ts):
 * every planted fault of examples/demo-faults.json is found at its row, item and rule with
 * nothing else at error severity; declared missing codes are counted by kind and never
 * reported as faults; the clean semicolon / decimal-comma / windows-1252 variant has no error.
 * The manifest is the outside reference here: it is written by the generator as it plants.
 */
import { describe, it, expect } from 'vitest';
import { readFile } from 'node:fs/promises';
import { fileURLToPath } from 'node:url';
import { loadCodebookOrThrow } from '@codeweir/codebook';
import { checkFile, type CheckResult } from '@codeweir/check';

const ex = (f: string): string => fileURLToPath(new URL(`../examples/${f}`, import.meta.url));

interface Planted {
  row: number;
  item: string | null;
  rule: string;
  severity: string;
  suggestion?: number;
}

const key = (row: number, item: string | null, rule: string): string => `${row}|${item ?? ''}|${rule}`;

describe('demo delivery through the library', () => {
  let result: CheckResult;
  let planted: Planted[];

  it('finds every planted fault with the right rule, row and severity, and no other error', async () => {
    const cb = await loadCodebookOrThrow(ex('household.codebook.json'));
    planted = JSON.parse(await readFile(ex('demo-faults.json'), 'utf8')) as Planted[];
    result = await checkFile(ex('demo-delivery.csv'), cb);
    const found = new Map(result.findings.map((f) => [key(f.row, f.item, f.rule), f]));
    for (const p of planted) {
      const f = found.get(key(p.row, p.item, p.rule));
      expect(f, `planted ${key(p.row, p.item, p.rule)}`).toBeDefined();
      expect(f!.severity).toBe(p.severity);
      if (p.suggestion !== undefined) expect(f!.suggestion).toBe(String(p.suggestion));
    }
    const want = new Set(planted.map((p) => key(p.row, p.item, p.rule)));
    const extraErrors = result.findings.filter((f) => f.severity === 'error' && !want.has(key(f.row, f.item, f.rule)));
    expect(extraErrors).toEqual([]);
    expect(result.summary.findings.bySeverity.error).toBe(planted.filter((p) => p.severity === 'error').length);
    expect(result.summary.accepted).toBe(false);
  });

  it('counts declared missing codes by kind, not as faults', async () => {
    const cb = await loadCodebookOrThrow(ex('household.codebook.json'));
    const planted = JSON.parse(await readFile(ex('demo-faults.json'), 'utf8')) as Planted[];
    const r = result ?? (await checkFile(ex('demo-delivery.csv'), cb));
    let missingCells = 0;
    for (const item of cb.items) {
      const t = r.summary.items[item.name]!;
      const declared = new Set<string>(['blank', ...item.missing.map((m) => m.kind)]);
      for (const [kind, n] of Object.entries(t.missing)) {
        // Only the item's own declared kinds (or blank) can appear.
        expect(declared.has(kind), `${item.name} ${kind}`).toBe(true);
        missingCells += n ?? 0;
      }
      // Invalid cells of an item are exactly its planted cell faults (ragged rows aside).
      const cellRules = planted.filter((p) => p.item === item.name && p.severity === 'error' && p.rule !== 'duplicate-id');
      // A short row leaves the cells past its end invalid without a cell finding.
      const shortRows = planted.filter((p) => p.rule === 'ragged-row' && (p as { fields?: number }).fields! < cb.items.length).length;
      expect(t.invalid, item.name).toBeGreaterThanOrEqual(cellRules.length);
      expect(t.invalid, item.name).toBeLessThanOrEqual(cellRules.length + shortRows);
    }
    expect(missingCells).toBeGreaterThan(0);
    expect(r.summary.findings.byRule['not-a-code']).toBe(planted.filter((p) => p.rule === 'not-a-code').length);
  });

  it('the semicolon, decimal-comma, windows-1252 variant has no error finding', async () => {
    const cb = await loadCodebookOrThrow(ex('household.codebook.json'));
    const r = await checkFile(ex('demo-delivery-semicolon.csv'), cb, { decimalComma: true, encoding: 'windows-1252' });
    expect(r.summary.rows).toBeGreaterThan(0);
    expect(r.findings.filter((f) => f.severity === 'error')).toEqual([]);
    expect(r.summary.items.weight!.valid).toBeGreaterThan(0);
  });
});
