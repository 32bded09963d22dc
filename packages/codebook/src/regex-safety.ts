/**
 * Screening of user-written patterns for catastrophic backtracking. safe-regex2 measures star
 * height (a repeated group that itself contains a repetition, as in `(a+)+`); it does not see
 * ambiguity between alternatives under a repetition, as in `(a|a)*` or `(a|ab)+`, where the
 * engine can split the same text in exponentially many ways. {@link ambiguousRepetition}
 * covers that: conservative by design (it may reject a harmless pattern; a rejected pattern
 * can be rewritten, a hung check cannot be undone).
 */
import safeRegex from 'safe-regex2';

interface Group {
  /** Start of the current alternative's first atom, or undefined until one is seen. */
  firsts: Array<string | null>;
  current: string | null | undefined;
  innerRepeat: boolean;
}

// Characters sampled to decide whether two first atoms can match the same character.
const SAMPLE = Array.from({ length: 0x7f - 0x09 }, (_, k) => String.fromCharCode(0x09 + k)).concat(['\u00e9', '\u00a0', '\u4e00']);

function overlap(a: string | null, b: string | null): boolean {
  if (a === null || b === null) return true;
  try {
    const ra = new RegExp(`^(?:${a})$`, 'u');
    const rb = new RegExp(`^(?:${b})$`, 'u');
    return SAMPLE.some((c) => ra.test(c) && rb.test(c));
  } catch {
    return true;
  }
}

/** Reads the atom at `i`: returns its source (null when not a single-character atom) and end. */
function atomAt(p: string, i: number): { src: string | null; end: number } {
  const c = p[i]!;
  if (c === '\\') {
    const e = p[i + 1] ?? '';
    return { src: /[dDwWsS]|[^a-zA-Z0-9]/.test(e) ? `\\${e}` : null, end: i + 2 };
  }
  if (c === '[') {
    let j = i + 1;
    if (p[j] === '^') j++;
    if (p[j] === ']') j++;
    while (j < p.length && p[j] !== ']') j += p[j] === '\\' ? 2 : 1;
    return { src: p.slice(i, j + 1), end: j + 1 };
  }
  if (c === '.') return { src: '.', end: i + 1 };
  return { src: c.replace(/[$^*+?()[\]{}|/]/g, '\\$&'), end: i + 1 };
}

/** Length of a quantifier at `i` and whether it lets its operand repeat without a bound. */
function quantifierAt(p: string, i: number): { len: number; unbounded: boolean; variable: boolean } | undefined {
  const c = p[i];
  let len = 0;
  let unbounded = false;
  let variable = false;
  if (c === '*' || c === '+') {
    len = 1;
    unbounded = true;
    variable = true;
  } else if (c === '?') {
    len = 1;
    variable = true;
  } else if (c === '{') {
    const m = /^\{(\d+)(,(\d*))?\}/.exec(p.slice(i));
    if (!m) return undefined;
    len = m[0].length;
    unbounded = m[2] !== undefined && m[3] === '';
    variable = m[2] !== undefined && (m[3] === '' || Number(m[3]) > Number(m[1]));
  } else return undefined;
  if (p[i + len] === '?') len++;
  return { len, unbounded, variable };
}

/**
 * True when a group repeated without bound contains an unbounded repetition, an empty
 * alternative, or two alternatives that can begin with the same character. Linear scan.
 */
export function ambiguousRepetition(pattern: string): boolean {
  const stack: Group[] = [{ firsts: [], current: undefined, innerRepeat: false }];
  let i = 0;
  while (i < pattern.length) {
    const c = pattern[i]!;
    const top = stack[stack.length - 1]!;
    if (c === '(') {
      top.current ??= null;
      let j = i + 1;
      if (pattern[j] === '?') {
        const m = /^\?(?::|=|!|<=|<!|<[A-Za-z_][A-Za-z0-9_]*>)/.exec(pattern.slice(j));
        j += m ? m[0].length : 1;
      }
      stack.push({ firsts: [], current: undefined, innerRepeat: false });
      i = j;
      continue;
    }
    if (c === '|') {
      top.firsts.push(top.current ?? null);
      top.current = undefined;
      i++;
      continue;
    }
    if (c === ')' && stack.length > 1) {
      const g = stack.pop()!;
      g.firsts.push(g.current ?? null);
      const q = quantifierAt(pattern, i + 1);
      const parent = stack[stack.length - 1]!;
      if (q?.unbounded) {
        if (g.innerRepeat) return true;
        if (g.firsts.length > 1) {
          if (g.firsts.some((f) => f === null)) return true;
          for (let a = 0; a < g.firsts.length; a++) for (let b = a + 1; b < g.firsts.length; b++) if (overlap(g.firsts[a]!, g.firsts[b]!)) return true;
        }
      }
      if (g.innerRepeat || q?.unbounded) parent.innerRepeat = true;
      i += 1 + (q?.len ?? 0);
      continue;
    }
    if (c === '^' || c === '$') {
      i++;
      continue;
    }
    const a = atomAt(pattern, i);
    if (top.current === undefined) top.current = a.src;
    i = a.end;
    const q = quantifierAt(pattern, i);
    if (q) {
      // A first atom that may be skipped (a?, a*) does not fix the first character.
      if (q.variable && top.current === a.src && !q.unbounded && q.len > 0) top.current = null;
      if (q.unbounded) top.innerRepeat = true;
      i += q.len;
    }
  }
  return false;
}

/**
 * True when `pattern` may backtrack catastrophically: safe-regex2's star-height test fails or
 * {@link ambiguousRepetition} finds ambiguous alternatives under a repetition.
 */
export function isUnsafePattern(pattern: string): boolean {
  return !safeRegex(pattern) || ambiguousRepetition(pattern);
}
