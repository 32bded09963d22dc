/**
 * Importing variable lists as questionnaire teams keep them. The workbooks are written here
 * with exceljs's own API (cells typed as a person would type them: numbers as numbers), not
 * with our exporter, so the reader is checked against the xlsx library itself.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import ExcelJS from 'exceljs';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseCodebook } from '@codeweir/codebook';
import { importCodebook, parseListCell, formatEntry, parseBounds } from '../src/index.ts';

let dir = '';
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'codeweir-varlist-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

async function workbook(file: string, sheets: Record<string, unknown[][]>): Promise<string> {
  const wb = new ExcelJS.Workbook();
  for (const [name, rows] of Object.entries(sheets)) {
    const ws = wb.addWorksheet(name);
    for (const r of rows) ws.addRow(r);
  }
  const path = join(dir, file);
  await wb.xlsx.writeFile(path);
  return path;
}

describe('the cell syntax', () => {
  it('reads codes in one cell, with bins, and quoted labels holding the separators', () => {
    expect(parseListCell('1=Yes; 2=No', { bins: true })).toEqual([
      { code: '1', label: 'Yes', quoted: false },
      { code: '2', label: 'No', quoted: false },
    ]);
    expect(parseListCell('1=None [0..0]\n2="1; 2 or 3" [1..3]; 3=4 or more [4..]', { bins: true })).toEqual([
      { code: '1', label: 'None', quoted: false, bin: { min: 0, max: 0 } },
      { code: '2', label: '1; 2 or 3', quoted: false, bin: { min: 1, max: 3 } },
      { code: '3', label: '4 or more', quoted: false, bin: { min: 4 } },
    ]);
    expect(parseListCell('-8=Don\'t know (dont-know); -9 (refused); 9=Refused', { kinds: true })).toEqual([
      { code: '-8', label: "Don't know", quoted: false, kind: 'dont-know' },
      { code: '-9', quoted: false, kind: 'refused' },
      { code: '9', label: 'Refused', quoted: false },
    ]);
  });

  it('writes what it reads back, quoting where needed', () => {
    const e = { code: 'a=b', label: 'x [1..2] "q"', kind: 'refused' as const };
    const text = formatEntry(e);
    expect(text).toBe('"a=b"="x [1..2] ""q""" (refused)');
    expect(parseListCell(text, { kinds: true })).toEqual([{ ...e, quoted: true }]);
  });

  it('reads bounds written in the usual ways', () => {
    expect(parseBounds('0..20')).toEqual({ min: 0, max: 20 });
    expect(parseBounds('0 to 20')).toEqual({ min: 0, max: 20 });
    expect(parseBounds('0-20')).toEqual({ min: 0, max: 20 });
    expect(parseBounds('-5..-1')).toEqual({ min: -5, max: -1 });
    expect(parseBounds('0..')).toEqual({ min: 0 });
    expect(parseBounds('..40')).toEqual({ max: 40 });
    expect(parseBounds('')).toBeUndefined();
    expect(parseBounds('about ten')).toBeNull();
  });
});

describe('importing a workbook made by exceljs', () => {
  it('one row an item, codes in one cell and one row per code, missing codes with and without kinds', async () => {
    const path = await workbook('tellmark-short.xlsx', {
      items: [
        ['Variable', 'Label', 'Label@fr', 'Type', 'Level', 'Codes', 'Value', 'Value label', 'Missing', 'Missing kind', 'Range', 'Asked when', 'Unit'],
        ['hh_id', 'Household identifier', '', 'text', '', '', '', '', '', '', '', '', ''],
        ['sex', 'Sex of respondent', 'Sexe', 'integer', 'nominal', '1=Male; 2=Female', '', '', '-9=Refused (refused)', '', '', '', ''],
        ['edu', 'Highest level of school completed', '', 'integer', 'ordinal', '', 1, 'None', '', '', '', '', ''],
        ['', '', '', '', '', '', 2, 'Primary', '', '', '', '', ''],
        ['', '', '', '', '', '', 3, 'Secondary', '', '', '', '', ''],
        ['', '', '', '', '', '', 8, "Don't know", '', 'dont-know', '', '', ''],
        ['', '', '', '', '', '', 9, 'Refused', '', 'refused', '', '', ''],
        ['income', 'Household cash income last month', '', 'number', 'scale', '', '', '', '9999998=Don\'t know; 9999999=Refused', '', '0..', '', 'marks'],
        ['children', 'Children under 15', '', 'integer', 'ratio', '', '', '', '9 (refused)', '', '0..20', '', 'persons'],
        ['school_km', 'Distance to school', '', '', '', '', '', '', '-7=Valid skip (not-applicable)', '', '0..100', 'children > 0', 'km'],
      ],
    });
    const r = await importCodebook(path);
    const cb = r.codebook as any;
    expect(cb.items.map((i: any) => i.name)).toEqual(['hh_id', 'sex', 'edu', 'income', 'children', 'school_km']);
    const byName = Object.fromEntries(cb.items.map((i: any) => [i.name, i]));
    // The plain label column is a second language beside label@fr; the list declares none, so "und" is marked.
    expect(byName.sex.label).toEqual({
      und: 'Sex of respondent [check: item "sex": the plain label is taken as language "und"]',
      fr: 'Sexe [check: item "sex": the plain label is taken as language "und"]',
    });
    expect(byName.sex.codes).toEqual([{ code: 1, label: 'Male' }, { code: 2, label: 'Female' }]);
    expect(byName.sex.missing).toEqual([{ code: -9, kind: 'refused', label: 'Refused' }]);
    // One row per code; rows with a missing kind are missing codes.
    expect(byName.edu.codes).toEqual([{ code: 1, label: 'None' }, { code: 2, label: 'Primary' }, { code: 3, label: 'Secondary' }]);
    expect(byName.edu.missing).toEqual([{ code: 8, kind: 'dont-know', label: "Don't know" }, { code: 9, kind: 'refused', label: 'Refused' }]);
    expect(byName.edu.label).toBe('Highest level of school completed');
    // Words of another tool and kinds read from labels are guesses, marked in the label.
    expect(byName.income).toMatchObject({ type: 'decimal', level: 'ratio', range: { min: 0 }, unit: 'marks' });
    expect(byName.income.missing).toEqual([{ code: 9999998, kind: 'dont-know', label: "Don't know" }, { code: 9999999, kind: 'refused', label: 'Refused' }]);
    expect(byName.income.label).toMatch(/^Household cash income last month \[check: type decimal \(written "number"\); level ratio \(written "scale"\); missing code 9999998 taken as dont-know; missing code 9999999 taken as refused\]$/);
    expect(byName.school_km).toMatchObject({ type: 'integer', level: 'ratio', askedWhen: 'children > 0', range: { min: 0, max: 100 } });
    expect(r.guesses.filter((g) => g.item === 'school_km').map((g) => g.field)).toEqual(['type', 'level']);
    // The codebook lints: warnings for the legacy codes inside ranges, no error.
    const lint = parseCodebook(JSON.stringify(cb));
    expect(lint.problems.filter((p) => p.severity === 'error')).toEqual([]);
    expect(lint.problems.map((p) => [p.code, p.item])).toEqual(
      expect.arrayContaining([['missing-in-range', 'income'], ['missing-in-range', 'children']]),
    );
  });

  it('numbers typed as numbers and text typed as text read the same', async () => {
    const path = await workbook('typed.xlsx', {
      items: [
        ['name', 'label', 'type', 'level', 'codes', 'range'],
        ['q1', 'Rating', 'integer', 'ordinal', '1=Low; 2=High', ''],
        ['q2', 'Hours', 'decimal', 'ratio', '', '0..168'],
      ],
      about: [['field', 'value'], ['codebook', 'typed'], ['version', 3], ['title', 'Typed cells']],
    });
    const r = await importCodebook(path);
    expect(r.guesses).toEqual([]);
    expect(r.codebook).toMatchObject({ codebook: 'typed', version: '3', title: 'Typed cells' });
    expect(parseCodebook(JSON.stringify(r.codebook)).ok).toBe(true);
  });

  it('what cannot be decided is listed, not invented: an unknown column and an unreadable range', async () => {
    const path = await workbook('odd.xlsx', {
      items: [
        ['name', 'label', 'type', 'level', 'range', 'colour'],
        ['age', 'Age', 'integer', 'ratio', 'about ten', 'red'],
      ],
    });
    const r = await importCodebook(path);
    expect(r.notes).toEqual([
      'items: column 6 "colour" is not a column the import reads; it was left out.',
      'items: row 2, the range "about ten" of item "age" is not min..max; it was left out.',
    ]);
    expect((r.codebook.items[0] as any).range).toBeUndefined();
  });

  it('a CSV variable list reads the same as the items sheet', async () => {
    const path = join(dir, 'list.csv');
    await writeFile(path, 'name,label,type,level,codes,missing\nsex,Sex,integer,nominal,"1=Male; 2=Female","-9=Refused (refused)"\n');
    const r = await importCodebook(path);
    expect(r.codebook.items).toEqual([{ name: 'sex', label: 'Sex', type: 'integer', level: 'nominal', codes: [{ code: 1, label: 'Male' }, { code: 2, label: 'Female' }], missing: [{ code: -9, kind: 'refused', label: 'Refused' }] }]);
    // A CSV carries no identifier: it comes from the file name and is marked in the title.
    expect(r.codebook.codebook).toBe('list');
    expect(r.codebook.title).toMatch(/\[check: identifier "list" from the file name; version 1 assumed\]$/);
  });

  it('refuses a file that is no workbook with one sentence (exit 2)', async () => {
    const path = join(dir, 'fake.xlsx');
    await writeFile(path, 'not a zip');
    await expect(importCodebook(path)).rejects.toMatchObject({ code: 'CW_FILE_UNREADABLE', exitCode: 2 });
    await expect(importCodebook(join(dir, 'list.pdf'))).rejects.toMatchObject({ code: 'CW_USAGE' });
  });
});
