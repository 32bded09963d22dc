import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, it, expect } from 'vitest';
import { parseCodebook, type CompiledCodebook } from '@codeweir/codebook';
import { checkFile } from '../src/index.ts';
import { codebook, run, where } from './helpers.ts';

const ref = (f: string): string => fileURLToPath(new URL(`../../../test/reference/${f}`, import.meta.url));
function load(f: string): CompiledCodebook {
  const r = parseCodebook(readFileSync(ref(f), 'utf8'), f);
  if (!r.ok) throw new Error(JSON.stringify(r.problems));
  return r.codebook;
}

const items = [
  { name: 'id', label: 'Record', role: 'id', type: 'integer' },
  { name: 'district', label: 'District', role: 'group', type: 'integer', level: 'nominal', codes: [1, 2, 3].map((c) => ({ code: c, label: `D${c}` })) },
  { name: 'ea', label: 'Enumeration area', role: 'group', type: 'text' },
  { name: 'wt', label: 'Weight', role: 'weight', type: 'decimal', level: 'ratio', missing: [{ code: -9, kind: 'omitted' }] },
];

describe('design findings', () => {
  it('flags a single-cluster stratum, a cluster in two strata and records without a usable weight', async () => {
    const cb = codebook(items, { design: { strata: 'district', cluster: 'ea' } });
    const rows = [
      ['1', '1', 'A', '2'],
      ['2', '1', 'B', '2'],
      ['3', '2', 'C', '0'],
      ['4', '2', 'C', '-9'],
      ['5', '3', 'B', '-1.5'],
      ['6', '3', 'B', ''],
    ];
    const r = await run(cb, rows);
    // District 2 has only cluster C; district 3 only cluster B (which district 1 also has).
    expect(r.findings.filter((f) => f.rule === 'lone-cluster-stratum').map((f) => f.value)).toEqual(['2', '3']);
    expect(r.findings.filter((f) => f.rule === 'cluster-across-strata').map((f) => [f.item, f.value])).toEqual([['ea', 'B']]);
    expect(where(r, 'weight-not-positive')).toEqual([[3, 'wt'], [4, 'wt'], [5, 'wt'], [6, 'wt']]);
    expect(r.findings.find((f) => f.row === 5 && f.rule === 'weight-not-positive')!.value).toBe('-1.5');
    expect(r.summary.findings.byRule['weight-not-positive']).toBe(4);
    expect(r.summary.items.wt!.findings['weight-not-positive']).toBe(4);
    expect(r.summary.items.district!.findings['lone-cluster-stratum']).toBe(2);
  });

  it('counts every row finding but keeps only the first per rule under the cap', async () => {
    const cb = codebook(items, { design: { weight: 'wt' } });
    const rows = Array.from({ length: 10 }, (_, i) => [String(i + 1), '1', 'A', '0']);
    const r = await run(cb, rows, { maxFindingsPerRule: 3 });
    expect(r.summary.findings.byRule['weight-not-positive']).toBe(10);
    expect(where(r, 'weight-not-positive')).toHaveLength(3);
  });

  it('no design, no design findings (a weight item alone does not ask for them)', async () => {
    const r = await run(codebook(items), [['1', '1', 'A', '0']]);
    expect(r.summary.findings.byRule['weight-not-positive']).toBeUndefined();
  });

  // Outside reference: R's survey::svydesign(id = ~psu, strata = ~stratum) on its nhanes data
  // refuses the design with "Clusters not nested in strata" unless nest = TRUE, since PSU
  // numbers 1 and 2 recur in every stratum; with stratum 75's PSU 2 removed, svymean fails with
  // "Stratum (75) has only one PSU" under survey.lonely.psu = "fail" (see survey-design.R).
  it('nhanes: PSU numbers reused across strata, and the stratum left with one PSU', async () => {
    const cb = load('survey-nhanes.codebook.json');
    const full = await checkFile(ref('survey-nhanes.csv'), cb, { threads: 1 });
    expect(full.findings.filter((f) => f.rule === 'cluster-across-strata').map((f) => f.value).sort()).toEqual(['1', '2']);
    expect(full.summary.findings.byRule['lone-cluster-stratum']).toBeUndefined();
    const lonely = await checkFile(ref('survey-nhanes-lonely.csv'), cb, { threads: 1 });
    expect(lonely.findings.filter((f) => f.rule === 'lone-cluster-stratum').map((f) => f.value)).toEqual(['75']);
  });
});

describe('design parts are kept without retained coded items', () => {
  it('finds the nhanes lonely stratum with retainCoded false (as codeweir check runs)', async () => {
    const cb = load('survey-nhanes.codebook.json');
    const r = await checkFile(ref('survey-nhanes-lonely.csv'), cb, { threads: 1, retainCoded: false });
    expect(r.findings.filter((f) => f.rule === 'lone-cluster-stratum').map((f) => f.value)).toEqual(['75']);
    expect(r.store.columns.race).toBeUndefined();
  });
});
