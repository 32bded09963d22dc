/**
 * The report's own colours. Built on a blue/orange/grey axis, which stays distinguishable for
 * the common red-green colour-vision deficiencies, and never the only carrier of meaning:
 * every coloured mark also has a shape, a label or a table.
 */
export const PALETTE = {
  blue: '#1d5f9e',
  orange: '#d46f0a',
  grey: '#6e6e6e',
  darkBlue: '#0e365c',
  darkOrange: '#8a4305',
  lightBlue: '#8bb8e0',
  lightOrange: '#f2b774',
  lightGrey: '#c4c4c4',
  ink: '#1b1f24',
  muted: '#59616b',
  rule: '#e3e6ea',
  paper: '#ffffff',
} as const;

/** Qualitative series, in the order categories take them (nominal stacks and legends). */
export const CATEGORY_COLOURS: readonly string[] = [
  PALETTE.blue,
  PALETTE.orange,
  PALETTE.grey,
  PALETTE.lightBlue,
  PALETTE.lightOrange,
  PALETTE.darkBlue,
  PALETTE.darkOrange,
  PALETTE.lightGrey,
];

/** Stops of the sequential ramp (missingness heat map): pale, mid and dark blue. */
export const SEQUENTIAL: readonly [string, string, string] = ['#eef3f8', '#4a8cc9', PALETTE.darkBlue];

/**
 * `count` colours for ordered categories: evenly spaced along the sequential ramp (lightest
 * first), so scale order reads as lightness order.
 * Cost: O(count). Throws nothing.
 */
export function orderedColours(count: number): string[] {
  if (count <= 1) return [PALETTE.blue];
  // The lightest step starts darker than the heat map's zero so that it still shows on paper.
  const stops = [hex('#b9d2ea'), hex(SEQUENTIAL[1]), hex(SEQUENTIAL[2])];
  return Array.from({ length: count }, (_, i) => {
    const t = (i / (count - 1)) * 2;
    const k = Math.min(1, Math.floor(t));
    const [a, b] = [stops[k]!, stops[k + 1]!];
    return `#${a.map((v, c) => Math.round(v + (b[c]! - v) * (t - k)).toString(16).padStart(2, '0')).join('')}`;
  });
}

/** `count` colours for unordered categories: the qualitative list, repeated when it runs out. */
export function categoryColours(count: number): string[] {
  return Array.from({ length: count }, (_, i) => CATEGORY_COLOURS[i % CATEGORY_COLOURS.length]!);
}

function hex(c: string): [number, number, number] {
  return [1, 3, 5].map((i) => parseInt(c.slice(i, i + 2), 16)) as [number, number, number];
}
