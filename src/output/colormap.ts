/**
 * Colour maps of the slice pictures. Sequential: viridis (perceptually uniform; the map sampled at 10 equally spaced points
 * of the published map, interpolated linearly in sRGB). Diverging: Moreland's cool-to-warm map
 * (K. Moreland, "Diverging Color Maps for Scientific Visualization", ISVC 2009; 9 anchors, values
 * from memory of the paper's table), for signed data with white-grey at zero.
 */

/**
 * Colour map of a slice picture: `'sequential'` (viridis) or `'diverging'` (cool-to-warm, white-grey
 * at zero, for signed data).
 *
 * @example
 * ```ts
 * import type { ColorMapName } from 'chronomesh';
 * const map: ColorMapName = 'diverging';
 * console.log(map); // → diverging
 * ```
 */
export type ColorMapName = 'sequential' | 'diverging';

const VIRIDIS = ['#440154', '#482878', '#3e4989', '#31688e', '#26828e', '#1f9e89', '#35b779', '#6ece58', '#b5de2b', '#fde725'];
const COOL_WARM: [number, number, number][] = [
  [59, 76, 192], [98, 130, 234], [141, 176, 254], [184, 208, 249], [221, 221, 221],
  [245, 196, 173], [244, 154, 123], [222, 96, 77], [180, 4, 38],
];

function hex(h: string): [number, number, number] {
  return [parseInt(h.slice(1, 3), 16), parseInt(h.slice(3, 5), 16), parseInt(h.slice(5, 7), 16)];
}

const ANCHORS: Record<ColorMapName, [number, number, number][]> = { sequential: VIRIDIS.map(hex), diverging: COOL_WARM };

/** Anchor colours of a map, evenly spaced on [0, 1] (for SVG gradients). */
export function colorAnchors(map: ColorMapName): string[] {
  return ANCHORS[map].map(([r, g, b]) => `rgb(${r},${g},${b})`);
}

/** Colour of s ∈ [0, 1] (clamped) as `#rrggbb`. */
export function colorAt(map: ColorMapName, s: number): string {
  const a = ANCHORS[map];
  const x = Math.min(1, Math.max(0, Number.isFinite(s) ? s : 0)) * (a.length - 1);
  const i = Math.min(a.length - 2, Math.floor(x));
  const f = x - i;
  let out = '#';
  for (let k = 0; k < 3; k++) {
    const v = Math.round(a[i]![k]! + f * (a[i + 1]![k]! - a[i]![k]!));
    out += v.toString(16).padStart(2, '0');
  }
  return out;
}

/**
 * The map for data in [lo, hi]: diverging when the data clearly take both signs (each sign
 * reaching 2% of the largest magnitude), sequential otherwise (small undershoots of a one-signed
 * field do not switch the map).
 */
export function chooseColorMap(lo: number, hi: number): ColorMapName {
  const m = Math.max(Math.abs(lo), Math.abs(hi));
  return lo < -0.02 * m && hi > 0.02 * m ? 'diverging' : 'sequential';
}
