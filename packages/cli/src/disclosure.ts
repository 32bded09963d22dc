/**
 * The disclosure and design options shared by check and report: `--min-cell [k]`,
 * `--show-values`, and the design items `--weight`, `--strata`, `--cluster`, `--fpc` over the
 * codebook's `design`.
 */
import { CodeweirError } from '@codeweir/core';
import type { CompiledCodebook } from '@codeweir/codebook';

/** The smallest count shown when disclosure control is on and no k is given. */
export const DEFAULT_MIN_CELL = 5;

export const MIN_CELL_OPTION = {
  type: 'string',
  describe: `suppress counts below k (default ${DEFAULT_MIN_CELL}; the codebook's disclosure.minCell when set) and the cells that would reveal them`,
} as const;
export const SHOW_VALUES_OPTION = {
  type: 'boolean',
  default: false,
  describe: 'show the values of id items and of items marked confidential (withheld by default)',
} as const;

export interface DisclosureChoice {
  /** 1 when suppression is off. */
  minCell: number;
  showValues: boolean;
  /** Items whose values are withheld: confidential items and the id item (none with `--show-values`). */
  withhold: Set<string>;
  withholdIds: boolean;
}

/**
 * The disclosure settings of a run: on with `--min-cell` (k, or 5 when given without a number)
 * or the codebook's `disclosure.minCell`; confidential items and the id item are withheld from
 * what goes to others whatever the setting (the report, the team folders), nothing with
 * `--show-values`. Cost: O(items).
 * Throws CodeweirError CW_USAGE when k is not a whole number of at least 1.
 */
export function disclosureChoice(args: Record<string, unknown>, codebook: CompiledCodebook): DisclosureChoice {
  let minCell = codebook.minCell ?? 1;
  const raw = args['min-cell'];
  if (raw !== undefined) {
    const text = String(raw).trim();
    const k = text === '' || raw === true ? DEFAULT_MIN_CELL : Number(text);
    if (!Number.isInteger(k) || k < 1) throw new CodeweirError('CW_USAGE', `--min-cell takes a whole number of at least 1, got ${JSON.stringify(raw)}.`);
    minCell = k;
  }
  const showValues = args['show-values'] === true;
  const withhold = new Set<string>();
  if (!showValues) {
    for (const item of codebook.items) if (item.confidential) withhold.add(item.name);
    if (codebook.idItem) withhold.add(codebook.idItem.name);
  }
  return { minCell, showValues, withhold, withholdIds: !showValues };
}

/**
 * The codebook with its design replaced part by part by the design options given (`--weight`,
 * `--strata`, `--cluster`, `--fpc`); the codebook itself when none is given. Cost: O(1).
 */
export function withDesignOptions(codebook: CompiledCodebook, args: Record<string, unknown>): CompiledCodebook {
  const parts = ['weight', 'strata', 'cluster', 'fpc'] as const;
  if (!parts.some((p) => args[p] !== undefined && p !== 'weight')) return codebook;
  const design = { ...(codebook.design ?? {}) };
  for (const p of parts) if (args[p] !== undefined) design[p] = String(args[p]);
  for (const p of parts) {
    const name = design[p];
    if (name !== undefined && !codebook.byName.has(name)) throw new CodeweirError('CW_USAGE', `--${p} names ${JSON.stringify(name)}, which is not an item of the codebook.`);
  }
  // The source too: worker threads compile the codebook again from it.
  return { ...codebook, design, source: { ...(codebook.source as Record<string, unknown>), design } };
}
