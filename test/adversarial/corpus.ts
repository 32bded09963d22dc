/**
 * The adversarial corpus: deliveries and codebooks that arrive broken, hostile or odd. Made by
 * a seeded script (same bytes every run), each case with the outcome the contract requires.
 * The cases are written to a folder and driven through the CLI by adversarial.test.ts.
 */
import { Buffer } from 'node:buffer';
import { seededRandom } from '@codeweir/core';

export { seededRandom as seeded };

export const corpusCodebook = {
  codebook: 'corpus-check',
  version: '1',
  title: 'Adversarial corpus codebook',
  missingSets: { std: [{ code: -9, kind: 'refused', label: 'Refused' }] },
  items: [
    { name: 'rid', label: 'Record id', role: 'id', type: 'integer' },
    {
      name: 'team',
      label: 'Field team',
      role: 'group',
      type: 'integer',
      level: 'nominal',
      codes: [
        { code: 1, label: 'North' },
        { code: 2, label: 'South' },
      ],
    },
    {
      name: 'place',
      label: 'Place',
      type: 'text',
      level: 'nominal',
      codes: [
        { code: 'Mühlental', label: 'Mühlental' },
        { code: 'Seeweg', label: 'Seeweg' },
      ],
    },
    { name: 'rooms', label: 'Rooms', type: 'integer', level: 'ratio', range: { min: 1, max: 30 }, missing: 'std' },
    { name: 'remark', label: 'Remark', type: 'text' },
  ],
};

export const HEADER = ['rid', 'team', 'place', 'rooms', 'remark'];

/** Clean rows from the seeded generator: every cell valid or a declared missing code. */
export function cleanRows(rand: () => number, n: number): string[][] {
  const rows: string[][] = [];
  for (let i = 0; i < n; i++) {
    rows.push([
      String(i + 1),
      String(1 + Math.floor(rand() * 2)),
      rand() < 0.5 ? 'Mühlental' : 'Seeweg',
      rand() < 0.05 ? '-9' : String(1 + Math.floor(rand() * 8)),
      rand() < 0.3 ? 'roof, "leaking"' : '',
    ]);
  }
  return rows;
}

