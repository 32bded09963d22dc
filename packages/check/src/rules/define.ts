import type { FindingRule, FindingSeverity } from '../types.ts';

/**
 * One rule as data: its stable code, default severity and the formatter that writes the
 * message from typed parameters. The classifier and the pass decide *when* a rule applies;
 * the definition owns *what it says*, so the wording lives in one place per rule.
 */
export interface RuleDef<P> {
  readonly code: FindingRule;
  readonly severity: FindingSeverity;
  message(params: P): string;
}

/** Parameters every cell-level rule can read. */
export interface CellParams {
  item: string;
  value: string;
}

/** A bound for messages: "at least 0", "at most 120", "0 to 120". */
export function describeBounds(min: number | undefined, max: number | undefined): string {
  if (min !== undefined && max !== undefined) return `${min} to ${max}`;
  if (min !== undefined) return `at least ${min}`;
  if (max !== undefined) return `at most ${max}`;
  return 'any value';
}

/** Identity helper that keeps each rule's parameter type. */
export function defineRule<P>(def: RuleDef<P>): RuleDef<P> {
  return def;
}
