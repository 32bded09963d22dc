/**
 * The reference values that survey-design.R wrote with R's survey package (survey-design.json),
 * typed, and the paths of the files beside them, for the tests of design-based estimates.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

/** Absolute path of a file in test/reference. */
export const referenceFile = (f: string): string => fileURLToPath(new URL(f, import.meta.url));

/** One R estimate: a mean, or the proportion (0 to 1) of one code; overall or in one domain. */
export interface SurveyEstimate {
  kind: 'mean' | 'percent';
  item: string;
  code?: string | number;
  by?: string;
  domain?: string | number;
  n: number;
  estimate: number;
  se: number;
  /** "NaN" where R's deff is not defined (no variation). */
  deff: number | string;
  df: number;
  ciLow: number;
  ciHigh: number;
}

export interface SurveyCase {
  name: string;
  file: string;
  design: { weight: string; strata?: string; cluster?: string; fpc?: string; singleCluster?: string };
  degf: number;
  estimates: SurveyEstimate[];
}

export interface SurveyReference {
  source: string;
  cases: SurveyCase[];
  replace: { item: string; estimate: number; se: number; deff: number };
}

export const surveyReference = JSON.parse(readFileSync(referenceFile('survey-design.json'), 'utf8')) as SurveyReference;
