/**
 * The ledger's tables, as forward migrations: migration k takes a ledger from schema k - 1 to
 * schema k, and `schema_version` holds the version reached. A ledger is never migrated
 * backwards; one written by a newer codeweir is refused, not guessed at.
 *
 * Schema 1: deliveries and their counts. Schema 2 adds what record-level comparison and the
 * drift of interval and ratio items need (sorted valid values, record hashes). Deliveries
 * recorded under schema 1 keep their counts and have no values or records.
 */

/** Every group column holds '' (and the group code '') in the row of the whole delivery. */
export const MIGRATIONS: readonly (readonly string[])[] = [
  [
    `CREATE TABLE deliveries (
      id INTEGER PRIMARY KEY, file VARCHAR NOT NULL, hash VARCHAR NOT NULL UNIQUE,
      codebook VARCHAR NOT NULL, codebook_version VARCHAR NOT NULL, checked_at VARCHAR NOT NULL,
      rows BIGINT NOT NULL, verdict VARCHAR NOT NULL, errors BIGINT NOT NULL, warnings BIGINT NOT NULL)`,
    `CREATE TABLE item_counts (delivery INTEGER NOT NULL, item VARCHAR NOT NULL, level VARCHAR, absent BOOLEAN NOT NULL, valid BIGINT NOT NULL, invalid BIGINT NOT NULL)`,
    `CREATE TABLE missing_counts (delivery INTEGER NOT NULL, item VARCHAR NOT NULL, kind VARCHAR NOT NULL, group_item VARCHAR NOT NULL, group_code VARCHAR NOT NULL, n BIGINT NOT NULL)`,
    `CREATE TABLE group_counts (delivery INTEGER NOT NULL, group_item VARCHAR NOT NULL, group_code VARCHAR NOT NULL, rows BIGINT NOT NULL, cells BIGINT NOT NULL, missing_cells BIGINT NOT NULL, invalid_cells BIGINT NOT NULL)`,
    `CREATE TABLE finding_counts (delivery INTEGER NOT NULL, rule VARCHAR NOT NULL, item VARCHAR NOT NULL, group_item VARCHAR NOT NULL, group_code VARCHAR NOT NULL, n BIGINT NOT NULL)`,
    `CREATE TABLE code_counts (delivery INTEGER NOT NULL, item VARCHAR NOT NULL, position INTEGER NOT NULL, code VARCHAR NOT NULL, n BIGINT NOT NULL)`,
  ],
  [
    // Sorted valid values as little-endian float64, 8 bytes a value.
    `CREATE TABLE item_values (delivery INTEGER NOT NULL, item VARCHAR NOT NULL, n BIGINT NOT NULL, sorted_values BLOB NOT NULL)`,
    `CREATE TABLE record_sets (delivery INTEGER PRIMARY KEY, id_item VARCHAR NOT NULL, items VARCHAR[] NOT NULL, group_items VARCHAR[] NOT NULL, duplicates BIGINT NOT NULL, unidentified BIGINT NOT NULL)`,
    // cell_hashes: one little-endian uint32 FNV-1a hash per item of record_sets.items;
    // group_codes: the record's code of each of record_sets.group_items, joined by chr(31) (a
    // list column would cost DuckDB's appender ten times as much per record).
    `CREATE TABLE records (delivery INTEGER NOT NULL, record_id VARCHAR NOT NULL, row_hash VARCHAR NOT NULL, cell_hashes BLOB NOT NULL, group_codes VARCHAR NOT NULL)`,
  ],
];

/** The schema version this codeweir writes. */
export const SCHEMA_VERSION = MIGRATIONS.length;
