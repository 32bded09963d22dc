/**
 * Findings where a delivery breaks its sample design (the codebook's `design`): a stratum with
 * a single cluster (`lone-cluster-stratum`), a cluster value in more than one stratum
 * (`cluster-across-strata`) and a record without a usable weight (`weight-not-positive`). Run by
 * finalize from the retained columns and the group keys; nothing is computed without a design.
 */
import type { CompiledCodebook, CompiledItem } from '@codeweir/codebook';
import { rules } from './rules/index.ts';
import { GROUP_INVALID, GROUP_MISSING, type PartialResult } from './pass.ts';
import type { Finding, FindingRule } from './types.ts';

/** One design finding and the item index its count goes to (-1: none). `finding` null: counted, not kept. */
export interface DesignNote {
  rule: FindingRule;
  item: number;
  finding: Finding | null;
}

/** The per-row value text of an item from its group keys or retained column; undefined when not kept. */
function rowTexts(p: PartialResult, item: CompiledItem): ((row: number) => string | undefined) | undefined {
  const g = p.groups.find((gp) => gp.item === item.name);
  if (g) {
    return (r) => {
      const k = g.keys[g.rowKeys[r]!]!;
      return k === GROUP_MISSING || k === GROUP_INVALID ? undefined : k;
    };
  }
  const col = p.columns[item.index];
  if (col instanceof Uint16Array) return (r) => (col[r]! === 0 ? undefined : item.codes[col[r]! - 1]!.text);
  if (col instanceof Float64Array) return (r) => (Number.isNaN(col[r]!) ? undefined : String(col[r]!));
  return undefined;
}

/**
 * The design findings of a pass (see the file comment); row findings beyond `cap` per rule are
 * counted only. `idOf` gives the id text of a 1-based row. Cost: O(rows) with a map lookup per
 * row for strata and clusters. Throws nothing.
 */
export function designFindings(p: PartialResult, codebook: CompiledCodebook, cap: number, idOf: (row: number) => string): DesignNote[] {
  const design = codebook.design;
  if (!design || p.rows === 0) return [];
  const out: DesignNote[] = [];
  const at = (name: string | undefined): CompiledItem | undefined => (name === undefined ? undefined : codebook.byName.get(name));
  const weightItem = at(design.weight) ?? codebook.weightItem;
  const weights = weightItem ? p.columns[weightItem.index] : null;
  if (weightItem && weights instanceof Float64Array) {
    let kept = 0;
    for (let r = 0; r < weights.length; r++) {
      const w = weights[r]!;
      if (w > 0) continue;
      const rule = rules['weight-not-positive'];
      if (kept++ >= cap) {
        out.push({ rule: rule.code, item: weightItem.index, finding: null });
        continue;
      }
      const value = Number.isNaN(w) ? '' : String(w);
      out.push({
        rule: rule.code,
        item: weightItem.index,
        finding: { row: r + 1, id: idOf(r + 1), item: weightItem.name, value, rule: rule.code, severity: rule.severity, message: rule.message({ item: weightItem.name, value }) },
      });
    }
  }
  const strataItem = at(design.strata);
  const clusterItem = at(design.cluster);
  const strataOf = strataItem ? rowTexts(p, strataItem) : () => '';
  const clusterOf = clusterItem ? rowTexts(p, clusterItem) : (r: number) => String(r + 1);
  if (!strataOf || !clusterOf || (!strataItem && !clusterItem)) return out;
  // Stratum -> its clusters; cluster -> its strata (only when a cluster item is given).
  const clustersOf = new Map<string, Set<string>>();
  const strataOfCluster = new Map<string, Set<string>>();
  for (let r = 0; r < p.rows; r++) {
    const s = strataOf(r);
    const c = clusterOf(r);
    if (s === undefined || c === undefined) continue;
    let cs = clustersOf.get(s);
    if (!cs) clustersOf.set(s, (cs = new Set()));
    cs.add(c);
    if (clusterItem) {
      let ss = strataOfCluster.get(c);
      if (!ss) strataOfCluster.set(c, (ss = new Set()));
      ss.add(s);
    }
  }
  const itemLevel = (rule: FindingRule, item: CompiledItem, value: string, message: string): Finding => ({ row: 0, id: '', item: item.name, value, rule, severity: rules[rule].severity, message });
  const lone = rules['lone-cluster-stratum'];
  const named = strataItem ?? clusterItem!;
  for (const [s, cs] of clustersOf) {
    if (cs.size !== 1) continue;
    const cluster = clusterItem ? [...cs][0]! : '';
    const stratum = strataItem ? s : '(the whole sample)';
    out.push({ rule: lone.code, item: named.index, finding: itemLevel(lone.code, named, s, lone.message({ item: named.name, stratum, cluster })) });
  }
  if (strataItem && clusterItem) {
    const across = rules['cluster-across-strata'];
    for (const [c, ss] of strataOfCluster) {
      if (ss.size < 2) continue;
      out.push({ rule: across.code, item: clusterItem.index, finding: itemLevel(across.code, clusterItem, c, across.message({ item: clusterItem.name, cluster: c, strata: [...ss] })) });
    }
  }
  return out;
}
