// Hand-built codebooks and check results for the describe tests: the smallest objects that
// satisfy the contracts in packages/codebook/src/compiled.ts and packages/check/src/types.ts.
import type { CompiledCodebook, CompiledItem, Level } from '@codeweir/codebook';
import type { CheckResult, ItemColumn, ItemTally } from '@codeweir/check';

export interface ItemSpec {
  name: string;
  level?: Level;
  role?: CompiledItem['role'];
  type?: CompiledItem['type'];
  /** Codes with labels in declared (scale) order; bins make the item binned. */
  codes?: Array<{ code: number | string; label?: string; bin?: { min: number; max: number | null } }>;
  unit?: string;
}

export function item(spec: ItemSpec, index = 0): CompiledItem {
  const codes = (spec.codes ?? []).map((c, i) => ({
    index: i,
    code: c.code,
    text: String(c.code),
    label: c.label ?? `label ${c.code}`,
    ...(c.bin ? { bin: c.bin } : {}),
  }));
  const binned = codes.some((c) => c.bin !== undefined);
  return {
    index,
    name: spec.name,
    label: `${spec.name} label`,
    role: spec.role ?? 'item',
    type: spec.type ?? (codes.length > 0 ? 'integer' : 'decimal'),
    level: spec.level,
    unit: spec.unit,
    codes,
    codeByText: new Map(codes.map((c) => [c.text, c.index])),
    binned,
    bins: codes
      .filter((c) => c.bin)
      .map((c) => ({ index: c.index, min: c.bin!.min, max: c.bin!.max }))
      .sort((a, b) => a.min - b.min),
    missing: [],
    missingByText: new Map(),
    unique: spec.role === 'id',
  };
}

export function codebook(specs: ItemSpec[]): CompiledCodebook {
  const items = specs.map((s, i) => item(s, i));
  return {
    source: {},
    id: 'test-codebook',
    version: '1',
    title: 'test',
    items,
    byName: new Map(items.map((it) => [it.name, it])),
    idItem: items.find((it) => it.role === 'id'),
    groupItems: items.filter((it) => it.role === 'group'),
    weightItem: items.find((it) => it.role === 'weight'),
    rules: [],
  };
}

/** A coded column from 1-based code positions (0 = not valid). */
export function coded(name: string, positions: number[]): ItemColumn {
  return { kind: 'coded', item: name, codes: Uint16Array.from(positions) };
}

/** A numeric column (NaN = not valid). */
export function numeric(name: string, values: number[]): ItemColumn {
  return { kind: 'numeric', item: name, values: Float64Array.from(values) };
}

export function checkResult(columns: ItemColumn[], tallies: Record<string, Partial<ItemTally>> = {}): CheckResult {
  const rows = columns.length > 0 ? (columns[0]!.kind === 'coded' ? columns[0]!.codes.length : columns[0]!.values.length) : 0;
  const items: Record<string, ItemTally> = {};
  for (const c of columns) {
    items[c.item] = { valid: 0, invalid: 0, missing: {}, findings: {}, ...(tallies[c.item] ?? {}) };
  }
  return {
    summary: {
      codebook: { codebook: 'test-codebook', version: '1' },
      rows,
      header: { missing: [], unexpected: [], duplicate: [] },
      findings: { total: 0, byRule: {}, bySeverity: {} },
      items,
      groups: {},
      rules: {},
    },
    findings: [],
    store: { rows, columns: Object.fromEntries(columns.map((c) => [c.item, c])) },
  };
}
