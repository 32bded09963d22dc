import { CodeweirError } from '@codeweir/core';
import type { CompiledCodebook } from '@codeweir/codebook';
import type { ColumnStore } from '@codeweir/check';

/** The weight column in use: its item name and one weight per row (NaN where not usable). */
export interface WeightColumn {
  item: string;
  /** Row weights; NaN marks a missing, invalid or negative weight (the row is excluded). */
  weights: Float64Array;
}

/** The weights an item is described with: none for the weight item itself. Cost: O(1). */
export function weightsFor(weight: WeightColumn | undefined, item: string): Float64Array | undefined {
  return weight && weight.item !== item ? weight.weights : undefined;
}

/**
 * Resolves the weight item: the `weight` option when given, else the codebook's weight item
 * when the delivery has its column, else none. Negative weights become NaN (excluded).
 * Cost: O(rows). Throws CodeweirError CW_USAGE when the named item is unknown, has no column
 * in the delivery, or is not numeric.
 */
export function resolveWeight(store: ColumnStore, codebook: CompiledCodebook, name: string | undefined): WeightColumn | undefined {
  const chosen = name ?? codebook.weightItem?.name;
  if (chosen === undefined) return undefined;
  const explicit = name !== undefined;
  if (!codebook.byName.has(chosen)) {
    throw new CodeweirError('CW_USAGE', `--weight names ${JSON.stringify(chosen)}, which is not an item of the codebook.`);
  }
  const col = store.columns[chosen];
  if (!col) {
    if (!explicit) return undefined;
    throw new CodeweirError('CW_USAGE', `--weight names ${JSON.stringify(chosen)}, which has no column in the delivery.`);
  }
  if (col.kind !== 'numeric') {
    throw new CodeweirError('CW_USAGE', `--weight names ${JSON.stringify(chosen)}, a coded item; a weight must be a number.`);
  }
  const weights = new Float64Array(col.values.length);
  for (let r = 0; r < weights.length; r++) {
    const w = col.values[r]!;
    weights[r] = w >= 0 ? w : Number.NaN;
  }
  return { item: chosen, weights };
}
