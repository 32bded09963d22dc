import { describe, it, expect } from 'vitest';
import { renderChart, barChart, histogram, orderedColours, categoryColours, CATEGORY_COLOURS, escapeHtml } from '../src/index.ts';

/** Rectangles vega draws for bar marks: `d="Mx,yh{w}v{h}h-{w}Z"`. */
function rects(svg: string): Array<{ x: number; y: number; w: number; h: number }> {
  const marks = svg.slice(svg.indexOf('role-mark'));
  return [...marks.matchAll(/aria-roledescription="bar" d="M([\d.-]+),([\d.-]+)h([\d.-]+)v([\d.-]+)h/g)].map((m) => ({ x: +m[1]!, y: +m[2]!, w: +m[3]!, h: +m[4]! }));
}

describe('charts', () => {
  it('separates category bars and lets histogram bins touch', async () => {
    const bars = await renderChart({ id: 'b', ...barChart('t', 'd', [{ key: 'a', count: 3, percent: 30 }, { key: 'b', count: 5, percent: 50 }, { key: 'c', count: 2, percent: 20 }]) });
    const r = rects(bars).sort((p, q) => p.y - q.y);
    expect(r).toHaveLength(3);
    for (let i = 1; i < r.length; i++) expect(r[i]!.y).toBeGreaterThan(r[i - 1]!.y + r[i - 1]!.h);
    const hist = await renderChart({ id: 'h', ...histogram('t', 'd', [0, 10, 20, 30], [4, 7, 2], 'x') });
    const h = rects(hist).sort((p, q) => p.x - q.x);
    expect(h).toHaveLength(3);
    for (let i = 1; i < h.length; i++) expect(h[i]!.x).toBeCloseTo(h[i - 1]!.x + h[i - 1]!.w, 6);
  });

  it('gives every chart a role, a title and a description, all escaped', async () => {
    const svg = await renderChart({ id: 'e', ...barChart('<b>t</b>', 'a & "b"', [{ key: '<script>alert(1)</script>', count: 1, percent: 100 }]) });
    expect(svg.startsWith('<svg id="e" role="img" aria-labelledby="e-t e-d"')).toBe(true);
    expect(svg).toContain(`<title id="e-t">${escapeHtml('<b>t</b>')}</title><desc id="e-d">${escapeHtml('a & "b"')}</desc>`);
    // vega writes the category as an axis label (cut to the label width) and in the mark's
    // aria label, which becomes its hover title, escaped both times.
    expect(svg).toContain('>&lt;script&gt;alert(1)&lt;/s\u2026</text>');
    expect(svg).toContain('<title>&lt;script&gt;alert(1)&lt;/script&gt;: 1 (100.0%)</title>');
    expect(/<script/i.test(svg)).toBe(false);
  });
});

describe('palette', () => {
  // WCAG 2 relative luminance: sRGB channels linearised, weighted 0.2126 R + 0.7152 G + 0.0722 B.
  const luminance = (hex: string) => {
    const [r, g, b] = [1, 3, 5].map((i) => {
      const c = parseInt(hex.slice(i, i + 2), 16) / 255;
      return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
    }) as [number, number, number];
    return 0.2126 * r + 0.7152 * g + 0.0722 * b;
  };

  it('orders ordinal colours from light to dark, so scale order reads without hue', () => {
    const c = orderedColours(5);
    for (let i = 1; i < c.length; i++) expect(luminance(c[i]!)).toBeLessThan(luminance(c[i - 1]!));
  });

  it('gives distinct qualitative colours up to the palette size, then repeats', () => {
    expect(new Set(categoryColours(CATEGORY_COLOURS.length)).size).toBe(CATEGORY_COLOURS.length);
    expect(categoryColours(CATEGORY_COLOURS.length + 1).at(-1)).toBe(CATEGORY_COLOURS[0]);
  });
});
