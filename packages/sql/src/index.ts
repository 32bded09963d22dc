/**
 * @codeweir/sql: a codebook's checks compiled to SQL (DuckDB, PostgreSQL, and an ANSI dialect
 * for distributed engines), and the engines that run that SQL and give the built-in check's
 * outputs. DuckDB and the PostgreSQL client are loaded by dynamic import only when used.
 */
export { compileCheckSql, type CompiledSql, type CompileSqlOptions, type SqlSource } from './compile.ts';
export { celToSql, type ExpressionSite, type VariableSql } from './cel-sql.ts';
export { dialectOf, DIALECTS, ident, lit, type Dialect, type DialectName } from './dialect.ts';
export { checkWithEngine, checkWithDuckDb, checkWithPostgres, resultFromSql, type EngineOptions, type RunQuery, type SqlRow } from './engine.ts';
export { sqlScript, type ScriptOptions } from './script.ts';
