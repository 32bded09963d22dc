import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { compareSnapshots, codedDrift, numericDrift, normalizeThresholds, recordsCsv, DEFAULT_THRESHOLDS, fnv1a } from '../src/index.ts';
import type { DeliverySnapshot, RecordSet } from '../src/index.ts';

// R 4.2.2 chisq.test(rbind(previous, current), correct = FALSE) and ks.test; test/reference/drift.R.
const R = JSON.parse(readFileSync(resolve(import.meta.dirname, '../../../test/reference/drift.json'), 'utf8')) as {
  chisq: Record<string, { previous: number[]; current: number[]; statistic: number; df: number; p: number }>;
  ks: Record<string, { x: number[]; y: number[]; exact: boolean | null; statistic: number; p: number; method: string }>;
};

function records(ids: string[], rows: string[][], teams: string[]): RecordSet {
  return { idItem: 'hh', items: ['district', 'income'], ids, cells: Uint32Array.from(rows.flat().map(fnv1a)), groupItems: ['team'], groups: [teams], duplicates: 0, unidentified: 0 };
}

function snap(over: Partial<DeliverySnapshot>): DeliverySnapshot {
  return { file: 'x.csv', hash: 'h', codebook: { codebook: 'cb', version: '1' }, checkedAt: '', rows: 0, verdict: 'accepted', errors: 0, warnings: 0, items: {}, groups: {}, findings: [], records: null, ...over };
}

describe('codedDrift and numericDrift against R', () => {
  for (const [name, c] of Object.entries(R.chisq)) {
    it(`chi-square of homogeneity: ${name}`, () => {
      const d = codedDrift(c.previous, c.current, DEFAULT_THRESHOLDS);
      // R: chisq.test(...)$statistic, $parameter, $p.value
      expect(d.statistic).toBeCloseTo(c.statistic, 10);
      expect(d.df).toBe(c.df);
      expect(d.p).toBeCloseTo(c.p, 10);
    });
  }
  it('Kolmogorov-Smirnov on sorted values: small_ties (R exact)', () => {
    const c = R.ks.small_ties!;
    const d = numericDrift(Float64Array.from(c.x).sort(), Float64Array.from(c.y).sort(), DEFAULT_THRESHOLDS);
    expect(d.statistic).toBeCloseTo(c.statistic, 12);
    expect(d.p).toBeCloseTo(c.p, 10);
    expect(d.method).toBe('exact');
  });
  it('flags only when p is below and PSI at or above their thresholds', () => {
    // R with_new_code: p = 0.000124; its PSI (from the definition) is about 0.6 because of the new code.
    const c = R.chisq.with_new_code!;
    expect(codedDrift(c.previous, c.current, { p: 0.01, psi: 0.1 }).flagged).toBe(true);
    expect(codedDrift(c.previous, c.current, { p: 1e-5, psi: 0.1 }).flagged).toBe(false);
    expect(codedDrift(c.previous, c.current, { p: 0.01, psi: 5 }).flagged).toBe(false);
  });
  it('thresholds: one sentence for a bad value', () => {
    expect(() => normalizeThresholds({ psi: '-1' })).toThrow('--drift-psi takes a positive number, got -1.');
    expect(normalizeThresholds({ p: '0.05' })).toEqual({ p: 0.05, psi: 0.1 });
  });
});

describe('compareSnapshots', () => {
  const before = snap({
    file: 'w1.csv',
    items: {
      district: { level: 'nominal', valid: 3, invalid: 0, missing: {}, codes: { '1': 2, '2': 1, '3': 0 } },
      income: { level: 'ratio', valid: 2, invalid: 0, missing: { refused: 1 }, values: null },
    },
    groups: { team: { A: { rows: 2, cells: 6, missingCells: 1, invalidCells: 0, missing: { income: { refused: 1 } } }, B: { rows: 1, cells: 3, missingCells: 0, invalidCells: 1, missing: {} } } },
    records: records(['r1', 'r2', 'r3'], [['1', '-9'], ['1', '200'], ['2', '150']], ['A', 'A', 'B']),
  });
  const after = snap({
    file: 'w2.csv',
    items: {
      district: { level: 'nominal', valid: 3, invalid: 0, missing: {}, codes: { '1': 2, '2': 0, '3': 1 } },
      income: { level: 'ratio', valid: 1, invalid: 0, missing: { refused: 1, 'dont-know': 1 }, values: Float64Array.from([90]) },
    },
    groups: { team: { A: { rows: 2, cells: 6, missingCells: 2, invalidCells: 2, missing: { income: { refused: 1, 'dont-know': 1 } } }, C: { rows: 1, cells: 3, missingCells: 0, invalidCells: 0, missing: {} } } },
    records: records(['r1', 'r2', 'r4'], [['1', '-9'], ['1', '-8'], ['3', '90']], ['A', 'A', 'C']),
  });
  const c = compareSnapshots(before, after);

  it('records: added, removed, changed with their items, by first principles', () => {
    // Current-file order for added and changed, then the removed in previous-file order.
    expect(c.json.records).toEqual({ idItem: 'hh', added: 1, removed: 1, changed: 1, unchanged: 1, byItem: { income: 1 } });
    expect(c.changes).toEqual([
      { id: 'r2', change: 'changed', items: ['income'], groups: { team: 'A' } },
      { id: 'r4', change: 'added', items: [], groups: { team: 'C' } },
      { id: 'r3', change: 'removed', items: [], groups: { team: 'B' } },
    ]);
    expect(recordsCsv(c.changes, ['team'])).toBe('\ufeffid,change,items,team\r\nr2,changed,income,A\r\nr4,added,,C\r\nr3,removed,,B\r\n');
  });

  it('codes that appear and disappear, missing kinds before and after, overall and by group', () => {
    expect(c.json.items.district!.newCodes).toEqual(['3']);
    expect(c.json.items.district!.goneCodes).toEqual(['2']);
    expect(c.json.items.income!.missing).toEqual({ 'dont-know': { previous: 0, current: 1 }, refused: { previous: 1, current: 1 } });
    expect(c.json.items.income!.missingByGroup).toEqual({ A: { 'dont-know': { previous: 0, current: 1 }, refused: { previous: 1, current: 1 } } });
    expect(c.json.items.income!.drift).toBeNull();
    expect(c.json.items.income!.driftNote).toMatch(/earlier ledger schema/);
  });

  it('groups: missing share of cells and error cells, and each group\'s own records', () => {
    expect(c.json.groupItem).toBe('team');
    expect(c.json.groups.A).toEqual({ rows: { previous: 2, current: 2 }, missingPercent: { previous: 100 / 6, current: 200 / 6 }, errors: { previous: 0, current: 2 }, records: { added: 0, removed: 0, changed: 1 } });
    expect(c.json.groups.B!.missingPercent).toEqual({ previous: 0, current: null });
    expect(c.json.groups.C!.records).toEqual({ added: 1, removed: 0, changed: 0 });
  });

  it('no records on one side: a note instead of counts', () => {
    const x = compareSnapshots({ ...before, records: null }, after);
    expect(x.json.records).toBeNull();
    expect(x.json.recordsNote).toMatch(/records cannot be matched/);
  });
});
