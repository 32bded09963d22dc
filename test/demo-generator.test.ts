import { describe, it, expect } from 'vitest';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { makeDemo, buildDemo, DEMO_FILES, type PlantedFault } from '../examples/make-demo.ts';

const examples = new URL('../examples/', import.meta.url);
// csv-parse is the parsing oracle; it is a dependency of the read package, so resolve it from there.
const { parse } = createRequire(new URL('../packages/read/package.json', import.meta.url))('csv-parse/sync') as {
  parse: (input: string, options: Record<string, unknown>) => string[][];
};

interface CodebookJson {
  items: Array<{ name: string; codes?: Array<{ code: number | string; bin?: { min: number; max?: number } }> }>;
}

async function committed(name: string): Promise<Buffer> {
  return readFile(new URL(name, examples));
}

describe('demo generator', () => {
  it('regenerates byte-identical files from the same seed', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'codeweir-demo-'));
    try {
      const written = await makeDemo({ outDir: dir });
      expect(written).toHaveLength(3);
      for (const name of Object.values(DEMO_FILES)) {
        const fresh = await readFile(join(dir, name));
        expect(fresh.equals(await committed(name)), `${name} differs from the committed copy`).toBe(true);
      }
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });

  it('writes a delivery whose header, rows and planted faults agree with the manifest (csv-parse as oracle)', async () => {
    const codebook = JSON.parse((await committed('household.codebook.json')).toString('utf8')) as CodebookJson;
    const faults = JSON.parse((await committed(DEMO_FILES.faults)).toString('utf8')) as PlantedFault[];
    const [header, ...rows] = parse((await committed(DEMO_FILES.delivery)).toString('utf8'), { relax_column_count: true });
    const names = codebook.items.map((i) => i.name);
    expect(header).toEqual(names);
    expect(rows).toHaveLength(4000);

    // One fault a row, so no planted fault can trip another on the same row.
    expect(new Set(faults.map((f) => f.row)).size).toBe(faults.length);

    // Ragged rows are exactly the manifest's ragged-row entries, with the field count it states.
    const ragged = rows.flatMap((r, i) => (r.length === names.length ? [] : [{ row: i + 1, fields: r.length }]));
    expect(ragged).toEqual(faults.filter((f) => f.rule === 'ragged-row').map((f) => ({ row: f.row, fields: f.fields })));

    for (const f of faults) {
      const cells = rows[f.row - 1];
      if (f.rule === 'rule-failed') {
        for (const [item, value] of Object.entries(f.cells ?? {})) expect(cells[names.indexOf(item)]).toBe(value);
      } else if (f.item !== null) {
        expect(cells[names.indexOf(f.item)], `row ${f.row} ${f.item}`).toBe(f.value);
      }
      if (f.rule === 'duplicate-id') {
        // The first occurrence is earlier in the file and is itself not reported.
        const first = rows.findIndex((r) => r[0] === f.value) + 1;
        expect(first).toBeGreaterThan(0);
        expect(first).toBeLessThan(f.row);
      }
      if (f.rule === 'unbinned-value') {
        // First principles: the suggested code is the one bin whose [min, max] holds the raw count.
        const bins = codebook.items.find((i) => i.name === f.item)?.codes ?? [];
        const raw = Number(f.value);
        const holding = bins.filter((c) => c.bin && raw >= c.bin.min && (c.bin.max === undefined || raw <= c.bin.max));
        expect(holding.map((c) => String(c.code))).toEqual([f.suggestion]);
        expect(bins.some((c) => String(c.code) === f.value)).toBe(false);
      }
    }

    // Every fault kind the demo is meant to show is planted at least once.
    const kinds = new Set(faults.map((f) => f.rule));
    for (const rule of [
      'ragged-row', 'not-a-number', 'not-an-integer', 'not-a-date', 'not-a-code', 'unbinned-value', 'impossible', 'implausible',
      'pattern-mismatch', 'duplicate-id', 'answered-when-skipped', 'blank-when-asked', 'rule-failed',
    ]) {
      expect(kinds.has(rule as PlantedFault['rule']), rule).toBe(true);
    }
    expect(faults.some((f) => f.value !== null && f.value !== f.value.trim())).toBe(true);
  });

  it('writes a semicolon, decimal-comma, windows-1252 delivery', async () => {
    const bytes = await committed(DEMO_FILES.semicolon);
    // windows-1252 and latin1 agree on every byte this file uses (ASCII and 0xA0-0xFF), so latin1 decodes it.
    expect(bytes.some((b) => b >= 0x80 && b < 0xa0)).toBe(false);
    expect(bytes.includes(0xf1)).toBe(true); // n with tilde in windows-1252
    const [header, ...rows] = parse(bytes.toString('latin1'), { delimiter: ';' });
    expect(header[4]).toBe('weight');
    expect(rows).toHaveLength(300);
    expect(rows.every((r) => r.length === header.length)).toBe(true);
    expect(rows.every((r) => /^[0-9]+,[0-9]{2}$/.test(r[4]))).toBe(true);
    expect(rows.some((r) => r[28].includes('Castañar') || r[28].includes('Brønnvik') || r[28].includes('Aldersée'))).toBe(true);
  });

  it('refuses a delivery too small to spread its faults', () => {
    expect(() => buildDemo({ rows: 50 })).toThrow(expect.objectContaining({ code: 'CW_USAGE' }));
  });
});
