/**
 * HTML escaping for every string that comes from a codebook or a delivery. Escapes the five
 * characters that can end a text node or an attribute value (& < > " '), so one function
 * serves both places.
 *
 * Cost: one pass over the string. Throws nothing.
 * @example escapeHtml('<b>"x"</b>') // '&lt;b&gt;&quot;x&quot;&lt;/b&gt;'
 */
export function escapeHtml(value: unknown): string {
  return String(value).replace(/[&<>"']/g, (c) => ENTITIES[c] as string);
}

const ENTITIES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };
