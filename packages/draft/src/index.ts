/**
 * @codeweir/draft: a first codebook inferred from a delivery, every guess marked for a person
 * to confirm.
 */
export { draftCodebook, draftDelivery, Drafter, type DraftOptions, type DraftResult, type DraftCodebook, type RowsInput } from './draft.ts';
export { inferItem, patternFromShape, missingLabel, ID_NAME, TYPE_SHARE, FRACTION_SHARE, REPEAT_SHARE } from './infer.ts';
export type { DraftGuess, DraftItem, DraftCode, DraftMissingCode, GuessField, InferOptions, Inferred } from './infer.ts';
export { numericMissingCandidates, textMissingCandidates, kindOfSentinel, STRAY_SHARE, type MissingGuess } from './missing.ts';
export { ColumnProfile, shapeOf, MAX_DISTINCT, EDGE_VALUES, MAX_UNIQUE_TRACKED, type Edge } from './profile.ts';
export { formatJson } from './format.ts';
