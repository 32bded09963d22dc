/**
 * Hand-built inputs for the report: a small invented household survey (field teams in the
 * districts of an invented country), typed by the check, describe and codebook contracts. The
 * numbers are inputs to render, not results to prove: tests assert how they are shown.
 * `hostile()` puts markup and script into every string that comes from a codebook or a delivery.
 */
import { parseCodebook, type CompiledCodebook } from '@codeweir/codebook';
import type { CheckResult, ColumnStore, Finding } from '@codeweir/check';
import type { DescribeResult } from '@codeweir/describe';
import type { ReportInput } from '../src/index.ts';

/** Markup that must stay text: each would run script if it reached the page unescaped. */
export const PAYLOADS = ['<script>window.__pwned=1</script>', '<img src=x onerror="window.__pwned=2">', '"><svg onload="window.__pwned=3">'] as const;

interface Words {
  title: string;
  teamLabel: (i: number) => string;
  sexLabel: string;
  eduLabels: string[];
  question: string;
  unit: string;
  ruleMessage: string;
  findingValue: string;
  findingMessage: string;
  findingId: string;
  reason: string;
  convention: string;
  unexpectedColumn: string;
  ageName: string;
}

const PLAIN: Words = {
  title: 'Hollow Reach Household Panel (fictional)',
  teamLabel: (i) => ['North Reach', 'Lowmarsh', 'Kestrel Hills'][i]!,
  sexLabel: 'Female',
  eduLabels: ['None', 'Primary', 'Secondary', 'Tertiary'],
  question: 'How old were you at your last birthday?',
  unit: 'years',
  ruleMessage: 'A respondent under 15 cannot head the household.',
  findingValue: 'forty',
  findingMessage: '"forty" in age is not a number nor a declared missing code.',
  findingId: 'H-0007',
  reason: 'nominal codes have no arithmetic meaning',
  convention: 'sample standard deviation with n - 1 denominator (ddof = 1)',
  unexpectedColumn: 'interviewer_note',
  ageName: 'age',
};

const HOSTILE: Words = {
  title: `Panel ${PAYLOADS[0]}`,
  teamLabel: (i) => `${PAYLOADS[i % 3]} team ${i + 1}`,
  sexLabel: PAYLOADS[1],
  eduLabels: [PAYLOADS[0], PAYLOADS[1], PAYLOADS[2], 'Tertiary & more'],
  question: PAYLOADS[2],
  unit: PAYLOADS[1],
  ruleMessage: PAYLOADS[0],
  findingValue: PAYLOADS[1],
  findingMessage: PAYLOADS[2],
  findingId: PAYLOADS[0],
  reason: PAYLOADS[1],
  convention: PAYLOADS[2],
  unexpectedColumn: PAYLOADS[0],
  ageName: `age${PAYLOADS[2]}`,
};

function codebookJson(w: Words) {
  return {
    codebook: 'hollow-reach-panel',
    version: '0.3.1',
    title: w.title,
    missingSets: { std: [{ code: -9, kind: 'refused', label: 'Refused' }, { code: -7, kind: 'not-applicable', label: 'Valid skip' }] },
    items: [
      { name: 'hh_id', label: 'Household', role: 'id', type: 'text' },
      { name: 'team', label: 'Field team', role: 'group', type: 'integer', level: 'nominal', codes: [0, 1, 2].map((i) => ({ code: i + 1, label: w.teamLabel(i) })) },
      { name: 'sex', label: 'Sex', type: 'integer', level: 'nominal', codes: [{ code: 1, label: w.sexLabel }, { code: 2, label: 'Male' }], missing: 'std' },
      { name: 'edu', label: 'Schooling', type: 'integer', level: 'ordinal', codes: w.eduLabels.map((label, i) => ({ code: i + 1, label })), missing: 'std' },
      { name: w.ageName, label: 'Age', text: w.question, type: 'integer', level: 'ratio', unit: w.unit, range: { min: 0, max: 120 }, missing: 'std' },
      { name: 'visit_date', label: 'Date of visit', type: 'date', level: 'interval' },
      {
        name: 'trips',
        label: 'Market trips',
        type: 'integer',
        level: 'ordinal',
        codes: [
          { code: 1, label: 'none', bin: { min: 0, max: 0 } },
          { code: 2, label: '1 to 3', bin: { min: 1, max: 3 } },
          { code: 3, label: '4 or more', bin: { min: 4 } },
        ],
      },
      { name: 'remarks', label: 'Remarks', type: 'text' },
    ],
    rules: [{ id: 'head-age', test: `${JSON.stringify(w.ageName) === JSON.stringify('age') ? 'age' : 'sex'} >= 1`, severity: 'warning', message: w.ruleMessage }],
  };
}

