/**
 * Quick-look pictures of time slices as standalone SVG: a filled triangle
 * map with a colour bar in 2D, a line graph in 1D. For real post-processing
 * use the VTK export.
 */
import { InvalidArgumentError } from '../errors';
import { checkNumber, checkNumberArray, checkOptions, checkString } from '../validation/index';
import type { TimeSlice } from '../spacetime/space-time-solution';
import { checkSlice } from './slice-checks';

const SLICE_SVG_KEYS: Record<keyof Required<SliceSvgOptions>, true> = { title: true, range: true, width: true };

/** Options of {@link sliceToSvg}. */
export interface SliceSvgOptions {
  title?: string;
  /** Colour range; defaults to the slice's min/max. */
  range?: [number, number];
  width?: number;
}

// A perceptually ordered blue–white–red ramp (common practice for signed fields).
const RAMP: [number, number, number][] = [[49, 54, 149], [116, 173, 209], [224, 243, 248], [253, 174, 97], [165, 0, 38]];

function color(v: number, lo: number, hi: number): string {
  const s = hi > lo ? Math.min(1, Math.max(0, (v - lo) / (hi - lo))) : 0.5;
  const x = s * (RAMP.length - 1);
  const i = Math.min(RAMP.length - 2, Math.floor(x));
  const f = x - i;
  const c = RAMP[i]!.map((a, k) => Math.round(a + f * (RAMP[i + 1]![k]! - a)));
  return `rgb(${c[0]},${c[1]},${c[2]})`;
}

/**
 * An SVG picture of one slice.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, rectangleDomain, sliceToSvg } from 'chronomesh';
 * const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
 * const { solution } = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 3)).solve();
 * const svg = sliceToSvg(solution.slice(0.05), { title: 't = 0.05' });
 * ```
 */
export function sliceToSvg(slice: TimeSlice, opts: SliceSvgOptions = {}): string {
  checkSlice(slice);
  const o = checkOptions<SliceSvgOptions>(opts, 'opts', SLICE_SVG_KEYS);
  if (o.title !== undefined) checkString(o.title, 'opts.title', 1000);
  if (o.width !== undefined) checkNumber(o.width, 'opts.width', { min: 160, max: 20000 });
  if (o.range !== undefined) {
    checkNumberArray(o.range, 'opts.range', { length: 2 });
    if (!(o.range[0] < o.range[1])) {
      throw new InvalidArgumentError(`opts.range = [${o.range[0]}, ${o.range[1]}] must be increasing (low < high)`, { field: 'opts.range', expected: 'low < high', received: `${o.range[0]}, ${o.range[1]}` });
    }
  }
  opts = o;
  const { mesh, values } = slice;
  const W = opts.width ?? 520;
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) { lo = Math.min(lo, v); hi = Math.max(hi, v); }
  if (opts.range) [lo, hi] = opts.range;
  const d = mesh.dim;
  let xmin = Infinity, xmax = -Infinity, ymin = Infinity, ymax = -Infinity;
  for (let i = 0; i < mesh.vertexCount; i++) {
    const x = mesh.coords[d * i]!;
    const y = d === 2 ? mesh.coords[2 * i + 1]! : values[i]!;
    xmin = Math.min(xmin, x); xmax = Math.max(xmax, x);
    ymin = Math.min(ymin, y); ymax = Math.max(ymax, y);
  }
  if (d === 1) { ymin = Math.min(ymin, lo); ymax = Math.max(ymax, hi); }
  if (!(ymax > ymin)) { ymin -= 0.5; ymax += 0.5; }
  const pad = 40;
  const plotW = W - 2 * pad - (d === 2 ? 70 : 0);
  const plotH = d === 2 ? (plotW * (ymax - ymin)) / Math.max(xmax - xmin, 1e-300) : plotW * 0.6;
  const H = plotH + 2 * pad;
  const sx = (x: number) => pad + ((x - xmin) / (xmax - xmin)) * plotW;
  const sy = (y: number) => pad + plotH - ((y - ymin) / (ymax - ymin)) * plotH;
  const out: string[] = [`<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H.toFixed(0)}" font-family="sans-serif" font-size="12">`, `<rect width="100%" height="100%" fill="white"/>`];
  if (opts.title) out.push(`<text x="${W / 2}" y="${pad - 14}" text-anchor="middle" font-size="14">${opts.title.replace(/</g, '&lt;')}</text>`);
  const k = d + 1;
  if (d === 2) {
    for (let e = 0; e < mesh.elementCount; e++) {
      let avg = 0;
      const pts: string[] = [];
      for (let j = 0; j < k; j++) {
        const i = mesh.elements[k * e + j]!;
        avg += values[i]! / k;
        pts.push(`${sx(mesh.coords[2 * i]!).toFixed(2)},${sy(mesh.coords[2 * i + 1]!).toFixed(2)}`);
      }
      const c = color(avg, lo, hi);
      out.push(`<polygon points="${pts.join(' ')}" fill="${c}" stroke="${c}" stroke-width="0.3"/>`);
    }
    const bx = pad + plotW + 24;
    for (let s = 0; s < 50; s++) {
      out.push(`<rect x="${bx}" y="${(pad + plotH - ((s + 1) / 50) * plotH).toFixed(2)}" width="16" height="${(plotH / 50 + 0.5).toFixed(2)}" fill="${color(lo + ((s + 0.5) / 50) * (hi - lo), lo, hi)}"/>`);
    }
    out.push(`<text x="${bx + 20}" y="${pad + 4}">${hi.toPrecision(3)}</text>`, `<text x="${bx + 20}" y="${pad + plotH}">${lo.toPrecision(3)}</text>`);
  } else {
    const order = Array.from({ length: mesh.vertexCount }, (_, i) => i).sort((a, b) => mesh.coords[a]! - mesh.coords[b]!);
    out.push(`<line x1="${pad}" y1="${sy(0)}" x2="${pad + plotW}" y2="${sy(0)}" stroke="#bbb"/>`);
    out.push(`<polyline fill="none" stroke="#1f77b4" stroke-width="2" points="${order.map((i) => `${sx(mesh.coords[i]!).toFixed(2)},${sy(values[i]!).toFixed(2)}`).join(' ')}"/>`);
    out.push(`<text x="${pad}" y="${sy(ymax) - 4}">${ymax.toPrecision(3)}</text>`, `<text x="${pad}" y="${sy(ymin) + 14}">${ymin.toPrecision(3)}</text>`);
  }
  out.push('</svg>', '');
  return out.join('\n');
}
