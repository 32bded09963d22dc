/** Types of the SQL peer's plain-JavaScript runner. */
export interface QuerySpec {
  setup: string[];
  queries: Record<string, string>;
}
export function runQueries(spec: QuerySpec): Promise<Record<string, Array<Record<string, unknown>>>>;
