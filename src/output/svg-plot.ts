/**
 * Log–log convergence plots as standalone SVG: error (or estimator) against
 * the number of unknowns, one polyline per series, dashed reference slopes
 * anchored at the first point of the first series, decade grid lines.
 */
import { InvalidArgumentError } from '../errors';
import { checkNumber, checkNumberArray, checkObject, checkOptions, checkString } from '../validation/index';

const PLOT_KEYS: Record<keyof Required<PlotOptions>, true> = { title: true, xLabel: true, yLabel: true, referenceSlopes: true, width: true, height: true };

/** One curve of a {@link convergencePlotSvg}. */
export interface PlotSeries {
  label: string;
  /** (unknowns, value) pairs, both > 0. */
  points: [number, number][];
}

/** Options of {@link convergencePlotSvg}. */
export interface PlotOptions {
  title?: string;
  xLabel?: string;
  yLabel?: string;
  /** Reference slopes drawn as dashed lines, e.g. `[-0.5, -1]`. */
  referenceSlopes?: number[];
  width?: number;
  height?: number;
}

const DASHES = ['6 4', '2 3', '10 3 2 3'];
const COLORS = ['#1f77b4', '#d62728', '#2ca02c', '#9467bd', '#ff7f0e', '#17becf'];

/**
 * A log–log plot of the given series.
 *
 * @example
 * ```ts
 * import { convergencePlotSvg } from 'chronomesh';
 * const svg = convergencePlotSvg([{ label: 'sparse', points: [[100, 0.1], [400, 0.05], [1600, 0.025]] }], { referenceSlopes: [-0.5] });
 * ```
 */