/** Compiles a fixture codebook with the real compiler, so the report sees a real CompiledCodebook. */
function compile(json: unknown): CompiledCodebook {
  const r = parseCodebook(JSON.stringify(json), 'fixture.codebook.json');
  if (!r.ok) throw new Error(`fixture codebook does not compile: ${r.problems.map((p) => `${p.path} ${p.message}`).join('; ')}`);
  return r.codebook;
}

const ROWS = 12;
// Retained columns of 12 rows: NaN / 0 where the cell is not valid.
const AGE = [34, 41, 29, NaN, 52, 38, 47, 33, 91, 36, 40, 44];
const DATE = [20514, 20515, 20515, 20516, 20518, 20519, 20520, 20520, 20521, 20522, 20523, 20524];
const TEAM = [1, 1, 1, 1, 2, 2, 2, 2, 3, 3, 3, 3];
const SEX = [1, 2, 1, 2, 1, 2, 0, 2, 1, 2, 1, 2];
const EDU = [2, 3, 3, 1, 4, 2, 3, 3, 1, 2, 4, 3];

function store(ageName: string): ColumnStore {
  return {
    rows: ROWS,
    columns: {
      team: { kind: 'coded', item: 'team', codes: Uint16Array.from(TEAM) },
      sex: { kind: 'coded', item: 'sex', codes: Uint16Array.from(SEX) },
      edu: { kind: 'coded', item: 'edu', codes: Uint16Array.from(EDU) },
      [ageName]: { kind: 'numeric', item: ageName, values: Float64Array.from(AGE) },
      visit_date: { kind: 'numeric', item: 'visit_date', values: Float64Array.from(DATE) },
    },
  };
}

function check(w: Words, accepted: boolean): CheckResult {
  const findings: Finding[] = [
    // `groups` is the row's team code (TEAM below): rows 4, 7 and 9 are in teams 1, 2 and 3.
    { row: 4, id: w.findingId, item: w.ageName, value: w.findingValue, rule: 'not-a-number', severity: 'error', message: w.findingMessage, groups: { team: '1' } },
    { row: 9, id: 'H-0009', item: w.ageName, value: '91', rule: 'outlier', severity: 'info', message: '91 in age lies beyond the inner fence.', groups: { team: '3' } },
    { row: 7, id: 'H-0007', item: 'trips', value: '6', rule: 'unbinned-value', severity: 'error', message: 'trips is binned but holds the raw quantity 6.', suggestion: '3', groups: { team: '2' } },
  ];
  const errors = accepted ? 0 : 2;
  const shown = accepted ? findings.filter((f) => f.severity !== 'error') : findings;
  return {
    summary: {
      codebook: { codebook: 'hollow-reach-panel', version: '0.3.1' },
      rows: ROWS,
      header: { missing: [], unexpected: [w.unexpectedColumn], duplicate: [] },
      findings: {
        total: shown.length,
        byRule: accepted ? { outlier: 1 } : { 'not-a-number': 1, 'unbinned-value': 1, outlier: 1 },
        bySeverity: { error: errors, warning: 0, info: 1 },
      },
      items: {
        hh_id: { valid: 12, invalid: 0, missing: {}, findings: {} },
        team: { valid: 12, invalid: 0, missing: {}, findings: {} },
        sex: { valid: 11, invalid: 0, missing: { refused: 1 }, findings: {} },
        edu: { valid: 12, invalid: 0, missing: {}, findings: {} },
        [w.ageName]: { valid: 11, invalid: 1, missing: {}, findings: accepted ? { outlier: 1 } : { 'not-a-number': 1, outlier: 1 } },
        visit_date: { valid: 12, invalid: 0, missing: {}, findings: {} },
        trips: { valid: 11, invalid: 1, missing: {}, findings: accepted ? {} : { 'unbinned-value': 1 } },
        remarks: { valid: 2, invalid: 0, missing: { blank: 10 }, findings: {} },
      },
      groups: {
        team: {
          '1': { sex: { valid: 4, invalid: 0, missing: {} }, [w.ageName]: { valid: 3, invalid: 1, missing: {} } },
          '2': { sex: { valid: 3, invalid: 0, missing: { refused: 1 } }, [w.ageName]: { valid: 4, invalid: 0, missing: {} } },
          '3': { sex: { valid: 4, invalid: 0, missing: {} }, [w.ageName]: { valid: 4, invalid: 0, missing: {} } },
        },
      },
      rules: { 'head-age': { passed: 10, failed: 0, undetermined: 2 } },
      recordMissing: [9, 3],
      accepted,
    },
    findings: shown,
    store: store(w.ageName),
  };
}

