/**
 * The registry of finding rules: one definition per file, keyed by its stable code so a typo in
 * a code is a compile error. `RULE_ORDER` fixes a number per rule for the hot path (counters
 * are typed arrays indexed by it) and the tie order of findings on the same row and item.
 */
import type { FindingRule } from '../types.ts';
import type { RuleDef } from './define.ts';
import { missingColumn } from './missing-column.ts';
import { unexpectedColumn } from './unexpected-column.ts';
import { duplicateColumn } from './duplicate-column.ts';
import { columnOrder } from './column-order.ts';
import { raggedRow } from './ragged-row.ts';
import { notANumber } from './not-a-number.ts';
import { notAnInteger } from './not-an-integer.ts';
import { notADate } from './not-a-date.ts';
import { notACode } from './not-a-code.ts';
import { unbinnedValue } from './unbinned-value.ts';
import { unbinnedColumn } from './unbinned-column.ts';
import { impossible } from './impossible.ts';
import { implausible } from './implausible.ts';
import { patternMismatch } from './pattern-mismatch.ts';
import { duplicateId } from './duplicate-id.ts';
import { answeredWhenSkipped } from './answered-when-skipped.ts';
import { blankWhenAsked } from './blank-when-asked.ts';
import { missingCodeWhenSkipped } from './missing-code-when-skipped.ts';
import { ruleFailed } from './rule-failed.ts';
import { outlier } from './outlier.ts';
import { extreme } from './extreme.ts';
import { surroundingSpace } from './surrounding-space.ts';
import { noRows } from './no-rows.ts';
import { loneClusterStratum } from './lone-cluster-stratum.ts';
import { clusterAcrossStrata } from './cluster-across-strata.ts';
import { weightNotPositive } from './weight-not-positive.ts';

export { describeBounds, type RuleDef, type CellParams } from './define.ts';

export const rules = {
  'missing-column': missingColumn,
  'unexpected-column': unexpectedColumn,
  'duplicate-column': duplicateColumn,
  'column-order': columnOrder,
  'no-rows': noRows,
  'ragged-row': raggedRow,
  'surrounding-space': surroundingSpace,
  'unbinned-column': unbinnedColumn,
  'not-a-number': notANumber,
  'not-an-integer': notAnInteger,
  'not-a-date': notADate,
  'not-a-code': notACode,
  'unbinned-value': unbinnedValue,
  impossible,
  implausible,
  'pattern-mismatch': patternMismatch,
  'duplicate-id': duplicateId,
  'answered-when-skipped': answeredWhenSkipped,
  'blank-when-asked': blankWhenAsked,
  'missing-code-when-skipped': missingCodeWhenSkipped,
  'rule-failed': ruleFailed,
  outlier,
  extreme,
  'weight-not-positive': weightNotPositive,
  'lone-cluster-stratum': loneClusterStratum,
  'cluster-across-strata': clusterAcrossStrata,
} as const satisfies { [K in FindingRule]: RuleDef<never> };

/** Every rule in a fixed order; the position is the rule's number in counters. */
export const RULE_ORDER = Object.keys(rules) as FindingRule[];

/** Rule code -> its number in {@link RULE_ORDER}. */
export const RULE_NUMBER: Readonly<Record<FindingRule, number>> = Object.fromEntries(
  RULE_ORDER.map((r, i) => [r, i]),
) as Record<FindingRule, number>;
