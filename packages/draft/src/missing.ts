/**
 * Guessing missing-value codes from the data alone.
 *
 * The rule (common practice in survey data, stated so a person can judge it):
 * - a number is a candidate only if it has a conventional sentinel shape: a negative whole
 *   number -1 to -9 or made of 9s (-99, -98, -999, ...), or a positive whole number made of 9s
 *   whose last digit may be 6, 7 or 8 (9, 8, 99, 98, 97, 999, 998, 9999, ...);
 * - it must sit apart at an end of the column: positive candidates are the longest run of such
 *   values at the top whose lowest member lies more than 1 above every other value (so at least
 *   one whole number between them is unused); negative candidates are such values among the
 *   lowest of a column whose other values are 0 or more, but for at most 0.5% stray negatives
 *   (typos, which a check reports);
 * - at most four candidates per end, and at least one ordinary value must remain.
 * The kind is guessed from the last digit (9 refused, 8 don't know, 7 not applicable,
 * 6 not administered, anything else omitted), again common practice and often wrong: every
 * guess carries a marker for a person to confirm.
 */
import type { MissingKind } from '@codeweir/codebook';
import type { ColumnProfile, Edge } from './profile.ts';

const MAX_PER_END = 4;
/** Share of other negative numbers tolerated as typos beside negative sentinels (our own threshold). */
export const STRAY_SHARE = 0.005;
const POSITIVE_SENTINEL = /^9*[6-9]$/;
const NEGATIVE_SENTINEL = /^-(?:[1-9]|9+[6-9])$/;

export interface MissingGuess {
  code: number | string;
  kind: MissingKind;
  count: number;
}

/** The kind conventionally meant by a sentinel's last digit. */
export function kindOfSentinel(code: number): MissingKind {
  switch (Math.abs(code) % 10) {
    case 9:
      return 'refused';
    case 8:
      return 'dont-know';
    case 7:
      return 'not-applicable';
    case 6:
      return 'not-administered';
    default:
      return 'omitted';
  }
}

/** The run of sentinel-shaped values at one end of an edge list, nearest the end first. */
function sentinelRun(edge: Edge, shape: RegExp): Edge {
  const run: Edge = [];
  for (const e of edge) {
    if (run.length === MAX_PER_END || !Number.isInteger(e[0]) || !shape.test(String(e[0]))) break;
    run.push(e);
  }
  return run;
}

/**
 * Candidate missing codes of a numeric column by the rule above, from its edge lists. Cost:
 * O(EDGE_VALUES). Throws nothing. A column whose values are all sentinel-shaped yields none,
 * since no ordinary value remains to set them apart from.
 */
export function numericMissingCandidates(p: ColumnProfile): MissingGuess[] {
  const out: MissingGuess[] = [];
  // The longest part of the top run that clears the gap: in 1..7 plus 9, 7 and 6 look like
  // sentinels but touch the values below them, while 9 stands apart.
  const top = sentinelRun(p.high, POSITIVE_SENTINEL);
  for (let k = top.length; k > 0; k--) {
    const bodyMax = p.high[k];
    if (bodyMax !== undefined && top[k - 1][0] - bodyMax[0] > 1) {
      for (const [code, count] of top.slice(0, k)) out.push({ code, kind: kindOfSentinel(code), count });
      break;
    }
  }
  // Negative sentinels among the lowest values; other negatives may be a few typos (which a
  // check reports as impossible) but no more, or the column simply has negative values.
  const bottom = p.low.filter(([v]) => v < 0 && Number.isInteger(v) && NEGATIVE_SENTINEL.test(String(v))).slice(0, MAX_PER_END);
  const inBottom = bottom.reduce((a, [, n]) => a + n, 0);
  const hasBody = p.high.length > 0 && p.high[0][0] >= 0;
  if (bottom.length > 0 && hasBody && p.negatives - inBottom <= STRAY_SHARE * p.numbers) {
    for (const [code, count] of bottom) out.push({ code, kind: kindOfSentinel(code), count });
  }
  // A column with fewer distinct values than the edge holds has its whole range in both lists;
  // a value must not be claimed by both ends.
  const seen = new Set<number | string>();
  return out.filter((g) => (seen.has(g.code) ? false : (seen.add(g.code), true))).sort((a, b) => Number(a.code) - Number(b.code));
}

/** Conventional text tokens for missing answers (compared case-insensitively, whole cell). */
const TEXT_TOKENS: ReadonlyMap<string, MissingKind> = new Map([
  ['dk', 'dont-know'],
  ["don't know", 'dont-know'],
  ['ref', 'refused'],
  ['rf', 'refused'],
  ['refused', 'refused'],
  ['na', 'not-applicable'],
  ['n/a', 'not-applicable'],
  ['nr', 'omitted'],
]);

/** Cells of a text column that are conventional missing tokens (DK, REF, NA, N/A, NR), as written. */
export function textMissingCandidates(p: ColumnProfile): MissingGuess[] {
  const out: MissingGuess[] = [];
  for (const [text, count] of p.texts) {
    const kind = TEXT_TOKENS.get(text.toLowerCase());
    if (kind) out.push({ code: text, kind, count });
  }
  return out.sort((a, b) => String(a.code).localeCompare(String(b.code)));
}

