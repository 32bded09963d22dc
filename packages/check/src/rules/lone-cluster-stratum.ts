import { defineRule } from './define.ts';

export const loneClusterStratum = defineRule<{ item: string; stratum: string; cluster: string }>({
  code: 'lone-cluster-stratum',
  severity: 'warning',
  message: (p) =>
    `Stratum ${p.stratum} of ${p.item} has a single cluster${p.cluster === '' ? '' : ` (${p.cluster})`}, so its variance cannot be estimated within the stratum; standard errors compare that cluster with the mean cluster of the whole sample instead.`,
});
