import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { readDeliveryText } from '../src/index.ts';
import { collect, oracle } from './helpers.ts';

/** RFC 4180 writing: a field is quoted when it holds the delimiter, a quote, CR or LF (and when empty, so a one-column blank row is not a blank line); quotes inside are doubled. */
function writeCsv(table: string[][], delimiter: string, eol: string, trailing: boolean): string {
  const field = (v: string) =>
    v === '' || v.includes(delimiter) || v.includes('"') || v.includes('\r') || v.includes('\n') ? `"${v.replaceAll('"', '""')}"` : v;
  return table.map((row) => row.map(field).join(delimiter)).join(eol) + (trailing ? eol : '');
}

const piece = fc.oneof(
  fc.constantFrom('"', ',', ';', '\t', '|', '\r', '\n', '\r\n', '""', 'é', '😀', '日本', ' ', 'a', '1'),
  fc.string({ maxLength: 4 }),
);
const cell = fc.array(piece, { maxLength: 5 }).map((parts) => parts.join(''));
const table = fc
  .integer({ min: 1, max: 5 })
  .chain((width) => fc.array(fc.array(cell, { minLength: width, maxLength: width }), { minLength: 1, maxLength: 8 }));

describe('round trip of arbitrary tables (fast-check)', () => {
  for (const delimiter of [',', ';', '\t', '|']) {
    it(`reads back what was written with ${JSON.stringify(delimiter)}`, async () => {
      await fc.assert(
        fc.asyncProperty(
          table,
          fc.constantFrom('\n', '\r\n'),
          fc.boolean(),
          fc.integer({ min: 1, max: 24 }),
          async (t, eol, trailing, blockSize) => {
            const text = writeCsv(t, delimiter, eol, trailing);
            const d = readDeliveryText(text, { delimiter, blockSize, batchRows: 3 });
            const got = await collect(d);
            // The property: reading returns the table exactly (header, then rows).
            expect(d.header).toEqual(t[0]);
            expect(got.rows).toEqual(t.slice(1));
            // And csv-parse 7, the oracle, reads the same text the same way (the writer makes no
            // blank lines, so the oracle skips none).
            const expected = oracle(text, delimiter, d.newline, false);
            expect(d.header).toEqual(expected.header);
            expect(got.rows).toEqual(expected.rows);
          },
        ),
        { numRuns: 150 },
      );
    });
  }
});