export function convergencePlotSvg(series: PlotSeries[], opts: PlotOptions = {}): string {
  if (!Array.isArray(series)) checkObject(series, 'series', 'an array of { label, points }');
  series.forEach((s, i) => {
    checkObject(s, `series[${i}]`, 'a series { label, points: [x, y][] }');
    checkString(s.label, `series[${i}].label`, 200);
    if (!Array.isArray(s.points)) checkObject(s.points, `series[${i}].points`, 'an array of [x, y] pairs');
    s.points.forEach((p, j) => checkNumberArray(p, `series[${i}].points[${j}]`, { length: 2, finite: false }));
  });
  const o = checkOptions<PlotOptions>(opts, 'opts', PLOT_KEYS);
  for (const k of ['title', 'xLabel', 'yLabel'] as const) if (o[k] !== undefined) checkString(o[k], `opts.${k}`, 1000);
  if (o.width !== undefined) checkNumber(o.width, 'opts.width', { min: 320, max: 20000 });
  if (o.height !== undefined) checkNumber(o.height, 'opts.height', { min: 200, max: 20000 });
  if (o.referenceSlopes !== undefined) {
    checkNumberArray(o.referenceSlopes, 'opts.referenceSlopes', { maxLength: 16 });
    o.referenceSlopes.forEach((r, i) => checkNumber(r, `opts.referenceSlopes[${i}]`, { min: -20, max: 20 }));
  }
  opts = o;
  const W = opts.width ?? 640;
  const H = opts.height ?? 440;
  const m = { l: 78, r: 160, t: 40, b: 56 };
  const all = series.flatMap((s) => s.points);
  if (all.length === 0) throw new InvalidArgumentError('convergencePlotSvg needs at least one point', { field: 'series' });
  series.forEach((s, i) => s.points.forEach(([x, y], j) => {
    if (!(x > 0 && y > 0 && Number.isFinite(x) && Number.isFinite(y))) {
      throw new InvalidArgumentError(`series[${i}].points[${j}] = (${x}, ${y}) must have finite positive coordinates (log–log axes)`, {
        field: `series[${i}].points[${j}]`,
        expected: 'finite x > 0 and y > 0',
        received: `${x}, ${y}`,
      });
    }
  }));
  const lx = all.map((p) => Math.log10(p[0]));
  const ly = all.map((p) => Math.log10(p[1]));
  const x0 = Math.floor(Math.min(...lx));
  const x1 = Math.max(x0 + 1, Math.ceil(Math.max(...lx)));
  const y0 = Math.floor(Math.min(...ly));
  const y1 = Math.max(y0 + 1, Math.ceil(Math.max(...ly)));
  const px = (v: number) => m.l + ((Math.log10(v) - x0) / (x1 - x0)) * (W - m.l - m.r);
  const py = (v: number) => H - m.b - ((Math.log10(v) - y0) / (y1 - y0)) * (H - m.t - m.b);
  const out: string[] = [];
  out.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" font-family="sans-serif" font-size="12">`);
  out.push(`<rect width="${W}" height="${H}" fill="white"/>`);
  for (let e = x0; e <= x1; e++) {
    const x = px(10 ** e);
    out.push(`<line x1="${x}" y1="${m.t}" x2="${x}" y2="${H - m.b}" stroke="#ddd"/>`);
    out.push(`<text x="${x}" y="${H - m.b + 18}" text-anchor="middle">1e${e}</text>`);
  }
  for (let e = y0; e <= y1; e++) {
    const y = py(10 ** e);
    out.push(`<line x1="${m.l}" y1="${y}" x2="${W - m.r}" y2="${y}" stroke="#ddd"/>`);
    out.push(`<text x="${m.l - 8}" y="${y + 4}" text-anchor="end">1e${e}</text>`);
  }
  out.push(`<rect x="${m.l}" y="${m.t}" width="${W - m.l - m.r}" height="${H - m.t - m.b}" fill="none" stroke="#333"/>`);
  // Left-aligned: a long title (problem files name their plots after their title) runs into the
  // legend's free space on the right instead of off the left edge.
  if (opts.title) out.push(`<text x="10" y="${m.t - 14}" font-size="14">${esc(opts.title)}</text>`);
  out.push(`<text x="${(m.l + W - m.r) / 2}" y="${H - 14}" text-anchor="middle">${esc(opts.xLabel ?? 'unknowns')}</text>`);
  out.push(`<text transform="translate(18 ${(m.t + H - m.b) / 2}) rotate(-90)" text-anchor="middle">${esc(opts.yLabel ?? 'error')}</text>`);
  let legendY = m.t + 10;
  const legend = (color: string, label: string, dash: string | null) => {
    const x = W - m.r + 12;
    out.push(`<line x1="${x}" y1="${legendY}" x2="${x + 24}" y2="${legendY}" stroke="${color}" stroke-width="2"${dash ? ` stroke-dasharray="${dash}"` : ''}/>`);
    out.push(`<text x="${x + 30}" y="${legendY + 4}">${esc(label)}</text>`);
    legendY += 20;
  };
  series.forEach((s, i) => {
    const color = COLORS[i % COLORS.length]!;
    const pts = s.points.map(([x, y]) => `${px(x).toFixed(1)},${py(y).toFixed(1)}`);
    out.push(`<polyline points="${pts.join(' ')}" fill="none" stroke="${color}" stroke-width="2"/>`);
    for (const [x, y] of s.points) out.push(`<circle cx="${px(x).toFixed(1)}" cy="${py(y).toFixed(1)}" r="3" fill="${color}"/>`);
    legend(color, s.label, null);
  });
  const anchor = series.find((s) => s.points.length > 0)!.points[0]!;
  const xEnd = 10 ** x1;
  (opts.referenceSlopes ?? []).forEach((slope, i) => {
    // In log coordinates (no overflow for steep slopes): log y = log y_a + slope · (log x − log x_a).
    const lyEnd = Math.log10(anchor[1]) + slope * (x1 - Math.log10(anchor[0]));
    const yEndPx = H - m.b - ((lyEnd - y0) / (y1 - y0)) * (H - m.t - m.b);
    const dash = DASHES[i % DASHES.length]!;
    out.push(`<line x1="${px(anchor[0])}" y1="${py(anchor[1])}" x2="${px(xEnd)}" y2="${yEndPx}" stroke="#555" stroke-dasharray="${dash}" clip-path="url(#plot)"/>`);
    legend('#555', `slope ${slope}`, dash);
  });
  out.splice(2, 0, `<defs><clipPath id="plot"><rect x="${m.l}" y="${m.t}" width="${W - m.l - m.r}" height="${H - m.t - m.b}"/></clipPath></defs>`);
  out.push('</svg>', '');
  return out.join('\n');
}

function esc(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
}
