import { readFileSync } from 'node:fs';
import { describe as suite, it, expect } from 'vitest';
import { parseCodebook, type CompiledCodebook } from '@codeweir/codebook';
import { checkFile, type CheckResult } from '@codeweir/check';
import { describe } from '../src/describe.ts';
import { describeParallel } from '../src/parallel.ts';
import type { DescribeResult, Interval } from '../src/types.ts';
import { referenceFile, surveyReference, type SurveyCase } from '../../../test/reference/survey-design.ts';

// Oracle: R's survey package (svydesign; svymean deff = TRUE; confint df = degf; svyciprop
// method = "logit"; domains by subset designs, as svyby) on its apistrat, apiclus1 and nhanes
// samples: test/reference/survey-design.R wrote the CSVs and survey-design.json.
const ref = referenceFile;
const reference = surveyReference;

function load(f: string): CompiledCodebook {
  const r = parseCodebook(readFileSync(ref(f), 'utf8'), f);
  if (!r.ok) throw new Error(JSON.stringify(r.problems));
  return r.codebook;
}
const codebooks: Record<string, string> = {
  'survey-apistrat.csv': 'survey-apistrat.codebook.json',
  'survey-apiclus1.csv': 'survey-apiclus1.codebook.json',
  'survey-nhanes.csv': 'survey-nhanes.codebook.json',
  'survey-nhanes-lonely.csv': 'survey-nhanes.codebook.json',
};

const close = (actual: number | null | undefined, expected: number, rel = 1e-9): void => {
  expect(actual).not.toBeNull();
  expect(Math.abs(actual! - expected)).toBeLessThanOrEqual(rel * Math.max(1, Math.abs(expected)));
};
const at = <T>(v: T | Record<string, T> | undefined, code: string | undefined): T => (code === undefined ? (v as T) : (v as Record<string, T>)[code]!);

async function run(c: SurveyCase): Promise<{ out: DescribeResult; res: CheckResult; cb: CompiledCodebook }> {
  const base = load(codebooks[c.file]!);
  // The case's design replaces the codebook's (some cases leave the fpc out).
  const cb: CompiledCodebook = { ...base, design: { ...c.design } };
  const res = await checkFile(ref(c.file), cb, { threads: 1 });
  const by = c.estimates.find((e) => e.by)?.by;
  return { out: describe(res, cb, by ? { by } : {}), res, cb };
}

suite('describe with a sample design against R survey', () => {
  for (const c of reference.cases) {
    it(c.name, async () => {
      const { out } = await run(c);
      let compared = 0;
      for (const e of c.estimates) {
        const d = out.items[e.item]!;
        // R's mean of the 0/1 item hi_chol is its percent of code 1 here (a nominal item has no mean).
        if (e.kind === 'mean' && d.level === 'nominal') continue;
        const fig = e.by === undefined ? d.weighted! : d.domains![String(e.domain)]!;
        const code = e.kind === 'percent' ? String(e.code) : undefined;
        const scale = e.kind === 'percent' ? 100 : 1;
        expect(fig.n).toBe(e.n);
        expect(fig.df).toBe(e.df);
        close(e.kind === 'mean' ? fig.mean : fig.percent![code!], scale * e.estimate);
        close(e.kind === 'mean' ? (fig.se as number) : fig.percentSe![code!], scale * e.se);
        const deff = at(fig.deff, code);
        const nEff = at(fig.nEffective, code);
        if (typeof e.deff === 'number') {
          close(deff, e.deff);
          close(nEff, e.n / e.deff);
        } else {
          expect(deff).toBeNull();
        }
        const ci = at<Interval | null>(fig.ci as Interval | Record<string, Interval | null>, code)!;
        // svyciprop fits its logit interval by iterated weighted least squares (glm's convergence
        // tolerance 1e-8), so R gives it to about 7 significant digits.
        close(ci.low, scale * e.ciLow, 1e-6);
        close(ci.high, scale * e.ciHigh, 1e-6);
        expect(ci.method).toMatch(e.kind === 'percent' ? /^logit, t on \d+ design degrees of freedom$/ : /^t on/);
        compared++;
      }
      expect(compared).toBeGreaterThan(c.estimates.length * 0.8);
    });
  }

  it('reports the design, its single-cluster stratum and conventions in the JSON', async () => {
    const c = reference.cases.find((x) => x.file === 'survey-nhanes-lonely.csv')!;
    const { out } = await run(c);
    expect(out.design).toMatchObject({ weight: 'wt', strata: 'stratum', cluster: 'psu', fpc: null, by: 'sex', strataCount: 15, clusters: 30, df: 15, excludedRows: 0 });
    expect(out.design!.singleCluster.strata).toEqual(['75']);
    expect(out.design!.singleCluster.note).toMatch(/Stratum 75 has a single cluster/);
    expect(out.conventions.designEffect).toMatch(/without replacement/);
    expect(out.conventions.designInterval).toMatch(/logit/);
  });

  it('a design with fpc reads population counts; the parallel describe gives the same result', async () => {
    const c = reference.cases[0]!;
    const { out, res, cb } = await run(c);
    expect(out.design!.fpcAs).toBe('population count');
    const par = await describeParallel(res, cb, { by: 'comp_imp' }, { threads: 2, minRows: 1 });
    expect(JSON.stringify(par)).toBe(JSON.stringify(out));
  });
});

suite('design options', () => {
  it('without a design nothing changes: no design block, no standard errors', async () => {
    const base = load('survey-apistrat.codebook.json');
    const cb: CompiledCodebook = { ...base };
    delete (cb as { design?: unknown }).design;
    const res = await checkFile(ref('survey-apistrat.csv'), cb, { threads: 1 });
    const out = describe(res, cb);
    expect(out.design).toBeUndefined();
    expect(out.items.api00!.weighted!.se).toBeUndefined();
    expect(out.conventions.designVariance).toBeUndefined();
    // The same with --strata given: design-based (first principles: options stand for the codebook's design).
    const withStrata = describe(res, cb, { strata: 'stype', fpc: 'fpc' });
    const r = reference.cases[0]!.estimates.find((e) => e.item === 'api00' && !e.by)!;
    close(withStrata.items.api00!.weighted!.se as number, r.se);
  });

  it('names unknown or unusable design items in one sentence', async () => {
    const cb = load('survey-apistrat.codebook.json');
    const res = await checkFile(ref('survey-apistrat.csv'), cb, { threads: 1 });
    expect(() => describe(res, cb, { strata: 'nope' })).toThrow(/--strata names "nope", which is not an item of the codebook/);
    expect(() => describe(res, cb, { fpc: 'awards' })).toThrow(/--fpc names "awards", which is not a number/);
    expect(() => describe(res, cb, { by: '' })).toThrow(/--by takes an item name/);
  });
});
