// Outside oracles for the bivariate statistics tests: the R 4.2.2 values in
// test/reference/r-oracle.json (keys correlation, mahalanobis, chisq, etaSquared) and
// the jStat library (npm `jstat`, which ships no type declarations).
import { createRequire } from 'node:module';
import { R } from './oracle.ts';

export interface RChiSquare {
  table: number[][];
  statistic: number;
  df: number;
  p: number;
  expected: number[][];
  cramersV: number;
  phi: number | null;
}

export interface RBivariate {
  correlation: {
    x: number[];
    y: number[];
    pearson: number;
    spearman: number;
    tiesX: number[];
    tiesY: number[];
    tiesPearson: number;
    tiesSpearman: number;
  };
  mahalanobis: { cutoff_chisq2_0999: number; flagged_rows_1based: number[]; max_d2: number };
  chisq: Record<'t2x2' | 't3x4' | 'sparse', RChiSquare>;
  etaSquared: { group: number[]; y: number[]; etaSquared: number };
}

export const RB = R as unknown as RBivariate;

/** The jStat functions the bivariate tests call. */
export interface JStatBivariate {
  corrcoeff(x: number[], y: number[]): number;
  spearmancoeff(x: number[], y: number[]): number;
  chisquare: { cdf(x: number, df: number): number; inv(p: number, df: number): number };
}

export const jStat = (createRequire(import.meta.url)('jstat') as { jStat: JStatBivariate }).jStat;

/** Expands a counts table into one (row index, column index) observation per counted unit. */
export function expandTable(table: number[][]): { rows: number[]; columns: number[] } {
  const rows: number[] = [];
  const columns: number[] = [];
  table.forEach((row, i) =>
    row.forEach((count, j) => {
      for (let k = 0; k < count; k++) {
        rows.push(i);
        columns.push(j);
      }
    }),
  );
  return { rows, columns };
}
