/**
 * Publishable pictures of time slices as standalone SVG. In 2D: the field over the leaf mesh with
 * colours interpolated linearly within each triangle (by subdividing triangles whose values span
 * more than a small part of the colour range), axes with ticks and coordinates, and a labelled
 * colour bar; a perceptually uniform sequential map for one-signed data and a diverging map
 * (symmetric about 0) for signed data. In 1D: a line graph with axes and ticks. The range is taken
 * from the data unless given; values outside a given range are reported under the colour bar.
 */
import { InvalidArgumentError } from '../errors';
import { checkNumber, checkNumberArray, checkOneOf, checkOptions, checkString } from '../validation/index';
import type { TimeSlice } from '../spacetime/space-time-solution';
import { checkSlice } from './slice-checks';
import { chooseColorMap, colorAnchors, colorAt, type ColorMapName } from './colormap';
import { axesSvg, escapeXml, frameX, frameY, niceTicks, tickLabel, type PlotFrame } from './svg-common';

/** Options of {@link sliceToSvg}. */
export interface SliceSvgOptions {
  title?: string;
  /** Name of the quantity, shown on the colour bar or the vertical axis (default "u"). */
  quantity?: string;
  /** Colour (2D) or vertical-axis (1D) range; defaults to the slice's min/max. */
  range?: [number, number];
  /** Colour map; default: diverging for signed data, sequential otherwise. */
  colorMap?: ColorMapName;
  /** Labels of the coordinate axes (default "x", "y"). */
  axisLabels?: [string, string];
  /** Width of the picture in pixels (default 560). */
  width?: number;
  /**
   * Curves drawn over the field, such as those of concentrated sources (`HeatProblem`'s
   * `curveSources`): polylines `[[x, y], …]` in 2D (a dashed line with a dark edge, legible on
   * every colour), points `[[x]]` in 1D (a dashed vertical line).
   */
  lines?: ArrayLike<number>[][];
}

const fmt = (v: number) => v.toFixed(2);

const SLICE_SVG_KEYS: Record<keyof Required<SliceSvgOptions>, true> = {
  title: true, quantity: true, range: true, colorMap: true, axisLabels: true, width: true, lines: true,
};

/**
 * An SVG picture of one slice.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, rectangleDomain, sliceToSvg } from 'chronomesh';
 * const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
 * const { solution } = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 3)).solve();
 * const svg = sliceToSvg(solution.slice(0.05), { title: 't = 0.05', quantity: 'temperature' });
 * ```
 */
export function sliceToSvg(slice: TimeSlice, opts: SliceSvgOptions = {}): string {
  checkSlice(slice);
  const o = checkOptions<SliceSvgOptions>(opts, 'opts', SLICE_SVG_KEYS);
  if (o.title !== undefined) checkString(o.title, 'opts.title', 1000);
  if (o.quantity !== undefined) checkString(o.quantity, 'opts.quantity', 200);
  if (o.colorMap !== undefined) checkOneOf(o.colorMap, 'opts.colorMap', ['sequential', 'diverging'] as const);
  if (o.axisLabels !== undefined) {
    if (!Array.isArray(o.axisLabels) || o.axisLabels.length !== 2) throw new InvalidArgumentError('opts.axisLabels must be a pair of strings', { field: 'opts.axisLabels' });
    o.axisLabels.forEach((l, i) => checkString(l, `opts.axisLabels[${i}]`, 200));
  }
  if (o.width !== undefined) checkNumber(o.width, 'opts.width', { min: 160, max: 20000 });
  if (o.range !== undefined) {
    checkNumberArray(o.range, 'opts.range', { length: 2 });
    if (!(o.range[0] < o.range[1])) {
      throw new InvalidArgumentError(`opts.range = [${o.range[0]}, ${o.range[1]}] must be increasing (low < high)`, { field: 'opts.range', expected: 'low < high', received: `${o.range[0]}, ${o.range[1]}` });
    }
  }
  if (o.lines !== undefined) {
    const d = slice.mesh.dim;
    if (!Array.isArray(o.lines)) throw new InvalidArgumentError('opts.lines must be an array of curves (arrays of points)', { field: 'opts.lines' });
    o.lines.forEach((line, i) => {
      if (!Array.isArray(line) || line.length === 0) throw new InvalidArgumentError(`opts.lines[${i}] must be a non-empty array of points`, { field: `opts.lines[${i}]` });
      line.forEach((p, k) => checkNumberArray(p, `opts.lines[${i}][${k}]`, { length: d }));
    });
  }
  opts = o;
  return slice.mesh.dim === 2 ? slice2d(slice, opts) : slice1d(slice, opts);
}

function dataRange(values: Float64Array): [number, number] {
  let lo = Infinity, hi = -Infinity;
  for (const v of values) { if (v < lo) lo = v; if (v > hi) hi = v; }
  return [lo, hi];
}

