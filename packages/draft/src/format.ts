/**
 * JSON text for a drafted codebook that a person can read and edit: two-space indentation, with
 * every object or array that fits on one line of at most 100 characters kept on one line (a
 * code, a missing code, a short list), so a long code list reads as one code a line.
 */

const WIDTH = 100;

function flat(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(flat).join(', ')}]`;
  if (value !== null && typeof value === 'object') {
    const body = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined)
      .map(([k, v]) => `${JSON.stringify(k)}: ${flat(v)}`)
      .join(', ');
    return body.length === 0 ? '{}' : `{ ${body} }`;
  }
  return JSON.stringify(value);
}

function block(value: unknown, indent: string, keyLength: number): string {
  const one = flat(value);
  if (value === null || typeof value !== 'object' || indent.length + keyLength + one.length <= WIDTH) return one;
  const inner = indent + '  ';
  if (Array.isArray(value)) {
    if (value.length === 0) return '[]';
    return `[\n${value.map((v) => inner + block(v, inner, 0)).join(',\n')}\n${indent}]`;
  }
  const entries = Object.entries(value as Record<string, unknown>).filter(([, v]) => v !== undefined);
  return `{\n${entries.map(([k, v]) => `${inner}${JSON.stringify(k)}: ${block(v, inner, k.length + 4)}`).join(',\n')}\n${indent}}`;
}

/**
 * Formats a JSON value as described above, ending with a newline. The result parses back to
 * the same value (`JSON.parse(formatJson(v))` deep-equals `v` for JSON values; undefined
 * properties are dropped as JSON.stringify drops them). Cost: O(size x depth). Throws nothing
 * for JSON values.
 */
export function formatJson(value: unknown): string {
  return block(value, '', 0) + '\n';
}
