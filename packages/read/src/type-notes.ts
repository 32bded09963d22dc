/**
 * Notes where a typed delivery's column type disagrees with the codebook's item type. The cells
 * are judged by their value whatever the column type (a Parquet double 2.0 in an integer item
 * is the valid value 2); the note tells the data manager the file was typed otherwise than the
 * codebook says, which often means an export setting to fix upstream.
 */
import type { DeliveredType } from './types.ts';

/** One column whose delivered type disagrees with its item's type. */
export interface TypeNote {
  column: string;
  delivered: DeliveredType;
  /** The codebook item's `type`. */
  expected: string;
  message: string;
}

const COMPATIBLE: Record<string, readonly DeliveredType[]> = {
  integer: ['integer'],
  decimal: ['integer', 'decimal'],
  date: ['date'],
  text: ['text'],
};

/**
 * The type notes of a delivery: for each column that names an item, a note when its delivered
 * type is not one the item's type takes as it is (integer items: integer; decimal items:
 * integer or decimal; date items: date; text items: text). Columns without a delivered type
 * (delimited text) give none. Pure; O(columns). Throws nothing.
 * @example typeNotes({ age: 'decimal' }, [{ name: 'age', type: 'integer' }])[0].delivered // 'decimal'
 */
export function typeNotes(columnTypes: Readonly<Record<string, DeliveredType>> | undefined, items: ReadonlyArray<{ name: string; type: string }>): TypeNote[] {
  if (columnTypes === undefined) return [];
  const notes: TypeNote[] = [];
  for (const item of items) {
    const delivered = columnTypes[item.name];
    if (delivered === undefined) continue;
    if ((COMPATIBLE[item.type] ?? []).includes(delivered)) continue;
    notes.push({
      column: item.name,
      delivered,
      expected: item.type,
      message: `${item.name} was delivered as ${delivered} cells but the codebook's item is ${item.type}; each cell is judged by its value.`,
    });
  }
  return notes;
}