function header(W: number, H: number, title: string | undefined, cx: number): string[] {
  const out = [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H.toFixed(0)}" viewBox="0 0 ${W} ${H.toFixed(0)}" font-family="DejaVu Sans, Arial, sans-serif" font-size="12">`,
    `<rect width="100%" height="100%" fill="white"/>`,
  ];
  if (title) out.push(`<text class="title" x="${cx.toFixed(2)}" y="24" text-anchor="middle" font-size="15">${escapeXml(title)}</text>`);
  return out;
}

function slice2d(slice: TimeSlice, opts: SliceSvgOptions): string {
  const { mesh, values } = slice;
  const c = mesh.coords;
  const [dlo, dhi] = dataRange(values);
  let [lo, hi] = opts.range ?? [dlo, dhi];
  const map = opts.colorMap ?? chooseColorMap(lo, hi);
  if (map === 'diverging' && !opts.range) { const m = Math.max(-lo, hi); lo = -m; hi = m; }
  if (!(hi > lo)) { const m = Math.abs(lo) > 0 ? Math.abs(lo) * 1e-3 : 0.5; lo -= m; hi += m; }
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
  for (let i = 0; i < mesh.vertexCount; i++) {
    x0 = Math.min(x0, c[2 * i]!); x1 = Math.max(x1, c[2 * i]!);
    y0 = Math.min(y0, c[2 * i + 1]!); y1 = Math.max(y1, c[2 * i + 1]!);
  }
  const W = opts.width ?? 560;
  const left = 64, right = 120, top = 40, bottom = 50;
  const plotW = W - left - right;
  const plotH = Math.min(2.5 * plotW, Math.max(0.2 * plotW, (plotW * (y1 - y0)) / (x1 - x0)));
  const f: PlotFrame = { left, top, width: plotW, height: plotH, x0, x1, y0, y1 };
  const H = top + plotH + bottom;
  const out = header(W, H, opts.title, left + plotW / 2);
  const col = (v: number) => colorAt(map, (v - lo) / (hi - lo));
  // Field: each triangle split into n² similar sub-triangles, n chosen from how much of the colour
  // range its values span, each filled with the colour of the linear interpolant at its centroid.
  out.push('<g class="field" stroke-width="0.6" stroke-linejoin="round">');
  const span = hi - lo;
  const tri = (ax: number, ay: number, bx: number, by: number, cx: number, cy: number, v: number) => {
    const k = col(v);
    out.push(`<polygon points="${fmt(frameX(f, ax))},${fmt(frameY(f, ay))} ${fmt(frameX(f, bx))},${fmt(frameY(f, by))} ${fmt(frameX(f, cx))},${fmt(frameY(f, cy))}" fill="${k}" stroke="${k}"/>`);
  };
  for (let e = 0; e < mesh.elementCount; e++) {
    const i0 = mesh.elements[3 * e]!, i1 = mesh.elements[3 * e + 1]!, i2 = mesh.elements[3 * e + 2]!;
    const v0 = values[i0]!, v1 = values[i1]!, v2 = values[i2]!;
    const ax = c[2 * i0]!, ay = c[2 * i0 + 1]!, bx = c[2 * i1]!, by = c[2 * i1 + 1]!, cx = c[2 * i2]!, cy = c[2 * i2 + 1]!;
    const spread = Math.max(v0, v1, v2) - Math.min(v0, v1, v2);
    const n = Math.max(1, Math.min(6, Math.ceil((32 * spread) / span)));
    // Barycentric lattice: point (i, j) = A + (i/n)(B − A) + (j/n)(C − A).
    const P = (i: number, j: number): [number, number, number] => {
      const s = i / n, t = j / n;
      return [ax + s * (bx - ax) + t * (cx - ax), ay + s * (by - ay) + t * (cy - ay), v0 + s * (v1 - v0) + t * (v2 - v0)];
    };
    for (let j = 0; j < n; j++) {
      for (let i = 0; i + j < n; i++) {
        const p = P(i, j), q = P(i + 1, j), r = P(i, j + 1);
        tri(p[0], p[1], q[0], q[1], r[0], r[1], (p[2] + q[2] + r[2]) / 3);
        if (i + j + 1 < n) {
          const s = P(i + 1, j + 1);
          tri(q[0], q[1], s[0], s[1], r[0], r[1], (q[2] + s[2] + r[2]) / 3);
        }
      }
    }
  }
  out.push('</g>');
  if (opts.lines && opts.lines.length > 0) {
    out.push('<g class="lines" fill="none" stroke-linejoin="round" stroke-linecap="round">');
    for (const line of opts.lines) {
      const pts = line.map((p) => `${fmt(frameX(f, p[0]!))},${fmt(frameY(f, p[1]!))}`).join(' ');
      out.push(`<polyline points="${pts}" stroke="#111" stroke-width="3"/>`, `<polyline points="${pts}" stroke="#fff" stroke-width="1.4" stroke-dasharray="5 3"/>`);
    }
    out.push('</g>');
  }
  out.push(axesSvg(f, opts.axisLabels?.[0] ?? 'x', opts.axisLabels?.[1] ?? 'y'));
  // Colour bar: a linear gradient through the map's anchors (the same sRGB interpolation as above).
  const bx = left + plotW + 22, bw = 16, by0 = top, bh = plotH;
  const anchors = colorAnchors(map);
  out.push('<g class="colorbar">');
  out.push(`<defs><linearGradient id="colorbar-gradient" x1="0" y1="1" x2="0" y2="0">${anchors.map((a, i) => `<stop offset="${(i / (anchors.length - 1)).toFixed(4)}" stop-color="${a}"/>`).join('')}</linearGradient></defs>`);
  out.push(`<rect class="colorbar-ramp" x="${bx}" y="${by0}" width="${bw}" height="${bh.toFixed(2)}" fill="url(#colorbar-gradient)" stroke="#222"/>`);
  const ticks = niceTicks(lo, hi, Math.max(3, Math.round(bh / 50)));
  const step = ticks.length > 1 ? ticks[1]! - ticks[0]! : Math.abs(hi - lo) || 1;
  for (const v of ticks) {
    const y = by0 + bh - ((v - lo) / (hi - lo)) * bh;
    out.push(`<line class="tick colorbar-tick" x1="${bx + bw}" y1="${fmt(y)}" x2="${bx + bw + 5}" y2="${fmt(y)}" stroke="#222"/>`);
    out.push(`<text class="tick-label colorbar-tick-label" x="${bx + bw + 8}" y="${fmt(y + 4)}">${escapeXml(tickLabel(v, step))}</text>`);
  }
  const q = opts.quantity ?? 'u';
  out.push(`<text class="colorbar-label" transform="translate(${bx + bw + 62} ${fmt(by0 + bh / 2)}) rotate(-90)" text-anchor="middle">${escapeXml(q)}</text>`);
  if (opts.range && (dlo < lo || dhi > hi)) {
    out.push(`<text class="range-note" x="${bx - 6}" y="${fmt(by0 + bh + 34)}" font-size="10" fill="#b00">data ${escapeXml(dlo.toPrecision(3))} … ${escapeXml(dhi.toPrecision(3))} exceed the range</text>`);
  }
  out.push('</g>', '</svg>', '');
  return out.join('\n');
}

