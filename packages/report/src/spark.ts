/**
 * Small inline charts for the item index: plain SVG written here (no chart library), one row
 * high, so that the index shows each item's shape at a glance. The cards hold the full charts.
 */
import { escapeHtml as esc } from './escape.ts';
import { PALETTE } from './palette.ts';

export const SPARK_WIDTH = 132;
export const SPARK_HEIGHT = 20;

/**
 * Bars of the given heights side by side, scaled to the largest; `touching` draws a histogram
 * (no gaps, a continuum), otherwise separate bars (distinct categories). `label` is the
 * accessible name. Cost: O(values). Throws nothing.
 * @example sparkBars([3, 5, 1], 'age: 3 bins', true)
 */
export function sparkBars(values: readonly number[], label: string, touching: boolean): string {
  // A suppressed count (NaN, see disclosure.ts) would give a bar away: no sparkline then.
  if (values.length === 0 || values.some((v) => Number.isNaN(v))) return '';
  const top = Math.max(...values);
  const n = values.length;
  const step = SPARK_WIDTH / n;
  const gap = touching ? 0 : Math.min(2, step * 0.25);
  const bars = values
    .map((v, i) => {
      const h = top > 0 ? Math.max(v > 0 ? 1 : 0, (v / top) * (SPARK_HEIGHT - 1)) : 0;
      return `<rect x="${(i * step + gap / 2).toFixed(2)}" y="${(SPARK_HEIGHT - h).toFixed(2)}" width="${Math.max(0.5, step - gap).toFixed(2)}" height="${h.toFixed(2)}"/>`;
    })
    .join('');
  return `<svg class="spark" width="${SPARK_WIDTH}" height="${SPARK_HEIGHT}" viewBox="0 0 ${SPARK_WIDTH} ${SPARK_HEIGHT}" role="img"><title>${esc(label)}</title><line x1="0" y1="${SPARK_HEIGHT - 0.5}" x2="${SPARK_WIDTH}" y2="${SPARK_HEIGHT - 0.5}" stroke="${PALETTE.rule}"/><g fill="${PALETTE.blue}">${bars}</g></svg>`;
}
