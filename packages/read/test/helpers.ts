import { parse } from 'csv-parse/sync';
import type { Delivery } from '../src/index.ts';

export interface Read {
  header: string[];
  rows: string[][];
  /** Physical line each data row starts on. */
  lines: number[];
}

/** Every data row of a delivery, checking on the way that batch numbering is contiguous. */
export async function collect(d: Delivery): Promise<{ rows: string[][]; lines: number[]; firstRows: number[] }> {
  const rows: string[][] = [];
  const lines: number[] = [];
  const firstRows: number[] = [];
  for await (const b of d.batches()) {
    firstRows.push(b.firstRow);
    if (b.offsets.length !== b.count + 1 || b.lines.length !== b.count || b.fields.length !== b.offsets[b.count]) throw new Error('batch shape');
    for (let r = 0; r < b.count; r++) {
      rows.push(b.fields.slice(b.offsets[r], b.offsets[r + 1]));
      lines.push(b.lines[r] as number);
    }
  }
  return { rows, lines, firstRows };
}

/**
 * The oracle: csv-parse 7 (csv-parse/sync) with RFC 4180 quoting, CRLF and LF both ending
 * records (CR alone for CR files), BOM removed. Its `info.lines` is the line a record ends on, so
 * a record starts on the line after the previous record's end. By our documented rule, blank
 * lines at the very end (csv-parse reports them as one-empty-field records) are dropped.
 */
export function oracle(text: string, delimiter: string, newline: 'lf' | 'cr' = 'lf', blankLines = true): Read {
  const recs = parse(text, {
    delimiter,
    bom: true,
    info: true,
    relax_column_count: true,
    // A quote inside an unquoted field is an ordinary character, as in our grammar.
    relax_quotes: true,
    record_delimiter: newline === 'cr' ? ['\r\n', '\r'] : ['\r\n', '\n'],
  }) as unknown as Array<{ record: string[]; info: { lines: number } }>;
  const starts: number[] = [];
  let prevEnd = 0;
  for (const r of recs) {
    starts.push(prevEnd + 1);
    prevEnd = r.info.lines;
  }
  // csv-parse cannot tell a blank line from a quoted empty field (`""`); a caller whose text has
  // no blank lines passes blankLines = false so nothing is skipped.
  const isBlank = (r: string[]) => blankLines && r.length === 1 && r[0] === '';
  // Blank lines before the header are skipped (our rule), so the header is the first non-blank record.
  let h = 0;
  while (h < recs.length && isBlank((recs[h] as { record: string[] }).record)) h++;
  let end = recs.length;
  while (end > h + 1 && isBlank((recs[end - 1] as { record: string[] }).record)) end--;
  return {
    header: (recs[h] as { record: string[] }).record,
    rows: recs.slice(h + 1, end).map((r) => r.record),
    lines: starts.slice(h + 1, end),
  };
}
