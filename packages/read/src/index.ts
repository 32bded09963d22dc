/**
 * @codeweir/read: the fast delimited-file row source. Files, byte ranges and in-memory text
 * all stream flat row batches (see `types.ts`).
 */
export type * from './types.ts';
export { openDelivery, openDeliveryRange, tokenizeFile } from './file.ts';
export { readDeliveryText } from './text.ts';
export { splitDelivery, type SplitRange } from './split.ts';
export { normalizeReadOptions, DEFAULT_MAX_FIELD_BYTES, DEFAULT_BLOCK_SIZE, DEFAULT_BATCH_FIELDS } from './options.ts';
