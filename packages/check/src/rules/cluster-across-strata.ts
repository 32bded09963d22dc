import { defineRule } from './define.ts';

export const clusterAcrossStrata = defineRule<{ item: string; cluster: string; strata: string[] }>({
  code: 'cluster-across-strata',
  severity: 'warning',
  message: (p) =>
    `Cluster ${p.cluster} of ${p.item} occurs in ${p.strata.length} strata (${p.strata.slice(0, 5).join(', ')}${p.strata.length > 5 ? ', ...' : ''}); standard errors treat each stratum's part as its own cluster, which is right only if cluster numbers restart in every stratum.`,
});
