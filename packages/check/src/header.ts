import type { CompiledCodebook } from '@codeweir/codebook';

/** How a delivery's header maps onto the codebook. */
export interface HeaderMap {
  /** The header as delivered. */
  columns: string[];
  /** Item index -> field position of its (first) column, or -1 when the column is absent. */
  positions: Int32Array;
  missing: string[];
  /** Header names that are not items, with their 1-based position. */
  unexpected: Array<{ column: string; position: number }>;
  /** Names appearing more than once, with their count. */
  duplicate: Array<{ column: string; count: number }>;
  /** First item (in codebook order) whose column is out of codebook order; undefined when in order. */
  outOfOrder?: string;
}

/**
 * Matches a header against the codebook by exact, case-sensitive name. A repeated name is
 * matched to its first column; the order of columns does not matter for checking (an order
 * different from the codebook's is reported once). Cost: O(columns + items). Throws nothing.
 */
export function mapHeader(codebook: CompiledCodebook, header: readonly string[]): HeaderMap {
  const first = new Map<string, number>();
  const counts = new Map<string, number>();
  header.forEach((h, i) => {
    counts.set(h, (counts.get(h) ?? 0) + 1);
    if (!first.has(h)) first.set(h, i);
  });
  const positions = new Int32Array(codebook.items.length);
  const missing: string[] = [];
  codebook.items.forEach((item, i) => {
    const p = first.get(item.name);
    positions[i] = p ?? -1;
    if (p === undefined) missing.push(item.name);
  });
  const unexpected: HeaderMap['unexpected'] = [];
  header.forEach((h, i) => {
    if (!codebook.byName.has(h) && first.get(h) === i) unexpected.push({ column: h, position: i + 1 });
  });
  const duplicate: HeaderMap['duplicate'] = [];
  for (const [column, count] of counts) if (count > 1) duplicate.push({ column, count });
  let outOfOrder: string | undefined;
  let last = -1;
  for (let i = 0; i < positions.length; i++) {
    const p = positions[i]!;
    if (p < 0) continue;
    if (p < last) {
      outOfOrder = codebook.items[i]!.name;
      break;
    }
    last = p;
  }
  return { columns: [...header], positions, missing, unexpected, duplicate, outOfOrder };
}