function quote(field: string, delimiter: string): string {
  return /["\r\n]/.test(field) || field.includes(delimiter) ? `"${field.replace(/"/g, '""')}"` : field;
}

export function toCsv(header: string[], rows: string[][], delimiter = ',', eol: string | ((i: number) => string) = '\n'): string {
  const end = typeof eol === 'string' ? () => eol : eol;
  const lines = [header, ...rows].map((r) => r.map((f) => quote(f, delimiter)).join(delimiter));
  return lines.map((l, i) => l + end(i)).join('');
}

/** What a case must produce. */
export interface Expectation {
  exit: 0 | 1 | 2;
  /** Every pattern must occur in stderr (the one clear sentence: file, line, column or path). */
  stderr?: RegExp[];
  /** Check the `--json` summary. */
  summary?: (s: any) => void;
  /** Outputs expected in --out when the run read the file. */
  outputs?: boolean;
}

export interface CorpusCase {
  name: string;
  /** The data file (relative to the case folder); absent for codebook-only cases. */
  data?: { file: string; bytes: Buffer };
  /** Codebook text; the corpus codebook when absent. */
  codebook?: string;
  command: 'check' | 'lint';
  extraArgs?: string[];
  /** Data path to pass instead of a written file (a path that does not exist, a folder). */
  path?: 'missing' | 'directory';
  expect: Expectation;
}

export function makeCorpus(seed = 20261201): CorpusCase[] {
  const rand = seededRandom(seed);
  const rows = cleanRows(rand, 200);
  const cb = JSON.stringify(corpusCodebook, null, 2);
  const utf8 = (s: string) => Buffer.from(s, 'utf8');
  const cases: CorpusCase[] = [];

  cases.push({ name: 'clean', data: { file: 'clean.csv', bytes: utf8(toCsv(HEADER, rows)) }, command: 'check', expect: { exit: 0, outputs: true, summary: (s) => { if (s.rows !== 200) throw new Error(`rows ${s.rows}`); } } });
  cases.push({ name: 'empty file', data: { file: 'empty.csv', bytes: Buffer.alloc(0) }, command: 'check', expect: { exit: 2, stderr: [/empty\.csv/, /empty/i] } });
  cases.push({
    name: 'header only',
    data: { file: 'header-only.csv', bytes: utf8(HEADER.join(',') + '\n') },
    command: 'check',
    expect: { exit: 0, outputs: true, summary: (s) => { if (s.rows !== 0) throw new Error(`rows ${s.rows}`); if (!s.findings.byRule['no-rows']) throw new Error('no no-rows warning'); } },
  });
  {
    // An unclosed quote opening on data row 150: physical line 151 (the header is line 1). No
    // later field holds a quote, so nothing closes it before the end of the file.
    const broken = rows.map((r, i) => (i >= 149 ? [...r.slice(0, 4), ''] : [...r]));
    broken[149][4] = '\u0000QUOTE';
    const text = toCsv(HEADER, broken).replace('\u0000QUOTE', '"never closed');
    cases.push({ name: 'unclosed quote', data: { file: 'unclosed.csv', bytes: utf8(text) }, command: 'check', expect: { exit: 2, stderr: [/unclosed\.csv/, /line 151/] } });
  }
  {
    const ragged = rows.map((r) => [...r]);
    const picked = new Set<number>();
    while (picked.size < 7) picked.add(Math.floor(rand() * ragged.length));
    let k = 0;
    for (const i of picked) ragged[i] = k++ % 2 === 0 ? ragged[i].slice(0, 3) : [...ragged[i], 'extra'];
    cases.push({
      name: 'ragged rows',
      data: { file: 'ragged.csv', bytes: utf8(toCsv(HEADER, ragged)) },
      command: 'check',
      expect: { exit: 1, outputs: true, summary: (s) => { if (s.findings.byRule['ragged-row'] !== 7) throw new Error(`ragged-row ${s.findings.byRule['ragged-row']}`); } },
    });
  }
  cases.push({ name: 'UTF-8 BOM', data: { file: 'bom.csv', bytes: Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), utf8(toCsv(HEADER, rows))]) }, command: 'check', expect: { exit: 0, summary: (s) => { if (s.header.missing.length || s.header.unexpected.length) throw new Error('BOM leaked into the header'); } } });
  cases.push({ name: 'semicolon delimiter', data: { file: 'semicolon.csv', bytes: utf8(toCsv(HEADER, rows, ';')) }, command: 'check', expect: { exit: 0, summary: (s) => { if (s.rows !== 200) throw new Error(`rows ${s.rows}`); } } });
  cases.push({ name: 'mixed CRLF and LF', data: { file: 'mixed-eol.csv', bytes: utf8(toCsv(HEADER, rows, ',', (i) => (i % 3 === 0 ? '\r\n' : '\n'))) }, command: 'check', expect: { exit: 0, summary: (s) => { if (s.rows !== 200 || s.items.remark.invalid !== 0) throw new Error(`rows ${s.rows}`); } } });
  cases.push({
    name: 'Latin-1 with --encoding latin1',
    data: { file: 'latin1.csv', bytes: Buffer.from(toCsv(HEADER, rows), 'latin1') },
    command: 'check',
    extraArgs: ['--encoding', 'latin1'],
    expect: { exit: 0, summary: (s) => { if (s.items.place.invalid !== 0 || s.items.place.valid !== 200) throw new Error(`place ${JSON.stringify(s.items.place)}`); } },
  });
  cases.push({
    name: 'UTF-16 LE with a BOM',
    data: { file: 'utf16.csv', bytes: Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(toCsv(HEADER, rows), 'utf16le')]) },
    command: 'check',
    expect: { exit: 0, summary: (s) => { if (s.items.place.valid !== 200) throw new Error(`place ${JSON.stringify(s.items.place)}`); } },
  });
  {
    const withNul = rows.map((r) => [...r]);
    withNul[10][4] = 'before\u0000after';
    cases.push({ name: 'NUL byte in a field', data: { file: 'nul.csv', bytes: utf8(toCsv(HEADER, withNul)) }, command: 'check', expect: { exit: 0, outputs: true, summary: (s) => { if (s.rows !== 200) throw new Error(`rows ${s.rows}`); } } });
  }
  {
    const big = rows.map((r) => [...r]);
    big[5][4] = 'x'.repeat(5 * 1024 * 1024);
    const bytes = utf8(toCsv(HEADER, big));
    cases.push({ name: '5 MB field', data: { file: 'big-field.csv', bytes }, command: 'check', expect: { exit: 0, summary: (s) => { if (s.rows !== 200) throw new Error(`rows ${s.rows}`); } } });
    cases.push({ name: '5 MB field past --max-field-bytes', data: { file: 'big-field-limit.csv', bytes }, command: 'check', extraArgs: ['--max-field-bytes', '1000000'], expect: { exit: 2, stderr: [/big-field-limit\.csv/, /line 7/] } });
  }
  {
    const noise = Buffer.alloc(64 * 1024);
    for (let i = 0; i < noise.length; i++) noise[i] = Math.floor(rand() * 256);
    cases.push({ name: 'random binary', data: { file: 'random.bin', bytes: noise }, command: 'check', expect: { exit: 2, stderr: [/random\.bin/] } });
  }
  {
    const hostile = rows.map((r) => [...r]);
    hostile[3][2] = '<script>window.__pwned=1</script>';
    hostile[4][2] = '<img src=x onerror="window.__pwned=1">';
    hostile[5][4] = '"><svg onload=alert(1)>';
    cases.push({
      name: 'HTML and script in values',
      data: { file: 'hostile.csv', bytes: utf8(toCsv(HEADER, hostile)) },
      command: 'check',
      expect: { exit: 1, outputs: true, summary: (s) => { if (s.items.place.findings['not-a-code'] !== 2) throw new Error(`place ${JSON.stringify(s.items.place)}`); } },
    });
  }
  {
    const formulas = rows.map((r) => [...r]);
    formulas[20][2] = '=HYPERLINK("http://example.invalid","x")';
    formulas[21][2] = '+SUM(1,2)';
    formulas[22][2] = '-2+3';
    formulas[23][2] = '@SUM(A1)';
    cases.push({
      name: 'spreadsheet formulas in values',
      data: { file: 'formulas.csv', bytes: utf8(toCsv(HEADER, formulas)) },
      command: 'check',
      expect: { exit: 1, outputs: true, summary: (s) => { if (s.items.place.findings['not-a-code'] !== 4) throw new Error(`place ${JSON.stringify(s.items.place)}`); } },
    });
  }
  {
    const header = ['rid', 'team', 'place', 'rooms', 'rooms', 'colour'];
    const body = rows.map((r) => [r[0], r[1], r[2], r[3], r[3], 'blue']);
    cases.push({
      name: 'duplicate, missing and extra columns',
      data: { file: 'columns.csv', bytes: utf8(toCsv(header, body)) },
      command: 'check',
      expect: {
        exit: 1,
        outputs: true,
        summary: (s) => {
          const h = s.header;
          if (JSON.stringify([h.missing, h.unexpected, h.duplicate]) !== JSON.stringify([['remark'], ['colour'], ['rooms']])) throw new Error(JSON.stringify(h));
        },
      },
    });
  }
  cases.push({ name: 'a path that does not exist', command: 'check', path: 'missing', expect: { exit: 2, stderr: [/does-not-exist\.csv/] } });
  cases.push({ name: 'a directory', command: 'check', path: 'directory', expect: { exit: 2, stderr: [/a-folder/] } });
  {
    // Broken JSON: a trailing comma on line 4, column 23 of the codebook text below.
    const text = '{\n  "codebook": "x",\n  "version": "1",\n  "title": "broken",,\n  "items": []\n}\n';
    cases.push({ name: 'broken codebook JSON (lint)', codebook: text, command: 'lint', expect: { exit: 1, stderr: [], summary: (s) => { const p = s.problems[0]; if (p.code !== 'json-syntax' || p.line !== 4) throw new Error(JSON.stringify(p)); } } });
    cases.push({ name: 'broken codebook JSON (check)', codebook: text, data: { file: 'clean-for-broken.csv', bytes: utf8(toCsv(HEADER, rows)) }, command: 'check', expect: { exit: 1, stderr: [/codebook\.json/, /line 4/] } });
  }
  {
    const evil = structuredClone(corpusCodebook) as any;
    evil.items[4].pattern = '^(a+)+$';
    cases.push({ name: 'catastrophic pattern', codebook: JSON.stringify(evil, null, 2), command: 'lint', expect: { exit: 1, summary: (s) => { if (!s.problems.some((p: any) => p.path === '/items/4/pattern' && p.severity === 'error')) throw new Error(JSON.stringify(s.problems)); } } });
  }
  {
    const deep = structuredClone(corpusCodebook) as any;
    deep.items[4].askedWhen = '('.repeat(5000) + 'rooms > 1' + ')'.repeat(5000);
    cases.push({ name: 'CEL nested 5000 deep', codebook: JSON.stringify(deep), command: 'lint', expect: { exit: 1, summary: (s) => { if (!s.problems.some((p: any) => p.path === '/items/4/askedWhen' && p.severity === 'error')) throw new Error(JSON.stringify(s.problems)); } } });
  }
  return cases;
}
