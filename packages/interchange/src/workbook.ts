/**
 * Files of a variable list: an xlsx workbook (Office Open XML, read and written with exceljs)
 * or a CSV file (read with @codeweir/read, so delimiter detection, encodings and RFC 4180
 * quoting are those of a delivery). Cells are read as text: numbers as JavaScript prints them,
 * dates as YYYY-MM-DD, formulas as their cached result.
 */
import { CodeweirError } from '@codeweir/core';
import { openDelivery, type ReadOptions } from '@codeweir/read';
import type { VariableList } from './variable-list.ts';

/** Sheet names of a variable-list workbook (matched ignoring case, spaces and underscores). */
export const SHEETS = { items: 'items', missingSets: 'missing sets', rules: 'rules', about: 'about' } as const;

const sheetKey = (s: string) => s.toLowerCase().replace(/[\s_-]+/g, '');

/** Text of one exceljs cell value. */
function valueText(v: unknown): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'string') return v;
  if (typeof v === 'number' || typeof v === 'boolean') return String(v);
  if (v instanceof Date) return v.toISOString().slice(0, 10);
  if (typeof v === 'object') {
    const o = v as Record<string, unknown>;
    if (Array.isArray(o.richText)) return (o.richText as Array<{ text: string }>).map((t) => t.text).join('');
    if ('result' in o) return valueText(o.result);
    if ('text' in o) return valueText(o.text);
    if ('error' in o) return String(o.error);
  }
  return String(v);
}

/**
 * Reads a variable-list workbook: the sheet named `items` (else the first sheet) and, when
 * present, `missing sets`, `rules` and `about`. Throws CodeweirError CW_FILE_UNREADABLE
 * (exit 2) for a file that is not an xlsx workbook, CW_FILE_EMPTY for one without a sheet.
 */
export async function readVariableListXlsx(path: string): Promise<VariableList> {
  const { default: ExcelJS } = await import('exceljs');
  const wb = new ExcelJS.Workbook();
  try {
    await wb.xlsx.readFile(path);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') throw new CodeweirError('CW_FILE_NOT_FOUND', `${path} does not exist; check the path.`, { file: path, cause: e });
    throw new CodeweirError('CW_FILE_UNREADABLE', `${path} cannot be read as an xlsx workbook (${(e as Error).message}).`, { file: path, cause: e });
  }
  const byKey = new Map(wb.worksheets.map((ws) => [sheetKey(ws.name), ws]));
  const table = (name: string): string[][] | undefined => {
    const ws = byKey.get(sheetKey(name));
    if (!ws) return undefined;
    const rows: string[][] = [];
    ws.eachRow({ includeEmpty: true }, (row, n) => {
      const values = Array.isArray(row.values) ? (row.values as unknown[]).slice(1) : [];
      rows[n - 1] = Array.from(values, valueText);
    });
    for (let i = 0; i < rows.length; i++) rows[i] ??= [];
    return rows;
  };
  const first = wb.worksheets[0];
  if (!first) throw new CodeweirError('CW_FILE_EMPTY', `The workbook ${path} has no sheet.`, { file: path });
  const items = table(SHEETS.items) ?? table(first.name)!;
  const out: VariableList = { items };
  const sets = table(SHEETS.missingSets) ?? table('missingSets');
  if (sets) out.missingSets = sets;
  const rules = table(SHEETS.rules);
  if (rules) out.rules = rules;
  const about = table(SHEETS.about);
  if (about) out.about = about;
  return out;
}

/**
 * Reads a CSV variable list (the items table alone) with the delivery reader. Throws what
 * `openDelivery` throws for unreadable files (exit 2), with line numbers.
 */
export async function readVariableListCsv(path: string, options: ReadOptions = {}): Promise<VariableList> {
  const d = await openDelivery(path, options);
  const rows: string[][] = [d.header];
  for await (const b of d.batches()) {
    for (let r = 0; r < b.count; r++) rows.push(b.fields.slice(b.offsets[r]!, b.offsets[r + 1]!));
  }
  return { items: rows };
}

/**
 * The xlsx workbook of a variable list as bytes: one sheet per table, every cell written as
 * text (so `1.50` or `007` stays as written), the header row bold and frozen. Cost: the
 * workbook in memory.
 */
export async function variableListXlsx(list: VariableList): Promise<Uint8Array> {
  const { default: ExcelJS } = await import('exceljs');
  const wb = new ExcelJS.Workbook();
  const add = (name: string, rows: string[][] | undefined) => {
    if (!rows) return;
    const ws = wb.addWorksheet(name, { views: [{ state: 'frozen', ySplit: 1 }] });
    for (const r of rows) ws.addRow(r);
    ws.getRow(1).font = { bold: true };
  };
  add(SHEETS.items, list.items);
  add(SHEETS.missingSets, list.missingSets);
  add(SHEETS.rules, list.rules);
  add(SHEETS.about, list.about);
  return new Uint8Array(await wb.xlsx.writeBuffer());
}
