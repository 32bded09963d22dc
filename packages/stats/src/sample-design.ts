/**
 * The first-stage structure of a complex sample, resolved once per data set so that every
 * design-based estimate afterwards is a pass over the rows plus a pass over the clusters.
 *
 * Convention: clusters (primary sampling units) are sampled with replacement within strata (the
 * usual first-stage approximation); a cluster is the pair (stratum, cluster value), so cluster
 * numbers reused in each stratum are distinct clusters. Without a cluster item every row is its
 * own cluster; without a strata item the sample is one stratum. A finite population correction
 * is (1 - f_h) with f_h = n_h / N_h when the fpc value is a population count of clusters (above
 * 1) or f_h itself when every fpc value is at most 1 (a sampling fraction).
 */
import { CodeweirError } from '@codeweir/core';

/** How a stratum with a single cluster enters the variance. */
export type SingleClusterRule = 'adjust';

/** The inputs: one entry per row. */
export interface SampleDesignInput {
  /** Row weights; NaN, 0 or negative: the row takes no part in any estimate. */
  weights: ArrayLike<number>;
  /** Stratum key per row (any integer); -1 marks a row whose stratum is unknown (excluded). */
  strata?: ArrayLike<number>;
  /** Cluster key per row (any integer); -1 marks a row whose cluster is unknown (excluded). */
  clusters?: ArrayLike<number>;
  /** Population count of clusters of the row's stratum, or its sampling fraction; NaN: unknown (excluded). */
  fpc?: ArrayLike<number>;
}

/** The resolved design. */
export interface SampleDesign {
  rows: number;
  /** Usable weight per row: 0 where the row is excluded. */
  weights: Float64Array;
  /** Cluster number per row (0-based, into the per-cluster arrays); -1: row excluded. */
  clusterOfRow: Int32Array;
  /** Stratum number (0-based) of each cluster. */
  stratumOfCluster: Int32Array;
  /** Clusters in each stratum (n_h), from the whole sample. */
  clustersInStratum: Int32Array;
  /** Finite population correction factor (1 - f_h) of each stratum; 1 without fpc. */
  fpcFactor: Float64Array;
  /** Stratum keys as given (the `strata` input values), by stratum number. */
  strataKeys: number[];
  /** Stratum numbers with a single cluster. */
  singleClusterStrata: number[];
  singleCluster: SingleClusterRule;
  /** Rows left out: weight missing or not positive, stratum, cluster or fpc unknown. */
  excludedRows: number;
  /** Whether fpc values were read as sampling fractions (true) or population counts (false); absent without fpc. */
  fpcAsFraction?: boolean;
}

/**
 * Resolves the design from per-row weights, strata, clusters and fpc values (see the file
 * comment for the conventions). Single-cluster strata are kept and flagged: their one cluster
 * is compared with the mean cluster total of the whole sample ('adjust'), the way that
 * neither drops the stratum's variance nor fails.
 * Cost: O(rows) with one map lookup per row. Throws CodeweirError CW_USAGE (exit code 2) when fpc values mix
 * fractions and counts, differ within a stratum, are not positive, or a stratum has more
 * clusters than its population count.
 * @example resolveSampleDesign({ weights: [2, 2, 3], strata: [1, 1, 2] }).clustersInStratum // Int32Array [2, 1]
 */
export function resolveSampleDesign(input: SampleDesignInput): SampleDesign {
  const rows = input.weights.length;
  const weights = new Float64Array(rows);
  const clusterOfRow = new Int32Array(rows).fill(-1);
  const stratumAt = new Map<number, number>();
  const strataKeys: number[] = [];
  const clusterAt = new Map<string, number>();
  const stratumOfCluster: number[] = [];
  const fpcOfStratum: number[] = [];
  let excludedRows = 0;
  for (let r = 0; r < rows; r++) {
    const w = input.weights[r]!;
    const sKey = input.strata ? input.strata[r]! : 0;
    const cKey = input.clusters ? input.clusters[r]! : r;
    const fpc = input.fpc ? input.fpc[r]! : Number.NaN;
    if (!(w > 0) || sKey < 0 || cKey < 0 || (input.fpc && Number.isNaN(fpc))) {
      excludedRows++;
      continue;
    }
    let s = stratumAt.get(sKey);
    if (s === undefined) {
      s = strataKeys.length;
      stratumAt.set(sKey, s);
      strataKeys.push(sKey);
      fpcOfStratum.push(fpc);
    } else if (input.fpc && fpcOfStratum[s] !== fpc) {
      throw new CodeweirError('CW_USAGE', `The fpc value differs within stratum ${sKey} (${fpcOfStratum[s]} and ${fpc} on row ${r + 1}); it must be one value per stratum.`);
    }
    const pair = `${s}:${cKey}`;
    let c = clusterAt.get(pair);
    if (c === undefined) {
      c = stratumOfCluster.length;
      clusterAt.set(pair, c);
      stratumOfCluster.push(s);
    }
    clusterOfRow[r] = c;
    weights[r] = w;
  }
  const clustersInStratum = new Int32Array(strataKeys.length);
  for (const s of stratumOfCluster) clustersInStratum[s]!++;
  const fpcFactor = new Float64Array(strataKeys.length).fill(1);
  const design: SampleDesign = {
    rows,
    weights,
    clusterOfRow,
    stratumOfCluster: Int32Array.from(stratumOfCluster),
    clustersInStratum,
    fpcFactor,
    strataKeys,
    singleClusterStrata: [],
    singleCluster: 'adjust',
    excludedRows,
  };
  if (input.fpc && strataKeys.length > 0) {
    if (fpcOfStratum.some((f) => !(f > 0))) throw new CodeweirError('CW_USAGE', 'Every fpc value must be a positive number (a population count of clusters or a sampling fraction).');
    const asFraction = fpcOfStratum.every((f) => f <= 1);
    if (!asFraction && fpcOfStratum.some((f) => f <= 1)) {
      throw new CodeweirError('CW_USAGE', 'The fpc values mix sampling fractions (at most 1) and population counts (above 1); give one or the other.');
    }
    design.fpcAsFraction = asFraction;
    fpcOfStratum.forEach((f, s) => {
      const n = clustersInStratum[s]!;
      if (!asFraction && n > f) {
        throw new CodeweirError('CW_USAGE', `Stratum ${strataKeys[s]} has ${n} sampled clusters but an fpc population count of ${f}.`);
      }
      fpcFactor[s] = asFraction ? 1 - f : 1 - n / f;
    });
  }
  clustersInStratum.forEach((n, s) => {
    if (n === 1) design.singleClusterStrata.push(s);
  });
  return design;
}

/**
 * Degrees of freedom of the design for the rows where `counts(r)` holds: clusters with at
 * least one such row minus strata with at least one such row (at least 0).
 * Cost: O(rows + clusters). Throws nothing.
 */
export function designDegreesOfFreedom(design: SampleDesign, counts: (row: number) => boolean): number {
  const seenCluster = new Uint8Array(design.stratumOfCluster.length);
  const seenStratum = new Uint8Array(design.clustersInStratum.length);
  let clusters = 0;
  let strata = 0;
  for (let r = 0; r < design.rows; r++) {
    const c = design.clusterOfRow[r]!;
    if (c < 0 || seenCluster[c] || !counts(r)) continue;
    seenCluster[c] = 1;
    clusters++;
    const s = design.stratumOfCluster[c]!;
    if (!seenStratum[s]) {
      seenStratum[s] = 1;
      strata++;
    }
  }
  return Math.max(0, clusters - strata);
}
