/**
 * Strict number and date parsing for cells. `Number()` alone is too lenient for a delivery
 * check (it reads "" as 0, "0x1A" as 26 and " 7" as 7), so only plain decimal notation is
 * accepted: optional sign, digits, one decimal mark, optional exponent.
 */

const DECIMAL = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

function parseSlow(s: string, decimalComma: boolean): number {
  let t = s;
  if (decimalComma) {
    // With a decimal comma a full stop is ambiguous (a thousands separator in many locales),
    // so it makes the cell not a number rather than silently a different value.
    if (t.indexOf('.') !== -1) return Number.NaN;
    t = t.replace(',', '.');
  }
  if (!DECIMAL.test(t)) return Number.NaN;
  const v = Number(t);
  return Number.isFinite(v) ? v + 0 : Number.NaN;
}

/**
 * Parses an already trimmed cell as a number; NaN when it is not one.
 *
 * Convention: plain decimal notation only (sign, digits, `.` or with `decimalComma` `,`,
 * exponent); no thousands separators, no hex, no Infinity; -0 reads as 0. Cost: O(length),
 * with a loop-only fast path for up to 15 digits (mantissa / 10^k, correctly rounded). Throws nothing.
 * @example parseNumber('-9', false) // -9
 */
export function parseNumber(s: string, decimalComma: boolean): number {
  const n = s.length;
  if (n === 0) return Number.NaN;
  let i = 0;
  let neg = false;
  let c = s.charCodeAt(0);
  if (c === 45) {
    neg = true;
    i = 1;
  } else if (c === 43) i = 1;
  if (i === n) return Number.NaN;
  const mark = decimalComma ? 44 : 46;
  let m = 0;
  let digits = 0;
  let frac = -1;
  for (; i < n; i++) {
    c = s.charCodeAt(i);
    const d = c - 48;
    if (d >= 0 && d <= 9) {
      m = m * 10 + d;
      digits++;
      if (frac >= 0) frac++;
    } else if (c === mark && frac < 0) frac = 0;
    else break;
  }
  // Up to 15 digits the mantissa m is exact, and so is 10^k (k <= 22): one division of two
  // exact doubles is correctly rounded, so this equals what Number() gives for the same text.
  if (i === n && digits > 0 && digits <= 15) {
    const v = frac > 0 ? m / POW10[frac]! : m;
    return neg ? 0 - v : v;
  }
  return parseSlow(s, decimalComma);
}

const POW10 = Float64Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;
const DAY_MS = 86_400_000;

/**
 * Parses an already trimmed cell written YYYY-MM-DD (ISO 8601 calendar date) into whole days
 * since 1970-01-01 (proleptic Gregorian, UTC); NaN when it is not a real date (2023-02-30 is not).
 * Cost: one regular expression and one Date.UTC. Throws nothing.
 * @example parseIsoDate('1970-01-02') // 1
 */
export function parseIsoDate(s: string): number {
  const m = ISO_DATE.exec(s);
  if (m === null) return Number.NaN;
  const y = Number(m[1]);
  const mo = Number(m[2]);
  const d = Number(m[3]);
  if (mo < 1 || mo > 12 || d < 1 || d > 31) return Number.NaN;
  const ms = Date.UTC(y, mo - 1, d);
  const back = new Date(ms);
  if (back.getUTCFullYear() !== y || back.getUTCMonth() !== mo - 1 || back.getUTCDate() !== d) return Number.NaN;
  return ms / DAY_MS;
}