function slice1d(slice: TimeSlice, opts: SliceSvgOptions): string {
  const { mesh, values } = slice;
  const [dlo, dhi] = dataRange(values);
  let [lo, hi] = opts.range ?? [dlo, dhi];
  if (!opts.range) { const pad = 0.05 * (hi - lo); lo -= pad; hi += pad; }
  if (!(hi > lo)) { const m = Math.abs(lo) > 0 ? Math.abs(lo) * 0.1 : 0.5; lo -= m; hi += m; }
  let x0 = Infinity, x1 = -Infinity;
  for (let i = 0; i < mesh.vertexCount; i++) { x0 = Math.min(x0, mesh.coords[i]!); x1 = Math.max(x1, mesh.coords[i]!); }
  const W = opts.width ?? 560;
  const left = 72, right = 24, top = 40, bottom = 50;
  const plotW = W - left - right, plotH = Math.round(plotW * 0.55);
  const f: PlotFrame = { left, top, width: plotW, height: plotH, x0, x1, y0: lo, y1: hi };
  const out = header(W, top + plotH + bottom, opts.title, left + plotW / 2);
  out.push(`<defs><clipPath id="plot-area"><rect x="${left}" y="${top}" width="${plotW}" height="${plotH}"/></clipPath></defs>`);
  if (lo < 0 && hi > 0) out.push(`<line class="zero-line" x1="${left}" y1="${fmt(frameY(f, 0))}" x2="${left + plotW}" y2="${fmt(frameY(f, 0))}" stroke="#bbb"/>`);
  const order = Array.from({ length: mesh.vertexCount }, (_, i) => i).sort((a, b) => mesh.coords[a]! - mesh.coords[b]!);
  for (const line of opts.lines ?? []) {
    for (const p of line) {
      const x = fmt(frameX(f, p[0]!));
      out.push(`<line class="line-marker" x1="${x}" y1="${top}" x2="${x}" y2="${top + plotH}" stroke="#888" stroke-dasharray="5 3"/>`);
    }
  }
  out.push(`<polyline class="graph" clip-path="url(#plot-area)" fill="none" stroke="#1f4e99" stroke-width="2" stroke-linejoin="round" points="${order.map((i) => `${fmt(frameX(f, mesh.coords[i]!))},${fmt(frameY(f, values[i]!))}`).join(' ')}"/>`);
  out.push(axesSvg(f, opts.axisLabels?.[0] ?? 'x', opts.quantity ?? 'u'));
  if (opts.range && (dlo < lo || dhi > hi)) {
    out.push(`<text class="range-note" x="${left + plotW}" y="${top - 6}" text-anchor="end" font-size="10" fill="#b00">data ${escapeXml(dlo.toPrecision(3))} … ${escapeXml(dhi.toPrecision(3))} exceed the range</text>`);
  }
  out.push('</svg>', '');
  return out.join('\n');
}
