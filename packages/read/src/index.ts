/**
 * @codeweir/read: the fast delimited-file row source. Files, byte ranges and in-memory text all
 * stream flat row batches (see `types.ts`): row `r` of a batch is
 * `fields[offsets[r]] .. fields[offsets[r + 1] - 1]`, with no object per row.
 *
 * Decisions a caller should know:
 * - A blank line in the middle of the data is a row with one empty field (so a check can flag it
 *   as ragged); blank lines at the end are dropped; blank lines before the header are skipped.
 * - Characters after a closing quote are kept (`"ab"c` reads `abc`); a quote inside an unquoted
 *   field is an ordinary character. Nothing is silently dropped.
 * - Invalid UTF-8 without `encoding` is an error (CW_ENCODING, line and column, with a hint to
 *   read the file as windows-1252), never replacement characters.
 * - A byte-order mark wins over `encoding`. NUL bytes inside otherwise normal text are kept as
 *   U+0000; a first block full of control bytes is CW_CSV_BINARY.
 * - A field value of 13 characters or more may share memory with its 8 MiB block; a consumer
 *   that keeps many long values for the whole pass (not just the current batch) keeps those
 *   blocks alive. Short values (most survey cells) never do.
 */
export type * from './types.ts';
export { openDelivery, openDeliveryRange, tokenizeFile } from './file.ts';
export { readDeliveryText } from './text.ts';
export { openAnyDelivery, formatOf, cellText, FORMATS, type DeliveryFormat, type AnyReadOptions } from './formats.ts';
export { typeNotes, type TypeNote } from './type-notes.ts';
export { splitDelivery, type SplitRange } from './split.ts';
export { normalizeReadOptions, DEFAULT_MAX_FIELD_BYTES, DEFAULT_BLOCK_SIZE, DEFAULT_BATCH_FIELDS } from './options.ts';
