/**
 * Lint problems as data: a stable `code` from {@link ProblemCode}, a JSON pointer `path`, a
 * severity and a message. Every code and its severity is declared once here, so a typo in a
 * check is a compile error and the lint report can be filtered by code.
 */
import type { Problem, Severity } from './compiled.ts';

/** Every problem code lint can report, with its severity. */
export const PROBLEM_SEVERITY = {
  // File and schema
  'json-syntax': 'error',
  'duplicate-key': 'error',
  'unknown-field': 'error',
  'missing-field': 'error',
  'wrong-type': 'error',
  'invalid-value': 'error',
  schema: 'error',
  // Items
  'duplicate-item': 'error',
  'level-required': 'error',
  'level-type': 'error',
  'codes-required': 'error',
  'role-type': 'error',
  'multiple-id': 'error',
  'multiple-weight': 'error',
  // Codes and bins
  'duplicate-code': 'error',
  'code-type': 'error',
  'bin-missing': 'error',
  'bin-inverted': 'error',
  'bins-overlap': 'error',
  'bins-gap': 'warning',
  'binned-not-ordinal': 'error',
  // Missing codes
  'unknown-missing-set': 'error',
  'unused-missing-set': 'warning',
  'duplicate-missing-code': 'error',
  'missing-collides': 'error',
  'missing-in-range': 'warning',
  'missing-in-bin': 'error',
  // Bounds
  'range-type': 'error',
  'range-inverted': 'error',
  'expect-inverted': 'error',
  'expect-outside-range': 'error',
  // Patterns
  'pattern-type': 'error',
  'pattern-invalid': 'error',
  'pattern-unsafe': 'error',
  // Expressions
  'cel-syntax': 'error',
  'cel-type': 'error',
  'cel-unknown-item': 'error',
  'cel-not-boolean': 'error',
  'cel-too-deep': 'error',
  'asked-when-self': 'error',
  'asked-when-cycle': 'error',
  'cel-bad-date': 'error',
  'duplicate-rule-id': 'error',
  // Sample design
  'design-unknown-item': 'error',
  'design-item-repeated': 'error',
  'design-item-type': 'error',
  // Labels and languages
  'language-tag': 'error',
  'label-language-missing': 'warning',
  'label-language-undeclared': 'warning',
} as const satisfies Record<string, Severity>;

export type ProblemCode = keyof typeof PROBLEM_SEVERITY;

/** A lint problem whose code is one of {@link ProblemCode}. */
export interface CodebookProblem extends Problem {
  code: ProblemCode;
  /** For problems inside a string value (CEL): 0-based index of the offending character. */
  charIndex?: number;
}

/** Builds a problem with the declared severity of its code. */
export function problem(code: ProblemCode, path: string, message: string): CodebookProblem {
  return { path, code, severity: PROBLEM_SEVERITY[code], message };
}

/** True when any problem is at error severity. */
export function hasErrors(problems: readonly Problem[]): boolean {
  return problems.some((p) => p.severity === 'error');
}

/**
 * Edit distance with adjacent transpositions (optimal string alignment): insert, delete,
 * substitute and swap two neighbouring characters each cost 1, so "lable" is 1 from "label".
 * Cost: O(a x b) time and memory (names are short).
 */
export function editDistance(a: string, b: string): number {
  const d: number[][] = Array.from({ length: a.length + 1 }, (_, i) => [i, ...Array<number>(b.length).fill(0)]);
  for (let j = 1; j <= b.length; j++) d[0]![j] = j;
  for (let i = 1; i <= a.length; i++) {
    for (let j = 1; j <= b.length; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let v = Math.min(d[i - 1]![j]! + 1, d[i]![j - 1]! + 1, d[i - 1]![j - 1]! + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) v = Math.min(v, d[i - 2]![j - 2]! + 1);
      d[i]![j] = v;
    }
  }
  return d[a.length]![b.length]!;
}

/**
 * The candidate closest to `word` by edit distance (ignoring case), when it is close enough to
 * be a plausible typo: at most a third of the word's length, and at least 1 (common practice
 * for "did you mean" hints). Ties go to the earlier candidate.
 */
export function closest(word: string, candidates: Iterable<string>): string | undefined {
  let best: string | undefined;
  let bestD = Infinity;
  const w = word.toLowerCase();
  for (const c of candidates) {
    const d = editDistance(w, c.toLowerCase());
    if (d < bestD) {
      bestD = d;
      best = c;
    }
  }
  const limit = Math.max(1, Math.floor(word.length / 3));
  return best !== undefined && bestD <= limit ? best : undefined;
}

/** " (did you mean "x"?)" or "" when nothing is close. */
export function didYouMean(word: string, candidates: Iterable<string>): string {
  const c = closest(word, candidates);
  return c === undefined ? '' : ` (did you mean "${c}"?)`;
}
