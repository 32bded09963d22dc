/**
 * The `describe --json` document (interface contract) and the fields issue-level features add.
 * Consumers: report, cli. Extend, do not rename. `percent` values are 0 to 100.
 */
import type { Level, MissingTally } from '@codeweir/codebook';

export interface Frequency {
  code: number | string;
  label: string;
  count: number;
  percent: number;
  /** Ordinal (and binned) items only, in scale order. */
  cumulativePercent?: number;
  /** With weights: weighted count and percent. */
  weightedCount?: number;
  weightedPercent?: number;
}

export interface Fences {
  lower: number;
  upper: number;
  lowerExtreme: number;
  upperExtreme: number;
}

export interface OrdinalPosition {
  code: number | string;
  label: string;
}

export interface ItemDescription {
  level: Level | 'text';
  label: string;
  unit?: string;
  binned?: boolean;
  /** Valid cells only. */
  n: number;
  missing: Partial<Record<MissingTally, number>>;
  invalid: number;
  frequencies?: Frequency[];
  /** Nominal: frequency table order used. */
  order?: 'code' | 'scale';
  mode?: Array<number | string>;
  median?: number;
  q1?: number;
  q3?: number;
  iqr?: number;
  /** Ordinal items: median and quartiles as codes with labels. */
  medianCode?: OrdinalPosition;
  q1Code?: OrdinalPosition;
  q3Code?: OrdinalPosition;
  /** Ordinal IQR in scale steps (positions), named so. */
  percentiles?: Record<string, number>;
  /** Ordinal items: requested percentiles (key: percent, e.g. "10") as categories. */
  percentileCodes?: Record<string, OrdinalPosition>;
  mean?: number;
  sd?: number;
  min?: number;
  max?: number;
  range?: number;
  skewness?: number;
  kurtosis?: number;
  cv?: number;
  geometricMean?: number;
  /** Binned items: grouped-data median interpolated within the median bin. */
  groupedMedian?: number;
  fences?: Fences;
  outliers?: number;
  extremes?: number;
  /** Most extreme values beyond the fences, lowest and highest. */
  outlierValues?: { low: number[]; high: number[] };
  /** Set when outliers move the mean or sd materially; states the rule and recommends median and IQR. */
  outlierNote?: string;
  /** Histogram counts for the report (Freedman-Diaconis bins by default). */
  histogram?: { rule: string; edges: number[]; counts: number[] };
  weighted?: {
    sumOfWeights: number;
    n: number;
    excluded: number;
    mean?: number;
    sd?: number;
    median?: number;
    q1?: number;
    q3?: number;
    /** Ordinal items: weighted median and quartiles as categories. */
    medianCode?: OrdinalPosition;
    q1Code?: OrdinalPosition;
    q3Code?: OrdinalPosition;
    percent?: Record<string, number>;
  } & DesignFigures;
  /** With a design and `by`: design-based estimates in each domain (key: the by item's code). */
  domains?: Record<string, DomainEstimate>;
  /** Statistic name -> reason it is not given for this item. */
  withheld: Record<string, string>;
  /** Conventions in use (quantile type, ddof, skewness estimator...). */
  conventions?: Record<string, string>;
}

/** A 95% confidence interval and how it was made. */
export interface Interval {
  low: number;
  high: number;
  method: string;
}

/**
 * Design-based figures (present with a sample design): a mean's standard error, design effect,
 * effective sample size and interval as numbers; for coded items the same per code, keyed by
 * code (percent units for `percentSe` and the interval). null where undefined (no variation).
 */
export interface DesignFigures {
  se?: number | null;
  percentSe?: Record<string, number | null>;
  deff?: number | null | Record<string, number | null>;
  nEffective?: number | null | Record<string, number | null>;
  ci?: Interval | null | Record<string, Interval | null>;
  /** Design degrees of freedom of the cases used (clusters minus strata). */
  df?: number;
}

/** One domain's design-based estimates. */
export interface DomainEstimate extends DesignFigures {
  label: string;
  /** Cases used: in the domain, valid, with a usable design row. */
  n: number;
  sumOfWeights: number;
  mean?: number;
  percent?: Record<string, number>;
}

/** The sample design the estimates used. */
export interface DesignSummary {
  weight: string | null;
  strata: string | null;
  cluster: string | null;
  fpc: string | null;
  by?: string;
  /** How fpc values were read: population counts of clusters, or sampling fractions. */
  fpcAs?: 'population count' | 'sampling fraction';
  strataCount: number;
  clusters: number;
  /** Clusters minus strata. */
  df: number;
  /** Rows outside every estimate: weight missing or not positive, stratum, cluster or fpc unknown. */
  excludedRows: number;
  /** Strata with a single cluster (codes) and how they enter the variance. */
  singleCluster: { rule: 'adjust'; strata: string[]; note?: string };
}

export interface GroupSummary {
  code: number | string;
  label: string;
  n: number;
  mean: number | null;
  sd: number | null;
  median: number | null;
  q1: number | null;
  q3: number | null;
  fences?: Fences | null;
  outliers?: number;
  extremes?: number;
}

export interface PairCategorical {
  x: string;
  y: string;
  kind: 'categorical-categorical';
  n: number;
  rows: OrdinalPosition[];
  columns: OrdinalPosition[];
  table: number[][];
  expected: number[][];
  rowPercent: number[][];
  columnPercent: number[][];
  cellPercent: number[][];
  chiSquare: number | null;
  df: number;
  p: number | null;
  cramersV: number | null;
  phi: number | null;
  /** Share (0-100) of expected counts below 5. */
  lowExpectedPercent: number;
  warnings: string[];
  spearman?: number | null;
  gamma?: number | null;
  /** Present when the pair was computed on listwise-complete rows (valid on every requested item). */
  listwise?: true;
  /** Conventions of the statistics given (continuity correction, how empty rows are handled...). */
  conventions?: Record<string, string>;
}

export interface PairContinuous {
  x: string;
  y: string;
  kind: 'continuous-continuous';
  n: number;
  pearson: number | null;
  spearman: number | null;
  /** 1-based data rows whose squared Mahalanobis distance exceeds the chi-square(2) 0.999 point. */
  bivariateOutliers: number[];
  mahalanobisCutoff: number;
  notes: string[];
  /** A sample of points for the scatter plot (all when small). */
  sample?: Array<[number, number]>;
  /** 1-based data rows of `sample`, same order. */
  sampleRows?: number[];
  /** Largest squared Mahalanobis distance among the pairs (null when undefined). */
  maxMahalanobis?: number | null;
  listwise?: true;
  conventions?: Record<string, string>;
}

export interface PairMixed {
  x: string;
  y: string;
  kind: 'categorical-continuous';
  n: number;
  groups: GroupSummary[];
  etaSquared: number | null;
  /** True when the pair was requested continuous-first: x is always the categorical item. */
  swapped?: boolean;
  listwise?: true;
  conventions?: Record<string, string>;
}

export type PairDescription = PairCategorical | PairContinuous | PairMixed;

export interface DescribeResult {
  quantileType: number;
  weight?: string;
  listwise?: boolean;
  rows: number;
  items: Record<string, ItemDescription>;
  pairs: PairDescription[];
  conventions: Record<string, string>;
  /** Present with a sample design (codebook `design` or a design option). */
  design?: DesignSummary;
}