function describeResult(w: Words): DescribeResult {
  const eduCounts = [2, 3, 5, 2];
  return {
    quantileType: 7,
    rows: ROWS,
    items: {
      team: {
        level: 'nominal',
        label: 'Field team',
        n: 12,
        missing: {},
        invalid: 0,
        order: 'code',
        frequencies: [0, 1, 2].map((i) => ({ code: i + 1, label: w.teamLabel(i), count: 4, percent: 100 / 3 })),
        mode: [1, 2, 3],
        withheld: { median: 'nominal categories have no order', mean: w.reason },
      },
      sex: {
        level: 'nominal',
        label: 'Sex',
        n: 11,
        missing: { refused: 1 },
        invalid: 0,
        order: 'code',
        // Deliberately out of code order: the report orders bars by the codebook.
        frequencies: [
          { code: 2, label: 'Male', count: 6, percent: (100 * 6) / 11 },
          { code: 1, label: w.sexLabel, count: 5, percent: (100 * 5) / 11 },
        ],
        mode: [2],
        withheld: { mean: w.reason, median: 'nominal categories have no order' },
      },
      edu: {
        level: 'ordinal',
        label: 'Schooling',
        n: 12,
        missing: {},
        invalid: 0,
        order: 'scale',
        frequencies: w.eduLabels.map((label, i) => ({ code: i + 1, label, count: eduCounts[i]!, percent: (100 * eduCounts[i]!) / 12, cumulativePercent: (100 * eduCounts.slice(0, i + 1).reduce((a, b) => a + b, 0)) / 12 })),
        mode: [3],
        medianCode: { code: 3, label: w.eduLabels[2]! },
        q1Code: { code: 2, label: w.eduLabels[1]! },
        q3Code: { code: 3, label: w.eduLabels[2]! },
        iqr: 1,
        withheld: { mean: 'ordinal codes are ranks, not quantities' },
        conventions: { ordinalQuantiles: 'Hyndman-Fan type 1 on scale positions' },
      },
      [w.ageName]: {
        level: 'ratio',
        label: 'Age',
        unit: w.unit,
        n: 11,
        missing: {},
        invalid: 1,
        median: 40,
        q1: 35,
        q3: 45.5,
        iqr: 10.5,
        mean: 44.09,
        sd: 16.4,
        min: 29,
        max: 91,
        range: 62,
        fences: { lower: 19.25, upper: 61.25, lowerExtreme: 3.5, upperExtreme: 77 },
        outliers: 0,
        extremes: 1,
        histogram: { rule: 'Freedman-Diaconis', edges: [29, 39, 49, 59, 69, 79, 89, 99], counts: [4, 5, 1, 0, 0, 0, 1] },
        withheld: { frequencies: 'a frequency table of a ratio item is given as a histogram' },
        conventions: { quantileType: 'Hyndman-Fan type 7 sample quantiles', sd: w.convention },
      },
      visit_date: {
        level: 'interval',
        label: 'Date of visit',
        n: 12,
        missing: {},
        invalid: 0,
        median: 20519.5,
        q1: 20515.75,
        q3: 20521.25,
        iqr: 5.5,
        mean: 20518.92,
        sd: 3.15,
        min: 20514,
        max: 20524,
        range: 10,
        fences: { lower: 20507.5, upper: 20529.5, lowerExtreme: 20499.25, upperExtreme: 20537.75 },
        outliers: 0,
        extremes: 0,
        withheld: { cv: 'the scale has no absolute zero' },
      },
      trips: {
        level: 'ordinal',
        label: 'Market trips',
        binned: true,
        n: 11,
        missing: {},
        invalid: 1,
        frequencies: [
          { code: 1, label: 'none', count: 2, percent: (100 * 2) / 11, cumulativePercent: (100 * 2) / 11 },
          { code: 2, label: '1 to 3', count: 6, percent: (100 * 6) / 11, cumulativePercent: (100 * 8) / 11 },
          { code: 3, label: '4 or more', count: 3, percent: (100 * 3) / 11, cumulativePercent: 100 },
        ],
        medianCode: { code: 2, label: '1 to 3' },
        q1Code: { code: 2, label: '1 to 3' },
        q3Code: { code: 3, label: '4 or more' },
        iqr: 1,
        groupedMedian: 2.33,
        withheld: {},
      },
      remarks: { level: 'text', label: 'Remarks', n: 2, missing: { blank: 10 }, invalid: 0, withheld: { median: 'text has no order' } },
    },
    pairs: [
      {
        x: 'sex',
        y: 'edu',
        kind: 'categorical-categorical',
        n: 11,
        rows: [{ code: 1, label: w.sexLabel }, { code: 2, label: 'Male' }],
        columns: w.eduLabels.map((label, i) => ({ code: i + 1, label })),
        table: [[1, 1, 2, 1], [1, 1, 3, 1]],
        expected: [[0.91, 0.91, 2.27, 0.91], [1.09, 1.09, 2.73, 1.09]],
        rowPercent: [[20, 20, 40, 20], [100 / 6, 100 / 6, 50, 100 / 6]],
        columnPercent: [[50, 50, 40, 50], [50, 50, 60, 50]],
        cellPercent: [[100 / 11, 100 / 11, 200 / 11, 100 / 11], [100 / 11, 100 / 11, 300 / 11, 100 / 11]],
        chiSquare: 0.12,
        df: 3,
        p: 0.989,
        cramersV: 0.104,
        phi: null,
        lowExpectedPercent: 100,
        warnings: ['All 8 expected counts are below 5: the chi-square approximation is unreliable.'],
      },
      {
        x: w.ageName,
        y: 'visit_date',
        kind: 'continuous-continuous',
        n: 11,
        pearson: 0.21,
        spearman: 0.25,
        bivariateOutliers: [9],
        mahalanobisCutoff: 13.82,
        notes: [],
      },
      {
        x: 'team',
        y: w.ageName,
        kind: 'categorical-continuous',
        n: 11,
        groups: [0, 1, 2].map((i) => ({ code: i + 1, label: w.teamLabel(i), n: i === 0 ? 3 : 4, mean: 40, sd: 5, median: 38, q1: 33, q3: 45, fences: { lower: 15, upper: 63, lowerExtreme: -3, upperExtreme: 81 }, outliers: 0, extremes: i === 2 ? 1 : 0 })),
        etaSquared: 0.18,
      },
    ],
    conventions: { sd: w.convention, percent: 'percent of valid cells (0 to 100)' },
  };
}

/** The report input for the fixture survey; `accepted` drops the error findings. */
export function fixture(options: { hostile?: boolean; accepted?: boolean } = {}): ReportInput {
  const w = options.hostile ? HOSTILE : PLAIN;
  return {
    codebook: compile(codebookJson(w)),
    check: check(w, options.accepted ?? false),
    describe: describeResult(w),
    file: options.hostile ? `deliveries/${PAYLOADS[1]}.csv` : 'deliveries/wave-3.csv',
    generatedAt: '2026-11-30T12:00:00Z',
  };
}

/** The fixture's words, for assertions. */
export const WORDS = { plain: PLAIN, hostile: HOSTILE };
