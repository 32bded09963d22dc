/**
 * @codeweir/check: classifies every cell of a delivery against a compiled codebook, reports
 * findings, counts missingness by item, record and group, and writes the findings log.
 */
export type * from './types.ts';
export { check, checkDelivery, checkFile } from './check.ts';
export { checkFileParallel, type ParallelOptions } from './parallel.ts';
export { createPass, detachPartial, attachPartial, SLOTS, GROUP_MISSING, GROUP_INVALID, type Pass, type PartialResult, type DetachedPartial, type GroupPartial, type IdColumn } from './pass.ts';
export { mergePartials, finalize, sortAndCapFindings } from './finalize.ts';
export { normalizeCheckOptions, type CheckOptions, type CheckOptionsInput } from './options.ts';
export { compileClassifiers, KINDS, VALID, VALID_WARN, MISSING, INVALID, type Classifiers, type ItemClassifier, type CellOut, type ItemShape } from './classify.ts';
export { mapHeader, type HeaderMap } from './header.ts';
export { parseNumber, parseIsoDate } from './parse.ts';
export { writeCheckOutputs, folderName, findingsCsv, findingsJsonl, missingnessCsv, missingnessByGroupCsv, neutraliseCell, type WriteCheckOptions } from './outputs.ts';
export { rules, RULE_ORDER, RULE_NUMBER, type RuleDef } from './rules/index.ts';
export { missingnessSuppression, invalidSuppressedItems, suppressedSummary, suppressedMissingCells, withholdFindings, tallyCells, SUPPRESSED_MARK, WITHHELD_MARK, type DisclosureOptions, type LineStates, type MissingnessSuppression } from './disclosure.ts';
export { findingsSuppression, INVALIDATING_RULES, SEVERITIES, NO_ROW, NOT_LOGGED, keyRule, keySeverity, KEY_TOTAL, keyRuleAt, keyItemRule, keyCrossRule, keyGroupSeverity, keyGroupTotal, keyGroupRule, type FindingsSuppression, type FindingsSuppressionInput, type FindingsGroup } from './findings-disclosure.ts';
