/** Number formatting for the report: fixed en-US digits so a report reads the same everywhere. */

const INT = new Intl.NumberFormat('en-US', { maximumFractionDigits: 0 });

/**
 * A statistic for display: integers with digit grouping, other values with four significant
 * digits (at least one decimal above 1000), `-` for null, undefined or NaN.
 * Cost: O(1). Throws nothing.
 */
export function formatNumber(x: number | null | undefined): string {
  if (x === null || x === undefined || Number.isNaN(x)) return '-';
  if (!Number.isFinite(x)) return x > 0 ? '+inf' : '-inf';
  if (Number.isInteger(x)) return INT.format(x);
  const abs = Math.abs(x);
  if (abs >= 1000) return new Intl.NumberFormat('en-US', { minimumFractionDigits: 1, maximumFractionDigits: 1 }).format(x);
  if (abs < 1e-4) return x.toExponential(2);
  return String(Number(x.toPrecision(4)));
}

/** A percentage already on the 0 to 100 scale, one decimal: `12.3%`. */
export function formatPercent(p: number | null | undefined): string {
  if (p === null || p === undefined || Number.isNaN(p)) return '-';
  return `${p.toFixed(1)}%`;
}

/** A p-value: three decimals, `< 0.001` below that (common practice). */
export function formatP(p: number | null | undefined): string {
  if (p === null || p === undefined || Number.isNaN(p)) return '-';
  return p < 0.001 ? '< 0.001' : p.toFixed(3);
}

const DAY_MS = 86_400_000;

/** A date item's value (whole days since 1970-01-01, as check parses dates) as YYYY-MM-DD. */
export function formatDate(days: number | null | undefined): string {
  if (days === null || days === undefined || !Number.isFinite(days)) return '-';
  return new Date(Math.round(days * DAY_MS)).toISOString().slice(0, 10);
}

/** Days since 1970-01-01 to epoch milliseconds, for temporal chart axes. */
export function daysToMs(days: number): number {
  return days * DAY_MS;
}
