/**
 * import(export(c)) == c over generated codebooks, for the spreadsheet variable list (through
 * a real xlsx file written and read by exceljs) and for DDI-Codebook 2.5 XML (through the XML
 * text and fast-xml-parser). The generated codebooks lint without errors (asserted), and the
 * import of an export guesses nothing.
 */
import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseCodebook } from '@codeweir/codebook';
import { codebookFromDdi, codebookFromVariableList, ddiFromCodebook, readVariableListXlsx, variableListFromCodebook, variableListXlsx } from '../src/index.ts';
import { codebookArb } from './generate.ts';

/** The JSON value of a codebook (undefined fields dropped, as in a file). */
const json = (v: unknown) => JSON.parse(JSON.stringify(v));

describe('round trip import(export(c)) == c', () => {
  it('generated codebooks are valid codebooks', () => {
    fc.assert(
      fc.property(codebookArb, (cb) => {
        const r = parseCodebook(JSON.stringify(cb));
        expect(r.problems.filter((p) => p.severity === 'error')).toEqual([]);
      }),
      { numRuns: 200 },
    );
  });

  it('through a DDI-Codebook 2.5 file', () => {
    fc.assert(
      fc.property(codebookArb, (cb) => {
        const back = codebookFromDdi(ddiFromCodebook(cb), 'x.xml');
        expect(back.guesses).toEqual([]);
        expect(json(back.codebook)).toEqual(json(cb));
      }),
      { numRuns: 200 },
    );
  });

  it('through the variable list as tables (no file)', () => {
    fc.assert(
      fc.property(codebookArb, (cb) => {
        const back = codebookFromVariableList(variableListFromCodebook(cb), 'x.xlsx');
        expect(back.guesses).toEqual([]);
        expect(back.notes).toEqual([]);
        expect(json(back.codebook)).toEqual(json(cb));
      }),
      { numRuns: 300 },
    );
  });

  it('through an xlsx workbook written and read by exceljs', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'codeweir-roundtrip-'));
    try {
      await fc.assert(
        fc.asyncProperty(codebookArb, async (cb) => {
          const file = join(dir, 'list.xlsx');
          await writeFile(file, await variableListXlsx(variableListFromCodebook(cb)));
          const back = codebookFromVariableList(await readVariableListXlsx(file), 'list.xlsx');
          expect(back.guesses).toEqual([]);
          expect(json(back.codebook)).toEqual(json(cb));
        }),
        { numRuns: 40 },
      );
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});
