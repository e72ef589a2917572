/**
 * Curve colours, hot to cool: the curve at the least negative grid (most current) glows like an
 * ember, more negative grids cool towards blue. Colours are picked by a curve's place in the
 * plan, so they do not shift while a live sweep adds curves.
 */
const DARK_STOPS = [
  '#ffd166',
  '#ff9f4a',
  '#ff6f3c',
  '#ef4f5f',
  '#d6479a',
  '#a35ad6',
  '#6f72f0',
  '#3f95f2',
  '#29b6c6',
  '#3fc48b',
];
const LIGHT_STOPS = [
  '#b07800',
  '#d0661a',
  '#c8431f',
  '#b8283f',
  '#a3226f',
  '#7a34a8',
  '#4a4fc4',
  '#1f6fc4',
  '#0d8597',
  '#1f8a5b',
];

/** Colour of curve `index` of `count` in the given scheme. */
export function curveColour(index: number, count: number, dark: boolean): string {
  const stops = dark ? DARK_STOPS : LIGHT_STOPS;
  if (count <= 1) return stops[1];
  const at = Math.round((index / (count - 1)) * (stops.length - 1));
  return stops[Math.min(Math.max(at, 0), stops.length - 1)];
}
