/**
 * @codeweir/ledger: a fieldwork season remembered. Every delivery checked with `--ledger` is
 * appended to one DuckDB file (counts by item, kind of missing and group; by rule, item and
 * group; valid-value summaries; one hash per record), and any two deliveries are compared:
 * records added, removed and changed, codes that appeared or disappeared, missingness before
 * and after, and the drift of each item's distribution.
 */
export { snapshotFromCheck, NOT_BY_GROUP, type DeliverySnapshot, type ItemSnapshot, type GroupSnapshot, type FindingCount } from './snapshot.ts';
export { readRecords, fileHash, fnv1a, rowHash, GROUP_MISSING, GROUP_INVALID, type RecordSet } from './records.ts';
export { codedDrift, numericDrift, driftConventions, normalizeThresholds, DEFAULT_THRESHOLDS, type Drift, type DriftThresholds } from './drift.ts';
export { compareSnapshots, recordsCsv, type Comparison, type CompareJson, type CompareOptions, type ItemChange, type GroupChange, type RecordChange, type DeliveryRef, type Before } from './compare.ts';
export { Ledger, DEFAULT_LEDGER_WAIT_MS, type LedgerOptions, type DeliveryRow, type AppendResult } from './ledger.ts';
export { MIGRATIONS, SCHEMA_VERSION } from './schema.ts';
export { ledgerHistory, type History, type HistoryOptions } from './history.ts';
