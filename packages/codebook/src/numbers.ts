/**
 * The one rule for matching numeric cells to numeric codes: a cell matches a code when the
 * cell text is exactly String(code), or when the cell is a plain decimal number whose value
 * prints as String(code). So code 1 matches "1", "1.0", "01" and "+1"; code -9 matches "-9"
 * and "-9.00"; code 1.5 matches "1.50". Exponent forms ("1e0") and surrounding spaces do not
 * count as plain decimal numbers.
 */

const PLAIN_DECIMAL = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)$/;

/**
 * The canonical text (String(Number(text))) of a plain decimal number, or undefined when
 * `text` is not one. "-0" gives "0". Pure; O(length).
 */
export function canonicalNumberText(text: string): string | undefined {
  if (!PLAIN_DECIMAL.test(text)) return undefined;
  const n = Number(text);
  if (!Number.isFinite(n)) return undefined;
  return String(n === 0 ? 0 : n);
}

/**
 * Every cell text under which a code is looked up: String(code), plus the canonical number
 * text when the item is numeric and the code is a number or a numeric string.
 */
export function codeKeys(code: number | string, numericItem: boolean): string[] {
  const text = String(code);
  if (!numericItem) return [text];
  const canon = typeof code === 'number' ? String(code === 0 ? 0 : code) : canonicalNumberText(code);
  return canon === undefined || canon === text ? [text] : [text, canon];
}

/**
 * Looks a cell up in a code table keyed by {@link codeKeys}: first the exact text, then (for
 * numeric items) its canonical number text. Pure; O(length of the cell).
 */
export function lookupCell<T>(table: ReadonlyMap<string, T>, cell: string, numericItem: boolean): T | undefined {
  const exact = table.get(cell);
  if (exact !== undefined || !numericItem) return exact;
  const canon = canonicalNumberText(cell);
  return canon === undefined ? undefined : table.get(canon);
}
